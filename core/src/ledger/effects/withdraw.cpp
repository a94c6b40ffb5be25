// withdraw: undoes an entry, or redoes it when the entry undone is a withdrawal (decision.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::detail {

/// The non-withdraw entry a withdrawal of `target` toggles, and whether it ends up in effect.
std::pair<std::uint64_t, bool> withdrawalBase(const Cleaned& cleaned, std::uint64_t target) {
    std::uint64_t cur = target;
    bool state = false;
    while (Access::kindOf(cleaned, cur) == DecisionKind::Withdraw) {
        cur = Access::targetOf(cleaned, cur);
        state = !state;
    }
    return {cur, state};
}

Status withdraw(const Drop& drop, const Cleaned& cleaned, const Decision& dec, EffectBuilder& out) {
    const std::string id = std::to_string(dec.target);
    if (dec.target > cleaned.entryCount())
        return makeError(ErrorCode::NotFound, "there is no entry " + id);
    if (!cleaned.inEffect(dec.target)) {
        return makeError(ErrorCode::InvalidValue, "entry " + id + " is already withdrawn");
    }
    const auto [base, restore] = withdrawalBase(cleaned, dec.target);
    const Effect& effect = Access::effectOf(cleaned, base);
    for (const CellChange& change : effect.cells) {
        auto at = locate(drop, change.measure, change.region, change.date);
        if (!at)
            return at.error();
        const std::size_t key = Access::cellIndex(cleaned, at->measure, at->region, at->day);
        const auto* writers = Access::writersIfAny(cleaned, key);
        const CleanedCell& now = cleaned.cell(at->measure, at->region, at->day);
        if (!restore) {
            if (!writers || writers->empty() || writers->back() != base) {
                const std::string later =
                    writers && !writers->empty() ? std::to_string(writers->back()) : "?";
                return cellError(
                    ErrorCode::InvalidValue,
                    "entry " + std::to_string(base) + " cannot be withdrawn: entry " + later +
                        " changed the same cells later and is still in effect; withdraw entry " +
                        later + " first",
                    change.region, change.date.iso());
            }
            out.set(at->measure, at->region, at->day, change.before);
        } else {
            if ((writers && !writers->empty() && writers->back() > base) || now != change.before) {
                return cellError(
                    ErrorCode::InvalidValue,
                    "entry " + std::to_string(base) +
                        " cannot be restored: its cells were changed since it was withdrawn",
                    change.region, change.date.iso());
            }
            out.set(at->measure, at->region, at->day, change.after);
        }
    }
    for (const TotalChange& t : effect.totals) {
        auto series = findSeries(drop, t.measure, t.region);
        if (!series)
            return series.error();
        out.addScope(series->measure, series->region);
    }
    return Ok{};
}

}  // namespace siftwave::detail
