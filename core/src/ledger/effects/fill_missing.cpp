// fill_missing: fills the days of a gap by zero, linear interpolation or a share of the catch-up
// (decision.h).
#include "ledger/effects/effect_support.h"

#include "siftwave/ledger/apportion.h"

#include <vector>

namespace siftwave::ledger::detail {

namespace {

std::int64_t floorDiv(std::int64_t a, std::int64_t b) {
    std::int64_t q = a / b;
    if ((a % b != 0) && ((a < 0) != (b < 0)))
        --q;
    return q;
}

Status fillMissing(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                   EffectBuilder& out) {
    auto series = findSeries(drop, dec.measure, dec.region);
    if (!series)
        return series.error();
    const auto [m, r] = *series;
    auto gap = findDays(drop, *dec.window, dec.region);
    if (!gap)
        return gap.error();
    for (std::int32_t d = gap->first; d <= gap->last; ++d) {
        const CleanedCell& c = cleaned.cell(m, r, d);
        if (auto s = requireWritable(drop, c, r, d); !s)
            return s;
        if (c.hasValue()) {
            return cellError(ErrorCode::InvalidValue,
                             "the " + unit(drop) + " already has a value; fill only " +
                                 units(drop) + " without one",
                             dec.region, drop.periodStart(d).iso());
        }
    }
    const std::int64_t n = gap->last - gap->first + 1;
    // Copies for the lambda: C++20 lets a lambda capture structured bindings, clang 14 does not.
    auto neighbour = [&, m = m, r = r](std::int32_t d, const char* side) -> Result<std::int64_t> {
        if (d < 0 || d >= drop.periods() || !cleaned.cell(m, r, d).hasValue()) {
            return cellError(ErrorCode::InvalidValue,
                             std::string(fillMethodName(dec.fillMethod)) +
                                 " filling needs a value on the " + unit(drop) + " " + side +
                                 " the gap",
                             dec.region, dec.window->iso());
        }
        return cleaned.cell(m, r, d).value;
    };
    switch (dec.fillMethod) {
        case FillMethod::Zero:
            for (std::int32_t d = gap->first; d <= gap->last; ++d)
                out.set(m, r, d, {0, CleanedState::Filled});
            break;
        case FillMethod::Linear: {
            auto a = neighbour(gap->first - 1, "before");
            if (!a)
                return a.error();
            auto b = neighbour(gap->last + 1, "after");
            if (!b)
                return b.error();
            // value_k = round((a (n+1-k) + b k) / (n+1)), halves rounded up.
            for (std::int64_t k = 1; k <= n; ++k) {
                const std::int64_t num = *a * (n + 1 - k) + *b * k;
                const std::int64_t value = floorDiv(2 * num + (n + 1), 2 * (n + 1));
                out.set(m, r, gap->first + static_cast<std::int32_t>(k) - 1,
                        {value, CleanedState::Filled});
            }
            break;
        }
        case FillMethod::Share: {
            auto next = neighbour(gap->last + 1, "after");
            if (!next)
                return next.error();
            if (*next < 0) {
                return cellError(
                    ErrorCode::InvalidValue,
                    "the catch-up " + unit(drop) + " after the gap is negative; spread it first",
                    dec.region, drop.periodStart(gap->last + 1).iso());
            }
            std::vector<std::int64_t> ones(static_cast<std::size_t>(n + 1), 1);
            auto parts = apportionLargestRemainder(*next, ones);
            if (!parts)
                return parts.error();
            for (std::int64_t k = 0; k < n; ++k) {
                out.set(m, r, gap->first + static_cast<std::int32_t>(k),
                        {(*parts)[static_cast<std::size_t>(k)], CleanedState::Filled});
            }
            const CleanedCell& nextCell = cleaned.cell(m, r, gap->last + 1);
            out.set(m, r, gap->last + 1, {parts->back(), nextCell.state});
            break;
        }
    }
    out.addScope(m, r);
    return Ok{};
}

Status validate(const Decision& d) {
    return firstFailure({needRegion(d), needMeasure(d), needWindow(d)});
}

// zero writes 0 where no value was: the total cannot change.
bool conserves(const Decision& d) {
    return d.fillMethod == FillMethod::Share || d.fillMethod == FillMethod::Zero;
}

std::optional<KindMark> mark(const MarkContext& c) {
    const Decision& d = c.entry.decision;
    KindMark m;
    m.at = *d.window;
    m.count = c.change;
    // The periods the window covers (a date anywhere in a week selects it).
    const int periods =
        c.axis.periodOnGrid(d.window->last) - c.axis.periodOnGrid(d.window->first) + 1;
    m.label = std::to_string(periods) + " " +
              (periods == 1 ? c.axis.unitName() : c.axis.unitPlural()) + " filled (" +
              c.count(c.change) + ")";
    return m;
}

constexpr DecisionFlag kFlags[] = {
    {"region"}, {"measure"}, {"days"}, {"periods"}, {"method", "--method"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Region, DecisionParam::Measure,
                                         DecisionParam::Window, DecisionParam::FillMethod};

}  // namespace

extern const DecisionKindInfo kFillMissingKind = {
    .kind = DecisionKind::FillMissing,
    .name = "fill_missing",
    .help =
        "--region CODE --measure NAME --days FIRST:LAST --method zero|linear|share\n"
        "                     fills days without a value; share splits the next day's catch-up\n"
        "                     value over the gap and itself (total kept), zero and linear state\n"
        "                     their change\n",
    .flags = kFlags,
    .measureFromDrop = true,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conserves,
    .effect = fillMissing,
    .checkEffect = noNewNegatives,
    .marksSeries = namesSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
