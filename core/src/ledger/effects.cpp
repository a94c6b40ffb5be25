// Deriving an Effect from a Decision and applying it: the dispatch to each kind's
// effect (effects/<kind>.cpp) and the rules every effect is checked against.
#include "ledger/effects.h"

#include "ledger/effects/effect_support.h"

#include <tuple>

namespace siftwave::ledger::detail {

namespace {

/// The kind's own rule, then the conservation of totals of the kinds that keep them.
Status checkKindRules(const DecisionKindInfo& kind, const Cleaned& cleaned, const Decision& dec,
                      const Effect& effect) {
    if (kind.checkEffect) {
        if (auto s = kind.checkEffect(cleaned, dec, effect); !s)
            return s;
    }
    if (kind.conservesTotals(dec)) {
        for (const TotalChange& t : effect.totals) {
            if (t.before != t.after) {
                return cellError(ErrorCode::Conservation,
                                 "the decision would change the total of " + t.measure + " from " +
                                     std::to_string(t.before) + " to " + std::to_string(t.after),
                                 t.region);
            }
        }
    }
    return Ok{};
}

}  // namespace

Result<Effect> deriveEffect(const Drop& drop, const Cleaned& cleaned, const Decision& decision) {
    if (auto s = decision.validate(); !s)
        return s.error();
    if (cleaned.measureCount() != drop.measures.size() ||
        cleaned.regionCount() != drop.regionCodes.size() || cleaned.days() != drop.periods()) {
        return makeError(ErrorCode::Usage, "the cleaned data does not belong to this drop");
    }
    const DecisionKindInfo& kind = decisionKindInfo(decision.kind);
    EffectBuilder out(drop, cleaned);
    if (Status status = kind.effect(drop, cleaned, decision, out); !status)
        return status.error();
    Effect effect = out.finish();
    if (auto s = checkKindRules(kind, cleaned, decision, effect); !s)
        return s.error();
    return effect;
}

Status applyEffect(const Drop& drop, Cleaned& cleaned, const Decision& decision,
                   const Effect& effect) {
    const std::uint64_t sequence = cleaned.entryCount() + 1;
    std::uint64_t base = 0;
    bool restore = false;
    if (decision.kind == DecisionKind::Withdraw)
        std::tie(base, restore) = withdrawalBase(cleaned, decision.target);
    for (const CellChange& change : effect.cells) {
        auto at = locate(drop, change.measure, change.region, change.date);
        if (!at)
            return at.error();
        CleanedCell& cell = Access::cell(cleaned, at->measure, at->region, at->day);
        Access::total(cleaned, at->measure, at->region) += change.after.counted() - cell.counted();
        cell = change.after;
        const std::size_t key = Access::cellIndex(cleaned, at->measure, at->region, at->day);
        Access::touches(cleaned, key).push_back(sequence);
        auto& writers = Access::writers(cleaned, key);
        if (decision.kind != DecisionKind::Withdraw) {
            writers.push_back(sequence);
        } else if (restore) {
            writers.push_back(base);
        } else if (!writers.empty() && writers.back() == base) {
            writers.pop_back();
        }
    }
    if (decision.kind == DecisionKind::Withdraw) {
        std::uint64_t cur = decision.target;
        bool state = false;
        while (true) {
            Access::setInEffect(cleaned, cur, state);
            if (Access::kindOf(cleaned, cur) != DecisionKind::Withdraw)
                break;
            cur = Access::targetOf(cleaned, cur);
            state = !state;
        }
    }
    Access::pushEntry(cleaned, decision.kind, decision.target, effect);
    return Ok{};
}

}  // namespace siftwave::ledger::detail
