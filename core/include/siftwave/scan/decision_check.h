#pragma once
// checkDecision: what a decision would newly make look wrong, before it is applied.
//
// A redistribution that spreads a dump evenly over a short window can leave a plateau or a
// new spike, and a large one can build a wave the reported counts never had. The analyst
// should see that before Apply, not after. checkDecision() re-scans the cleaned series the
// decision changes, as they are now and as they would be after it, and reports:
//   - every finding of the scan's value detectors (missing_dates, negative_count,
//     backlog_dump, reporting_gap, stale_values, cumulative_decrease) on the after series
//     with no finding of the same kind, region and measure overlapping its periods before;
//   - every wave (fit/waves.h, the detection the fit's automatic window uses, with the
//     drop's cadence defaults) of an after series that peaks inside the periods the decision
//     raises, where the reported counts without the moved ones (the before series with
//     only the decision's decreases applied) have no wave peaking: a peak built from moved
//     counts alone; and whether it would become the series' largest wave (what "largest
//     wave" would fit).
// Both scans run on the whole cleaned measure (every region), so the pooled facts the
// detectors use (weekday factors, overdispersion) are those a scan after Apply would use.
// The same code serves the decision pane and `siftwave-cli decide --dry-run`.

#include "siftwave/drop.h"
#include "siftwave/fit/waves.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"
#include "siftwave/scan/finding.h"
#include "siftwave/scan/scan_options.h"

#include <nlohmann/json_fwd.hpp>

#include <string>
#include <vector>

namespace siftwave::scan {

/// A wave the decision would create in one series.
struct NewWave {
    std::string region;  // verbatim code
    std::string measure;
    Date first;            // first day of the wave's first period
    Date peak;             // first day of its peak period
    Date last;             // first day of its last period
    double peakValue = 0;  // smoothed counts per period at the peak
    bool largest = false;  // it would be the series' highest wave (what a fit would describe)
};

struct DecisionCheck {
    std::vector<Finding> newFindings;  // ids and ranks as a scan of the after data gives them
    std::vector<NewWave> newWaves;
    bool clean() const { return newFindings.empty() && newWaves.empty(); }
};

/// The check above for `decision` on `cleaned` (replay(drop, ledger)). Errors: those of
/// ledger::previewDecision (the decision does not apply), Usage when the options do not
/// validate.
Result<DecisionCheck> checkDecision(const Drop& drop, const ledger::Cleaned& cleaned,
                                    const ledger::Decision& decision,
                                    const ScanOptions& options = {});

/// One line per new anomaly, for a person: "new backlog_dump (critical) in 1301 cases on
/// 2026-03-02: observed ...", "new wave in 1301 cases peaking 2026-03-04 at 600 a day, which
/// would become the largest wave". Empty when the check is clean.
std::vector<std::string> describeDecisionCheck(const DecisionCheck& check, Cadence cadence);

/// {"clean": bool, "new_findings": [findingToJson...], "new_waves": [{"region", "measure",
/// "first", "peak", "last", "peak_value", "largest"}]}
nlohmann::json decisionCheckToJson(const DecisionCheck& check);

}  // namespace siftwave::scan
