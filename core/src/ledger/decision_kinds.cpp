// The table of decision kinds: one descriptor per kind, each defined beside its
// effect in effects/<kind>.cpp (see siftwave/ledger/decision_kinds.h).
#include "siftwave/ledger/decision_kinds.h"

#include <array>
#include <cassert>
#include <string_view>

namespace siftwave {

namespace detail {
extern const DecisionKindInfo kRedistributeKind;
extern const DecisionKindInfo kSpreadNegativeKind;
extern const DecisionKindInfo kFillMissingKind;
extern const DecisionKindInfo kResolveDuplicateKind;
extern const DecisionKindInfo kMergeCodesKind;
extern const DecisionKindInfo kExcludeKind;
extern const DecisionKindInfo kAcceptKind;
extern const DecisionKindInfo kWithdrawKind;
}  // namespace detail

namespace {

// In DecisionKind order.
constexpr std::array<const DecisionKindInfo*, 8> kKinds = {
    &detail::kRedistributeKind,     &detail::kSpreadNegativeKind, &detail::kFillMissingKind,
    &detail::kResolveDuplicateKind, &detail::kMergeCodesKind,     &detail::kExcludeKind,
    &detail::kAcceptKind,           &detail::kWithdrawKind,
};

}  // namespace

const DecisionKindInfo& decisionKindInfo(DecisionKind kind) {
    const auto i = static_cast<std::size_t>(kind);
    assert(i < kKinds.size() && kKinds[i]->kind == kind);
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

}  // namespace siftwave
