// reporting_gap: a run of zeros inside an active stretch of a series.
//
// Issue 14: the expected level of the run is the lower of the two sides' medians, and the
// run is a gap only when its chance under that level and the measure's negative-binomial
// noise (zeroRunChance below) is at most 1e-4: the tail zeros of a finished outbreak and
// the zeros before its take-off are plausible and not gaps. Evidence adds level_before,
// level_after and chance_under_local_level. The catch-up is spread over the gap by the
// expected level (redistribute's `level` method: the trend between the periods around the
// gap times the weekday factors; a centred moving average over the zeros put it at the
// gap's edges, a flat fill missed the weekday cycle). What follows is the earlier
// description; its level is now the lower side.
//
// A run of reported zeros, with a non-zero value somewhere before and after it
// (the quiet tails of a series are not gaps), where the median of the reported
// periods on each side is at least the minimum level: under Poisson noise a
// run of L zeros at level mu has chance exp(-L mu). Daily data: at least
// min_days [2] zero days, window_days [14] days on each side, min_level [5] a
// day (chance below 5e-5). Weekly data: at least min_weeks [1] zero week,
// window_weeks [4] weeks on each side, min_weekly_level [20] a week (chance
// exp(-20) = 2e-9; stricter than the daily bar because a single period decides,
// and weekly counts are overdispersed: under negative-binomial noise of size 25
// a zero week at 10 has a chance of 1e-4). When the period after the run is more than
// twice the level it is the catch-up, and the suggestion is to redistribute it
// over the run; otherwise to treat the zeros as unreported.
//
// Evidence: periods, days (the days they cover: equal for daily data),
// level_around, chance_under_poisson, first_line, value_after, catch_up.

#include "scan/robust_stats.h"
#include "scan/scan_input.h"

#include <algorithm>
#include <cmath>
#include <optional>
#include <utility>

namespace siftwave::scan::detail {

namespace {

// A run of zeros is a gap when its chance under the local level is at most this (the bar
// of stale_values; our choice).
constexpr double kMaxChance = 1e-4;

// The thresholds of the drop's cadence.
struct GapThresholds {
    int minRun = 0;       // periods
    int window = 0;       // periods on each side
    double minLevel = 0;  // counts per period
};

// First and last period with a positive reported value; nullopt when there is none.
std::optional<std::pair<std::int32_t, std::int32_t>> positiveSpan(std::span<const Cell> cells,
                                                                  std::int32_t periods) {
    std::int32_t firstPositive = -1, lastPositive = -1;
    for (std::int32_t t = 0; t < periods; ++t) {
        const Cell& c = cells[static_cast<std::size_t>(t)];
        if (c.reported() && c.value > 0) {
            if (firstPositive < 0)
                firstPositive = t;
            lastPositive = t;
        }
    }
    if (firstPositive < 0)
        return std::nullopt;
    return std::pair{firstPositive, lastPositive};
}

// The last period of the run of reported zeros from `t`, before `lastPositive`.
std::int32_t zeroRunEnd(std::span<const Cell> cells, std::int32_t t, std::int32_t lastPositive) {
    std::int32_t end = t;
    while (end + 1 < lastPositive && cells[static_cast<std::size_t>(end) + 1].reported() &&
           cells[static_cast<std::size_t>(end) + 1].value == 0) {
        ++end;
    }
    return end;
}

// Cheap bound first: the median around the run is at most its largest value.
bool mayBeActive(std::span<const Cell> cells, std::int32_t periods, std::int32_t t,
                 std::int32_t end, const GapThresholds& th) {
    bool active = false;
    for (std::int32_t j = std::max(0, t - th.window);
         j <= std::min(periods - 1, end + th.window) && !active; ++j) {
        const Cell& n = cells[static_cast<std::size_t>(j)];
        active = n.reported() && n.value >= th.minLevel;
    }
    return active;
}

// The expected level of the run: the lower of the medians of the `window` periods on
// each side (a run at the edge of an outbreak, before its take-off or in its tail, is
// judged by its quiet side; a gap inside an active stretch has both sides high).
struct LocalLevel {
    double before = 0, after = 0, expected = 0;
};
LocalLevel localLevel(std::span<const double> values, std::int32_t first, std::int32_t last,
                      int window) {
    const auto n = static_cast<std::int32_t>(values.size());
    std::vector<double> side;
    const auto medianOf = [&](std::int32_t a, std::int32_t b) {
        side.clear();
        for (std::int32_t t = std::max(0, a); t <= std::min(n - 1, b); ++t)
            if (!std::isnan(values[static_cast<std::size_t>(t)]))
                side.push_back(values[static_cast<std::size_t>(t)]);
        return side.empty() ? 0.0 : medianInPlace(side);
    };
    LocalLevel l;
    l.before = medianOf(first - window, first - 1);
    l.after = medianOf(last + 1, last + window);
    l.expected = std::min(l.before, l.after);
    return l;
}

// Chance of `periods` zeros in a row at mean `level` under negative-binomial noise with
// overdispersion phi: P(0) = (1 + phi mu)^(-1/phi) each (Poisson exp(-mu) when phi = 0;
// Hilbe, "Negative Binomial Regression", 2nd ed., ch. 5).
double zeroRunChance(double level, int periods, double phi) {
    const double logP0 = phi > 1e-9 ? -std::log1p(phi * level) / phi : -level;
    return std::exp(periods * logP0);
}

// Redistribute the catch-up after the run over it, or else exclude the zeros as unreported.
void suggestForGap(Finding& f, const Drop& drop, const Cell& after, std::int32_t end, double level,
                   bool catchUp) {
    if (catchUp) {
        ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Redistribute);
        s.date = drop.periodStart(end + 1);
        s.excess = std::max<long long>(0, std::llround(after.value - level));
        s.window = ledger::DayRange{*f.first, *f.last};
        s.redistributeMethod = ledger::RedistributeMethod::Level;
        f.suggestion = std::move(s);
    } else {
        ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Exclude);
        s.window = ledger::DayRange{*f.first, *f.last};
        f.suggestion = std::move(s);
        f.suggestionNotes.note = std::string("zeros inside an active stretch are probably ") +
                                 drop.axis.unitPlural() + " that were not reported";
    }
}

