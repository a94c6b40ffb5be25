// The helpers every decision kind's effect shares (see effect_support.h).
#include "ledger/effects/effect_support.h"

namespace siftwave::ledger::detail {

Error cellError(ErrorCode code, std::string message, const std::string& region, std::string date) {
    Error e = makeError(code, std::move(message));
    e.region = region;
    e.date = std::move(date);
    return e;
}

std::string unit(const Drop& drop) {
    return drop.axis.unitName();
}
std::string units(const Drop& drop) {
    return drop.axis.unitPlural();
}

Effect EffectBuilder::finish() const {
    Effect effect;
    std::map<std::pair<std::size_t, std::size_t>, std::int64_t> deltas;
    for (const auto& [key, change] : m_changes) {
        const CellKey& k = change.first;
        const CleanedCell& before = m_cleaned.cell(k.measure, k.region, k.day);
        const CleanedCell& after = change.second;
        if (before == after)
            continue;
        effect.cells.push_back(CellChange{m_drop.measures[k.measure], m_drop.regionCodes[k.region],
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

Result<DaySpan> findDays(const Drop& drop, const DayRange& range, const std::string& region) {
    auto first = findDay(drop, range.first, region);
    if (!first)
        return first.error();
    auto last = findDay(drop, range.last, region);
    if (!last)
        return last.error();
    return DaySpan{*first, *last};
}

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

Status usageError(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}

Status needRegion(const Decision& d) {
    if (d.region.empty())
        return usageError(std::string(decisionKindName(d.kind)) + " needs a region");
    return Ok{};
}

Status needMeasure(const Decision& d) {
    if (d.measure.empty())
        return usageError(std::string(decisionKindName(d.kind)) + " needs a measure");
    return Ok{};
}

Status needDate(const Decision& d) {
    if (!d.date)
        return usageError(std::string(decisionKindName(d.kind)) + " needs a date");
    return Ok{};
}

Status needWindow(const Decision& d) {
    if (!d.window)
        return usageError(std::string(decisionKindName(d.kind)) +
                          " needs a window of days FIRST:LAST");
    return Ok{};
}

Status firstFailure(std::initializer_list<Status> checks) {
    for (const Status& s : checks) {
        if (!s)
            return s;
    }
    return Ok{};
}

bool conservesAlways(const Decision&) {
    return true;
}

bool conservesNever(const Decision&) {
    return false;
}

Status noNewNegatives(const Cleaned&, const Decision&, const Effect& effect) {
    for (const CellChange& c : effect.cells) {
        if (c.after.hasValue() && c.after.value < 0 && c.after.value < c.before.counted()) {
            return cellError(ErrorCode::Conservation, "the decision would make a count negative",
                             c.region, c.date.iso());
        }
    }
    return Ok{};
}

bool namesSeries(const Decision& d, const std::string& region, const std::string& measure) {
    return d.region == region && d.measure == measure;
}

bool coversSeries(const Decision& d, const std::string& region, const std::string& measure) {
    return (d.region.empty() || d.region == region) && (d.measure.empty() || d.measure == measure);
}

}  // namespace siftwave::ledger::detail
