#pragma once
// Finding: one suspected problem in a Drop, found by the scan.
//
// A finding names its kind, where it is (region, measure, period range), how
// sure and how serious the scan is (severity), where it sits in the review
// order (rank, 1 = look at this first), the evidence in numbers and a
// suggested decision for the ledger. Findings are derived data: the same Drop
// (and the same previous Drop and register) always gives the same findings
// with the same ids.
//
// JSON form (findingToJson):
//   {"id", "kind", "severity": "info"|"warning"|"critical", "rank", "region",
//    "measure", "first", "last", "evidence": {...}, "suggestion": {...}}
// "region" and "measure" are null for drop-wide findings; "first" and "last"
// are ISO 8601 dates, absent for region-wide kinds (code_collision, ...): the
// first days of the first and the last period (a day, or a week of weekly data).
// Evidence counts periods under "periods" and, under the keys daily data has
// always used ("days", "baseline_days", ...), the days those periods cover (the
// same numbers for daily data); the README's scan section lists them.

#include "siftwave/date.h"
#include "siftwave/time_axis.h"

#include <nlohmann/json.hpp>

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace siftwave::scan {

enum class FindingKind {
    MissingDates,
    DuplicateRow,
    NegativeCount,
    BacklogDump,
    ReportingGap,
    StaleValues,
    CodeCollision,
    CodeVariant,
    UnknownCode,
    WeekdayEffect,
    CumulativeDecrease,
    HierarchyMismatch,
    Revision,
};

inline constexpr FindingKind kAllFindingKinds[] = {
    FindingKind::MissingDates,  FindingKind::DuplicateRow,       FindingKind::NegativeCount,
    FindingKind::BacklogDump,   FindingKind::ReportingGap,       FindingKind::StaleValues,
    FindingKind::CodeCollision, FindingKind::CodeVariant,        FindingKind::UnknownCode,
    FindingKind::WeekdayEffect, FindingKind::CumulativeDecrease, FindingKind::HierarchyMismatch,
    FindingKind::Revision,
};

/// The identifier used in JSON and on the command line: "missing_dates", "backlog_dump", ...
const char* findingKindName(FindingKind kind);
std::optional<FindingKind> findingKindFromName(std::string_view name);

enum class Severity {
    Info,      // read correctly, but worth knowing (e.g. a code other tools misread)
    Warning,   // probably wrong; look before briefing
    Critical,  // moves the picture: a share of the region's counts is in doubt
};

/// "info", "warning", "critical".
const char* severityName(Severity severity);

struct Finding {
    std::string id;  // stable: kind, region, measure and date range hashed (see scan.h)
    FindingKind kind = FindingKind::MissingDates;
    Severity severity = Severity::Warning;
    int rank = 0;  // 1-based review order, set by scanDrop()

    std::optional<std::string> region;   // verbatim code; nullopt for drop-wide findings
    std::optional<std::string> measure;  // nullopt when the finding is about every measure
    std::optional<Date> first;           // first day of the first period; nullopt for
    std::optional<Date> last;            // region-wide kinds; last: of the last period
    Cadence cadence = Cadence::Daily;    // of the drop: the unit its texts count in

    /// How many counts the finding puts in doubt (excess, negative value, revised
    /// amount, ...). Orders findings of the same severity; not part of the JSON.
    double impact = 0.0;

    nlohmann::json evidence = nlohmann::json::object();
    nlohmann::json suggestion = nlohmann::json::object();
};

/// The JSON object described above.
nlohmann::json findingToJson(const Finding& finding);

/// One line for a person, from the evidence: "observed 2643 where about 199 was expected
/// (excess 2444)". Counts days or weeks by the finding's cadence. For tables and list views.
std::string describeFinding(const Finding& finding);

}  // namespace siftwave::scan
