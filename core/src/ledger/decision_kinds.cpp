// The table of decision kinds: one descriptor per kind, each defined beside its
// effect in effects/<kind>.cpp (see siftwave/ledger/decision_kinds.h).
#include "siftwave/ledger/decision_kinds.h"

#include <cassert>
#include <iterator>
#include <string>
#include <string_view>

namespace siftwave::ledger {

namespace detail {
extern const DecisionKindInfo kRedistributeKind;
extern const DecisionKindInfo kSpreadNegativeKind;
extern const DecisionKindInfo kFillMissingKind;
extern const DecisionKindInfo kResolveDuplicateKind;
extern const DecisionKindInfo kMergeCodesKind;
extern const DecisionKindInfo kExcludeKind;
extern const DecisionKindInfo kAcceptKind;
extern const DecisionKindInfo kWithdrawKind;
extern const DecisionKindInfo kNowcastCompleteKind;
}  // namespace detail

namespace {

// In DecisionKind order.
constexpr const DecisionKindInfo* kKinds[] = {
    &detail::kRedistributeKind,     &detail::kSpreadNegativeKind, &detail::kFillMissingKind,
    &detail::kResolveDuplicateKind, &detail::kMergeCodesKind,     &detail::kExcludeKind,
    &detail::kAcceptKind,           &detail::kWithdrawKind,       &detail::kNowcastCompleteKind,
};

}  // namespace

const DecisionKindInfo& decisionKindInfo(DecisionKind kind) {
    const auto i = static_cast<std::size_t>(kind);
    assert(i < std::size(kKinds) && kKinds[i]->kind == kind);
    return *kKinds[i];
}

std::span<const DecisionKindInfo* const> decisionKinds() {
    return kKinds;
}

bool DecisionKindInfo::hasParameter(DecisionParam p) const {
    for (DecisionParam q : parameters) {
        if (q == p)
            return true;
    }
    return false;
}

const DecisionFlag* DecisionKindInfo::flag(std::string_view flagName) const {
    for (const DecisionFlag& f : flags) {
        if (flagName == f.name)
            return &f;
    }
    return nullptr;
}

std::string decisionWhere(const Decision& d, WhereStyle style) {
    const DecisionKindInfo& kind = decisionKindInfo(d.kind);
    const bool codes = kind.hasParameter(DecisionParam::Variant);  // merge_codes
    if (style == WhereStyle::Prose) {
        if (codes)
            return d.variant + " into " + d.into;
        if (kind.hasParameter(DecisionParam::Entry))  // withdraw
            return "entry #" + std::to_string(d.target);
        std::string where = d.region.empty() ? std::string("every region") : d.region;
        where += d.measure.empty() ? std::string(", every measure") : ", " + d.measure;
        if (d.date)
            where += ", " + d.date->iso();
        else if (d.window)
            where += ", " + d.window->first.iso() + " to " + d.window->last.iso();
        return where;
    }
    std::string where;
    auto add = [&](const std::string& part) {
        if (part.empty())
            return;
        if (!where.empty())
            where += ' ';
        where += part;
    };
    add(codes ? d.variant + " \u2192 " + d.into : d.region);
    add(d.measure);
    if (d.date)
        add(d.date->iso());
    else if (d.window)
        add(d.window->iso());
    return where;
}

}  // namespace siftwave::ledger
