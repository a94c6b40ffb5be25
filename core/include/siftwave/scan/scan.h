#pragma once
// The anomaly scan: every detector over one Drop, findings ranked for review.
//
// scanDrop() runs each enabled detector (one per FindingKind, see
// core/src/scan/), gives every finding a stable id and ranks them: critical
// before warning before info, then by impact (counts in doubt), then by kind,
// region order and date, so the findings that would change a briefing come
// first.
//
// Ids: "<kind>-" followed by 12 hex digits of the 64-bit FNV-1a hash of
// "kind|region|measure|first|last" (Fowler, Noll and Vo, the FNV-1a variant;
// offset basis 14695981039346656037, prime 1099511628211). The same Drop
// always gives the same ids; a second finding with the same key gets "-2", ...

#include "siftwave/drop.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"
#include "siftwave/scan/finding.h"
#include "siftwave/scan/scan_options.h"

#include <nlohmann/json_fwd.hpp>

#include <cstddef>
#include <map>
#include <string>
#include <vector>

namespace siftwave::scan {

/// What the scan may compare the drop with. Both are optional.
struct ScanContext {
    const Drop* previous = nullptr;           // the release before; enables `revision`
    const RegionRegister* regions = nullptr;  // enables `unknown_code`, `hierarchy_mismatch`
};

/// How much history moved between the previous release and this one.
struct RevisionSummary {
    bool compared = false;           // a previous drop was given
    std::size_t cellsCompared = 0;   // cells reported in both releases
    std::size_t cellsChanged = 0;    // of those, with another value now
    std::size_t cellsAppeared = 0;   // reported now, not reported before (inside the old calendar)
    std::size_t cellsVanished = 0;   // reported before, not reported now
    std::size_t regionsRevised = 0;  // regions with at least one changed, appeared or vanished cell
    double netChange = 0;            // sum of (new - old) over changed cells
    double absoluteChange = 0;       // sum of |new - old|
    double previousTotal = 0;        // sum of old values over the compared cells
};

struct ScanReport {
    Cadence cadence = Cadence::Daily;               // of the drop: its periods are days or weeks
    std::vector<Finding> findings;                  // ranked, rank 1 first
    std::map<std::string, std::size_t> byKind;      // every kind, 0 when none
    std::map<std::string, std::size_t> bySeverity;  // "info", "warning", "critical"
    RevisionSummary revisions;
};

/// Runs the scan. Usage error when the options do not validate.
Result<ScanReport> scanDrop(const Drop& drop, const ScanOptions& options = {},
                            const ScanContext& context = {});

/// {"findings": [...], "summary": {"cadence": "daily"|"weekly", "by_kind": {...},
/// "by_severity": {...}, "revisions": {...}}} ("revisions" only when a previous drop was
/// compared).
nlohmann::json scanReportToJson(const ScanReport& report);
/// The "summary" object of scanReportToJson() alone: a writer that streams the findings one
/// at a time (siftwave-cli scan --json) writes it after them.
nlohmann::json scanSummaryToJson(const ScanReport& report);

/// The stable id of a finding from its kind, region, measure and range (see above).
std::string findingId(const Finding& finding);

}  // namespace siftwave::scan
