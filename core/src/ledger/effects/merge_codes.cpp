// merge_codes: adds a variant code's cells into the canonical code (decision.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::detail {

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

}  // namespace siftwave::detail
