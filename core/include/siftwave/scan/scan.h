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

namespace siftwave {
class ReleaseHistory;
}

namespace siftwave::scan {

/// What the scan may compare the drop with. All are optional.
struct ScanContext {
    const Drop* previous = nullptr;           // the release before; enables `revision` (the
                                              // history of two releases: previous, the drop)
    const RegionRegister* regions = nullptr;  // enables `unknown_code`, `hierarchy_mismatch`
    // Successive releases of the series, the scanned drop their latest (the same object):
    // enables `revision` for the newest pair and summarises every successive pair. Give either
    // this or `previous`, not both.
    const ReleaseHistory* history = nullptr;
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

/// The revisions between two successive releases of a history of more than two.
struct ReleaseRevisions {
    std::string previousFile, currentFile;          // the releases' paths as read
    Date previousAsOf, currentAsOf;                 // their last periods' first days
    RevisionSummary summary;                        // as RevisionSummary for --previous
    std::map<std::string, std::size_t> bySeverity;  // the pair's revision findings: "warning"...
    std::map<std::string, std::size_t> byChange;    // ... and by change: "values_revised"...
};

struct ScanReport {
    Cadence cadence = Cadence::Daily;               // of the drop: its periods are days or weeks
    std::vector<Finding> findings;                  // ranked, rank 1 first
    std::map<std::string, std::size_t> byKind;      // every kind, 0 when none
    std::map<std::string, std::size_t> bySeverity;  // "info", "warning", "critical"
    RevisionSummary revisions;  // the newest pair: the previous release against the drop
    // A history of more than two releases: each successive pair, oldest first (the last is
    // the newest pair of `revisions` and the findings); empty otherwise.
    std::vector<ReleaseRevisions> releaseRevisions;
};

/// Runs the scan. Usage error when the options do not validate, or when the context's history
/// is given with `previous` or does not end with `drop` itself.
Result<ScanReport> scanDrop(const Drop& drop, const ScanOptions& options = {},
                            const ScanContext& context = {});

/// {"findings": [...], "summary": {"cadence": "daily"|"weekly", "by_kind": {...},
/// "by_severity": {...}, "revisions": {...}, "release_revisions": [...]}} ("revisions" only
/// when a previous drop was compared, "release_revisions" only for a history of more than two
/// releases: one object per successive pair with the files, their as-of dates, the revisions'
/// summary, by_severity and by_change).
nlohmann::json scanReportToJson(const ScanReport& report);
/// The "summary" object of scanReportToJson() alone: a writer that streams the findings one
/// at a time (siftwave-cli scan --json) writes it after them.
nlohmann::json scanSummaryToJson(const ScanReport& report);

/// The stable id of a finding from its kind, region, measure and range (see above).
std::string findingId(const Finding& finding);

}  // namespace siftwave::scan
