// Deriving an Effect from a Decision and applying it: the dispatch to each kind's
// effect (effects/<kind>.cpp) and the rules every effect is checked against.
#include "ledger/effects.h"

#include "ledger/effects/effect_support.h"

#include <map>
#include <tuple>

namespace siftwave::detail {

namespace {

/// The conservation rules of each kind, checked on the finished effect.
Status checkKindRules(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                      const Effect& effect) {
    if (dec.kind == DecisionKind::Redistribute || dec.kind == DecisionKind::SpreadNegative ||
        dec.kind == DecisionKind::FillMissing) {
        for (const CellChange& c : effect.cells) {
            if (c.after.hasValue() && c.after.value < 0 && c.after.value < c.before.counted()) {
                return cellError(ErrorCode::Conservation,
                                 "the decision would make a count negative", c.region,
                                 c.date.iso());
            }
        }
    }
    if (decisionConservesTotals(dec)) {
        for (const TotalChange& t : effect.totals) {
            if (t.before != t.after) {
                return cellError(ErrorCode::Conservation,
                                 "the decision would change the total of " + t.measure + " from " +
                                     std::to_string(t.before) + " to " + std::to_string(t.after),
                                 t.region);
            }
        }
    }
    if (dec.kind == DecisionKind::MergeCodes) {
        std::map<std::string, std::int64_t> variantBefore;
        for (const TotalChange& t : effect.totals) {
            if (t.region == dec.variant) {
                if (t.after != 0)
                    return cellError(ErrorCode::Conservation, "the merged code keeps a total",
                                     t.region);
                variantBefore[t.measure] = t.before;
            }
        }
        for (const TotalChange& t : effect.totals) {
            if (t.region == dec.into && t.after != t.before + variantBefore[t.measure]) {
                return cellError(ErrorCode::Conservation,
                                 "merging would not add the variant's total exactly", t.region);
            }
        }
    }
    if (dec.kind == DecisionKind::Withdraw) {
        const auto [base, restore] = withdrawalBase(cleaned, dec.target);
        std::map<std::pair<std::string, std::string>, std::int64_t> expected;
        for (const TotalChange& t : Access::effectOf(cleaned, base).totals) {
            expected[{t.measure, t.region}] = restore ? t.change() : -t.change();
        }
        for (const TotalChange& t : effect.totals) {
            if (t.change() != expected[{t.measure, t.region}]) {
                return cellError(ErrorCode::Conservation,
                                 "the withdrawal would not reverse the entry's change exactly",
                                 t.region);
            }
        }
    }
    (void)drop;
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
    EffectBuilder out(drop, cleaned);
    Status status = Ok{};
    switch (decision.kind) {
        case DecisionKind::Redistribute:
            status = redistribute(drop, cleaned, decision, out);
            break;
        case DecisionKind::SpreadNegative:
            status = spreadNegative(drop, cleaned, decision, out);
            break;
        case DecisionKind::FillMissing:
            status = fillMissing(drop, cleaned, decision, out);
            break;
        case DecisionKind::ResolveDuplicate:
            status = resolveDuplicate(drop, cleaned, decision, out);
            break;
        case DecisionKind::MergeCodes:
            status = mergeCodes(drop, cleaned, decision, out);
            break;
        case DecisionKind::Exclude:
            status = exclude(drop, cleaned, decision, out);
            break;
        case DecisionKind::Accept:
            status = accept(drop, cleaned, decision, out);
            break;
        case DecisionKind::Withdraw:
            status = withdraw(drop, cleaned, decision, out);
            break;
    }
    if (!status)
        return status.error();
    Effect effect = out.finish();
    if (auto s = checkKindRules(drop, cleaned, decision, effect); !s)
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

}  // namespace siftwave::detail
