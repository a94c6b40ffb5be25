// missing_dates: periods (days or weeks) inside a region's reporting span with
// no value.
//
// The span of a region runs from its first to its last period that has a row in
// any measure; the periods before and after (a region that starts late or
// stops) are not findings. Inside it, a period is missing for a measure when its
// cell is absent (no row) or blank (a missing-value token). One finding per
// contiguous run of at least min_days days / min_weeks weeks: with measure null
// when every measure misses the same periods (no row at all), else one per
// measure. For a finding about every measure, the numbers are those of the
// first measure, and the suggestion must suit every measure.
//
// What the suggestion is, in this order:
//   1. catch-up: the period after the run is more than 1.5 x the level around
//      (the median of the level_days / level_weeks reported periods on each
//      side): "share", the catch-up split over the run and itself (moves
//      counts, adds none);
//   2. probably true zeros: the median of the nearest true_zero_periods
//      reported periods on each side is at most true_zero_max_level counts per
//      period, in every measure the suggestion is for. A tally made from a case
//      list writes no row for a period without cases, and at such levels a zero
//      is ordinary (Poisson chance exp(-level) per period, at least 5 % at the
//      default 3). Severity info; "zero", filling 0, never interpolating;
//   3. otherwise "linear": rounded interpolation between the reported periods
//      on either side, as the ledger's fill_missing computes it (effects.cpp);
//      when a side has no reported value there is nothing to interpolate from
//      and the suggestion is to accept (look) instead.
// A suggestion never adds counts without the evidence saying how many:
// `suggestion_adds` {measure: counts} holds what it adds to each measure's
// total on the drop as read (0 for share and zero).
//
// Evidence: periods, days (the days they cover: equal for daily data), absent,
// blank, level_around, level_nearby, zero_chance_nearby (exp(-level_nearby)),
// probably_true_zeros, zeros_reported (the series' reported zeros: none in a
// tally from a case list), value_after and line_after when the next period has
// a value, suggestion_adds.

#include "scan/robust_stats.h"
#include "scan/scan_input.h"

#include <cmath>

