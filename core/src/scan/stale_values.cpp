// stale_values: a run of one repeated non-zero value (copied forward).
//
// A run of L >= min_days days (min_weeks weeks in weekly data) identical reported values
// v > 0 is reported when the chance that L draws at the run's expected level are all equal
// (and non-zero) is at most max_chance: sum_{k >= 1} p_k^L under negative-binomial noise with
// the measure's overdispersion (equalNonZeroRunChance, robust_stats.h). The expected level is
// the median of the reported values in the `window` periods on each side of the run (issue 14,
// as reporting_gap judges its zeros), and it must be at least `min_level` a day /
// `min_weekly_level` a week (reporting_gap's bars): below them repeats are common, the copies carry
// few counts, and a run of 1s among zeros is as likely a small cluster. Small counts repeat by
// chance (three 1s at a level of 1 have a chance of 0.05). Evidence: value, periods, level_around,
// chance_under_local_level, and chance_under_poisson (the older measure: q(v)^(L-1) with
// q(v) = exp(-2v) I_0(2v), the chance of L - 1 draws equal to the one before at level v).

#include "scan/robust_stats.h"
#include "scan/scan_input.h"

#include <algorithm>
#include <cmath>
#include <unordered_map>

namespace siftwave::scan::detail {
namespace {

// The median of the reported values in the `window` periods on each side of [first, last];
// their mean when the median is below 1 (a sparse series' median is 0 and says nothing of its
// rate, and a zero level would make any run of 1s impossible).
double levelAround(std::span<const Cell> cells, std::int32_t first, std::int32_t last, int window,
                   std::vector<double>& scratch) {
    const auto n = static_cast<std::int32_t>(cells.size());
    scratch.clear();
    for (std::int32_t t = std::max(0, first - window); t <= std::min(n - 1, last + window); ++t) {
        const Cell& c = cells[static_cast<std::size_t>(t)];
        if ((t < first || t > last) && c.reported())
            scratch.push_back(static_cast<double>(c.value));
    }
    if (scratch.empty())
        return 0.0;
    double mean = 0;
    for (double v : scratch)
        mean += v / static_cast<double>(scratch.size());
    const double median = medianInPlace(scratch);
    return std::max(0.0, median >= 1 ? median : mean);
}

// The finding of the run t..end of `value`.
Finding staleFinding(const ScanInput& in, std::size_t m, std::size_t r, const Cell& c,
                     std::int32_t t, std::int32_t end) {
    const Drop& drop = in.drop;
    const int periods = end - t + 1;
    Finding f = makeFinding(in, FindingKind::StaleValues, Severity::Warning, r, m);
    f.first = drop.periodStart(t);
    f.last = drop.periodStart(end);
    f.impact = static_cast<double>(c.value) * (periods - 1);
    f.evidence = {{"value", c.value},
                  {"days", in.daysIn(periods)},
                  {"periods", periods},
                  {"chance_under_poisson",
                   std::pow(poissonEqualChance(static_cast<double>(c.value)), periods - 1)},
                  {"first_line", c.line}};
    // The first period of the run may be genuine; the copies follow it.
    ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Exclude);
    s.window = ledger::DayRange{drop.periodStart(t + 1), *f.last};
    f.suggestion = std::move(s);
    f.suggestionNotes.note = "values copied forward carry no new count";
    return f;
}

}  // namespace

void findStaleValues(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const StaleValuesOptions& o = in.options.staleValues;
    const int minRun = in.periods(o.minDays, o.minWeeks);
    const int window = in.periods(o.windowDays, o.windowWeeks);
    const double minLevel = in.drop.axis.weekly() ? o.minWeeklyLevel : o.minLevel;
    std::vector<double> scratch;
    forEachCountSeries(in, [&](std::size_t m, std::size_t r, std::span<const Cell> cells) {
        const double phi = in.measures[m].overdispersion;
        for (std::int32_t t = 0; t < drop.periods(); ++t) {
            const Cell& c = cells[static_cast<std::size_t>(t)];
            if (!c.reported() || c.value <= 0)
                continue;
            std::int32_t end = t;
            while (end + 1 < drop.periods() &&
                   cells[static_cast<std::size_t>(end) + 1].reported() &&
                   cells[static_cast<std::size_t>(end) + 1].value == c.value) {
                ++end;
            }
            const int periods = end - t + 1;
            if (periods >= minRun) {
                const double level = levelAround(cells, t, end, window, scratch);
                const double chance = equalNonZeroRunChance(level, phi, periods);
                if (level >= minLevel && chance <= o.maxChance) {
                    Finding f = staleFinding(in, m, r, c, t, end);
                    f.evidence["level_around"] = std::round(level * 10) / 10;
                    f.evidence["chance_under_local_level"] = chance;
                    out.push_back(std::move(f));
                }
            }
            t = end;
        }
    });
}

}  // namespace siftwave::scan::detail
