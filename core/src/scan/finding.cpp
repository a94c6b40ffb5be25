#include "siftwave/scan/finding.h"

namespace siftwave::scan {

const char* findingKindName(FindingKind kind) {
    switch (kind) {
        case FindingKind::MissingDates:
            return "missing_dates";
        case FindingKind::DuplicateRow:
            return "duplicate_row";
        case FindingKind::NegativeCount:
            return "negative_count";
        case FindingKind::BacklogDump:
            return "backlog_dump";
        case FindingKind::ReportingGap:
            return "reporting_gap";
        case FindingKind::StaleValues:
            return "stale_values";
        case FindingKind::CodeCollision:
            return "code_collision";
        case FindingKind::CodeVariant:
            return "code_variant";
        case FindingKind::UnknownCode:
            return "unknown_code";
        case FindingKind::WeekdayEffect:
            return "weekday_effect";
        case FindingKind::CumulativeDecrease:
            return "cumulative_decrease";
        case FindingKind::HierarchyMismatch:
            return "hierarchy_mismatch";
        case FindingKind::Revision:
            return "revision";
    }
    return "missing_dates";
}

std::optional<FindingKind> findingKindFromName(std::string_view name) {
    for (FindingKind kind : kAllFindingKinds) {
        if (name == findingKindName(kind))
            return kind;
    }
    return std::nullopt;
}

const char* severityName(Severity severity) {
    switch (severity) {
        case Severity::Info:
            return "info";
        case Severity::Warning:
            return "warning";
        case Severity::Critical:
            return "critical";
    }
    return "info";
}

nlohmann::json findingToJson(const Finding& f) {
    nlohmann::json j = nlohmann::json::object();
    j["id"] = f.id;
    j["kind"] = findingKindName(f.kind);
    j["severity"] = severityName(f.severity);
    j["rank"] = f.rank;
    j["region"] = f.region ? nlohmann::json(*f.region) : nlohmann::json(nullptr);
    j["measure"] = f.measure ? nlohmann::json(*f.measure) : nlohmann::json(nullptr);
    if (f.first)
        j["first"] = f.first->iso();
    if (f.last)
        j["last"] = f.last->iso();
    j["evidence"] = f.evidence;
    j["suggestion"] = f.suggestion;
    return j;
}

}  // namespace siftwave::scan
