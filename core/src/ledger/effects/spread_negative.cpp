// spread_negative: sets a negative correction to 0 and takes it from the earlier days (decision.h).
#include "ledger/effects/effect_support.h"

#include "siftwave/ledger/apportion.h"

#include <algorithm>
#include <vector>

namespace siftwave::ledger::detail {

namespace {

Status spreadNegative(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                      EffectBuilder& out) {
    auto at = locate(drop, dec.measure, dec.region, *dec.date);
    if (!at)
        return at.error();
    const auto [m, r, day] = *at;
    const CleanedCell& negative = cleaned.cell(m, r, day);
    if (auto s = requireWritable(drop, negative, r, day); !s)
        return s;
    if (!negative.hasValue() || negative.value >= 0) {
        return cellError(ErrorCode::InvalidValue,
                         "the " + unit(drop) + " holds no negative value to spread", dec.region,
                         dec.date->iso());
    }
    DaySpan window{0, day - 1};
    if (dec.window) {
        auto w = findDays(drop, *dec.window, dec.region);
        if (!w)
            return w.error();
        window = *w;
        if (window.last >= day) {
            // Dates before the correction's date may still fall in its week.
            return cellError(
                ErrorCode::InvalidValue,
                "the " + units(drop) + " absorbing a negative correction must come before it",
                dec.region, dec.window->iso());
        }
    }
    if (window.last < window.first) {
        return cellError(ErrorCode::Conservation,
                         "there are no earlier " + units(drop) + " to absorb the correction",
                         dec.region, dec.date->iso());
    }
    std::vector<std::int64_t> weights;
    std::int64_t available = 0;
    for (std::int32_t d = window.first; d <= window.last; ++d) {
        const CleanedCell& c = cleaned.cell(m, r, d);
        const std::int64_t w = c.hasValue() ? std::max<std::int64_t>(0, c.value) : 0;
        weights.push_back(w);
        available += w;
    }
    const std::int64_t amount = -negative.value;
    if (available < amount) {
        return cellError(ErrorCode::Conservation,
                         "the earlier " + units(drop) + " hold " + std::to_string(available) +
                             ", less than the correction of " + std::to_string(negative.value) +
                             "; spreading it would make " + units(drop) + " negative",
                         dec.region, dec.date->iso());
    }
    auto parts = apportionLargestRemainder(amount, weights);
    if (!parts)
        return parts.error();
    for (std::int32_t d = window.first; d <= window.last; ++d) {
        const std::int64_t part = (*parts)[static_cast<std::size_t>(d - window.first)];
        if (part > 0)
            out.set(m, r, d, withAdded(cleaned.cell(m, r, d), -part));
    }
    out.set(m, r, day, CleanedCell{0, negative.state});
    out.addScope(m, r);
    return Ok{};
}

Status validate(const Decision& d) {
    if (auto s = firstFailure({needRegion(d), needMeasure(d), needDate(d)}); !s)
        return s;
    if (d.window && d.window->last >= *d.date)
        return usageError("the days absorbing a negative correction must come before it");
    return Ok{};
}

std::optional<KindMark> mark(const MarkContext& c) {
    const Decision& d = c.entry.decision;
    std::int64_t negative = 0;
    for (const CellChange& cell : c.entry.effect.cells)
        if (cell.region == c.region && cell.measure == c.measure && cell.date == *d.date)
            negative = cell.before.value;
    KindMark m;
    m.at = DayRange{*d.date, *d.date};
    m.count = -negative;
    m.label = "negative " + c.count(negative) + " spread back";
    return m;
}

constexpr DecisionFlag kFlags[] = {{"region"}, {"measure"}, {"date"}, {"window"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Region, DecisionParam::Measure,
                                         DecisionParam::Date, DecisionParam::Window};

}  // namespace

extern const DecisionKindInfo kSpreadNegativeKind = {
    .kind = DecisionKind::SpreadNegative,
    .name = "spread_negative",
    .help =
        "--region CODE --measure NAME --date DAY [--window FIRST:LAST]\n"
        "                     sets the negative value on DAY to 0 and takes it from the earlier\n"
        "                     days (default: all of them) in proportion to their counts\n",
    .flags = kFlags,
    .measureFromDrop = true,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesAlways,
    .effect = spreadNegative,
    .checkEffect = noNewNegatives,
    .marksSeries = namesSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
