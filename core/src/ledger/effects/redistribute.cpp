// redistribute: moves an excess from a dump day over earlier days (decision.h).
#include "ledger/effects/effect_support.h"
#include "ledger/effects/level_weights.h"

#include "siftwave/ledger/apportion.h"
#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

namespace siftwave::ledger::detail {

namespace {

/// Weights for the baseline method: the centred moving average of width `width`
/// (series/smoothing.h, partial windows at the ends) of the region's series, with
/// the dump day and the days without a value left out of every window (NaN).
/// The averages are quantised to 1e-6 of a count (llround) so that the largest
/// remainder step runs in exact integers; negative or missing averages weigh 0.
std::vector<std::int64_t> baselineWeights(const Cleaned& cleaned, std::size_t m, std::size_t r,
                                          DaySpan window, std::int32_t dumpDay, int width) {
    std::vector<double> series(static_cast<std::size_t>(cleaned.days()),
                               std::numeric_limits<double>::quiet_NaN());
    for (std::int32_t d = 0; d < cleaned.days(); ++d) {
        const CleanedCell& c = cleaned.cell(m, r, d);
        if (d != dumpDay && c.hasValue())
            series[static_cast<std::size_t>(d)] = static_cast<double>(c.value);
    }
    const std::vector<double> average = series::centredMovingAverage(series, width);
    std::vector<std::int64_t> weights;
    for (std::int32_t d = window.first; d <= window.last; ++d) {
        const double a = average[static_cast<std::size_t>(d)];
        weights.push_back(std::isfinite(a) && a > 0 ? std::llround(a * 1e6) : 0);
    }
    return weights;
}

Status redistribute(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                    EffectBuilder& out) {
    auto at = locate(drop, dec.measure, dec.region, *dec.date);
    if (!at)
        return at.error();
    const auto [m, r, dump] = *at;
    auto window = findDays(drop, *dec.window, dec.region);
    if (!window)
        return window.error();
    if (window->last >= dump) {
        // Dates before the dump date may still fall in its week.
        return cellError(ErrorCode::InvalidValue,
                         "the redistribution window must end before the " + unit(drop) +
                             " it takes the excess from",
                         dec.region, dec.window->iso());
    }
    const CleanedCell& from = cleaned.cell(m, r, dump);
    if (auto s = requireWritable(drop, from, r, dump); !s)
        return s;
    if (!from.hasValue()) {
        return cellError(ErrorCode::InvalidValue,
                         "the " + unit(drop) + " has no value to take an excess from", dec.region,
                         dec.date->iso());
    }
    if (from.value < dec.excess) {
        return cellError(ErrorCode::Conservation,
                         "the " + unit(drop) + " holds " + std::to_string(from.value) +
                             ", less than the excess of " + std::to_string(dec.excess) +
                             "; moving it would make the " + unit(drop) + " negative",
                         dec.region, dec.date->iso());
    }
    std::vector<std::int64_t> weights;
    for (std::int32_t d = window->first; d <= window->last; ++d) {
        const CleanedCell& c = cleaned.cell(m, r, d);
        if (auto s = requireWritable(drop, c, r, d); !s)
            return s;
        switch (dec.redistributeMethod) {
            case RedistributeMethod::Uniform:
                weights.push_back(1);
                break;
            case RedistributeMethod::Proportional:
                weights.push_back(c.hasValue() ? std::max<std::int64_t>(0, c.value) : 0);
                break;
            case RedistributeMethod::Baseline:
            case RedistributeMethod::Level:
                break;
        }
    }
    if (dec.redistributeMethod == RedistributeMethod::Baseline)
        weights = baselineWeights(cleaned, m, r, *window, dump, dec.baselineWidth);
    if (dec.redistributeMethod == RedistributeMethod::Level)
        weights = levelWeights(drop, cleaned, m, r, *window, dump, dec.baselineWidth);
    auto parts = apportionLargestRemainder(dec.excess, weights);
    if (!parts) {
        return cellError(ErrorCode::InvalidValue,
                         std::string("the window has no counts to weight a ") +
                             redistributeMethodName(dec.redistributeMethod) +
                             " redistribution by; use the uniform method or another window",
                         dec.region, dec.window->iso());
    }
    for (std::int32_t d = window->first; d <= window->last; ++d) {
        const std::int64_t part = (*parts)[static_cast<std::size_t>(d - window->first)];
        out.set(m, r, d, withAdded(cleaned.cell(m, r, d), part));
    }
    out.set(m, r, dump, CleanedCell{from.value - dec.excess, from.state});
    out.addScope(m, r);
    return Ok{};
}

Status validate(const Decision& d) {
    if (auto s = firstFailure({needRegion(d), needMeasure(d), needDate(d), needWindow(d)}); !s)
        return s;
    if (d.excess <= 0)
        return usageError("redistribute needs an excess greater than 0");
    if (d.window->last >= *d.date) {
        return usageError(
            "the redistribution window must end before the day it takes the excess from");
    }
    if (d.baselineWidth < 3 || d.baselineWidth > 21 || d.baselineWidth % 2 == 0)
        return usageError("the baseline width must be an odd number of periods from 3 to 21");
    return Ok{};
}

std::optional<KindMark> mark(const MarkContext& c) {
    const Decision& d = c.entry.decision;
    KindMark m;
    m.at = DayRange{*d.date, *d.date};
    m.window = d.window;
    m.count = d.excess;
    m.label = c.count(d.excess) + " moved to earlier " + c.axis.unitPlural();
    return m;
}

constexpr DecisionFlag kFlags[] = {{"region"},
                                   {"measure"},
                                   {"date"},
                                   {"window"},
                                   {"method", "--method"},
                                   {"excess", "--excess N or --excess auto"},
                                   {"baseline-width"}};
constexpr DecisionParam kParameters[] = {
    DecisionParam::Region,       DecisionParam::Measure, DecisionParam::Date,
    DecisionParam::Window,       DecisionParam::Excess,  DecisionParam::RedistributeMethod,
    DecisionParam::BaselineWidth};

}  // namespace

extern const DecisionKindInfo kRedistributeKind = {
    .kind = DecisionKind::Redistribute,
    .name = "redistribute",
    .help =
        "--region CODE --measure NAME --date DAY --excess N|auto\n"
        "                     --window FIRST:LAST --method uniform|proportional|baseline|level\n"
        "                     [--baseline-width N]\n"
        "                     moves N counts from DAY over the earlier days FIRST..LAST (largest\n"
        "                     remainder method); level weights each day by its expected level\n"
        "                     (the trend from the N days before the window to the N after DAY);\n"
        "                     auto takes the excess the scan estimates for DAY\n"
        "                     and, without --window, the window it suggests\n",
    .flags = kFlags,
    .measureFromDrop = true,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesAlways,
    .effect = redistribute,
    .checkEffect = noNewNegatives,
    .marksSeries = namesSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
