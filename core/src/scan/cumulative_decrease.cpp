// cumulative_decrease: a cumulative measure that goes down.
//
// A measure is taken as cumulative when, over all regions, at least
// min_rising_share of the changes between consecutive reported values (day to
// day, or week to week) are rises (and there are at least min_changes
// changes); counts per period rise and fall about equally often. In a
// cumulative measure, each run of periods below the highest value reported so
// far is one finding, with the suggestion to work on the differences between
// periods (where the decrease becomes one negative count).

#include "scan/scan_input.h"

#include <algorithm>

namespace siftwave::scan::detail {

void findCumulativeDecreases(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        const MeasureFacts& facts = in.measures[m];
        if (!facts.cumulative)
            continue;
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            const std::span<const Cell> cells = drop.series(m, r);
            bool seen = false;
            std::int32_t peak = 0;
            std::int32_t peakDay = 0;
            for (std::int32_t t = 0; t < drop.periods(); ++t) {
                const Cell& c = cells[static_cast<std::size_t>(t)];
                if (!c.reported())
                    continue;
                if (!seen || c.value >= peak) {
                    seen = true;
                    peak = c.value;
                    peakDay = t;
                    continue;
                }
                // A run of days below the running peak.
                std::int32_t end = t, lowest = c.value, lastBelow = t;
                for (std::int32_t j = t + 1; j < drop.periods(); ++j) {
                    const Cell& n = cells[static_cast<std::size_t>(j)];
                    if (!n.reported())
                        continue;
                    if (n.value >= peak)
                        break;
                    lowest = std::min(lowest, n.value);
                    lastBelow = j;
                }
                end = lastBelow;
                Finding f =
                    makeFinding(in, FindingKind::CumulativeDecrease, Severity::Warning, r, m);
                f.first = drop.periodStart(t);
                f.last = drop.periodStart(end);
                f.impact = static_cast<double>(peak - lowest);
                f.evidence = {{"before", peak},
                              {"before_date", drop.periodStart(peakDay).iso()},
                              {"value", c.value},
                              {"lowest", lowest},
                              {"decrease", peak - lowest},
                              {"line", c.line},
                              {"measure_rising_changes", facts.rises},
                              {"measure_falling_changes", facts.falls}};
                suggestAccept(f, std::string("the measure is cumulative: its ") +
                                     (in.weekly() ? "weekly" : "daily") +
                                     " differences turn this decrease into a negative "
                                     "count that spread_negative can absorb");
                f.suggestionNotes.action = "use_daily_differences";
                out.push_back(std::move(f));
                t = end;
            }
        }
    }
}

}  // namespace siftwave::scan::detail
