#include "siftwave/ledger/decision.h"

namespace siftwave {

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
    switch (kind) {
        case DecisionKind::Redistribute:
            return "redistribute";
        case DecisionKind::SpreadNegative:
            return "spread_negative";
        case DecisionKind::FillMissing:
            return "fill_missing";
        case DecisionKind::ResolveDuplicate:
            return "resolve_duplicate";
        case DecisionKind::MergeCodes:
            return "merge_codes";
        case DecisionKind::Exclude:
            return "exclude";
        case DecisionKind::Accept:
            return "accept";
        case DecisionKind::Withdraw:
            return "withdraw";
    }
    return "accept";
}

std::optional<DecisionKind> decisionKindFromName(std::string_view name) {
    for (DecisionKind k :
         {DecisionKind::Redistribute, DecisionKind::SpreadNegative, DecisionKind::FillMissing,
          DecisionKind::ResolveDuplicate, DecisionKind::MergeCodes, DecisionKind::Exclude,
          DecisionKind::Accept, DecisionKind::Withdraw}) {
        if (name == decisionKindName(k))
            return k;
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
    }
    return "uniform";
}

std::optional<RedistributeMethod> redistributeMethodFromName(std::string_view name) {
    for (auto m : {RedistributeMethod::Uniform, RedistributeMethod::Proportional,
                   RedistributeMethod::Baseline}) {
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
    switch (d.kind) {
        case DecisionKind::Redistribute:
        case DecisionKind::SpreadNegative:
        case DecisionKind::Accept:
            return true;
        case DecisionKind::FillMissing:
            // zero writes 0 where no value was: the total cannot change.
            return d.fillMethod == FillMethod::Share || d.fillMethod == FillMethod::Zero;
        default:
            return false;
    }
}

namespace {
Status usage(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}
}  // namespace

Status Decision::validate() const {
    const std::string k = decisionKindName(kind);
    auto needRegion = [&]() -> Status {
        if (region.empty())
            return usage(k + " needs a region");
        return Ok{};
    };
    auto needMeasure = [&]() -> Status {
        if (measure.empty())
            return usage(k + " needs a measure");
        return Ok{};
    };
    auto needDate = [&]() -> Status {
        if (!date)
            return usage(k + " needs a date");
        return Ok{};
    };
    auto needWindow = [&]() -> Status {
        if (!window)
            return usage(k + " needs a window of days FIRST:LAST");
        return Ok{};
    };
    switch (kind) {
        case DecisionKind::Redistribute: {
            for (auto s : {needRegion(), needMeasure(), needDate(), needWindow()}) {
                if (!s)
                    return s;
            }
            if (excess <= 0)
                return usage("redistribute needs an excess greater than 0");
            if (window->last >= *date) {
                return usage(
                    "the redistribution window must end before the day it takes the excess from");
            }
            if (baselineWidth < 3 || baselineWidth > 21 || baselineWidth % 2 == 0) {
                return usage("the baseline width must be an odd number of days from 3 to 21");
            }
            return Ok{};
        }
        case DecisionKind::SpreadNegative: {
            for (auto s : {needRegion(), needMeasure(), needDate()}) {
                if (!s)
                    return s;
            }
            if (window && window->last >= *date) {
                return usage("the days absorbing a negative correction must come before it");
            }
            return Ok{};
        }
        case DecisionKind::FillMissing:
            for (auto s : {needRegion(), needMeasure(), needWindow()}) {
                if (!s)
                    return s;
            }
            return Ok{};
        case DecisionKind::ResolveDuplicate:
            for (auto s : {needRegion(), needMeasure(), needDate()}) {
                if (!s)
                    return s;
            }
            return Ok{};
        case DecisionKind::MergeCodes:
            if (variant.empty() || into.empty())
                return usage("merge_codes needs a variant code and the code to merge it into");
            if (variant == into)
                return usage("merge_codes needs two different codes");
            return Ok{};
        case DecisionKind::Exclude:
            if (region.empty() && !window)
                return usage("exclude needs a region, a window of days, or both");
            return Ok{};
        case DecisionKind::Accept:
            return needRegion();
        case DecisionKind::Withdraw:
            if (target == 0)
                return usage("withdraw needs the id of the entry to undo");
            return Ok{};
    }
    return Ok{};
}

}  // namespace siftwave
