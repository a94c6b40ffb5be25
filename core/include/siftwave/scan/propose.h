#pragma once
// proposeDecision: the decision to propose for one cell an analyst points at (a
// bar picked on the plot, or `siftwave-cli decide redistribute --excess auto`), or for a
// finding (its Decide button): every front end proposes through these two calls.
//
// A picked cell is a suspected backlog: counts reported on one period that belong
// to earlier ones. What is proposed, in this order:
//   1. nothing (InvalidValue) when the cell holds no reported value, or is the
//      first period of the drop (no earlier period to move counts to);
//   2. the scan's own suggestion for that cell, when one of `findings` is a
//      backlog_dump of that region, measure (or every measure) and period: the
//      scan has already weighed it, and the decision then names the finding;
//   3. otherwise a redistribution from the scan's backlog estimate for that period
//      (estimateBacklog, scan/backlog.h, with `options`): its excess, its window
//      (the gap before the period, the deficit before it, or else the longest
//      plausible window: WindowBasis in scan/backlog.h) and the method the detector
//      would suggest (level over a gap: the expected level from the trend around it;
//      proportional otherwise, which follows the shape already in the window);
//   4. when there is no estimate (too few reported neighbours), a redistribution
//      with excess 0 for the analyst to set, over the same `redistribute_days`/
//      `_weeks` periods before, proportional; `noEstimate` says why.
// Because the backlog_dump detector builds its suggestion from the very estimate of
// step 3, steps 2 and 3 give the same excess, window and method for a cell the scan
// flagged with default options; step 2 adds the finding's id. Nothing is decided
// here: the analyst previews, edits and gives the reason.

#include "siftwave/drop.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"
#include "siftwave/scan/backlog.h"
#include "siftwave/scan/finding.h"
#include "siftwave/scan/scan_options.h"

#include <optional>
#include <span>
#include <string>

namespace siftwave::scan {

struct ProposalRequest {
    std::string region;  // verbatim code
    std::string measure;
    Date day;                           // any day of the period
    std::span<const Finding> findings;  // the scan's findings still open (may be empty)
    ScanOptions options;                // for the backlog estimate (must validate)
};

enum class ProposalSource {
    Finding,          // step 2: the scan's suggestion
    BacklogEstimate,  // step 3
    NoEstimate,       // step 4
};

struct Proposal {
    ledger::Decision decision;
    ProposalSource source = ProposalSource::NoEstimate;
    const Finding* finding = nullptr;         // step 2: the finding (points into `findings`)
    std::optional<BacklogEstimate> estimate;  // step 3
    std::optional<Error> noEstimate;          // step 4: why there is no estimate
    std::int64_t reported = 0;                // the cell's reported value
};

/// The proposal above. Errors: NotFound for an unknown region or measure or a day outside
/// the calendar; InvalidValue for step 1; Usage for options that do not validate.
Result<Proposal> proposeDecision(const Drop& drop, const ProposalRequest& request);

/// The proposal for a finding itself (a finding's Decide in the GUI): its own suggestion, for
/// `measure` when the finding is about every measure (suggested_decision.h), source Finding;
/// for a backlog_dump the same decision the call above gives for the finding's period. Errors:
/// NotFound for a measure not in the drop, and suggestedDecision's (a finding that suggests
/// nothing).
Result<Proposal> proposeDecision(const Drop& drop, const Finding& finding,
                                 const std::string& measure);

}  // namespace siftwave::scan
