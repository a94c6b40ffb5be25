// merge_codes: adds a variant code's cells into the canonical code (decision.h).
#include "ledger/effects/effect_support.h"

#include <algorithm>

namespace siftwave::ledger::detail {

namespace {

Status mergeCodes(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                  EffectBuilder& out) {
    auto v = findRegion(drop, dec.variant);
    if (!v)
        return v.error();
    auto c = findRegion(drop, dec.into);
    if (!c)
        return c.error();
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        for (std::int32_t d = 0; d < drop.periods(); ++d) {
            const CleanedCell& vc = cleaned.cell(m, *v, d);
            const CleanedCell& cc = cleaned.cell(m, *c, d);
            if (vc.state == CleanedState::Merged) {
                return cellError(ErrorCode::InvalidValue,
                                 "region '" + dec.variant + "' is already merged", dec.variant);
            }
            if (cc.state == CleanedState::Merged) {
                return cellError(ErrorCode::InvalidValue,
                                 "region '" + dec.into +
                                     "' was itself merged into another code; merge into that code",
                                 dec.into);
            }
            if (vc.hasValue()) {
                if (cc.state == CleanedState::Excluded) {
                    return cellError(ErrorCode::InvalidValue,
                                     "the " + unit(drop) + " is excluded in '" + dec.into +
                                         "'; exclude the variant's " + unit(drop) +
                                         " too or withdraw the exclusion",
                                     dec.into, drop.periodStart(d).iso());
                }
                out.set(m, *c, d, cc.hasValue() ? CleanedCell{cc.value + vc.value, cc.state} : vc);
            }
            out.set(m, *v, d, CleanedCell{0, CleanedState::Merged});
        }
        out.addScope(m, *c);
        out.addScope(m, *v);
    }
    return Ok{};
}

Status validate(const Decision& d) {
    if (d.variant.empty() || d.into.empty())
        return usageError("merge_codes needs a variant code and the code to merge it into");
    if (d.variant == d.into)
        return usageError("merge_codes needs two different codes");
    return Ok{};
}

/// The variant keeps no total and the code kept gains exactly the variant's.
Status checkMerge(const Cleaned&, const Decision& dec, const Effect& effect) {
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
    return Ok{};
}

bool marksInto(const Decision& d, const std::string& region, const std::string&) {
    return d.into == region;
}

// The days of this region and measure whose cells the entry changed.
std::optional<DayRange> changedDays(const LedgerEntry& entry, const std::string& region,
                                    const std::string& measure) {
    std::optional<DayRange> range;
    for (const CellChange& c : entry.effect.cells) {
        if (c.region != region || c.measure != measure)
            continue;
        if (!range)
            range = DayRange{c.date, c.date};
        range->first = std::min(range->first, c.date);
        range->last = std::max(range->last, c.date);
    }
    return range;
}

std::optional<KindMark> mark(const MarkContext& c) {
    KindMark m;
    m.at = changedDays(c.entry, c.region, c.measure).value_or(c.calendar);
    m.count = c.change;
    m.label = c.entry.decision.variant + " merged in (+" + c.count(c.change) + ")";
    return m;
}

constexpr DecisionFlag kFlags[] = {{"variant"}, {"into"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Variant, DecisionParam::Into};

}  // namespace

extern const DecisionKindInfo kMergeCodesKind = {
    .kind = DecisionKind::MergeCodes,
    .name = "merge_codes",
    .help = "--variant CODE --into CODE   (all measures; e.g. 412 into 0412)\n",
    .flags = kFlags,
    .measureFromDrop = false,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesNever,
    .effect = mergeCodes,
    .checkEffect = checkMerge,
    .marksSeries = marksInto,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
