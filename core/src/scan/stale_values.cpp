// stale_values: a run of one repeated non-zero value (copied forward).
//
// A run of L >= min_days days (min_weeks weeks in weekly data) identical
// reported values v > 0 is reported when the
// chance of L - 1 consecutive equal draws under Poisson noise at level v,
// q(v)^(L-1) with q(v) = sum_k P(k)^2 = exp(-2v) I_0(2v), is at most
// max_chance. Poisson is the least dispersed count model in use, so real
// (overdispersed) counts repeat even less often: the test errs towards silence.
// Small counts repeat by chance (1, 1, 1 has chance 0.095) and are not reported.

#include "scan/robust_stats.h"
#include "scan/scan_input.h"

#include <cmath>
#include <unordered_map>

namespace siftwave::scan::detail {

void findStaleValues(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const StaleValuesOptions& o = in.options.staleValues;
    const int minRun = in.periods(o.minDays, o.minWeeks);
    std::unordered_map<std::int32_t, double> equalChance;  // memo per value
    forEachCountSeries(in, [&](std::size_t m, std::size_t r, std::span<const Cell> cells) {
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
                auto it = equalChance.find(c.value);
                if (it == equalChance.end()) {
                    it = equalChance.emplace(c.value, poissonEqualChance(c.value)).first;
                }
                const double chance = std::pow(it->second, periods - 1);
                if (chance <= o.maxChance) {
                    Finding f = makeFinding(in, FindingKind::StaleValues, Severity::Warning, r, m);
                    f.first = drop.periodStart(t);
                    f.last = drop.periodStart(end);
                    f.impact = static_cast<double>(c.value) * (periods - 1);
                    f.evidence = {{"value", c.value},
                                  {"days", in.daysIn(periods)},
                                  {"periods", periods},
                                  {"chance_under_poisson", chance},
                                  {"first_line", c.line}};
                    // The first period of the run may be genuine; the copies follow it.
                    ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Exclude);
                    s.window = ledger::DayRange{drop.periodStart(t + 1), *f.last};
                    f.suggestion = std::move(s);
                    f.suggestionNotes.note = "values copied forward carry no new count";
                    out.push_back(std::move(f));
                }
            }
            t = end;
        }
    });
}

}  // namespace siftwave::scan::detail
