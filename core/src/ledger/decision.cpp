#include "siftwave/ledger/decision.h"

#include "siftwave/ledger/decision_kinds.h"

namespace siftwave::ledger {

std::string DayRange::iso() const {
    return first.iso() + ":" + last.iso();
}

std::optional<DayRange> DayRange::fromIso(std::string_view text) {
    const auto colon = text.find(':');
    if (colon == std::string_view::npos)
        return std::nullopt;
    auto first = Date::fromIso(text.substr(0, colon));
    auto last = Date::fromIso(text.substr(colon + 1));
    if (!first || !last || *last < *first)
        return std::nullopt;
    return DayRange{*first, *last};
}

const char* decisionKindName(DecisionKind kind) {
    return decisionKindInfo(kind).name;
}

std::optional<DecisionKind> decisionKindFromName(std::string_view name) {
    for (const DecisionKindInfo* k : decisionKinds()) {
        if (name == k->name)
            return k->kind;
    }
    return std::nullopt;
}

const char* redistributeMethodName(RedistributeMethod method) {
    switch (method) {
        case RedistributeMethod::Uniform:
            return "uniform";
        case RedistributeMethod::Proportional:
            return "proportional";
        case RedistributeMethod::Baseline:
            return "baseline";
        case RedistributeMethod::Level:
            return "level";
    }
    return "uniform";
}

std::optional<RedistributeMethod> redistributeMethodFromName(std::string_view name) {
    for (auto m : {RedistributeMethod::Uniform, RedistributeMethod::Proportional,
                   RedistributeMethod::Baseline, RedistributeMethod::Level}) {
        if (name == redistributeMethodName(m))
            return m;
    }
    return std::nullopt;
}

const char* fillMethodName(FillMethod method) {
    switch (method) {
        case FillMethod::Zero:
            return "zero";
        case FillMethod::Linear:
            return "linear";
        case FillMethod::Share:
            return "share";
    }
    return "zero";
}

std::optional<FillMethod> fillMethodFromName(std::string_view name) {
    for (auto m : {FillMethod::Zero, FillMethod::Linear, FillMethod::Share}) {
        if (name == fillMethodName(m))
            return m;
    }
    return std::nullopt;
}

const char* duplicateRuleName(DuplicateRule rule) {
    switch (rule) {
        case DuplicateRule::First:
            return "first";
        case DuplicateRule::Last:
            return "last";
        case DuplicateRule::Sum:
            return "sum";
        case DuplicateRule::Max:
            return "max";
    }
    return "first";
}

std::optional<DuplicateRule> duplicateRuleFromName(std::string_view name) {
    for (auto r :
         {DuplicateRule::First, DuplicateRule::Last, DuplicateRule::Sum, DuplicateRule::Max}) {
        if (name == duplicateRuleName(r))
            return r;
    }
    return std::nullopt;
}

bool decisionConservesTotals(const Decision& d) {
    return decisionKindInfo(d.kind).conservesTotals(d);
}

Status Decision::validate() const {
    return decisionKindInfo(kind).validate(*this);
}

}  // namespace siftwave::ledger
