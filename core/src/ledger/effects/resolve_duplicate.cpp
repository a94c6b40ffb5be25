// resolve_duplicate: sets a cell from its duplicate rows (decision.h).
#include "ledger/effects/effect_support.h"

#include <algorithm>
#include <vector>

namespace siftwave::ledger::detail {

namespace {

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

Status validate(const Decision& d) {
    return firstFailure({needRegion(d), needMeasure(d), needDate(d)});
}

std::optional<KindMark> mark(const MarkContext& c) {
    const Decision& d = c.entry.decision;
    KindMark m;
    m.at = DayRange{*d.date, *d.date};
    m.count = c.change;
    m.label = "duplicate resolved";
    return m;
}

constexpr DecisionFlag kFlags[] = {
    {"region"}, {"measure"}, {"date"}, {"keep", "--keep first|last|sum|max"}};
constexpr DecisionParam kParameters[] = {DecisionParam::Region, DecisionParam::Measure,
                                         DecisionParam::Date, DecisionParam::Keep};

}  // namespace

extern const DecisionKindInfo kResolveDuplicateKind = {
    .kind = DecisionKind::ResolveDuplicate,
    .name = "resolve_duplicate",
    .help = "--region CODE --measure NAME --date DAY --keep first|last|sum|max\n",
    .flags = kFlags,
    .measureFromDrop = true,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesNever,
    .effect = resolveDuplicate,
    .checkEffect = nullptr,
    .marksSeries = namesSeries,
    .mark = mark,
};

}  // namespace siftwave::ledger::detail
