// backlog_dump: a period (day or week) far above what the surrounding periods
// make plausible, including the catch-up after a gap (method in
// siftwave/scan/backlog.h).
//
// Severity (issue 14: only when a gap or a deficit before the period says where the
// counts came from; otherwise warning): critical when the excess is at least critical_share of the
// region's total, or when the period is among the last recent_days (14) days or recent_weeks (4)
// weeks of the drop (it bends the current trend that a briefing reads); warning otherwise. Measures
// that are cumulative are left to cumulative_decrease.
//
// Evidence: observed, expected, excess, z, ratio, baseline_periods (neighbours
// used) and baseline_days (the days they cover: the same number for daily data),
// overdispersion, weekday_factor (daily data only), line, region_total, and
// after_gap {first, last, periods, days} when a gap came before, window_basis ("gap",
// "deficit", "longest": see backlog.h) and deficit (the window's shortfall) for "deficit".

#include "scan/backlog_estimate.h"
#include "scan/scan_input.h"
#include "siftwave/scan/backlog.h"

#include <cmath>

namespace siftwave::scan {
namespace detail {
namespace {

Finding toFinding(const ScanInput& in, std::size_t r, std::size_t m, const BacklogEstimate& e,
                  std::uint32_t line) {
    const Drop& drop = in.drop;
    const std::int32_t t = e.day.serial;
    const double total = in.measures[m].regionTotals[r];
    const bool recent = t >= drop.periods() - in.periods(in.options.backlogDump.recentDays,
                                                         in.options.backlogDump.recentWeeks);
    const bool large = total > 0 && e.excess >= in.options.backlogDump.criticalShare * total;
    // Critical needs a source too: a gap or a deficit before the period (issue 14: a lone
    // spike in a complete published curve is worth a look, not an alarm).
    const bool sourced = e.window == WindowBasis::Gap || e.window == WindowBasis::Deficit;
    Finding f =
        makeFinding(in, FindingKind::BacklogDump,
                    (large || recent) && sourced ? Severity::Critical : Severity::Warning, r, m);
    f.first = f.last = drop.periodStart(t);
    f.impact = static_cast<double>(e.excess);
    f.evidence = {
        {"observed", e.observed},
        {"expected", std::round(e.expected * 10) / 10},
        {"excess", e.excess},
        {"z", std::round(e.z * 100) / 100},
        {"ratio", e.expected > 0 ? nlohmann::json(std::round(e.observed / e.expected * 100) / 100)
                                 : nlohmann::json(nullptr)},
        {"baseline_days", in.daysIn(e.neighbours)},
        {"baseline_periods", e.neighbours},
        {"overdispersion", std::round(in.measures[m].overdispersion * 10000) / 10000},
        {"line", line},
        {"region_total", total}};
    if (!in.weekly()) {
        f.evidence["weekday_factor"] =
            std::round(in.measures[m].weekday.factor[static_cast<std::size_t>(in.weekdayOf(t))] *
                       1000) /
            1000;
    }
    if (e.gapFirst) {
        const int gapPeriods = e.gapLast->serial - e.gapFirst->serial + 1;
        f.evidence["after_gap"] =
            nlohmann::json{{"first", drop.periodStart(e.gapFirst->serial).iso()},
                           {"last", drop.periodStart(e.gapLast->serial).iso()},
                           {"days", in.daysIn(gapPeriods)},
                           {"periods", gapPeriods}};
    }
    constexpr const char* kBasis[] = {"default", "gap", "deficit", "longest"};
    f.evidence["window_basis"] = kBasis[static_cast<int>(e.window)];
    if (e.window == WindowBasis::Deficit)
        f.evidence["deficit"] = std::round(e.deficit);
    ledger::Decision s = suggestionFor(f, ledger::DecisionKind::Redistribute);
    s.date = drop.periodStart(t);
    s.excess = e.excess;
    s.window = ledger::DayRange{drop.periodStart(e.windowFirst.serial),
                                drop.periodStart(e.windowLast.serial)};
    // A gap is filled by the expected level (its reports say nothing); a deficit in proportion
    // to its reports, exact for a constant withheld share (tests/bench/scan_restore_bench, 40
    // seeds: level weights on deficits removed a median of 82.8 % of the error against 89.3 %).
    s.redistributeMethod =
        e.gapFirst ? ledger::RedistributeMethod::Level : ledger::RedistributeMethod::Proportional;
    f.suggestion = std::move(s);
    if (e.window == WindowBasis::Longest) {
        f.suggestionNotes.note =
            std::string("no shortfall before the ") + drop.axis.unitName() +
            " points to where the counts came from: the longest plausible window is offered; "
            "ask the reporting office which " +
            drop.axis.unitPlural() + " they belong to";
    }
    return f;
}

}  // namespace

void findBacklogDumps(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        if (in.measures[m].cumulative)
            continue;
        BacklogSeries series(in.options.backlogDump, drop.axis, in.measures[m].weekday,
                             in.measures[m].overdispersion, in.firstWeekday);
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            const std::span<const Cell> cells = drop.series(m, r);
            series.load(cells);
            for (std::int32_t t = 1; t < drop.periods(); ++t) {
                if (!series.mightBeFlagged(t))
                    continue;
                const std::optional<BacklogEstimate> e = series.estimate(t);
                if (!e || !e->flagged)
                    continue;
                out.push_back(toFinding(in, r, m, *e, cells[static_cast<std::size_t>(t)].line));
            }
        }
    }
}

}  // namespace detail

