// missing_dates: periods (days or weeks) inside a region's reporting span with
// no value.
//
// The span of a region runs from its first to its last period that has a row in
// any measure; the periods before and after (a region that starts late or
// stops) are not findings. Inside it, a period is missing for a measure when its
// cell is absent (no row) or blank (a missing-value token). One finding per
// contiguous run of at least min_days days / min_weeks weeks: with measure null
// when every measure misses the same periods (no row at all), else one per
// measure. The level around a run is the median of the level_days /
// level_weeks reported periods on each side.
//
// Evidence: periods, days (the days they cover: equal for daily data), absent,
// blank, level_around, value_after and line_after.

#include "scan/robust_stats.h"
#include "scan/scan_input.h"

#include <cmath>

namespace siftwave::scan::detail {
namespace {

bool missing(const Cell& c) {
    return c.state == CellState::Absent || c.state == CellState::Blank;
}

void addRun(const ScanInput& in, std::size_t region, std::optional<std::size_t> measure,
            std::int32_t first, std::int32_t last, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const std::size_t m = measure.value_or(0);
    const std::span<const Cell> cells = drop.series(m, region);
    const std::vector<double> values = seriesValues(cells);
    std::size_t absent = 0, blank = 0;
    for (std::int32_t t = first; t <= last; ++t) {
        const CellState s = cells[static_cast<std::size_t>(t)].state;
        absent += s == CellState::Absent;
        blank += s == CellState::Blank;
    }
    const MissingDatesOptions& o = in.options.missingDates;
    const double level = levelAround(values, first, last, in.periods(o.levelDays, o.levelWeeks));
    const int periods = last - first + 1;

    Finding f = makeFinding(in, FindingKind::MissingDates, Severity::Warning, region, measure);
    f.first = drop.periodStart(first);
    f.last = drop.periodStart(last);
    f.impact = std::isnan(level) ? periods : periods * std::max(level, 1.0);
    f.evidence = {
        {"days", in.daysIn(periods)}, {"periods", periods}, {"absent", absent}, {"blank", blank}};
    if (!std::isnan(level))
        f.evidence["level_around"] = level;
    std::string method = "linear";
    if (last + 1 < drop.periods() && cells[static_cast<std::size_t>(last) + 1].reported()) {
        const double next = cells[static_cast<std::size_t>(last) + 1].value;
        f.evidence["value_after"] = next;
        f.evidence["line_after"] = cells[static_cast<std::size_t>(last) + 1].line;
        // A next period well above the level is the catch-up: share it over the gap.
        if (!std::isnan(level) && next > 1.5 * std::max(level, 1.0)) {
            method = "share";
        }
    }
    f.suggestion = {{"decision", "fill_missing"},
                    {"method", method},
                    {"first", f.first->iso()},
                    {"last", f.last->iso()}};
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
