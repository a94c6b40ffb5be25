// reporting_gap: a run of zeros inside an active stretch of a series.
//
// A run of reported zeros, with a non-zero value somewhere before and after it
// (the quiet tails of a series are not gaps), where the median of the reported
// periods on each side is at least the minimum level: under Poisson noise a
// run of L zeros at level mu has chance exp(-L mu). Daily data: at least
// min_days [2] zero days, window_days [14] days on each side, min_level [5] a
// day (chance below 5e-5). Weekly data: at least min_weeks [1] zero week,
// window_weeks [4] weeks on each side, min_weekly_level [20] a week (chance
// exp(-20) = 2e-9; stricter than the daily bar because a single period decides,
// and weekly counts are overdispersed: under negative-binomial noise of size 25
// a zero week at 10 has a chance of 1e-4). When the period after the run is more than
// twice the level it is the catch-up, and the suggestion is to redistribute it
// over the run; otherwise to treat the zeros as unreported.
//
// Evidence: periods, days (the days they cover: equal for daily data),
// level_around, chance_under_poisson, first_line, value_after, catch_up.

#include "scan/scan_input.h"

#include <algorithm>
#include <cmath>

namespace siftwave::scan::detail {

void findReportingGaps(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const ReportingGapOptions& o = in.options.reportingGap;
    const int minRun = in.periods(o.minDays, o.minWeeks);
    const int window = in.periods(o.windowDays, o.windowWeeks);
    const double minLevel = in.periods(o.minLevel, o.minWeeklyLevel);
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        if (in.measures[m].cumulative)
            continue;
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            const std::span<const Cell> cells = drop.series(m, r);
            std::int32_t firstPositive = -1, lastPositive = -1;
            for (std::int32_t t = 0; t < drop.periods(); ++t) {
                const Cell& c = cells[static_cast<std::size_t>(t)];
                if (c.reported() && c.value > 0) {
                    if (firstPositive < 0)
                        firstPositive = t;
                    lastPositive = t;
                }
            }
            if (firstPositive < 0)
                continue;
            std::vector<double> values;  // filled on the first candidate only
            for (std::int32_t t = firstPositive + 1; t < lastPositive; ++t) {
                const Cell& c = cells[static_cast<std::size_t>(t)];
                if (!c.reported() || c.value != 0)
                    continue;
                std::int32_t end = t;
                while (end + 1 < lastPositive &&
                       cells[static_cast<std::size_t>(end) + 1].reported() &&
                       cells[static_cast<std::size_t>(end) + 1].value == 0) {
                    ++end;
                }
                const int periods = end - t + 1;
                // Cheap bound first: the median around the run is at most its largest value.
                bool mayBeActive = false;
                for (std::int32_t j = std::max(0, t - window);
                     j <= std::min(drop.periods() - 1, end + window) && !mayBeActive; ++j) {
                    const Cell& n = cells[static_cast<std::size_t>(j)];
                    mayBeActive = n.reported() && n.value >= minLevel;
                }
                if (periods >= minRun && mayBeActive) {
                    if (values.empty())
                        values = seriesValues(cells);
                    const double level = levelAround(values, t, end, window);
                    if (!std::isnan(level) && level >= minLevel) {
                        Finding f =
                            makeFinding(in, FindingKind::ReportingGap, Severity::Warning, r, m);
                        f.first = drop.periodStart(t);
                        f.last = drop.periodStart(end);
                        f.impact = level * periods;
                        f.evidence = {{"days", in.daysIn(periods)},
                                      {"periods", periods},
                                      {"level_around", level},
                                      {"chance_under_poisson", std::exp(-level * periods)},
                                      {"first_line", c.line}};
                        const Cell& after = cells[static_cast<std::size_t>(end) + 1];
                        const bool catchUp = after.reported() && after.value > 2.0 * level;
                        if (after.reported())
                            f.evidence["value_after"] = after.value;
                        f.evidence["catch_up"] = catchUp;
                        if (catchUp) {
                            ledger::Decision s =
                                suggestionFor(f, ledger::DecisionKind::Redistribute);
                            s.date = drop.periodStart(end + 1);
                            s.excess = std::max<long long>(0, std::llround(after.value - level));
                            s.window = ledger::DayRange{*f.first, *f.last};
                            s.redistributeMethod = ledger::RedistributeMethod::Baseline;
                            f.suggestion = std::move(s);
                        } else {
                            ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Exclude);
                            s.window = ledger::DayRange{*f.first, *f.last};
                            f.suggestion = std::move(s);
                            f.suggestionNotes.note =
                                std::string("zeros inside an active stretch are probably ") +
                                drop.axis.unitPlural() + " that were not reported";
                        }
                        out.push_back(std::move(f));
                    }
                }
                t = end;
            }
        }
    }
}

}  // namespace siftwave::scan::detail
