#pragma once
// ScanOptions: every threshold of the scan, with its default beside it.
//
// Each detector has its own block; every value can be set by name with
// set("backlog_dump.min_excess", "50") (the CLI's --set and the GUI use that),
// and every block has `enabled`. The README section "How the scan decides"
// explains what each threshold does.

#include "siftwave/result.h"

#include <string>
#include <string_view>
#include <vector>

namespace siftwave::scan {

struct MissingDatesOptions {
    bool enabled = true;
    int minDays = 1;  // shortest run of absent or blank days inside the span that is reported
};

struct DuplicateRowOptions {
    bool enabled = true;
};

struct NegativeCountOptions {
    bool enabled = true;
    int spreadDays = 14;  // suggested window of earlier days to absorb the correction
};

struct BacklogDumpOptions {
    bool enabled = true;
    int windowDays = 7;            // neighbours on each side of the day that form its baseline
    double threshold = 6.0;        // robust z: (observed - expected) / scale must reach this
    double minExcess = 20.0;       // and the excess must be at least this many counts ...
    double minRatio = 2.0;         // ... and observed at least this multiple of expected
    int gapMinDays = 2;            // a catch-up follows at least this many zero/low/missing days
    double gapLowFraction = 0.35;  // "low": at most this fraction of the surrounding level
    double gapThreshold = 3.0;     // robust z for a catch-up day (the gap is evidence already)
    int maxGapDays = 28;           // longest gap a catch-up is looked for behind
    int redistributeDays = 7;      // suggested window when there is no gap: the days before
    double criticalShare = 0.02;   // critical when the excess is this share of the region's total
};

struct ReportingGapOptions {
    bool enabled = true;
    int minDays = 2;        // shortest run of zeros
    double minLevel = 5.0;  // expected daily count around the run; below it zeros are plausible
    int windowDays = 14;    // days on each side that give the expected level
};

struct StaleValuesOptions {
    bool enabled = true;
    int minDays = 3;          // shortest run of one repeated non-zero value
    double maxChance = 1e-4;  // flag when such a run is this unlikely under Poisson noise
};

struct CodeCollisionOptions {
    bool enabled = true;
};

struct CodeVariantOptions {
    bool enabled = true;
};

struct UnknownCodeOptions {
    bool enabled = true;  // runs only with a region register
};

struct WeekdayEffectOptions {
    bool enabled = true;
    int minWeeks = 4;           // weeks of data needed before a pattern is estimated
    double minStrength = 0.15;  // report when the highest factor exceeds the lowest by this share
    double minLevel = 5.0;      // days whose 7-day average is below this are not used
};

struct CumulativeDecreaseOptions {
    bool enabled = true;
    double minRisingShare = 0.95;  // share of day-to-day changes that rise, for "cumulative"
    int minChanges = 10;           // changes needed before a measure is called cumulative
};

struct HierarchyMismatchOptions {
    bool enabled = true;     // runs only with a register that has parents
    double tolerance = 0.0;  // allowed |parent - sum(children)| on a day
};

struct RevisionOptions {
    bool enabled = true;      // runs only with a previous drop
    int maxDatesListed = 60;  // revised dates listed per finding (all are counted)
    double criticalShare =
        0.05;  // critical when |revised amount| is this share of the region's total
};

struct ScanOptions {
    MissingDatesOptions missingDates;
    DuplicateRowOptions duplicateRow;
    NegativeCountOptions negativeCount;
    BacklogDumpOptions backlogDump;
    ReportingGapOptions reportingGap;
    StaleValuesOptions staleValues;
    CodeCollisionOptions codeCollision;
    CodeVariantOptions codeVariant;
    UnknownCodeOptions unknownCode;
    WeekdayEffectOptions weekdayEffect;
    CumulativeDecreaseOptions cumulativeDecrease;
    HierarchyMismatchOptions hierarchyMismatch;
    RevisionOptions revision;

    /// Usage error naming the first value out of range.
    Status validate() const;

    /// Sets one value by its name, "detector.param" (snake_case, as in the README and
    /// in describeScanOptions()), from text. Usage error for an unknown name, a bad value or
    /// one out of range; the options are then left as they were.
    Status set(std::string_view name, std::string_view value);
};

struct OptionDescription {
    std::string name;          // "backlog_dump.min_excess"
    std::string defaultValue;  // as text
    std::string help;          // one line
};

/// Every name set() accepts, with its default and a one-line help, in a fixed order.
std::vector<OptionDescription> describeScanOptions();

}  // namespace siftwave::scan
