// unknown_code: a code that is not in the region register (--regions FILE).
//
// Codes are compared verbatim. When a register code has the same folded form
// (code_text.h) it is named, and the suggestion is to merge into it; otherwise
// the suggestion is to exclude the region (or add it to the register).

#include "scan/code_text.h"
#include "scan/scan_input.h"

#include <unordered_map>

namespace siftwave::scan::detail {

void findUnknownCodes(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const RegionRegister* reg = in.context.regions;
    if (reg == nullptr)
        return;
    std::unordered_map<std::string, std::string> byFold;
    for (const RegionEntry& e : reg->entries)
        byFold.emplace(foldCode(e.code), e.code);
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        const std::string& code = drop.regionCodes[r];
        if (reg->find(code) != nullptr)
            continue;
        std::size_t reported = 0;
        double total = 0;
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            for (const Cell& c : drop.series(m, r)) {
                reported += c.reported();
                if (m == 0 && c.reported())
                    total += c.value;
            }
        }
        Finding f = makeFinding(in, FindingKind::UnknownCode, Severity::Warning, r, std::nullopt);
        f.impact = total;
        f.evidence = {{"register", reg->path}, {"reported_cells", reported}};
        auto match = byFold.find(foldCode(code));
        if (match != byFold.end()) {
            f.evidence["similar"] = match->second;
            f.suggestion = mergeSuggestion(f, code, match->second);
        } else {
            f.suggestion = suggestionFor(f, ledger::DecisionKind::Exclude);  // the whole region
            f.suggestionNotes.note = "or add the region to the register";
        }
        out.push_back(std::move(f));
    }
}

}  // namespace siftwave::scan::detail
