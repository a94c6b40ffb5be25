// exclude: leaves cells out of the cleaned data (decision.h).
#include "ledger/effects/effect_support.h"

#include <numeric>
#include <vector>

namespace siftwave::ledger::detail {

namespace {

Status exclude(const Drop& drop, const Cleaned& cleaned, const Decision& dec, EffectBuilder& out) {
    std::vector<std::size_t> regions;
    if (dec.region.empty()) {
        regions.resize(drop.regionCodes.size());
        std::iota(regions.begin(), regions.end(), std::size_t{0});
    } else {
        auto r = findRegion(drop, dec.region);
        if (!r)
            return r.error();
        regions.push_back(*r);
    }
    std::vector<std::size_t> measures;
    if (dec.measure.empty()) {
        measures.resize(drop.measures.size());
        std::iota(measures.begin(), measures.end(), std::size_t{0});
    } else {
        auto m = findMeasure(drop, dec.measure);
        if (!m)
            return m.error();
        measures.push_back(*m);
    }
    DaySpan days{0, drop.periods() - 1};
    if (dec.window) {
        auto w = findDays(drop, *dec.window, dec.region);
        if (!w)
            return w.error();
        days = *w;
    }
    for (std::size_t m : measures) {
        for (std::size_t r : regions) {
            bool any = false;
            for (std::int32_t d = days.first; d <= days.last; ++d) {
                const CleanedCell& c = cleaned.cell(m, r, d);
                if (c.state == CleanedState::Excluded || c.state == CleanedState::Merged)
                    continue;
                out.set(m, r, d, CleanedCell{0, CleanedState::Excluded});
                any = true;
            }
            if (any || !dec.region.empty())
                out.addScope(m, r);
        }
    }
    if (out.empty())
        return makeError(ErrorCode::InvalidValue,
                         "every one of these cells is already excluded or merged");
    return Ok{};
}

Status validate(const Decision& d) {
    if (d.region.empty() && !d.window)
        return usageError("exclude needs a region, a window of days, or both");
    return Ok{};
}

// Left-out cells are shaded, not marked.
std::optional<KindMark> mark(const MarkContext& c) {
    KindMark m;
    m.shaded = true;
    m.at = c.entry.decision.window.value_or(c.calendar);
    m.count = -c.change;
    m.label = "excluded (" + c.count(-c.change) + ")";
    return m;
}

constexpr DecisionFlag kFlags[] = {{"region"}, {"measure"}, {"days"}, {"periods"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Region, DecisionParam::Measure,
                                         DecisionParam::Window};

}  // namespace

extern const DecisionKindInfo kExcludeKind = {
    .kind = DecisionKind::Exclude,
    .name = "exclude",
    .help =
        "[--region CODE] [--measure NAME] [--days FIRST:LAST]\n"
        "                     leaves cells out (a region, a day range, or both); the total drops\n"
        "                     by their sum\n",
    .flags = kFlags,
    .measureFromDrop = false,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesNever,
    .effect = exclude,
    .checkEffect = nullptr,
    .marksSeries = coversSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
