// accept: keeps the data as reported; changes no cell (decision.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::detail {

Status accept(const Drop& drop, const Cleaned&, const Decision& dec, EffectBuilder& out) {
    auto r = findRegion(drop, dec.region);
    if (!r)
        return r.error();
    if (dec.window) {
        auto w = findDays(drop, *dec.window, dec.region);
        if (!w)
            return w.error();
    }
    if (dec.measure.empty()) {
        for (std::size_t m = 0; m < drop.measures.size(); ++m)
            out.addScope(m, *r);
    } else {
        auto m = findMeasure(drop, dec.measure);
        if (!m)
            return m.error();
        out.addScope(*m, *r);
    }
    return Ok{};
}

}  // namespace siftwave::detail
