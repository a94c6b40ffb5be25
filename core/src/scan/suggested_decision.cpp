#include "siftwave/scan/suggested_decision.h"

namespace siftwave::scan {

Result<ledger::Decision> suggestedDecision(const Finding& finding, const std::string& measure) {
    if (!finding.suggestion)
        return makeError(ErrorCode::NotFound, "finding " + finding.id + " suggests no decision");
    ledger::Decision d = *finding.suggestion;
    d.finding = finding.id;
    // A finding about every measure is decided for the one in view; accept keeps "every".
    if (!finding.measure && d.kind != ledger::DecisionKind::Accept)
        d.measure = measure;
    return d;
}

}  // namespace siftwave::scan
