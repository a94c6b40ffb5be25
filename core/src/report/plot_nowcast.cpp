// The nowcast on a plot (plot_model.h: NowcastSpec).
#include "siftwave/report/plot_model.h"

#include <algorithm>
#include <limits>

namespace siftwave::report {

NowcastSpec nowcastSpecOf(const nowcast::NowcastResult& result, const TimeAxis& axis) {
    constexpr double kNone = std::numeric_limits<double>::quiet_NaN();
    NowcastSpec spec;
    const auto n = static_cast<std::size_t>(axis.periods());
    spec.mid.assign(n, kNone);
    spec.low.assign(n, kNone);
    spec.high.assign(n, kNone);
    for (const nowcast::NowcastRow& row : result.rows) {
        const std::optional<std::int32_t> p = axis.periodOf(row.date);
        // Drawn where reports are still expected (under 99 % in by now): over the older periods
        // of the window the estimate is the count itself, and a line there would only clutter.
        if (!p || !row.estimated || row.shareReported >= 0.99)
            continue;
        spec.mid[static_cast<std::size_t>(*p)] = row.nowcast;
        spec.low[static_cast<std::size_t>(*p)] = row.lo;
        spec.high[static_cast<std::size_t>(*p)] = row.hi;
    }
    const char* unit = result.cadence == Cadence::Weekly ? " weeks" : " days";
    spec.label = "Nowcast: estimate of reports still to come (chain-ladder, max delay " +
                 std::to_string(result.maxDelay) + unit + ", as of " + result.now.iso() + ")";
    spec.bandLabel = "95% interval of the nowcast";
    spec.caution = nowcast::kNowcastCaution;
    spec.now = result.now;
    return spec;
}

Result<nowcast::NowcastResult> nowcastOfCaseList(const Drop& drop, std::size_t region,
                                                 const nowcast::NowcastOptions& options) {
    if (!drop.caseList || drop.caseList->reportColumn.empty())
        return makeError(ErrorCode::Usage,
                         "a nowcast needs a case list with report dates, or a release history");
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromCases(drop, region, nowcast::lastReportDate(drop));
    if (!tri)
        return tri.error();
    return nowcast::nowcast(*tri, options);
}

}  // namespace siftwave::report
