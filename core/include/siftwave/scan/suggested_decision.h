#pragma once
// The Decision a finding suggests, ready for previewDecision() (ledger/replay.h).
//
// The detectors build the suggestion as a ledger Decision (Finding::suggestion);
// this hands it out with the finding's id attached and, for a finding about
// every measure (measure null), the measure it is decided for, so the GUI and
// the CLI start from the same proposal. Nothing is decided here: the analyst
// still previews, edits and gives the reason.
//
// What each kind's suggestion holds (dates are first days of periods: days, or
// weeks of weekly data; the ledger maps any date to the period that holds it):
//   redistribute      date, excess, method, window
//   spread_negative   date, window
//   fill_missing      window, method
//   resolve_duplicate date, duplicate rule
//   merge_codes       variant -> into (no region)
//   exclude           window (the periods), or none: the whole region
//   accept            the finding's region, measure and periods

#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"
#include "siftwave/scan/finding.h"

#include <string>

namespace siftwave::scan {

/// The suggested Decision. Error NotFound when the finding suggests nothing.
Result<ledger::Decision> suggestedDecision(const Finding& finding, const std::string& measure);

}  // namespace siftwave::scan
