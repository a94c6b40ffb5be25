// code_collision: a region code that other tools misread (severity info).
//
// Siftwave keeps codes as text, so it read the code correctly; whoever
// receives the cleaned file may not. The rules (code_text.h): missing-value
// tokens (NA, N/A, NULL, None, NaN, #N/A, -, the empty code, any case),
// booleans (TRUE/FALSE/YES/NO/ON/OFF), surrounding whitespace, leading zeros,
// scientific notation (1E5), more than 15 digits, and day-month shapes (MAR1,
// 1-MAR, 3/4) that spreadsheets turn into dates.

#include "scan/code_text.h"
#include "scan/scan_input.h"

namespace siftwave::scan::detail {

void findCodeCollisions(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        const std::optional<CodeCollision> c = codeCollision(drop.regionCodes[r]);
        if (!c)
            continue;
        std::size_t reported = 0;
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            for (const Cell& cell : drop.series(m, r))
                reported += cell.reported();
        }
        Finding f = makeFinding(in, FindingKind::CodeCollision, Severity::Info, r, std::nullopt);
        f.evidence = {{"reason", c->reason}, {"read_as", c->readAs}, {"reported_cells", reported}};
        suggestAccept(f,
                      "keep the code as quoted text when exporting, and tell "
                      "recipients: other tools read it as " +
                          c->readAs);
        out.push_back(std::move(f));
    }
}

}  // namespace siftwave::scan::detail
