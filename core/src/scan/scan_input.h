#pragma once
// What every detector reads: the drop, the options, the optional previous drop
// and register, and facts about each measure computed once (weekday factors,
// whether the measure is cumulative, region totals).
//
// Detectors index periods (days or weeks, drop.axis); a threshold that counts
// periods is taken for the drop's cadence with ScanInput::periods(days, weeks).
// Weekly drops have no weekday factors (all 1, `estimated` false).

#include "siftwave/drop.h"
#include "siftwave/scan/finding.h"
#include "siftwave/scan/scan.h"
#include "siftwave/scan/scan_options.h"

#include <nlohmann/json.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <span>
#include <string>
#include <vector>

namespace siftwave::scan::detail {

inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

/// Multiplicative weekday factors, index 0 = Monday .. 6 = Sunday, mean 1.
struct WeekdayFactors {
    std::array<double, 7> factor{1, 1, 1, 1, 1, 1, 1};
    std::array<std::size_t, 7> daysUsed{};  // ratios behind each factor
    bool estimated = false;                 // false: too little data, factors are all 1
    /// Highest factor / lowest factor - 1.
    double strength() const;
};

struct MeasureFacts {
    std::size_t index = 0;
    bool cumulative = false;
    std::size_t rises = 0;  // day-to-day increases over all regions
    std::size_t falls = 0;  // day-to-day decreases
    WeekdayFactors weekday;
    double overdispersion = 0;         // phi in Var = mu + phi mu^2 (1 / negative-binomial size)
    std::vector<double> regionTotals;  // sum of reported values per region
};

struct ScanInput {
    const Drop& drop;
    const ScanOptions& options;
    ScanContext context;
    int firstWeekday = 0;  // 0 = Monday, for day index 0 (daily drops)
    std::vector<MeasureFacts> measures;

    int weekdayOf(std::int32_t day) const { return (firstWeekday + day) % 7; }
    bool weekly() const { return drop.axis.weekly(); }
    /// The threshold for the drop's cadence: `daily` for daily data, `weekly` for weekly data.
    template <typename T>
    T periods(T daily, T weekly) const {
        return drop.axis.weekly() ? weekly : daily;
    }
    /// Days covered by `count` periods (the `days` of the evidence; equal for daily data).
    std::int64_t daysIn(std::int64_t count) const { return count * drop.axis.periodDays(); }
};

/// The threshold for a cadence (as ScanInput::periods, where there is no ScanInput).
template <typename T>
T forCadence(const TimeAxis& axis, T daily, T weekly) {
    return axis.weekly() ? weekly : daily;
}

/// Computes the measure facts. The options must validate.
ScanInput prepareScanInput(const Drop& drop, const ScanOptions& options,
                           const ScanContext& context = {});

/// The reported values of one series as doubles, NaN where not reported.
std::vector<double> seriesValues(std::span<const Cell> cells);

/// Median of the reported (non-NaN) values within `window` days before `first`
/// and after `last` (the run itself excluded); NaN when there are none.
double levelAround(std::span<const double> values, std::int32_t first, std::int32_t last,
                   int window);

/// Weekday factors by ratio to a centred 7-day moving average (classical
/// multiplicative decomposition; Hyndman and Athanasopoulos, "Forecasting:
/// Principles and Practice", 3rd ed., section 3.4): for every day t whose
/// window t-3..t+3 is fully reported with mean a_t >= minLevel, r_t = x_t / a_t;
/// the factor of weekday w is the median of its r_t; factors are scaled to mean 1.
/// `regions` selects the series pooled (all of them when empty; a drop with more
/// than 350,000 region-days then pools every k-th region so that about 350,000 are used).
WeekdayFactors estimateWeekdayFactors(const Drop& drop, std::size_t measure, int firstWeekday,
                                      std::span<const std::size_t> regions, double minLevel,
                                      int minWeeks);

/// Overdispersion phi (Var x = mu + phi mu^2, phi = 1/k of a negative binomial),
/// pooled over the regions of a measure: with weekday-adjusted values y_t and
/// their centred mean a_t over w periods (a_t >= 10), the residuals r_t = y_t - a_t
/// have variance about ((w-1)/w) Var y_t; phi is the value at which the median of
/// |r_t| / sqrt(((w-1)/w)(a_t + phi a_t^2)) equals 0.6745, the median of |N(0,1)|
/// (found by bisection on [0, 2], over at most 20,000 evenly spaced periods).
/// 0 when fewer than 50 periods qualify. w = 7 days for daily data (a whole week, so
/// that the weekday effect cancels); w = 5 weeks for weekly data (no weekday cycle to
/// cancel, and a shorter mean follows a seasonal wave, whose curvature would otherwise
/// count as noise): overdispersionWidth().
double estimateOverdispersion(const Drop& drop, std::size_t measure, int firstWeekday,
                              const WeekdayFactors& factors);
/// The w above for the drop's cadence.
int overdispersionWidth(const TimeAxis& axis);

/// Calls visit(m, r, cells) for every region's series of every measure that is not
/// cumulative (a cumulative measure's decreases are cumulative_decrease's).
template <typename Visit>
void forEachCountSeries(const ScanInput& in, Visit&& visit) {
    for (std::size_t m = 0; m < in.drop.measures.size(); ++m) {
        if (in.measures[m].cumulative)
            continue;
        for (std::size_t r = 0; r < in.drop.regionCodes.size(); ++r)
            visit(m, r, in.drop.series(m, r));
    }
}

/// A finding with kind, severity, region (by index) and measure (by index) filled in.
Finding makeFinding(const ScanInput& in, FindingKind kind, Severity severity,
                    std::optional<std::size_t> region, std::optional<std::size_t> measure);

/// A suggestion of `kind` for `f`, with the finding's region and measure (empty: every
/// measure); set the finding's region before.
ledger::Decision suggestionFor(const Finding& f, ledger::DecisionKind kind);
/// A suggestion to merge region `variant` into `into` (every measure; it names no region).
ledger::Decision mergeSuggestion(const Finding& f, const std::string& variant,
                                 const std::string& into);
/// Suggests keeping the finding's cells as reported (its region, measure and periods: set
/// them before), with a note for the analyst.
void suggestAccept(Finding& f, std::string note);

// One detector per file, each appending its findings.
void findMissingDates(const ScanInput& in, std::vector<Finding>& out);
void findDuplicateRows(const ScanInput& in, std::vector<Finding>& out);
void findNegativeCounts(const ScanInput& in, std::vector<Finding>& out);
void findBacklogDumps(const ScanInput& in, std::vector<Finding>& out);
void findReportingGaps(const ScanInput& in, std::vector<Finding>& out);
void findStaleValues(const ScanInput& in, std::vector<Finding>& out);
void findCodeCollisions(const ScanInput& in, std::vector<Finding>& out);
void findCodeVariants(const ScanInput& in, std::vector<Finding>& out);
void findUnknownCodes(const ScanInput& in, std::vector<Finding>& out);
void findWeekdayEffects(const ScanInput& in, std::vector<Finding>& out);
void findCumulativeDecreases(const ScanInput& in, std::vector<Finding>& out);
void findHierarchyMismatches(const ScanInput& in, std::vector<Finding>& out);
void findCaseDateProblems(const ScanInput& in, std::vector<Finding>& out);
/// Appends the revision findings of the newest pair of releases (the context's history, or its
/// previous drop and the scanned one) and fills the report's revision summaries.
void findRevisions(const ScanInput& in, ScanReport& report);

}  // namespace siftwave::scan::detail