Result<BacklogEstimate> estimateBacklog(const Drop& drop, std::string_view measure,
                                        std::string_view region, Date day,
                                        const ScanOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    const std::optional<std::size_t> m = drop.measureIndex(measure);
    if (!m)
        return makeError(ErrorCode::NotFound, "no measure '" + std::string(measure) + "'");
    const std::optional<std::size_t> r = drop.regionIndex(region);
    if (!r)
        return makeError(ErrorCode::NotFound, "no region '" + std::string(region) + "'");
    const std::optional<std::int32_t> t = drop.periodOf(day);
    if (!t) {
        return makeError(ErrorCode::NotFound, day.iso() + " is outside the drop's calendar");
    }
    // The same input the scan prepares: weekday factors for daily data only.
    const int firstWeekday = drop.axis.weekly() ? 0 : drop.axis.first().isoWeekday() - 1;
    const detail::WeekdayFactors factors =
        drop.axis.weekly() ? detail::WeekdayFactors{}
                           : detail::estimateWeekdayFactors(drop, *m, firstWeekday, {},
                                                            options.weekdayEffect.minLevel,
                                                            options.weekdayEffect.minWeeks);
    const double phi = detail::estimateOverdispersion(drop, *m, firstWeekday, factors);
    detail::BacklogSeries series(options.backlogDump, drop.axis, factors, phi, firstWeekday);
    series.load(drop.series(*m, *r));
    std::optional<BacklogEstimate> e = series.estimate(*t);
    if (!e) {
        const std::string unit = drop.axis.unitName();
        Error err = makeError(ErrorCode::InvalidValue,
                              "no backlog estimate: the " + unit +
                                  " has no reported value or too few reported neighbours");
        err.region = std::string(region);
        err.date = day.iso();
        return err;
    }
    e->day = drop.periodStart(e->day.serial);
    e->windowFirst = drop.periodStart(e->windowFirst.serial);
    e->windowLast = drop.periodStart(e->windowLast.serial);
    if (e->gapFirst)
        e->gapFirst = drop.periodStart(e->gapFirst->serial);
    if (e->gapLast)
        e->gapLast = drop.periodStart(e->gapLast->serial);
    return *e;
}

}  // namespace siftwave::scan
