#pragma once
// ScanOptions: every threshold of the scan, with its default beside it.
//
// Each detector has its own block; every value can be set by name with
// set("backlog_dump.min_excess", "50") (the CLI's --set and the GUI use that),
// and every block has `enabled`. The README section "How the scan decides"
// explains what each threshold does.
//
// Cadence. The detectors work on periods: the days of a daily drop, the weeks
// of a weekly one (time_axis.h). A threshold that counts periods has one value
// per cadence, named with its unit: `...Days` applies to daily data and
// `...Weeks` to weekly data ("backlog_dump.window_days",
// "backlog_dump.window_weeks"). The weekly defaults are not the daily ones
// divided by seven: a baseline needs enough neighbours to take a median and a
// spread from, so it keeps several periods, and a whole week with no report is
// already as unusual as two silent days. Why each weekly default is what it is
// stands beside it. Thresholds on counts (levels, excesses) are counts per
// period; where a weekly level differs from the daily one it has its own value.
// The weekday effect exists only in daily data: for weekly data the weekday
// detector does not run and the backlog baseline uses no weekday factors.

#include "siftwave/result.h"

#include <string>
#include <string_view>
#include <vector>

namespace siftwave::scan {

struct MissingDatesOptions {
    bool enabled = true;
    int minDays = 1;     // shortest run of absent or blank days inside the span that is reported
    int minWeeks = 1;    // the same for weeks: one week with no row is a finding
    int levelDays = 14;  // days on each side whose median is the level around a run
    int levelWeeks = 4;  // weeks on each side (about the 14 days' span in time, 8 neighbours)
    // Absent rows that are true zeros: a tally made from a case list writes no row for a
    // period without cases. A run is probably true zeros when the median of the nearest
    // `trueZeroPeriods` reported periods on each side is at most `trueZeroMaxLevel` counts
    // per period (same for both cadences: under Poisson noise at 3 a period a zero has a
    // chance of exp(-3) = 5 %, so zeros there are ordinary) and the period after the run is
    // no catch-up. The suggestion is then to fill 0, never to interpolate.
    double trueZeroMaxLevel = 3.0;  // counts per period
    int trueZeroPeriods = 3;        // nearest reported periods on each side
};

struct DuplicateRowOptions {
    bool enabled = true;
};

struct NegativeCountOptions {
    bool enabled = true;
    int spreadDays = 14;  // suggested window of earlier days to absorb the correction
    int spreadWeeks = 4;  // weeks: late reports and corrections of weekly notifications reach
                          // back a few weeks; 2 weeks (the 14 days) would often hold too few
                          // counts to absorb a correction (common practice, no source)
};

struct BacklogDumpOptions {
    bool enabled = true;
    int windowDays = 7;       // neighbours on each side of the day that form its baseline
    int windowWeeks = 4;      // weeks on each side: 8 neighbours still give a median and a MAD,
                              // and 4 weeks follow a seasonal wave (7 weeks would lag it)
    double threshold = 6.0;   // robust z: (observed - expected) / scale must reach this
    double minExcess = 20.0;  // and the excess must be at least this many counts ...
    double minRatio = 2.0;    // ... and observed at least this multiple of expected
    int gapMinDays = 2;       // a catch-up follows at least this many zero/low/missing days
    int gapMinWeeks = 1;      // weeks: one silent or low week is a gap (a single quiet day
                              // is ordinary, a whole quiet week in an active region is not)
    double gapLowFraction = 0.35;  // "low": at most this fraction of the surrounding level
    double gapThreshold = 3.0;     // robust z for a catch-up day (the gap is evidence already)
    int maxGapDays = 28;           // longest gap a catch-up is looked for behind
    int maxGapWeeks = 8;           // weeks: outages of weekly reporting last longer in time
    int redistributeDays = 7;      // suggested window when there is no gap: the days before
    int redistributeWeeks = 4;     // weeks before: late reports of weekly notifications mostly
                                   // arrive within a few weeks (common practice, no source)
    double criticalShare = 0.02;   // critical when the excess is this share of the region's total
    int recentDays = 14;           // critical when the day is among the last this many days ...
    int recentWeeks = 4;           // ... or weeks (a briefing reads the last month's trend)
};

struct ReportingGapOptions {
    bool enabled = true;
    int minDays = 2;        // shortest run of zeros
    int minWeeks = 1;       // weeks: one zero week at the weekly level below is as unlikely
    double minLevel = 5.0;  // expected daily count around the run; below it zeros are plausible
    double minWeeklyLevel = 20.0;  // expected weekly count: one zero week at 20 has a chance
                                   // of 2e-9 under Poisson and 4e-7 under negative-binomial
                                   // noise of size 25; the daily bar (exp(-10) = 4.5e-5) met
                                   // at 10 a week gave false gaps on overdispersed weekly counts
    int windowDays = 14;           // days on each side that give the expected level
    int windowWeeks = 4;           // weeks on each side (8 neighbours, as the backlog baseline)
};

struct StaleValuesOptions {
    bool enabled = true;
    int minDays = 3;          // shortest run of one repeated non-zero value
    int minWeeks = 3;         // weeks: the chance test below decides, as for days
    double maxChance = 1e-4;  // flag when such a run is this unlikely under the local level
    int windowDays = 14;      // days on each side of the run that give its expected level
    int windowWeeks = 4;      // weeks on each side (as reporting_gap)
    double minLevel = 5.0;    // expected daily count around the run (reporting_gap's bar): below
                              // it clean generated drops gave runs of 1-4 at chances of 5e-6 to
                            // 1e-4, as likely as the planted runs (tests/bench/scan_restore_bench)
    double minWeeklyLevel = 20.0;  // expected weekly count (reporting_gap's bar)
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
    bool enabled = true;        // daily data only: a weekly drop has no weekdays to compare
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

struct CaseDatesOptions {
    bool enabled = true;          // runs only on a case list (Drop::caseList)
    int maxLinesListed = 50;      // lines listed per finding (all are counted)
    double criticalShare = 0.05;  // critical when the rows are this share of the region's rows
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
    CaseDatesOptions caseDates;

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
