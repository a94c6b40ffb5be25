// withdraw: undoes an entry, or redoes it when the entry undone is a withdrawal (decision.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::ledger::detail {

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

namespace {

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

Status validate(const Decision& d) {
    if (d.target == 0)
        return usageError("withdraw needs the id of the entry to undo");
    return Ok{};
}

/// Every total moves back (or forth again) by exactly the change of the entry toggled.
Status checkWithdrawal(const Cleaned& cleaned, const Decision& dec, const Effect& effect) {
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
    return Ok{};
}

// A withdrawal shows as the entry it undoes disappearing from the figure.
bool marksNothing(const Decision&, const std::string&, const std::string&) {
    return false;
}

std::optional<KindMark> mark(const MarkContext&) {
    return std::nullopt;
}

constexpr DecisionFlag kFlags[] = {{"entry"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Entry};

}  // namespace

extern const DecisionKindInfo kWithdrawKind = {
    .kind = DecisionKind::Withdraw,
    .name = "withdraw",
    .help = "--entry N   undoes entry N (withdrawing a withdrawal redoes it)\n",
    .flags = kFlags,
    .measureFromDrop = false,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesNever,
    .effect = withdraw,
    .checkEffect = checkWithdrawal,
    .marksSeries = marksNothing,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
