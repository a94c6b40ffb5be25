#include "ledger/effects.h"

#include "ledger/cleaned_access.h"
#include "siftwave/ledger/apportion.h"
#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <numeric>
#include <set>
#include <utility>

namespace siftwave::detail {

namespace {

using Access = Cleaned::Access;

Error cellError(ErrorCode code, std::string message, const std::string& region = {},
                std::string date = {}) {
    Error e = makeError(code, std::move(message));
    e.region = region;
    e.date = std::move(date);
    return e;
}

/// "day" or "week": what the drop's periods are, for messages.
std::string unit(const Drop& drop) {
    return drop.axis.unitName();
}
std::string units(const Drop& drop) {
    return drop.axis.unitPlural();
}

struct CellKey {
    std::size_t measure;
    std::size_t region;
    std::int32_t day;
};

/// Collects cell changes in (measure, region, day) order and the scope of totals.
class EffectBuilder {
public:
    EffectBuilder(const Drop& drop, const Cleaned& cleaned) : m_drop(drop), m_cleaned(cleaned) {}

    const CleanedCell& current(std::size_t m, std::size_t r, std::int32_t d) const {
        auto it = m_changes.find(Access::cellIndex(m_cleaned, m, r, d));
        return it == m_changes.end() ? m_cleaned.cell(m, r, d) : it->second.second;
    }
    void set(std::size_t m, std::size_t r, std::int32_t d, CleanedCell after) {
        const std::size_t key = Access::cellIndex(m_cleaned, m, r, d);
        auto it = m_changes.find(key);
        if (it == m_changes.end()) {
            if (after == m_cleaned.cell(m, r, d))
                return;
            m_changes.emplace(key, std::make_pair(CellKey{m, r, d}, after));
        } else {
            it->second.second = after;
        }
        m_scope.insert({m, r});
    }
    void addScope(std::size_t m, std::size_t r) { m_scope.insert({m, r}); }
    bool empty() const { return m_changes.empty(); }

    Effect finish() const {
        Effect effect;
        std::map<std::pair<std::size_t, std::size_t>, std::int64_t> deltas;
        for (const auto& [key, change] : m_changes) {
            const CellKey& k = change.first;
            const CleanedCell& before = m_cleaned.cell(k.measure, k.region, k.day);
            const CleanedCell& after = change.second;
            if (before == after)
                continue;
            effect.cells.push_back(CellChange{m_drop.measures[k.measure],
                                              m_drop.regionCodes[k.region],
                                              m_drop.periodStart(k.day), before, after});
            deltas[{k.measure, k.region}] += after.counted() - before.counted();
        }
        for (const auto& [m, r] : m_scope) {
            const std::int64_t before = m_cleaned.total(m, r);
            auto it = deltas.find({m, r});
            const std::int64_t after = before + (it == deltas.end() ? 0 : it->second);
            effect.totals.push_back(
                TotalChange{m_drop.measures[m], m_drop.regionCodes[r], before, after});
        }
        return effect;
    }

private:
    const Drop& m_drop;
    const Cleaned& m_cleaned;
    std::map<std::size_t, std::pair<CellKey, CleanedCell>>
        m_changes;  // cell index orders by (m, r, d)
    std::set<std::pair<std::size_t, std::size_t>> m_scope;
};

Result<std::size_t> findRegion(const Drop& drop, const std::string& code) {
    auto r = drop.regionIndex(code);
    if (!r)
        return cellError(ErrorCode::NotFound, "region '" + code + "' is not in the drop", code);
    return *r;
}

Result<std::size_t> findMeasure(const Drop& drop, const std::string& name) {
    auto m = drop.measureIndex(name);
    if (!m)
        return makeError(ErrorCode::NotFound, "measure '" + name + "' is not in the drop");
    return *m;
}

/// The period that holds `date` (any day of a week selects that week).
Result<std::int32_t> findDay(const Drop& drop, Date date, const std::string& region) {
    auto d = drop.periodOf(date);
    if (!d) {
        return cellError(ErrorCode::NotFound,
                         unit(drop) + " " + date.iso() + " is outside the drop's calendar (" +
                             drop.axis.first().iso() + " to " + drop.axis.lastEnd().iso() + ")",
                         region, date.iso());
    }
    return *d;
}

/// The (measure, region) series a decision or a recorded change names.
struct SeriesAt {
    std::size_t measure;
    std::size_t region;
};

Result<SeriesAt> findSeries(const Drop& drop, const std::string& measure,
                            const std::string& region) {
    auto r = findRegion(drop, region);
    if (!r)
        return r.error();
    auto m = findMeasure(drop, measure);
    if (!m)
        return m.error();
    return SeriesAt{*m, *r};
}

struct CellAt {
    std::size_t measure;
    std::size_t region;
    std::int32_t day;
};

Result<CellAt> locate(const Drop& drop, const std::string& measure, const std::string& region,
                      Date date) {
    auto series = findSeries(drop, measure, region);
    if (!series)
        return series.error();
    auto d = findDay(drop, date, region);
    if (!d)
        return d.error();
    return CellAt{series->measure, series->region, *d};
}

struct DaySpan {
    std::int32_t first = 0;
    std::int32_t last = -1;
};

/// The periods a range of dates selects: from the period holding its first date to the
/// one holding its last.
Result<DaySpan> findDays(const Drop& drop, const DayRange& range, const std::string& region) {
    auto first = findDay(drop, range.first, region);
    if (!first)
        return first.error();
    auto last = findDay(drop, range.last, region);
    if (!last)
        return last.error();
    return DaySpan{*first, *last};
}

/// Refuses cells that a decision may not write over: excluded or merged ones.
Status requireWritable(const Drop& drop, const CleanedCell& cell, std::size_t r, std::int32_t d) {
    if (cell.state == CleanedState::Excluded) {
        return cellError(ErrorCode::InvalidValue,
                         "the " + unit(drop) + " is excluded; withdraw the exclusion first",
                         drop.regionCodes[r], drop.periodStart(d).iso());
    }
    if (cell.state == CleanedState::Merged) {
        return cellError(ErrorCode::InvalidValue,
                         "the region was merged into another code; decide on that code",
                         drop.regionCodes[r], drop.periodStart(d).iso());
    }
    return Ok{};
}

CleanedCell withAdded(const CleanedCell& cell, std::int64_t amount) {
    if (amount == 0)
        return cell;
    if (cell.hasValue())
        return CleanedCell{cell.value + amount, cell.state};
    return CleanedCell{amount, CleanedState::Filled};
}

std::int64_t floorDiv(std::int64_t a, std::int64_t b) {
    std::int64_t q = a / b;
    if ((a % b != 0) && ((a < 0) != (b < 0)))
        --q;
    return q;
}

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
                break;
        }
    }
    if (dec.redistributeMethod == RedistributeMethod::Baseline) {
        weights = baselineWeights(cleaned, m, r, *window, dump, dec.baselineWidth);
    }
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

