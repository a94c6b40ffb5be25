#include "siftwave/scan/scan_options.h"

#include <charconv>
#include <cmath>
#include <functional>
#include <sstream>
#include <variant>

namespace siftwave::scan {
namespace {

using ValuePointer = std::variant<bool*, int*, double*>;

struct Entry {
    const char* name;
    ValuePointer value;
    const char* help;
};

// The one table of option names: set() and describeScanOptions() both read it.
std::vector<Entry> optionTable(ScanOptions& o) {
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
        {"duplicate_row.enabled", &o.duplicateRow.enabled, "report repeated region/date rows"},
        {"negative_count.enabled", &o.negativeCount.enabled, "report negative counts"},
        {"negative_count.spread_days", &o.negativeCount.spreadDays,
         "earlier days suggested to absorb a negative correction"},
        {"negative_count.spread_weeks", &o.negativeCount.spreadWeeks,
         "earlier weeks suggested to absorb a negative correction"},
        {"backlog_dump.enabled", &o.backlogDump.enabled, "report periods far above their baseline"},
        {"backlog_dump.window_days", &o.backlogDump.windowDays,
         "neighbour days on each side that form the baseline"},
        {"backlog_dump.window_weeks", &o.backlogDump.windowWeeks,
         "neighbour weeks on each side that form the baseline"},
        {"backlog_dump.threshold", &o.backlogDump.threshold, "robust z-score a day must reach"},
        {"backlog_dump.min_excess", &o.backlogDump.minExcess,
         "smallest excess (counts) that is reported"},
        {"backlog_dump.min_ratio", &o.backlogDump.minRatio,
         "smallest observed / expected ratio that is reported"},
        {"backlog_dump.gap_min_days", &o.backlogDump.gapMinDays,
         "zero/low/missing days before a catch-up"},
        {"backlog_dump.gap_min_weeks", &o.backlogDump.gapMinWeeks,
         "zero/low/missing weeks before a catch-up"},
        {"backlog_dump.gap_low_fraction", &o.backlogDump.gapLowFraction,
         "a gap day is at most this fraction of the surrounding level"},
        {"backlog_dump.gap_threshold", &o.backlogDump.gapThreshold,
         "robust z-score a catch-up period must reach"},
        {"backlog_dump.max_gap_days", &o.backlogDump.maxGapDays,
         "longest gap (days) looked for behind a day"},
        {"backlog_dump.max_gap_weeks", &o.backlogDump.maxGapWeeks,
         "longest gap (weeks) looked for behind a week"},
        {"backlog_dump.redistribute_days", &o.backlogDump.redistributeDays,
         "suggested redistribution window (days) when there is no gap"},
        {"backlog_dump.redistribute_weeks", &o.backlogDump.redistributeWeeks,
         "suggested redistribution window (weeks) when there is no gap"},
        {"backlog_dump.critical_share", &o.backlogDump.criticalShare,
         "critical when the excess is this share of the region total"},
        {"backlog_dump.recent_days", &o.backlogDump.recentDays,
         "critical when among the last this many days"},
        {"backlog_dump.recent_weeks", &o.backlogDump.recentWeeks,
         "critical when among the last this many weeks"},
        {"reporting_gap.enabled", &o.reportingGap.enabled,
         "report runs of zeros inside active periods"},
        {"reporting_gap.min_days", &o.reportingGap.minDays, "shortest run of zero days"},
        {"reporting_gap.min_weeks", &o.reportingGap.minWeeks, "shortest run of zero weeks"},
        {"reporting_gap.min_level", &o.reportingGap.minLevel,
         "expected daily count around the run needed to call it a gap"},
        {"reporting_gap.min_weekly_level", &o.reportingGap.minWeeklyLevel,
         "expected weekly count around the run needed to call it a gap"},
        {"reporting_gap.window_days", &o.reportingGap.windowDays,
         "days on each side that give the expected level"},
        {"reporting_gap.window_weeks", &o.reportingGap.windowWeeks,
         "weeks on each side that give the expected level"},
        {"stale_values.enabled", &o.staleValues.enabled,
         "report runs of one repeated non-zero value"},
        {"stale_values.min_days", &o.staleValues.minDays, "shortest run (days)"},
        {"stale_values.min_weeks", &o.staleValues.minWeeks, "shortest run (weeks)"},
        {"stale_values.max_chance", &o.staleValues.maxChance,
         "report runs at most this likely under Poisson noise"},
        {"code_collision.enabled", &o.codeCollision.enabled, "report codes other tools misread"},
        {"code_variant.enabled", &o.codeVariant.enabled,
         "report codes equal after folding case, spaces, zeros"},
        {"unknown_code.enabled", &o.unknownCode.enabled, "report codes not in the register"},
        {"weekday_effect.enabled", &o.weekdayEffect.enabled,
         "report a weekly pattern (daily data only)"},
        {"weekday_effect.min_weeks", &o.weekdayEffect.minWeeks, "weeks of data needed"},
        {"weekday_effect.min_strength", &o.weekdayEffect.minStrength,
         "highest / lowest factor - 1 needed to report"},
        {"weekday_effect.min_level", &o.weekdayEffect.minLevel,
         "7-day average below which days are not used"},
        {"cumulative_decrease.enabled", &o.cumulativeDecrease.enabled,
         "report decreases of cumulative measures"},
        {"cumulative_decrease.min_rising_share", &o.cumulativeDecrease.minRisingShare,
         "share of rising changes that makes a measure cumulative"},
        {"cumulative_decrease.min_changes", &o.cumulativeDecrease.minChanges,
         "changes needed before a measure is called cumulative"},
        {"hierarchy_mismatch.enabled", &o.hierarchyMismatch.enabled,
         "report parents that differ from the sum of their children"},
        {"hierarchy_mismatch.tolerance", &o.hierarchyMismatch.tolerance,
         "allowed difference in a period"},
        {"revision.enabled", &o.revision.enabled, "compare with the previous release"},
        {"revision.max_dates_listed", &o.revision.maxDatesListed,
         "revised dates listed per finding"},
        {"revision.critical_share", &o.revision.criticalShare,
         "critical when the revised amount is this share of the region total"},
    };
}

std::string valueText(const ValuePointer& p) {
    std::ostringstream s;
    std::visit(
        [&](auto* v) {
            if constexpr (std::is_same_v<decltype(v), bool*>) {
                s << (*v ? "true" : "false");
            } else {
                s << *v;
            }
        },
        p);
    return s.str();
}

Error usage(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}

Status check(bool condition, const char* name, const char* rule) {
    if (condition)
        return Ok{};
    return usage(std::string("scan option ") + name + " must be " + rule);
}

}  // namespace

