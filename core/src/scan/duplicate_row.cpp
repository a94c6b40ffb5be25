// duplicate_row: the same region, date and measure on more than one row.
//
// The Drop keeps the first occurrence in its table and the repeats aside.
// One finding per (measure, region, period), listing every source line and value,
// and whether the values agree. Agreeing repeats are harmless (info); repeats
// that disagree put the difference in doubt (warning). Suggested decision:
// keep the first row when they agree, else the last (a later row is usually
// the correction; common practice, no source).

#include "scan/scan_input.h"

#include <algorithm>
#include <map>
#include <tuple>

namespace siftwave::scan::detail {

void findDuplicateRows(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    std::map<std::tuple<std::size_t, std::size_t, std::int32_t>, std::vector<const DuplicateRow*>>
        groups;
    for (const DuplicateRow& d : drop.duplicates) {
        if (d.measure >= drop.measures.size() || d.region >= drop.regionCodes.size() || d.day < 0 ||
            d.day >= drop.periods()) {
            continue;
        }
        groups[{d.measure, d.region, d.day}].push_back(&d);
    }
    for (const auto& [key, repeats] : groups) {
        const auto [m, r, day] = key;
        const Cell& kept = drop.cell(m, r, day);
        nlohmann::json rows = nlohmann::json::array();
        auto describe = [](const Cell& c) {
            nlohmann::json row = {{"line", c.line}, {"state", cellStateName(c.state)}};
            row["value"] = c.reported() ? nlohmann::json(c.value) : nlohmann::json(nullptr);
            return row;
        };
        rows.push_back(describe(kept));
        bool agree = true;
        double lo = kept.reported() ? kept.value : 0, hi = lo;
        for (const DuplicateRow* d : repeats) {
            rows.push_back(describe(d->cell));
            agree = agree && d->cell.state == kept.state &&
                    (!kept.reported() || d->cell.value == kept.value);
            if (d->cell.reported()) {
                lo = std::min<double>(lo, d->cell.value);
                hi = std::max<double>(hi, d->cell.value);
            }
        }
        Finding f = makeFinding(in, FindingKind::DuplicateRow,
                                agree ? Severity::Info : Severity::Warning, r, m);
        f.first = f.last = drop.periodStart(day);
        f.impact = hi - lo;
        f.evidence = {{"rows", rows}, {"values_agree", agree}, {"occurrences", rows.size()}};
        if (!agree)
            f.evidence["spread"] = hi - lo;
        ledger::Decision s = suggestionFor(f, ledger::DecisionKind::ResolveDuplicate);
        s.date = drop.periodStart(day);
        s.duplicateRule = agree ? ledger::DuplicateRule::First : ledger::DuplicateRule::Last;
        f.suggestion = std::move(s);
        out.push_back(std::move(f));
    }
}

}  // namespace siftwave::scan::detail