CleanedCell cleanedFromRaw(const Cell& raw) {
    return CleanedCell{raw.reported() ? raw.value : 0, cleanedStateOf(raw.state)};
}

Status resolveDuplicate(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                        EffectBuilder& out) {
    auto at = locate(drop, dec.measure, dec.region, *dec.date);
    if (!at)
        return at.error();
    const auto [m, r, day] = *at;
    std::vector<Cell> occurrences{drop.cell(m, r, day)};
    for (const DuplicateRow& dup : drop.duplicates) {
        if (dup.measure == m && dup.region == r && dup.day == day)
            occurrences.push_back(dup.cell);
    }
    if (occurrences.size() < 2) {
        return cellError(ErrorCode::NotFound,
                         "the drop has no duplicate rows for this " + unit(drop), dec.region,
                         dec.date->iso());
    }
    if (cleaned.cell(m, r, day) != cleanedFromRaw(occurrences.front()) ||
        !cleaned.touchedBy(m, r, day).empty()) {
        return cellError(ErrorCode::InvalidValue,
                         "an earlier entry changed this " + unit(drop) +
                             "; resolve duplicates before other decisions on it",
                         dec.region, dec.date->iso());
    }
    CleanedCell after = cleanedFromRaw(occurrences.front());
    switch (dec.duplicateRule) {
        case DuplicateRule::First:
            break;
        case DuplicateRule::Last:
            after = cleanedFromRaw(occurrences.back());
            break;
        case DuplicateRule::Sum:
        case DuplicateRule::Max: {
            bool any = false;
            std::int64_t acc = 0;
            for (const Cell& c : occurrences) {
                if (!c.reported())
                    continue;
                if (dec.duplicateRule == DuplicateRule::Sum) {
                    acc += c.value;
                } else {
                    acc = any ? std::max<std::int64_t>(acc, c.value) : c.value;
                }
                any = true;
            }
            if (any)
                after = CleanedCell{acc, CleanedState::Reported};
            break;
        }
    }
    out.set(m, r, day, after);
    out.addScope(m, r);
    return Ok{};
}

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