Status ScanOptions::validate() const {
    const std::vector<std::pair<bool, std::pair<const char*, const char*>>> rules = {
        {missingDates.minDays >= 1, {"missing_dates.min_days", "at least 1"}},
        {missingDates.minWeeks >= 1, {"missing_dates.min_weeks", "at least 1"}},
        {missingDates.levelDays >= 1, {"missing_dates.level_days", "at least 1"}},
        {missingDates.levelWeeks >= 1, {"missing_dates.level_weeks", "at least 1"}},
        {missingDates.trueZeroMaxLevel >= 0, {"missing_dates.true_zero_max_level", "0 or more"}},
        {missingDates.trueZeroPeriods >= 1, {"missing_dates.true_zero_periods", "at least 1"}},
        {negativeCount.spreadDays >= 1, {"negative_count.spread_days", "at least 1"}},
        {negativeCount.spreadWeeks >= 1, {"negative_count.spread_weeks", "at least 1"}},
        {backlogDump.windowDays >= 2 && backlogDump.windowDays <= 60,
         {"backlog_dump.window_days", "between 2 and 60"}},
        {backlogDump.windowWeeks >= 2 && backlogDump.windowWeeks <= 60,
         {"backlog_dump.window_weeks", "between 2 and 60"}},
        {backlogDump.threshold > 0, {"backlog_dump.threshold", "positive"}},
        {backlogDump.minExcess >= 0, {"backlog_dump.min_excess", "0 or more"}},
        {backlogDump.minRatio >= 1, {"backlog_dump.min_ratio", "at least 1"}},
        {backlogDump.gapMinDays >= 1, {"backlog_dump.gap_min_days", "at least 1"}},
        {backlogDump.gapMinWeeks >= 1, {"backlog_dump.gap_min_weeks", "at least 1"}},
        {backlogDump.gapLowFraction >= 0 && backlogDump.gapLowFraction < 1,
         {"backlog_dump.gap_low_fraction", "in [0, 1)"}},
        {backlogDump.gapThreshold > 0, {"backlog_dump.gap_threshold", "positive"}},
        {backlogDump.maxGapDays >= backlogDump.gapMinDays,
         {"backlog_dump.max_gap_days", "at least backlog_dump.gap_min_days"}},
        {backlogDump.maxGapWeeks >= backlogDump.gapMinWeeks,
         {"backlog_dump.max_gap_weeks", "at least backlog_dump.gap_min_weeks"}},
        {backlogDump.redistributeDays >= 1, {"backlog_dump.redistribute_days", "at least 1"}},
        {backlogDump.redistributeWeeks >= 1, {"backlog_dump.redistribute_weeks", "at least 1"}},
        {backlogDump.criticalShare > 0, {"backlog_dump.critical_share", "positive"}},
        {backlogDump.recentDays >= 0, {"backlog_dump.recent_days", "0 or more"}},
        {backlogDump.recentWeeks >= 0, {"backlog_dump.recent_weeks", "0 or more"}},
        {reportingGap.minDays >= 1, {"reporting_gap.min_days", "at least 1"}},
        {reportingGap.minWeeks >= 1, {"reporting_gap.min_weeks", "at least 1"}},
        {reportingGap.minLevel >= 0, {"reporting_gap.min_level", "0 or more"}},
        {reportingGap.minWeeklyLevel >= 0, {"reporting_gap.min_weekly_level", "0 or more"}},
        {reportingGap.windowDays >= 1, {"reporting_gap.window_days", "at least 1"}},
        {reportingGap.windowWeeks >= 1, {"reporting_gap.window_weeks", "at least 1"}},
        {staleValues.minDays >= 2, {"stale_values.min_days", "at least 2"}},
        {staleValues.minWeeks >= 2, {"stale_values.min_weeks", "at least 2"}},
        {staleValues.maxChance > 0 && staleValues.maxChance <= 1,
         {"stale_values.max_chance", "in (0, 1]"}},
        {weekdayEffect.minWeeks >= 1, {"weekday_effect.min_weeks", "at least 1"}},
        {weekdayEffect.minStrength >= 0, {"weekday_effect.min_strength", "0 or more"}},
        {weekdayEffect.minLevel >= 0, {"weekday_effect.min_level", "0 or more"}},
        {cumulativeDecrease.minRisingShare > 0.5 && cumulativeDecrease.minRisingShare <= 1,
         {"cumulative_decrease.min_rising_share", "in (0.5, 1]"}},
        {cumulativeDecrease.minChanges >= 1, {"cumulative_decrease.min_changes", "at least 1"}},
        {hierarchyMismatch.tolerance >= 0, {"hierarchy_mismatch.tolerance", "0 or more"}},
        {revision.maxDatesListed >= 0, {"revision.max_dates_listed", "0 or more"}},
        {revision.criticalShare > 0, {"revision.critical_share", "positive"}},
    };
    for (const auto& [ok, what] : rules) {
        Status s = check(ok, what.first, what.second);
        if (!s)
            return s;
    }
    return Ok{};
}

