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
