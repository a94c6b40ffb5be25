// accept: keeps the data as reported; changes no cell (decision.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::ledger::detail {

namespace {

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

Status validate(const Decision& d) {
    return needRegion(d);
}

std::optional<KindMark> mark(const MarkContext& c) {
    KindMark m;
    m.at = c.entry.decision.window.value_or(c.calendar);
    m.label = "accepted as reported";
    return m;
}

constexpr DecisionFlag kFlags[] = {{"region"}, {"measure"}, {"days"}, {"periods"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Region, DecisionParam::Measure,
                                         DecisionParam::Window};

}  // namespace

extern const DecisionKindInfo kAcceptKind = {
    .kind = DecisionKind::Accept,
    .name = "accept",
    .help =
        "--region CODE [--measure NAME] [--days FIRST:LAST]\n"
        "                     keeps the data as reported; records that it was looked at and why\n",
    .flags = kFlags,
    .measureFromDrop = false,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesAlways,
    .effect = accept,
    .checkEffect = nullptr,
    .marksSeries = coversSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
