#pragma once
// The Decision a finding suggests, ready for previewDecision() (ledger/replay.h).
//
// A finding's "suggestion" object names a decision kind and its parameters in
// the scan's JSON words (see finding.h); this turns it into a ledger Decision
// with the finding's id attached, so the GUI and the CLI start from the same
// proposal. Nothing is decided here: the analyst still previews, edits and
// gives the reason.
//
//   "redistribute"      date, excess, method, window_first..window_last
//   "spread_negative"   date, window_first..window_last
//   "fill_missing"      first..last, method
//   "resolve_duplicate" date, keep
//   "merge_codes"       from -> into
//   "exclude"           first..last (the finding's periods)
//   "accept"            the finding's region, measure and periods
//
// Dates are first days of periods (days, or weeks of weekly data); the ledger
// maps any date to the period that holds it. A finding about every measure
// (measure null) is decided for `measure`.

#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"
#include "siftwave/scan/finding.h"

#include <string>

namespace siftwave::scan {

/// The suggested Decision. Errors: NotFound when the finding suggests nothing,
/// InvalidValue when the suggestion's fields are not what the kind needs.
Result<Decision> suggestedDecision(const Finding& finding, const std::string& measure);

}  // namespace siftwave::scan