Status ScanOptions::set(std::string_view name, std::string_view value) {
    const ScanOptions before = *this;  // restored when the new value does not validate
    for (const Entry& e : optionTable(*this)) {
        if (name != e.name)
            continue;
        const std::string text(value);
        const std::string bad = "scan option " + std::string(name) + ": cannot read '" + text + "'";
        if (auto* b = std::get_if<bool*>(&e.value)) {
            if (text == "true" || text == "1" || text == "on" || text == "yes") {
                **b = true;
            } else if (text == "false" || text == "0" || text == "off" || text == "no") {
                **b = false;
            } else {
                return usage(bad + " as true or false");
            }
        } else if (auto* i = std::get_if<int*>(&e.value)) {
            int parsed = 0;
            auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), parsed);
            if (ec != std::errc() || end != text.data() + text.size()) {
                return usage(bad + " as a whole number");
            }
            **i = parsed;
        } else if (auto* d = std::get_if<double*>(&e.value)) {
            double parsed = 0;
            auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), parsed);
            if (ec != std::errc() || end != text.data() + text.size() || !std::isfinite(parsed)) {
                return usage(bad + " as a number");
            }
            **d = parsed;
        }
        Status valid = validate();
        if (!valid)
            *this = before;
        return valid;
    }
    return usage("unknown scan option '" + std::string(name) +
                 "' (see 'siftwave-cli scan --help' for the names)");
}

std::vector<OptionDescription> describeScanOptions() {
    ScanOptions defaults;
    std::vector<OptionDescription> out;
    for (const Entry& e : optionTable(defaults)) {
        out.push_back({e.name, valueText(e.value), e.help});
    }
    return out;
}

}  // namespace siftwave::scan