namespace siftwave::scan::detail {
namespace {

bool missing(const Cell& c) {
    return c.state == CellState::Absent || c.state == CellState::Blank;
}

/// Median of the nearest `count` reported values before `first` and after `last`; NaN
/// when there are none.
double levelNearby(std::span<const double> values, std::int32_t first, std::int32_t last,
                   int count) {
    std::vector<double> near;
    int taken = 0;
    for (std::int32_t t = first - 1; t >= 0 && taken < count; --t) {
        if (!std::isnan(values[static_cast<std::size_t>(t)])) {
            near.push_back(values[static_cast<std::size_t>(t)]);
            ++taken;
        }
    }
    taken = 0;
    const auto n = static_cast<std::int32_t>(values.size());
    for (std::int32_t t = last + 1; t < n && taken < count; ++t) {
        if (!std::isnan(values[static_cast<std::size_t>(t)])) {
            near.push_back(values[static_cast<std::size_t>(t)]);
            ++taken;
        }
    }
    return medianInPlace(near);
}

std::int64_t floorDiv(std::int64_t a, std::int64_t b) {
    std::int64_t q = a / b;
    if ((a % b != 0) && ((a < 0) != (b < 0)))
        --q;
    return q;
}

/// What fill_missing --method linear adds over first..last: the values
/// round((a (n+1-k) + b k) / (n+1)), halves up, k = 1..n, between the reported
/// values a and b on either side (the ledger's formula, core/src/ledger/effects.cpp).
/// nullopt when a side has no reported value.
std::optional<std::int64_t> linearFillAdds(std::span<const Cell> cells, std::int32_t first,
                                           std::int32_t last) {
    const auto n = static_cast<std::int32_t>(cells.size());
    if (first < 1 || last + 1 >= n)
        return std::nullopt;
    const Cell& before = cells[static_cast<std::size_t>(first) - 1];
    const Cell& after = cells[static_cast<std::size_t>(last) + 1];
    if (!before.reported() || !after.reported())
        return std::nullopt;
    const std::int64_t count = last - first + 1;
    std::int64_t sum = 0;
    for (std::int64_t k = 1; k <= count; ++k) {
        const std::int64_t num = before.value * (count + 1 - k) + after.value * k;
        sum += floorDiv(2 * num + (count + 1), 2 * (count + 1));
    }
    return sum;
}

// The measures a run's suggestion is for: the finding's own, or every one.
std::vector<std::size_t> suggestionMeasures(const Drop& drop, std::optional<std::size_t> measure) {
    std::vector<std::size_t> measures;
    if (measure) {
        measures.push_back(*measure);
    } else {
        for (std::size_t k = 0; k < drop.measures.size(); ++k)
            measures.push_back(k);
    }
    return measures;
}

// The finding of a run with what it counts: periods, absent, blank, reported zeros, level.
Finding runFinding(const ScanInput& in, std::size_t region, std::optional<std::size_t> measure,
                   std::int32_t first, std::int32_t last, std::span<const Cell> cells,
                   double level) {
    const Drop& drop = in.drop;
    std::size_t absent = 0, blank = 0, zeros = 0;
    for (std::int32_t t = first; t <= last; ++t) {
        const CellState s = cells[static_cast<std::size_t>(t)].state;
        absent += s == CellState::Absent;
        blank += s == CellState::Blank;
    }
    for (const Cell& c : cells)
        zeros += c.reported() && c.value == 0;
    const int periods = last - first + 1;
    Finding f = makeFinding(in, FindingKind::MissingDates, Severity::Warning, region, measure);
    f.first = drop.periodStart(first);
    f.last = drop.periodStart(last);
    f.impact = std::isnan(level) ? periods : periods * std::max(level, 1.0);
    f.evidence = {{"days", in.daysIn(periods)},
                  {"periods", periods},
                  {"absent", absent},
                  {"blank", blank},
                  {"zeros_reported", zeros}};
    if (!std::isnan(level))
        f.evidence["level_around"] = level;
    return f;
}

// Records the period after the run when it has a value; true when it is the catch-up.
bool noteValueAfter(Finding& f, const Drop& drop, std::span<const Cell> cells, std::int32_t last,
                    double level) {
    if (last + 1 >= drop.periods() || !cells[static_cast<std::size_t>(last) + 1].reported())
        return false;
    const double next = cells[static_cast<std::size_t>(last) + 1].value;
    f.evidence["value_after"] = next;
    f.evidence["line_after"] = cells[static_cast<std::size_t>(last) + 1].line;
    // A next period well above the level is the catch-up: share it over the gap.
    return !std::isnan(level) && next > 1.5 * std::max(level, 1.0);
}

// Whether the run is probably true zeros (low counts nearby in every measure), with the evidence.
bool noteTrueZeros(const ScanInput& in, Finding& f, std::span<const double> values,
                   std::size_t region, std::size_t m, const std::vector<std::size_t>& measures,
                   std::int32_t first, std::int32_t last, bool catchUp) {
    const MissingDatesOptions& o = in.options.missingDates;
    const double nearby = levelNearby(values, first, last, o.trueZeroPeriods);
    bool trueZeros = !catchUp && !std::isnan(nearby) && nearby <= o.trueZeroMaxLevel;
    for (std::size_t k : measures) {
        if (k == m)
            continue;
        const double other =
            levelNearby(seriesValues(in.drop.series(k, region)), first, last, o.trueZeroPeriods);
        trueZeros = trueZeros && !(other > o.trueZeroMaxLevel);
    }
    if (!std::isnan(nearby)) {
        f.evidence["level_nearby"] = nearby;
        f.evidence["zero_chance_nearby"] = std::exp(-nearby);
    }
    f.evidence["probably_true_zeros"] = trueZeros;
    return trueZeros;
}

// The fill a run's suggestion uses (none: nothing to interpolate from) and what it adds.
struct FillChoice {
    std::optional<ledger::FillMethod> method;
    nlohmann::json adds = nlohmann::json::object();  // {measure: counts added}
};

// Share for a catch-up, zero for true zeros, else linear where every measure can take it.
FillChoice chooseFill(const Drop& drop, std::size_t region,
                      const std::vector<std::size_t>& measures, std::int32_t first,
                      std::int32_t last, bool catchUp, bool trueZeros) {
    FillChoice choice;
    if (catchUp || trueZeros) {
        choice.method = catchUp ? ledger::FillMethod::Share : ledger::FillMethod::Zero;
        for (std::size_t k : measures)
            choice.adds[drop.measures[k]] = 0;
        return choice;
    }
    // Interpolation adds counts: say how many, for every measure it can be made for.
    bool interpolable = true;
    for (std::size_t k : measures) {
        const std::optional<std::int64_t> added =
            linearFillAdds(drop.series(k, region), first, last);
        if (added)
            choice.adds[drop.measures[k]] = *added;
        else
            interpolable = false;
    }
    if (interpolable)
        choice.method = ledger::FillMethod::Linear;
    return choice;
}

// The fill_missing suggestion with what it adds, or a look at the source when there is no fill.
void suggestFill(Finding& f, const Drop& drop, const FillChoice& choice, bool trueZeros) {
    if (!choice.method) {
        suggestAccept(f, std::string("no reported value on both sides of the gap to interpolate "
                                     "from; look at the source before filling these ") +
                             drop.axis.unitPlural());
        return;
    }
    f.evidence["suggestion_adds"] = choice.adds;
    ledger::Decision s = suggestionFor(f, ledger::DecisionKind::FillMissing);
    s.fillMethod = *choice.method;
    s.window = ledger::DayRange{*f.first, *f.last};
    f.suggestion = std::move(s);
    if (trueZeros) {
        f.suggestionNotes.note = std::string("absent rows amid low counts are probably ") +
                                 drop.axis.unitPlural() +
                                 " without cases (a tally made from a case list writes no "
                                 "row for them): fill 0, do not interpolate";
    }
}

// One finding for a missing run: its counts, the period after, true zeros, then the fill.
void addRun(const ScanInput& in, std::size_t region, std::optional<std::size_t> measure,
            std::int32_t first, std::int32_t last, std::vector<Finding>& out) {
    const MissingDatesOptions& o = in.options.missingDates;
    const std::size_t m = measure.value_or(0);
    const std::span<const Cell> cells = in.drop.series(m, region);
    const std::vector<double> values = seriesValues(cells);
    const double level = levelAround(values, first, last, in.periods(o.levelDays, o.levelWeeks));
    const std::vector<std::size_t> measures = suggestionMeasures(in.drop, measure);

    Finding f = runFinding(in, region, measure, first, last, cells, level);
    const bool catchUp = noteValueAfter(f, in.drop, cells, last, level);
    const bool trueZeros = noteTrueZeros(in, f, values, region, m, measures, first, last, catchUp);
    const FillChoice choice =
        chooseFill(in.drop, region, measures, first, last, catchUp, trueZeros);
    if (trueZeros)
        f.severity = Severity::Info;
    suggestFill(f, in.drop, choice, trueZeros);
    out.push_back(std::move(f));
}

}  // namespace

void findMissingDates(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const std::size_t measures = drop.measures.size();
    if (measures == 0 || drop.periods() == 0)
        return;
    const int minRun =
        in.periods(in.options.missingDates.minDays, in.options.missingDates.minWeeks);
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        // Span: first .. last period with a row (any state but absent) in any measure.
        std::int32_t spanFirst = -1, spanLast = -1;
        for (std::int32_t t = 0; t < drop.periods(); ++t) {
            for (std::size_t m = 0; m < measures; ++m) {
                if (drop.cell(m, r, t).state != CellState::Absent) {
                    if (spanFirst < 0)
                        spanFirst = t;
                    spanLast = t;
                    break;
                }
            }
        }
        if (spanFirst < 0)
            continue;
        auto allMissing = [&](std::int32_t t) {
            for (std::size_t m = 0; m < measures; ++m) {
                if (!missing(drop.cell(m, r, t)))
                    return false;
            }
            return true;
        };
        // Runs missing in every measure: one finding with no measure (or the one measure).
        for (std::int32_t t = spanFirst; t <= spanLast; ++t) {
            if (!allMissing(t))
                continue;
            std::int32_t end = t;
            while (end + 1 <= spanLast && allMissing(end + 1))
                ++end;
            if (end - t + 1 >= minRun) {
                addRun(in, r, measures == 1 ? std::optional<std::size_t>(0) : std::nullopt, t, end,
                       out);
            }
            t = end;
        }
        if (measures == 1)
            continue;
        // Runs missing in some measures only.
        for (std::size_t m = 0; m < measures; ++m) {
            for (std::int32_t t = spanFirst; t <= spanLast; ++t) {
                if (!missing(drop.cell(m, r, t)) || allMissing(t))
                    continue;
                std::int32_t end = t;
                while (end + 1 <= spanLast && missing(drop.cell(m, r, end + 1)) &&
                       !allMissing(end + 1)) {
                    ++end;
                }
                if (end - t + 1 >= minRun)
                    addRun(in, r, m, t, end, out);
                t = end;
            }
        }
    }
}

}  // namespace siftwave::scan::detail
