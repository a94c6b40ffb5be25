// code_variant: codes that become the same after folding surrounding
// whitespace, case and leading zeros ("0412" and "412"): probably one region
// split in two.
//
// For each group of two or more codes with one folded form, the canonical code
// is the one in the region register (when one is given), else the one with the
// most reported cells (first seen on a tie). One finding per other code, with
// the suggestion to merge it into the canonical code.

#include "scan/code_text.h"
#include "scan/scan_input.h"

#include <map>

namespace siftwave::scan::detail {
namespace {

struct CodeStats {
    std::size_t reported = 0;
    double total = 0;
    std::int32_t first = -1, last = -1;
};

CodeStats statsOf(const Drop& drop, std::size_t r) {
    CodeStats s;
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        const std::span<const Cell> cells = drop.series(m, r);
        for (std::int32_t t = 0; t < drop.periods(); ++t) {
            const Cell& c = cells[static_cast<std::size_t>(t)];
            if (!c.reported())
                continue;
            ++s.reported;
            if (m == 0)
                s.total += c.value;
            if (s.first < 0 || t < s.first)
                s.first = t;
            s.last = std::max(s.last, t);
        }
    }
    return s;
}

}  // namespace

void findCodeVariants(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    std::map<std::string, std::vector<std::size_t>> groups;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        groups[foldCode(drop.regionCodes[r])].push_back(r);
    }
    for (const auto& [folded, members] : groups) {
        if (members.size() < 2)
            continue;
        std::vector<CodeStats> stats;
        for (std::size_t r : members)
            stats.push_back(statsOf(drop, r));
        std::size_t canonical = 0;
        bool inRegister = false;
        for (std::size_t i = 0; i < members.size(); ++i) {
            const bool known = in.context.regions &&
                               in.context.regions->find(drop.regionCodes[members[i]]) != nullptr;
            if (known && !inRegister) {
                canonical = i;
                inRegister = true;
            } else if (!inRegister && stats[i].reported > stats[canonical].reported) {
                canonical = i;
            }
        }
        nlohmann::json variants = nlohmann::json::array();
        for (std::size_t i = 0; i < members.size(); ++i) {
            nlohmann::json v = {{"code", drop.regionCodes[members[i]]},
                                {"reported_cells", stats[i].reported}};
            if (stats[i].first >= 0) {
                v["first"] = drop.periodStart(stats[i].first).iso();
                v["last"] = drop.periodStart(stats[i].last).iso();
            }
            variants.push_back(std::move(v));
        }
        const std::size_t c = members[canonical];
        for (std::size_t i = 0; i < members.size(); ++i) {
            if (i == canonical)
                continue;
            const std::size_t r = members[i];
            // Days on which both codes have a value: a split region has few or none.
            std::size_t overlap = 0;
            for (std::size_t m = 0; m < drop.measures.size(); ++m) {
                for (std::int32_t t = 0; t < drop.periods(); ++t) {
                    overlap += drop.cell(m, r, t).reported() && drop.cell(m, c, t).reported();
                }
            }
            Finding f =
                makeFinding(in, FindingKind::CodeVariant, Severity::Warning, r, std::nullopt);
            f.impact = stats[i].total;
            f.evidence = {{"folded", folded},
                          {"canonical", drop.regionCodes[c]},
                          {"canonical_in_register", inRegister},
                          {"variants", variants},
                          {"overlap_cells", overlap}};
            f.suggestion = mergeSuggestion(f, drop.regionCodes[r], drop.regionCodes[c]);
            out.push_back(std::move(f));
        }
    }
}

}  // namespace siftwave::scan::detail
