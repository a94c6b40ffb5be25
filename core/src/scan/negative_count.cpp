// negative_count: a negative count, usually a correction of earlier periods.
//
// Every reported value below zero in a measure that is not cumulative (a
// cumulative measure's decreases are `cumulative_decrease`). The suggestion
// spreads the correction over the `spread_days` days (`spread_weeks` weeks of
// weekly data) before it, in proportion to them (the ledger's spread_negative).
// Critical when the correction is at least 2 % of the region's total, or larger
// than the earlier window can absorb.
//
// Evidence: value, line, earlier_periods and earlier_days (the window before,
// in periods and in the days they cover: equal for daily data),
// earlier_days_sum (the counts of that window), region_total.

#include "scan/scan_input.h"

#include <algorithm>
#include <cmath>

namespace siftwave::scan::detail {

void findNegativeCounts(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const int spread =
        in.periods(in.options.negativeCount.spreadDays, in.options.negativeCount.spreadWeeks);
    forEachCountSeries(in, [&](std::size_t m, std::size_t r, std::span<const Cell> cells) {
        for (std::int32_t t = 0; t < drop.periods(); ++t) {
            const Cell& c = cells[static_cast<std::size_t>(t)];
            if (!c.reported() || c.value >= 0)
                continue;
            const std::int32_t from = std::max(0, t - spread);
            double before = 0;
            for (std::int32_t j = from; j < t; ++j) {
                const Cell& p = cells[static_cast<std::size_t>(j)];
                if (p.reported() && p.value > 0)
                    before += p.value;
            }
            const double total = in.measures[m].regionTotals[r];
            const double size = -static_cast<double>(c.value);
            const bool absorbable = before >= size;
            const bool large = total > 0 ? size >= 0.02 * total : true;
            Finding f =
                makeFinding(in, FindingKind::NegativeCount,
                            large || !absorbable ? Severity::Critical : Severity::Warning, r, m);
            f.first = f.last = drop.periodStart(t);
            f.impact = size;
            f.evidence = {{"value", c.value},
                          {"line", c.line},
                          {"earlier_days_sum", before},
                          {"earlier_days", in.daysIn(t - from)},
                          {"earlier_periods", t - from},
                          {"region_total", total}};
            if (t > from) {
                ledger::Decision s = suggestionFor(f, ledger::DecisionKind::SpreadNegative);
                s.date = drop.periodStart(t);
                s.window = ledger::DayRange{drop.periodStart(from), drop.periodStart(t - 1)};
                f.suggestion = std::move(s);
                f.suggestionNotes.absorbable = absorbable;
            } else {
                suggestAccept(f, std::string("no earlier ") + drop.axis.unitPlural() +
                                     " in the drop to absorb it");
            }
            out.push_back(std::move(f));
        }
    });
}

}  // namespace siftwave::scan::detail
