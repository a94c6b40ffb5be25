#pragma once
// The per-period backlog arithmetic shared by the backlog_dump detector and
// estimateBacklog() (see siftwave/scan/backlog.h for the method). The windows
// are counted in periods of the drop's cadence (BacklogDumpOptions' `...Days`
// or `...Weeks`).

#include "scan/scan_input.h"
#include "siftwave/scan/backlog.h"

#include <optional>
#include <span>
#include <vector>

namespace siftwave::scan::detail {

/// Scratch space and the series of one region, reused across days.
class BacklogSeries {
public:
    BacklogSeries(const BacklogDumpOptions& options, const TimeAxis& axis,
                  const WeekdayFactors& factors, double overdispersion, int firstWeekday)
        : m_options(options),
          m_window(forCadence(axis, options.windowDays, options.windowWeeks)),
          m_gapMin(forCadence(axis, options.gapMinDays, options.gapMinWeeks)),
          m_maxGap(forCadence(axis, options.maxGapDays, options.maxGapWeeks)),
          m_redistribute(forCadence(axis, options.redistributeDays, options.redistributeWeeks)),
          m_factors(factors),
          m_overdispersion(overdispersion),
          m_firstWeekday(firstWeekday) {}

    /// Loads one region's cells.
    void load(std::span<const Cell> cells);

    /// Cheap test: false when period t cannot be flagged whatever the baseline.
    bool mightBeFlagged(std::int32_t t) const;

    /// The full estimate for period t (nullopt when not reported or too few neighbours).
    /// Dates are left as period indices in `day`, `gapFirst`, ... (serial = index).
    std::optional<BacklogEstimate> estimate(std::int32_t t);

private:
    // A side of the local trend: median of the weekday-adjusted values reported in
    // [first, last] at the mean index of those values; n = 0 when none is reported.
    struct Side {
        double median = 0;
        double centre = 0;
        double scale = 0;  // 1.4826 * MAD around the median
        int n = 0;
    };
    Side side(std::int32_t first, std::int32_t last);
    // The trend between two sides, at period j (weekday-adjusted).
    static double trendAt(const Side& left, const Side& right, double j);
    // The same, interpolated on the log scale (geometric growth or decline).
    static double growthAt(const Side& left, const Side& right, double j);
    // The deficit before t: the window length in periods with the largest sum of
    // (expected - reported) below a trend from the periods before it and after t.
    struct Deficit {
        int periods = 0;
        double sum = 0;
        double sd = 0;  // of the sum under the noise model
        Side left;
    };
    Deficit deficitBefore(std::int32_t t, const Side& right, double excess);
    double noiseSd(double mean) const;

    double factorAt(std::int32_t t) const {
        return m_factors.factor[static_cast<std::size_t>((m_firstWeekday + t) % 7)];
    }

    const BacklogDumpOptions& m_options;
    int m_window;        // neighbours on each side, in periods
    int m_gapMin;        // shortest gap, in periods
    int m_maxGap;        // longest gap looked for, in periods
    int m_redistribute;  // suggested window without a gap, in periods
    const WeekdayFactors& m_factors;
    double m_overdispersion;
    int m_firstWeekday;
    std::vector<double> m_x;  // reported value or NaN
    std::vector<double> m_y;  // x / weekday factor
    std::vector<double> m_scratch;
};

}  // namespace siftwave::scan::detail