Status accept(const Drop& drop, const Decision& dec, EffectBuilder& out) {
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

/// The conservation rules of each kind, checked on the finished effect.
Status checkKindRules(const Drop& drop, const Cleaned& cleaned, const Decision& dec,
                      const Effect& effect) {
    if (dec.kind == DecisionKind::Redistribute || dec.kind == DecisionKind::SpreadNegative ||
        dec.kind == DecisionKind::FillMissing) {
        for (const CellChange& c : effect.cells) {
            if (c.after.hasValue() && c.after.value < 0 && c.after.value < c.before.counted()) {
                return cellError(ErrorCode::Conservation,
                                 "the decision would make a count negative", c.region,
                                 c.date.iso());
            }
        }
    }
    if (decisionConservesTotals(dec)) {
        for (const TotalChange& t : effect.totals) {
            if (t.before != t.after) {
                return cellError(ErrorCode::Conservation,
                                 "the decision would change the total of " + t.measure + " from " +
                                     std::to_string(t.before) + " to " + std::to_string(t.after),
                                 t.region);
            }
        }
    }
    if (dec.kind == DecisionKind::MergeCodes) {
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
    }
    if (dec.kind == DecisionKind::Withdraw) {
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
    }
    (void)drop;
    return Ok{};
}

}  // namespace

Result<Effect> deriveEffect(const Drop& drop, const Cleaned& cleaned, const Decision& decision) {
    if (auto s = decision.validate(); !s)
        return s.error();
    if (cleaned.measureCount() != drop.measures.size() ||
        cleaned.regionCount() != drop.regionCodes.size() || cleaned.days() != drop.periods()) {
        return makeError(ErrorCode::Usage, "the cleaned data does not belong to this drop");
    }
    EffectBuilder out(drop, cleaned);
    Status status = Ok{};
    switch (decision.kind) {
        case DecisionKind::Redistribute:
            status = redistribute(drop, cleaned, decision, out);
            break;
        case DecisionKind::SpreadNegative:
            status = spreadNegative(drop, cleaned, decision, out);
            break;
        case DecisionKind::FillMissing:
            status = fillMissing(drop, cleaned, decision, out);
            break;
        case DecisionKind::ResolveDuplicate:
            status = resolveDuplicate(drop, cleaned, decision, out);
            break;
        case DecisionKind::MergeCodes:
            status = mergeCodes(drop, cleaned, decision, out);
            break;
        case DecisionKind::Exclude:
            status = exclude(drop, cleaned, decision, out);
            break;
        case DecisionKind::Accept:
            status = accept(drop, decision, out);
            break;
        case DecisionKind::Withdraw:
            status = withdraw(drop, cleaned, decision, out);
            break;
    }
    if (!status)
        return status.error();
    Effect effect = out.finish();
    if (auto s = checkKindRules(drop, cleaned, decision, effect); !s)
        return s.error();
    return effect;
}

Status applyEffect(const Drop& drop, Cleaned& cleaned, const Decision& decision,
                   const Effect& effect) {
    const std::uint64_t sequence = cleaned.entryCount() + 1;
    std::uint64_t base = 0;
    bool restore = false;
    if (decision.kind == DecisionKind::Withdraw)
        std::tie(base, restore) = withdrawalBase(cleaned, decision.target);
    for (const CellChange& change : effect.cells) {
        auto at = locate(drop, change.measure, change.region, change.date);
        if (!at)
            return at.error();
        CleanedCell& cell = Access::cell(cleaned, at->measure, at->region, at->day);
        Access::total(cleaned, at->measure, at->region) += change.after.counted() - cell.counted();
        cell = change.after;
        const std::size_t key = Access::cellIndex(cleaned, at->measure, at->region, at->day);
        Access::touches(cleaned, key).push_back(sequence);
        auto& writers = Access::writers(cleaned, key);
        if (decision.kind != DecisionKind::Withdraw) {
            writers.push_back(sequence);
        } else if (restore) {
            writers.push_back(base);
        } else if (!writers.empty() && writers.back() == base) {
            writers.pop_back();
        }
    }
    if (decision.kind == DecisionKind::Withdraw) {
        std::uint64_t cur = decision.target;
        bool state = false;
        while (true) {
            Access::setInEffect(cleaned, cur, state);
            if (Access::kindOf(cleaned, cur) != DecisionKind::Withdraw)
                break;
            cur = Access::targetOf(cleaned, cur);
            state = !state;
        }
    }
    Access::pushEntry(cleaned, decision.kind, decision.target, effect);
    return Ok{};
}

}  // namespace siftwave::detail