// The finding of the zero run t..end at `level` around it, with its evidence and suggestion.
Finding gapFinding(const ScanInput& in, std::size_t r, std::size_t m, std::span<const Cell> cells,
                   std::int32_t t, std::int32_t end, double level) {
    const Drop& drop = in.drop;
    const int periods = end - t + 1;
    Finding f = makeFinding(in, FindingKind::ReportingGap, Severity::Warning, r, m);
    f.first = drop.periodStart(t);
    f.last = drop.periodStart(end);
    f.impact = level * periods;
    f.evidence = {{"days", in.daysIn(periods)},
                  {"periods", periods},
                  {"level_around", level},
                  {"chance_under_poisson", std::exp(-level * periods)},
                  {"first_line", cells[static_cast<std::size_t>(t)].line}};
    const Cell& after = cells[static_cast<std::size_t>(end) + 1];
    const bool catchUp = after.reported() && after.value > 2.0 * level;
    if (after.reported())
        f.evidence["value_after"] = after.value;
    f.evidence["catch_up"] = catchUp;
    suggestForGap(f, drop, after, end, level, catchUp);
    return f;
}

// The gaps of one series: each zero run between its first and last positive value.
void findGapsInSeries(const ScanInput& in, std::size_t m, std::size_t r, const GapThresholds& th,
                      std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const std::span<const Cell> cells = drop.series(m, r);
    const auto span = positiveSpan(cells, drop.periods());
    if (!span)
        return;
    const auto [firstPositive, lastPositive] = *span;
    std::vector<double> values;  // filled on the first candidate only
    for (std::int32_t t = firstPositive + 1; t < lastPositive; ++t) {
        const Cell& c = cells[static_cast<std::size_t>(t)];
        if (!c.reported() || c.value != 0)
            continue;
        const std::int32_t end = zeroRunEnd(cells, t, lastPositive);
        if (end - t + 1 >= th.minRun && mayBeActive(cells, drop.periods(), t, end, th)) {
            if (values.empty())
                values = seriesValues(cells);
            const LocalLevel level = localLevel(values, t, end, th.window);
            const double chance =
                zeroRunChance(level.expected, end - t + 1, in.measures[m].overdispersion);
            if (level.expected >= th.minLevel && chance <= kMaxChance) {
                Finding f = gapFinding(in, r, m, cells, t, end, level.expected);
                f.evidence["level_before"] = std::round(level.before * 10) / 10;
                f.evidence["level_after"] = std::round(level.after * 10) / 10;
                f.evidence["chance_under_local_level"] = chance;
                out.push_back(std::move(f));
            }
        }
        t = end;
    }
}

}  // namespace

void findReportingGaps(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const ReportingGapOptions& o = in.options.reportingGap;
    const GapThresholds th{in.periods(o.minDays, o.minWeeks),
                           in.periods(o.windowDays, o.windowWeeks),
                           in.periods(o.minLevel, o.minWeeklyLevel)};
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        if (in.measures[m].cumulative)
            continue;
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r)
            findGapsInSeries(in, m, r, th, out);
    }
}

}  // namespace siftwave::scan::detail
