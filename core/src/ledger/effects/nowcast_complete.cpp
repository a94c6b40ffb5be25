// nowcast_complete: the cleaned series of a case list completed by its nowcast (decision.h,
// ledger/nowcast_completion.h).
#include "ledger/effects/effect_support.h"

#include "siftwave/ledger/nowcast_completion.h"
#include "siftwave/nowcast/nowcast.h"

#include <cmath>

namespace siftwave::ledger::detail {

namespace {

/// The nowcast the decision names, of the drop's case list.
Result<nowcast::NowcastResult> nowcastOf(const Drop& drop, std::size_t region, const Decision& d) {
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromCases(drop, region, *d.date, d.maxDelay);
    if (!tri)
        return tri.error();
    nowcast::NowcastOptions options;
    options.windowPeriods = d.nowcastWindow;
    return nowcast::nowcast(*tri, options);
}

/// Refuses a drop the decision cannot complete: no case list, or "now" before its last report
/// (the drop's counts then hold cases reported after now, which the nowcast would add again).
Status checkCompletable(const Drop& drop, const Decision& d) {
    if (!drop.caseList)
        return makeError(ErrorCode::InvalidValue,
                         "nowcast_complete needs a case list (each case's event and report "
                         "dates); this drop holds counts");
    const Date last = nowcast::lastReportDate(drop);
    if (*d.date < last)
        return makeError(ErrorCode::InvalidValue,
                         "the case list has reports up to " + last.iso() + "; a completion as of " +
                             d.date->iso() +
                             " would count again the cases reported after it: use --date " +
                             last.iso() + " or later");
    return Ok{};
}

Status complete(const Drop& drop, const Cleaned&, const Decision& dec, EffectBuilder& out) {
    if (Status s = checkCompletable(drop, dec); !s)
        return s;
    auto at = findSeries(drop, dec.measure, dec.region);
    if (!at)
        return at.error();
    Result<nowcast::NowcastResult> result = nowcastOf(drop, at->region, dec);
    if (!result)
        return result.error();
    for (const nowcast::NowcastRow& row : result->rows) {
        if (!row.estimated || !std::isfinite(row.nowcast))
            continue;
        const std::optional<std::int32_t> day = drop.periodOf(row.date);
        if (!day)
            continue;  // a period after the drop's calendar: nothing reported there
        const auto toCome = static_cast<std::int64_t>(std::llround(row.nowcast - row.reported));
        const CleanedCell& cell = out.current(at->measure, at->region, *day);
        if (Status s = requireWritable(drop, cell, at->region, *day); !s)
            return s;
        if (toCome > 0)
            out.set(at->measure, at->region, *day, withAdded(cell, toCome));
    }
    out.addScope(at->measure, at->region);
    return Ok{};
}

Status validate(const Decision& d) {
    if (Status s = firstFailure({needRegion(d), needMeasure(d), needDate(d)}); !s)
        return s;
    if (d.maxDelay < 1 || d.maxDelay > 366)
        return usageError("nowcast_complete needs a maximum delay of 1 to 366 periods");
    if (d.nowcastWindow < 1 || d.nowcastWindow > 3660)
        return usageError("nowcast_complete needs a window of 1 to 3660 periods");
    return Ok{};
}

std::optional<KindMark> mark(const MarkContext& c) {
    const Decision& d = c.entry.decision;
    KindMark m;
    const int days = c.axis.weekly() ? 7 * d.maxDelay : d.maxDelay;
    m.at = {*d.date - (days - 1), *d.date};
    m.count = c.change;
    m.label = "nowcast-completed (+" + c.count(c.change) + " still to come)";
    return m;
}

constexpr DecisionFlag kFlags[] = {
    {"region", "--region CODE"}, {"measure"}, {"date"}, {"max-delay"}, {"nowcast-window"}};
constexpr DecisionParam kParameters[] = {
    DecisionParam::Region,   DecisionParam::Measure,       DecisionParam::Date,
    DecisionParam::MaxDelay, DecisionParam::NowcastWindow, DecisionParam::NowcastMethod};

}  // namespace

extern const DecisionKindInfo kNowcastCompleteKind = {
    .kind = DecisionKind::NowcastComplete,
    .name = "nowcast_complete",
    .help =
        "--region CODE [--measure NAME] [--date NOW] [--max-delay N]\n"
        "                     [--nowcast-window N]  a case list only: adds to each recent\n"
        "                     period the reports still to come (chain-ladder nowcast as of\n"
        "                     NOW, default the last report date); fits and figures on the\n"
        "                     cleaned series then use the completed counts\n",
    .flags = kFlags,
    .measureFromDrop = true,
    .parameters = kParameters,
    .validate = validate,
    .conservesTotals = conservesNever,
    .effect = complete,
    .checkEffect = nullptr,
    .marksSeries = namesSeries,
    .mark = mark,
    .resolve = resolveNowcastCompletion,
};

}  // namespace siftwave::ledger::detail
