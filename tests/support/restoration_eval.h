#pragma once
// The restoration evaluation of issue 14: generated drops with known truth, one
// planted reporting fault per region, every redistribution the scan suggests
// applied through the real ledger path (draftEntry + applyEntry), and the cleaned
// series compared with the true counts.
//
// Faults (drawn per region from the seed):
//   backlog  a share of 30-60 % of each of 7-28 days held back and reported on the
//            day after them (plantBacklogDump);
//   gap      3-7 days of zeros whose counts are reported on the day after
//            (plantReportingGap).
// Measured over the fault's window (the held or zero days and the dump day) plus
// the 14 days before it: error = sum |value - truth|, before (reported) and after
// (cleaned); share removed = 1 - after / before. A spike is a cleaned window whose
// maximum exceeds 1.5 x the true maximum there. Used by tests/bench/
// scan_restore_bench.cpp (the figures) and tests/core/scan_restore_test.cpp (the
// floor on a few seeds).

#include "siftwave/scan/scan_options.h"

#include <cstdint>
#include <string>
#include <vector>

namespace siftwave::testing {

struct RestoredRegion {
    std::uint64_t seed = 0;
    std::string region;
    std::string kind;   // "backlog" or "gap"
    int faultDays = 0;  // held or zero days
    double share = 0;   // withheld share (backlog), 1 for a gap
    std::int32_t dumpDay = 0;
    double errorBefore = 0;
    double errorAfter = 0;
    double removed = 0;  // 1 - after / before
    double trueMax = 0;
    double cleanedMax = 0;
    bool found = false;        // a backlog_dump or reporting_gap finding on the fault
    int applied = 0;           // redistributions applied in the region
    int refused = 0;           // suggestions the ledger refused
    std::string refusal;       // why (the last one)
    std::int64_t planted = 0;  // counts held back or zeroed
    std::int64_t moved = 0;    // counts the applied suggestions moved
    int windowPeriods = 0;     // length of the last applied window
    std::string why;           // a fault not found: the backlog estimate of its dump
};

struct RestorationSummary {
    std::vector<RestoredRegion> regions;
    double median = 0;  // of `removed`
    double worst = 0;
    int spikes = 0;  // cleaned maximum > 1.5 x true maximum
    int found = 0;
};

/// One generated drop per seed (`regions` regions x 240 days), evaluated as above.
/// With `printRegion`, prints that region's findings and values to stdout (diagnosis).
RestorationSummary evaluateRestoration(const std::vector<std::uint64_t>& seeds, int regions = 24,
                                       const scan::ScanOptions& options = {},
                                       const std::string& printRegion = {});

}  // namespace siftwave::testing
