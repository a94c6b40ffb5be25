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
// The suggestion is typed: a ledger Decision (ledger/decision.h) the detector
// builds directly, plus a few words for the analyst (SuggestionNotes). It is
// written as JSON only at the edge, by findingToJson().
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
#include "siftwave/ledger/decision.h"
#include "siftwave/time_axis.h"

#include <nlohmann/json_fwd.hpp>

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

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
    CaseDates,
};

inline constexpr FindingKind kAllFindingKinds[] = {
    FindingKind::MissingDates,  FindingKind::DuplicateRow,       FindingKind::NegativeCount,
    FindingKind::BacklogDump,   FindingKind::ReportingGap,       FindingKind::StaleValues,
    FindingKind::CodeCollision, FindingKind::CodeVariant,        FindingKind::UnknownCode,
    FindingKind::WeekdayEffect, FindingKind::CumulativeDecrease, FindingKind::HierarchyMismatch,
    FindingKind::Revision,      FindingKind::CaseDates,
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

/// The evidence of a finding: numbers (and a few names) by key, per kind as the README's
/// scan section lists them, a JSON object. Detectors fill it (they include
/// nlohmann/json.hpp); readers that only show it use scalars() or dump() and need no JSON
/// header.
///
/// Memory: while a detector fills it, it is a nlohmann::json object (a tree of map nodes,
/// about 1 KB for ten keys). scanDrop() then compacts every finding's evidence to its CBOR
/// bytes (RFC 8949; about 150-250 bytes), so that a drop with tens of thousands of findings
/// keeps the scan's memory a small multiple of the drop's (issue 14). Reading a compact
/// evidence decodes it; writing to it (operator[] on a non-const evidence) expands it again.
class Evidence {
public:
    Evidence();
    Evidence(const Evidence& other);
    Evidence(Evidence&& other) noexcept;
    Evidence& operator=(const Evidence& other);
    Evidence& operator=(Evidence&& other) noexcept;
    ~Evidence();

    /// Replaces the whole object: `f.evidence = {{"value", v}, {"line", l}}`.
    Evidence& operator=(nlohmann::json object);
    /// One value, added (null) when absent.
    nlohmann::json& operator[](const std::string& key);
    /// One value that must be there (an assertion; null in a release build).
    nlohmann::json operator[](const std::string& key) const;

    /// The object itself ({} when nothing was written).
    nlohmann::json json() const;
    bool contains(const std::string& key) const;
    /// The top-level numbers and strings in key order, as text: strings as they are,
    /// numbers as JSON writes them. For reason drafts and list views.
    std::vector<std::pair<std::string, std::string>> scalars() const;
    /// The object as compact JSON text.
    std::string dump() const;

    /// Stores the object as CBOR bytes (see above); the value read back is the same.
    void compact();
    bool isCompact() const { return !m_packed.empty(); }

private:
    std::unique_ptr<nlohmann::json> m_object;  // while filled; null when empty or compact
    std::vector<std::uint8_t> m_packed;        // CBOR of the object once compact
    void expand();
};

/// What a suggestion says besides its Decision: the scan's words for the analyst. Each is
/// written into the suggestion's JSON only when set.
struct SuggestionNotes {
    std::string note;                // "note": why this decision, or what else to consider
    std::string action;              // "action": a step outside the ledger, e.g.
                                     // "use_daily_differences" (cumulative_decrease)
    std::optional<bool> absorbable;  // "absorbable" (spread_negative): the earlier periods
                                     // hold at least the correction
};

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

    Evidence evidence;

    /// The decision the scan suggests; nullopt when it suggests none. It names the finding's
    /// region and measure (empty for a finding about every measure: suggestedDecision()
    /// fills the measure in) and, once scanDrop() has given the finding its id, the id.
    std::optional<ledger::Decision> suggestion;
    SuggestionNotes suggestionNotes;
};

/// The JSON object described above.
nlohmann::json findingToJson(const Finding& finding);

/// The "suggestion" object of findingToJson(), in the scan's JSON words ({} for none):
///   {"decision": kind name, then per kind
///    redistribute       "date", "excess", "window_first", "window_last", "method"
///    spread_negative    "date", "window_first", "window_last"
///    fill_missing       "first", "last", "method"
///    resolve_duplicate  "date", "keep"
///    merge_codes        "from", "into"
///    exclude            "first", "last" (the periods), or "region" when it is a whole region
///    accept             nothing more
///   and "note", "action", "absorbable" where the SuggestionNotes hold them}
nlohmann::json suggestionToJson(const Finding& finding);
/// The same as compact JSON text, for readers without the JSON header (tooltips).
std::string suggestionText(const Finding& finding);

/// One line for a person, from the evidence: "observed 2643 where about 199 was expected
/// (excess 2444)". Counts days or weeks by the finding's cadence. For tables and list views.
std::string describeFinding(const Finding& finding);

}  // namespace siftwave::scan
