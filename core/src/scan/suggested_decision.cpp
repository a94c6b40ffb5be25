#include "siftwave/scan/suggested_decision.h"

#include <optional>

namespace siftwave::scan {

namespace {

std::optional<Date> dateField(const nlohmann::json& object, const char* key) {
    const auto it = object.find(key);
    if (it == object.end() || !it->is_string())
        return std::nullopt;
    return Date::fromIso(it->get<std::string>());
}

std::optional<DayRange> rangeFields(const nlohmann::json& object, const char* firstKey,
                                    const char* lastKey) {
    const auto first = dateField(object, firstKey);
    const auto last = dateField(object, lastKey);
    if (!first || !last || *last < *first)
        return std::nullopt;
    return DayRange{*first, *last};
}

std::string stringField(const nlohmann::json& object, const char* key) {
    const auto it = object.find(key);
    return it != object.end() && it->is_string() ? it->get<std::string>() : std::string();
}

Error badSuggestion(const Finding& finding, const std::string& what) {
    return makeError(ErrorCode::InvalidValue, "finding " + finding.id + ": the suggestion " + what);
}

}  // namespace

Result<Decision> suggestedDecision(const Finding& finding, const std::string& measure) {
    const nlohmann::json& s = finding.suggestion;
    const std::string kindName = s.is_object() ? stringField(s, "decision") : std::string();
    if (kindName.empty())
        return makeError(ErrorCode::NotFound, "finding " + finding.id + " suggests no decision");
    const std::optional<DecisionKind> kind = decisionKindFromName(kindName);
    if (!kind)
        return badSuggestion(finding, "names an unknown decision '" + kindName + "'");

    Decision d;
    d.kind = *kind;
    d.finding = finding.id;
    d.region = finding.region.value_or(std::string());
    d.measure = finding.measure.value_or(measure);
    switch (d.kind) {
        case DecisionKind::Redistribute: {
            d.date = dateField(s, "date");
            d.window = rangeFields(s, "window_first", "window_last");
            const auto excess = s.find("excess");
            if (!d.date || !d.window || excess == s.end() || !excess->is_number())
                return badSuggestion(finding, "lacks date, window or excess");
            d.excess = excess->get<std::int64_t>();
            const auto method = redistributeMethodFromName(stringField(s, "method"));
            d.redistributeMethod = method.value_or(RedistributeMethod::Proportional);
            break;
        }
        case DecisionKind::SpreadNegative:
            d.date = dateField(s, "date");
            d.window = rangeFields(s, "window_first", "window_last");
            if (!d.date)
                return badSuggestion(finding, "lacks the date");
            break;
        case DecisionKind::FillMissing: {
            d.window = rangeFields(s, "first", "last");
            if (!d.window)
                return badSuggestion(finding, "lacks the periods to fill");
            d.fillMethod =
                fillMethodFromName(stringField(s, "method")).value_or(FillMethod::Linear);
            break;
        }
        case DecisionKind::ResolveDuplicate:
            d.date = dateField(s, "date");
            if (!d.date)
                return badSuggestion(finding, "lacks the date");
            d.duplicateRule =
                duplicateRuleFromName(stringField(s, "keep")).value_or(DuplicateRule::First);
            break;
        case DecisionKind::MergeCodes:
            d.variant = stringField(s, "from");
            d.into = stringField(s, "into");
            d.region.clear();
            if (d.variant.empty() || d.into.empty())
                return badSuggestion(finding, "lacks the codes");
            break;
        case DecisionKind::Exclude:
            d.window = rangeFields(s, "first", "last");
            if (!d.window && finding.first && finding.last)
                d.window = DayRange{*finding.first, *finding.last};
            break;
        case DecisionKind::Accept:
            if (finding.first && finding.last)
                d.window = DayRange{*finding.first, *finding.last};
            d.measure = finding.measure.value_or(std::string());
            break;
        case DecisionKind::Withdraw:
            return badSuggestion(finding, "asks for a withdrawal, which only an analyst can");
    }
    return d;
}

}  // namespace siftwave::scan
