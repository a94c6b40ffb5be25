// The finding kinds, one entry each (see finding_kinds.h). To add a kind: its
// FindingKind value (finding.h), its options struct (scan_options.h), its
// detector (<kind>.cpp, declared in scan_input.h) and its entry here.
#include "scan/finding_kinds.h"

#include <cassert>

namespace siftwave::scan::detail {
namespace {

template <auto Member>
bool isEnabled(const ScanOptions& o) {
    return (o.*Member).enabled;
}

template <void (*Find)(const ScanInput&, std::vector<Finding>&)>
void run(const ScanInput& in, ScanReport& report) {
    Find(in, report.findings);
}

void runRevisions(const ScanInput& in, ScanReport& report) {
    findRevisions(in, report);
}

std::vector<OptionRule> noRules(const ScanOptions&) {
    return {};
}

// missing_dates ------------------------------------------------------------------------------

std::string describeMissingDates(const EvidenceText& e) {
    if (e.flag("probably_true_zeros")) {
        return e.periods("periods", "days") + " " + e.unit() +
               "(s) with no row amid low counts (about " + e.get("level_nearby") + " a " +
               e.unit() + " nearby): probably true zeros";
    }
    return e.periods("periods", "days") + " " + e.unit() +
           "(s) with no value inside the reporting span";
}

std::vector<OptionEntry> missingDatesOptions(ScanOptions& o) {
    return {
        {"missing_dates.enabled", &o.missingDates.enabled, "report runs of periods with no row"},
        {"missing_dates.min_days", &o.missingDates.minDays, "shortest run reported (days)"},
        {"missing_dates.min_weeks", &o.missingDates.minWeeks, "shortest run reported (weeks)"},
        {"missing_dates.level_days", &o.missingDates.levelDays,
         "days on each side that give the level around a run"},
        {"missing_dates.level_weeks", &o.missingDates.levelWeeks,
         "weeks on each side that give the level around a run"},
        {"missing_dates.true_zero_max_level", &o.missingDates.trueZeroMaxLevel,
         "counts per period nearby at or below which absent rows are probably true zeros"},
        {"missing_dates.true_zero_periods", &o.missingDates.trueZeroPeriods,
         "nearest reported periods on each side that give the nearby level"},
    };
}

std::vector<OptionRule> missingDatesRules(const ScanOptions& o) {
    const MissingDatesOptions& m = o.missingDates;
    return {
        {m.minDays >= 1, "missing_dates.min_days", "at least 1"},
        {m.minWeeks >= 1, "missing_dates.min_weeks", "at least 1"},
        {m.levelDays >= 1, "missing_dates.level_days", "at least 1"},
        {m.levelWeeks >= 1, "missing_dates.level_weeks", "at least 1"},
        {m.trueZeroMaxLevel >= 0, "missing_dates.true_zero_max_level", "0 or more"},
        {m.trueZeroPeriods >= 1, "missing_dates.true_zero_periods", "at least 1"},
    };
}

// duplicate_row ------------------------------------------------------------------------------

std::string describeDuplicateRow(const EvidenceText& e) {
    return e.get("occurrences") + " rows for one " + e.unit() + "; values " +
           (e.flag("values_agree") ? "agree" : "differ");
}

std::vector<OptionEntry> duplicateRowOptions(ScanOptions& o) {
    return {{"duplicate_row.enabled", &o.duplicateRow.enabled, "report repeated region/date rows"}};
}

// negative_count -----------------------------------------------------------------------------

std::string describeNegativeCount(const EvidenceText& e) {
    return "negative count " + e.get("value") + " (earlier " +
           e.periods("earlier_periods", "earlier_days") + " " + e.units() + " sum to " +
           e.get("earlier_days_sum") + ")";
}

std::vector<OptionEntry> negativeCountOptions(ScanOptions& o) {
    return {
        {"negative_count.enabled", &o.negativeCount.enabled, "report negative counts"},
        {"negative_count.spread_days", &o.negativeCount.spreadDays,
         "earlier days suggested to absorb a negative correction"},
        {"negative_count.spread_weeks", &o.negativeCount.spreadWeeks,
         "earlier weeks suggested to absorb a negative correction"},
    };
}

std::vector<OptionRule> negativeCountRules(const ScanOptions& o) {
    return {
        {o.negativeCount.spreadDays >= 1, "negative_count.spread_days", "at least 1"},
        {o.negativeCount.spreadWeeks >= 1, "negative_count.spread_weeks", "at least 1"},
    };
}

// backlog_dump -------------------------------------------------------------------------------

std::string describeBacklogDump(const EvidenceText& e) {
    return "observed " + e.get("observed") + " where about " + e.get("expected") +
           " was expected (excess " + e.get("excess") + ", z " + e.get("z") + ")" +
           (e.has("after_gap")
                ? ", after a gap of " + e.at("after_gap").periods("periods", "days") + " " +
                      e.unit() + "(s)"
                : "");
}

std::vector<OptionEntry> backlogDumpOptions(ScanOptions& o) {
    BacklogDumpOptions& b = o.backlogDump;
    return {
        {"backlog_dump.enabled", &b.enabled, "report periods far above their baseline"},
        {"backlog_dump.window_days", &b.windowDays,
         "neighbour days on each side that form the baseline"},
        {"backlog_dump.window_weeks", &b.windowWeeks,
         "neighbour weeks on each side that form the baseline"},
        {"backlog_dump.threshold", &b.threshold, "robust z-score a day must reach"},
        {"backlog_dump.min_excess", &b.minExcess, "smallest excess (counts) that is reported"},
        {"backlog_dump.min_ratio", &b.minRatio,
         "smallest observed / expected ratio that is reported"},
        {"backlog_dump.gap_min_days", &b.gapMinDays, "zero/low/missing days before a catch-up"},
        {"backlog_dump.gap_min_weeks", &b.gapMinWeeks, "zero/low/missing weeks before a catch-up"},
        {"backlog_dump.gap_low_fraction", &b.gapLowFraction,
         "a gap day is at most this fraction of the surrounding level"},
        {"backlog_dump.gap_threshold", &b.gapThreshold,
         "robust z-score a catch-up period must reach"},
        {"backlog_dump.max_gap_days", &b.maxGapDays, "longest gap (days) looked for behind a day"},
        {"backlog_dump.max_gap_weeks", &b.maxGapWeeks,
         "longest gap (weeks) looked for behind a week"},
        {"backlog_dump.redistribute_days", &b.redistributeDays,
         "suggested redistribution window (days) when there is no gap"},
        {"backlog_dump.redistribute_weeks", &b.redistributeWeeks,
         "suggested redistribution window (weeks) when there is no gap"},
        {"backlog_dump.critical_share", &b.criticalShare,
         "critical when the excess is this share of the region total"},
        {"backlog_dump.recent_days", &b.recentDays, "critical when among the last this many days"},
        {"backlog_dump.recent_weeks", &b.recentWeeks,
         "critical when among the last this many weeks"},
    };
}

std::vector<OptionRule> backlogDumpRules(const ScanOptions& o) {
    const BacklogDumpOptions& b = o.backlogDump;
    return {
        {b.windowDays >= 2 && b.windowDays <= 60, "backlog_dump.window_days", "between 2 and 60"},
        {b.windowWeeks >= 2 && b.windowWeeks <= 60, "backlog_dump.window_weeks",
         "between 2 and 60"},
        {b.threshold > 0, "backlog_dump.threshold", "positive"},
        {b.minExcess >= 0, "backlog_dump.min_excess", "0 or more"},
        {b.minRatio >= 1, "backlog_dump.min_ratio", "at least 1"},
        {b.gapMinDays >= 1, "backlog_dump.gap_min_days", "at least 1"},
        {b.gapMinWeeks >= 1, "backlog_dump.gap_min_weeks", "at least 1"},
        {b.gapLowFraction >= 0 && b.gapLowFraction < 1, "backlog_dump.gap_low_fraction",
         "in [0, 1)"},
        {b.gapThreshold > 0, "backlog_dump.gap_threshold", "positive"},
        {b.maxGapDays >= b.gapMinDays, "backlog_dump.max_gap_days",
         "at least backlog_dump.gap_min_days"},
        {b.maxGapWeeks >= b.gapMinWeeks, "backlog_dump.max_gap_weeks",
         "at least backlog_dump.gap_min_weeks"},
        {b.redistributeDays >= 1, "backlog_dump.redistribute_days", "at least 1"},
        {b.redistributeWeeks >= 1, "backlog_dump.redistribute_weeks", "at least 1"},
        {b.criticalShare > 0, "backlog_dump.critical_share", "positive"},
        {b.recentDays >= 0, "backlog_dump.recent_days", "0 or more"},
        {b.recentWeeks >= 0, "backlog_dump.recent_weeks", "0 or more"},
    };
}

// reporting_gap ------------------------------------------------------------------------------

std::string describeReportingGap(const EvidenceText& e) {
    return e.periods("periods", "days") + " zero " + e.unit() + "(s) where about " +
           e.get("level_around") + " a " + e.unit() + " is usual" +
           (e.flag("catch_up") ? ", then a catch-up" : "");
}

std::vector<OptionEntry> reportingGapOptions(ScanOptions& o) {
    ReportingGapOptions& g = o.reportingGap;
    return {
        {"reporting_gap.enabled", &g.enabled, "report runs of zeros inside active periods"},
        {"reporting_gap.min_days", &g.minDays, "shortest run of zero days"},
        {"reporting_gap.min_weeks", &g.minWeeks, "shortest run of zero weeks"},
        {"reporting_gap.min_level", &g.minLevel,
         "expected daily count around the run needed to call it a gap"},
        {"reporting_gap.min_weekly_level", &g.minWeeklyLevel,
         "expected weekly count around the run needed to call it a gap"},
        {"reporting_gap.window_days", &g.windowDays,
         "days on each side that give the expected level"},
        {"reporting_gap.window_weeks", &g.windowWeeks,
         "weeks on each side that give the expected level"},
    };
}

std::vector<OptionRule> reportingGapRules(const ScanOptions& o) {
    const ReportingGapOptions& g = o.reportingGap;
    return {
        {g.minDays >= 1, "reporting_gap.min_days", "at least 1"},
        {g.minWeeks >= 1, "reporting_gap.min_weeks", "at least 1"},
        {g.minLevel >= 0, "reporting_gap.min_level", "0 or more"},
        {g.minWeeklyLevel >= 0, "reporting_gap.min_weekly_level", "0 or more"},
        {g.windowDays >= 1, "reporting_gap.window_days", "at least 1"},
        {g.windowWeeks >= 1, "reporting_gap.window_weeks", "at least 1"},
    };
}

// stale_values -------------------------------------------------------------------------------

std::string describeStaleValues(const EvidenceText& e) {
    return "the value " + e.get("value") + " repeated on " + e.periods("periods", "days") + " " +
           e.units();
}

std::vector<OptionEntry> staleValuesOptions(ScanOptions& o) {
    return {
        {"stale_values.enabled", &o.staleValues.enabled,
         "report runs of one repeated non-zero value"},
        {"stale_values.min_days", &o.staleValues.minDays, "shortest run (days)"},
        {"stale_values.min_weeks", &o.staleValues.minWeeks, "shortest run (weeks)"},
        {"stale_values.max_chance", &o.staleValues.maxChance,
         "report runs at most this likely under the local level's noise"},
        {"stale_values.window_days", &o.staleValues.windowDays,
         "days on each side that give the run's expected level"},
        {"stale_values.window_weeks", &o.staleValues.windowWeeks,
         "weeks on each side that give the run's expected level"},
        {"stale_values.min_level", &o.staleValues.minLevel,
         "lowest expected daily count around a run that is reported"},
        {"stale_values.min_weekly_level", &o.staleValues.minWeeklyLevel,
         "lowest expected weekly count around a run that is reported"},
    };
}

std::vector<OptionRule> staleValuesRules(const ScanOptions& o) {
    const StaleValuesOptions& s = o.staleValues;
    return {
        {s.minDays >= 2, "stale_values.min_days", "at least 2"},
        {s.minWeeks >= 2, "stale_values.min_weeks", "at least 2"},
        {s.maxChance > 0 && s.maxChance <= 1, "stale_values.max_chance", "in (0, 1]"},
        {s.windowDays >= 1, "stale_values.window_days", "at least 1"},
        {s.windowWeeks >= 1, "stale_values.window_weeks", "at least 1"},
        {s.minLevel >= 0, "stale_values.min_level", "0 or more"},
        {s.minWeeklyLevel >= 0, "stale_values.min_weekly_level", "0 or more"},
    };
}

// code_collision, code_variant, unknown_code -------------------------------------------------

std::string describeCodeCollision(const EvidenceText& e) {
    return "other tools may read this code as " + e.get("read_as") + " (" + e.get("reason") + ")";
}

std::vector<OptionEntry> codeCollisionOptions(ScanOptions& o) {
    return {
        {"code_collision.enabled", &o.codeCollision.enabled, "report codes other tools misread"}};
}

std::string describeCodeVariant(const EvidenceText& e) {
    return "probably the same region as " + e.get("canonical");
}

std::vector<OptionEntry> codeVariantOptions(ScanOptions& o) {
    return {{"code_variant.enabled", &o.codeVariant.enabled,
             "report codes equal after folding case, spaces, zeros"}};
}

std::string describeUnknownCode(const EvidenceText& e) {
    return "not in the region register" +
           (e.has("similar") ? "; similar to " + e.get("similar") : std::string());
}

std::vector<OptionEntry> unknownCodeOptions(ScanOptions& o) {
    return {{"unknown_code.enabled", &o.unknownCode.enabled, "report codes not in the register"}};
}

// weekday_effect -----------------------------------------------------------------------------

std::string describeWeekdayEffect(const EvidenceText& e) {
    return "weekly reporting pattern: peak " + e.get("peak") + ", trough " + e.get("trough") +
           ", strength " + e.get("strength");
}

std::vector<OptionEntry> weekdayEffectOptions(ScanOptions& o) {
    return {
        {"weekday_effect.enabled", &o.weekdayEffect.enabled,
         "report a weekly pattern (daily data only)"},
        {"weekday_effect.min_weeks", &o.weekdayEffect.minWeeks, "weeks of data needed"},
        {"weekday_effect.min_strength", &o.weekdayEffect.minStrength,
         "highest / lowest factor - 1 needed to report"},
        {"weekday_effect.min_level", &o.weekdayEffect.minLevel,
         "7-day average below which days are not used"},
    };
}

std::vector<OptionRule> weekdayEffectRules(const ScanOptions& o) {
    const WeekdayEffectOptions& w = o.weekdayEffect;
    return {
        {w.minWeeks >= 1, "weekday_effect.min_weeks", "at least 1"},
        {w.minStrength >= 0, "weekday_effect.min_strength", "0 or more"},
        {w.minLevel >= 0, "weekday_effect.min_level", "0 or more"},
    };
}

// cumulative_decrease ------------------------------------------------------------------------

std::string describeCumulativeDecrease(const EvidenceText& e) {
    return "cumulative count falls from " + e.get("before") + " to " + e.get("lowest");
}

std::vector<OptionEntry> cumulativeDecreaseOptions(ScanOptions& o) {
    return {
        {"cumulative_decrease.enabled", &o.cumulativeDecrease.enabled,
         "report decreases of cumulative measures"},
        {"cumulative_decrease.min_rising_share", &o.cumulativeDecrease.minRisingShare,
         "share of rising changes that makes a measure cumulative"},
        {"cumulative_decrease.min_changes", &o.cumulativeDecrease.minChanges,
         "changes needed before a measure is called cumulative"},
    };
}

std::vector<OptionRule> cumulativeDecreaseRules(const ScanOptions& o) {
    const CumulativeDecreaseOptions& c = o.cumulativeDecrease;
    return {
        {c.minRisingShare > 0.5 && c.minRisingShare <= 1, "cumulative_decrease.min_rising_share",
         "in (0.5, 1]"},
        {c.minChanges >= 1, "cumulative_decrease.min_changes", "at least 1"},
    };
}

// hierarchy_mismatch -------------------------------------------------------------------------

std::string describeHierarchyMismatch(const EvidenceText& e) {
    return "differs from the sum of its children on " +
           e.periods("periods_mismatched", "days_mismatched") + " of " +
           e.periods("periods_compared", "days_compared") + " " + e.units();
}

std::vector<OptionEntry> hierarchyMismatchOptions(ScanOptions& o) {
    return {
        {"hierarchy_mismatch.enabled", &o.hierarchyMismatch.enabled,
         "report parents that differ from the sum of their children"},
        {"hierarchy_mismatch.tolerance", &o.hierarchyMismatch.tolerance,
         "allowed difference in a period"},
    };
}

std::vector<OptionRule> hierarchyMismatchRules(const ScanOptions& o) {
    return {{o.hierarchyMismatch.tolerance >= 0, "hierarchy_mismatch.tolerance", "0 or more"}};
}

// revision -----------------------------------------------------------------------------------

std::string describeRevision(const EvidenceText& e) {
    const std::string change = e.e.value("change", "");
    if (change == "values_revised") {
        return e.get("changed") + " value(s) changed, " + e.get("appeared") + " appeared, " +
               e.get("vanished") + " vanished; net " + e.get("net_change");
    }
    return change;
}

std::vector<OptionEntry> revisionOptions(ScanOptions& o) {
    return {
        {"revision.enabled", &o.revision.enabled, "compare with the previous release"},
        {"revision.max_dates_listed", &o.revision.maxDatesListed,
         "revised dates listed per finding"},
        {"revision.critical_share", &o.revision.criticalShare,
         "critical when the revised amount is this share of the region total"},
    };
}

std::vector<OptionRule> revisionRules(const ScanOptions& o) {
    return {
        {o.revision.maxDatesListed >= 0, "revision.max_dates_listed", "0 or more"},
        {o.revision.criticalShare > 0, "revision.critical_share", "positive"},
    };
}

// case_dates ---------------------------------------------------------------------------------

std::string describeCaseDates(const EvidenceText& e) {
    return e.get("rows") + " case row(s): " + e.e.value("problem", std::string()) + " (" +
           e.get("share") + " of the region's rows)";
}

std::vector<OptionEntry> caseDatesOptions(ScanOptions& o) {
    return {
        {"case_dates.enabled", &o.caseDates.enabled,
         "report case-list rows with a missing, unreadable or reversed date"},
        {"case_dates.max_lines_listed", &o.caseDates.maxLinesListed, "lines listed per finding"},
        {"case_dates.critical_share", &o.caseDates.criticalShare,
         "critical when the rows are this share of the region's rows"},
    };
}

std::vector<OptionRule> caseDatesRules(const ScanOptions& o) {
    return {
        {o.caseDates.maxLinesListed >= 0, "case_dates.max_lines_listed", "0 or more"},
        {o.caseDates.criticalShare > 0, "case_dates.critical_share", "positive"},
    };
}

// The table ----------------------------------------------------------------------------------

const FindingKindDescriptor kTable[] = {
    {FindingKind::MissingDates, "missing_dates", "periods with no row or a blank value",
     kNeedsDropOnly, isEnabled<&ScanOptions::missingDates>, run<findMissingDates>,
     describeMissingDates, missingDatesOptions, missingDatesRules},
    {FindingKind::DuplicateRow, "duplicate_row", "a region and period reported in several rows",
     kNeedsDropOnly, isEnabled<&ScanOptions::duplicateRow>, run<findDuplicateRows>,
     describeDuplicateRow, duplicateRowOptions, noRules},
    {FindingKind::NegativeCount, "negative_count", "a negative count, a correction of earlier ones",
     kNeedsDropOnly, isEnabled<&ScanOptions::negativeCount>, run<findNegativeCounts>,
     describeNegativeCount, negativeCountOptions, negativeCountRules},
    {FindingKind::BacklogDump, "backlog_dump", "a period far above its baseline (late reports)",
     kNeedsDropOnly, isEnabled<&ScanOptions::backlogDump>, run<findBacklogDumps>,
     describeBacklogDump, backlogDumpOptions, backlogDumpRules},
    {FindingKind::ReportingGap, "reporting_gap", "zeros inside an active stretch", kNeedsDropOnly,
     isEnabled<&ScanOptions::reportingGap>, run<findReportingGaps>, describeReportingGap,
     reportingGapOptions, reportingGapRules},
    {FindingKind::StaleValues, "stale_values", "one non-zero value copied forward", kNeedsDropOnly,
     isEnabled<&ScanOptions::staleValues>, run<findStaleValues>, describeStaleValues,
     staleValuesOptions, staleValuesRules},
    {FindingKind::CodeCollision, "code_collision", "a region code other tools misread",
     kNeedsDropOnly, isEnabled<&ScanOptions::codeCollision>, run<findCodeCollisions>,
     describeCodeCollision, codeCollisionOptions, noRules},
    {FindingKind::CodeVariant, "code_variant", "two codes for one region (case, spaces, zeros)",
     kNeedsDropOnly, isEnabled<&ScanOptions::codeVariant>, run<findCodeVariants>,
     describeCodeVariant, codeVariantOptions, noRules},
    {FindingKind::UnknownCode, "unknown_code", "a code not in the region register", kNeedsRegister,
     isEnabled<&ScanOptions::unknownCode>, run<findUnknownCodes>, describeUnknownCode,
     unknownCodeOptions, noRules},
    {FindingKind::WeekdayEffect, "weekday_effect", "a weekly reporting rhythm (daily data)",
     kNeedsDropOnly, isEnabled<&ScanOptions::weekdayEffect>, run<findWeekdayEffects>,
     describeWeekdayEffect, weekdayEffectOptions, weekdayEffectRules},
    {FindingKind::CumulativeDecrease, "cumulative_decrease", "a cumulative measure that falls",
     kNeedsDropOnly, isEnabled<&ScanOptions::cumulativeDecrease>, run<findCumulativeDecreases>,
     describeCumulativeDecrease, cumulativeDecreaseOptions, cumulativeDecreaseRules},
    {FindingKind::HierarchyMismatch, "hierarchy_mismatch",
     "a parent region that differs from the sum of its children", kNeedsRegister,
     isEnabled<&ScanOptions::hierarchyMismatch>, run<findHierarchyMismatches>,
     describeHierarchyMismatch, hierarchyMismatchOptions, hierarchyMismatchRules},
    {FindingKind::Revision, "revision", "history that moved since the previous release",
     kNeedsPrevious, isEnabled<&ScanOptions::revision>, runRevisions, describeRevision,
     revisionOptions, revisionRules},
    {FindingKind::CaseDates, "case_dates", "case-list rows with a missing or reversed date",
     kNeedsDropOnly, isEnabled<&ScanOptions::caseDates>, run<findCaseDateProblems>,
     describeCaseDates, caseDatesOptions, caseDatesRules},
};

}  // namespace

std::span<const FindingKindDescriptor> findingKindTable() {
    return kTable;
}

const FindingKindDescriptor& descriptorOf(FindingKind kind) {
    const auto i = static_cast<std::size_t>(kind);
    assert(i < std::size(kTable) && kTable[i].kind == kind);
    return kTable[i];
}

}  // namespace siftwave::scan::detail
