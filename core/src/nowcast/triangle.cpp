// The reporting triangle from a case list or from a release history (triangle.h).
#include "siftwave/nowcast/triangle.h"

#include <algorithm>

namespace siftwave::nowcast {
namespace {

constexpr double kUnknown = std::numeric_limits<double>::quiet_NaN();

ReportingTriangle emptyTriangle(const TimeAxis& source, std::int32_t nowPeriod, Date now,
                                int maxDelay, std::string region) {
    ReportingTriangle tri;
    tri.axis = source.weekly() ? TimeAxis::weekly(source.first(), nowPeriod + 1, source.weekStart(),
                                                  source.weekDate())
                               : TimeAxis::daily(source.first(), nowPeriod + 1);
    tri.nowPeriod = nowPeriod;
    tri.now = now;
    tri.maxDelay = maxDelay;
    tri.region = std::move(region);
    tri.cumulative.assign(
        static_cast<std::size_t>(nowPeriod + 1) * static_cast<std::size_t>(maxDelay + 1), kUnknown);
    return tri;
}

/// The delay of a case in periods, or nullopt when it has no usable report date.
std::optional<int> delayOf(const TimeAxis& axis, const CaseRecord& c) {
    if (!c.hasReport || c.reportBeforeEvent)
        return std::nullopt;
    return axis.periodOnGrid(c.report) - axis.periodOnGrid(c.event);
}

}  // namespace

double ReportingTriangle::reported(std::int32_t t) const {
    return at(t, std::min(elapsed(t), maxDelay));
}

Date lastReportDate(const Drop& drop) {
    Date now = drop.axis.first();
    if (drop.caseList)
        for (const CaseRecord& c : drop.caseList->cases)
            if (c.hasReport && !c.reportBeforeEvent)
                now = std::max(now, c.report);
    return now;
}

int maxDelayFromCases(const Drop& drop, Date now) {
    if (!drop.caseList)
        return 1;
    const std::int32_t nowPeriod = drop.axis.periodOnGrid(now);
    std::vector<int> delays;
    for (const CaseRecord& c : drop.caseList->cases) {
        const std::optional<int> d = delayOf(drop.axis, c);
        if (d && drop.axis.periodOnGrid(c.report) <= nowPeriod)
            delays.push_back(*d);
    }
    if (delays.empty())
        return 1;
    const std::size_t k = (delays.size() * 99 + 99) / 100 - 1;  // ceil(0.99 n) - 1
    std::nth_element(delays.begin(), delays.begin() + static_cast<std::ptrdiff_t>(k), delays.end());
    return std::max(1, delays[k]);
}

Result<ReportingTriangle> triangleFromCases(const Drop& drop, std::size_t region, Date now,
                                            int maxDelay) {
    if (!drop.caseList)
        return makeError(ErrorCode::Usage,
                         "a nowcast from one file needs a case list (one row per case with an "
                         "event and a report date); for aggregated counts give the releases");
    if (drop.caseList->reportColumn.empty())
        return makeError(ErrorCode::Usage,
                         "the case list has no report date column; name it with --report-col");
    if (maxDelay < 0)
        return makeError(ErrorCode::Usage, "the maximum delay must be 0 (chosen) or more");
    const std::int32_t nowPeriod = drop.axis.periodOnGrid(now);
    if (nowPeriod < 0)
        return makeError(ErrorCode::Usage, "now (" + now.iso() + ") is before the first event (" +
                                               drop.axis.first().iso() + ")");
    const int D = maxDelay > 0 ? maxDelay : maxDelayFromCases(drop, now);
    ReportingTriangle tri = emptyTriangle(drop.axis, nowPeriod, now, D, drop.regionCodes[region]);
    // Increments by delay (the last column gathers delay D and later), then running sums.
    std::vector<double> increments(tri.cumulative.size(), 0.0);
    for (const CaseRecord& c : drop.caseList->cases) {
        if (c.region != region)
            continue;
        const std::int32_t e = drop.axis.periodOnGrid(c.event);
        const std::optional<int> d = delayOf(drop.axis, c);
        if (e > nowPeriod)
            continue;
        if (!d) {
            ++tri.casesLeftOut;
            continue;
        }
        if (e + *d > nowPeriod)
            continue;  // reported after now: not known yet
        increments[static_cast<std::size_t>(e) * static_cast<std::size_t>(D + 1) +
                   static_cast<std::size_t>(std::min(*d, D))] += 1.0;
    }
    for (std::int32_t t = 0; t <= nowPeriod; ++t) {
        double sum = 0.0;
        for (int d = 0; d <= D && t + d <= nowPeriod; ++d) {
            sum += increments[static_cast<std::size_t>(t) * static_cast<std::size_t>(D + 1) +
                              static_cast<std::size_t>(d)];
            tri.at(t, d) = sum;
        }
    }
    return tri;
}

namespace {

/// The releases sorted by their as-of period, checked: one cadence, one per period.
Result<std::vector<const Drop*>> sortedReleases(const std::vector<const Drop*>& releases) {
    if (releases.empty())
        return makeError(ErrorCode::Usage, "a release history needs at least one release");
    std::vector<const Drop*> sorted = releases;
    std::sort(sorted.begin(), sorted.end(), [](const Drop* a, const Drop* b) {
        return a->axis.lastStart() < b->axis.lastStart();
    });
    const TimeAxis& axis = sorted.back()->axis;
    for (std::size_t k = 0; k < sorted.size(); ++k) {
        const Drop& r = *sorted[k];
        if (r.axis.empty() || r.axis.cadence() != axis.cadence() ||
            r.axis.weekStart() != axis.weekStart()) {
            Error e = makeError(ErrorCode::InvalidValue,
                                "the releases do not share one calendar: " + r.axis.describe() +
                                    " here, " + axis.describe() + " in the latest");
            e.file = r.source.path;
            return e;
        }
        if (k == 0)
            continue;
        const int step = axis.periodOnGrid(r.axis.lastStart()) -
                         axis.periodOnGrid(sorted[k - 1]->axis.lastStart());
        if (step != 1) {
            Error e = makeError(
                ErrorCode::InvalidValue,
                step == 0 ? "two releases end on the same " + std::string(axis.unitName()) + " (" +
                                r.axis.lastStart().iso() + "), also " + sorted[k - 1]->source.path
                          : "the releases skip from " + sorted[k - 1]->axis.lastStart().iso() +
                                " to " + r.axis.lastStart().iso() +
                                ": a release history needs one release per " + axis.unitName());
            e.file = r.source.path;
            return e;
        }
    }
    return sorted;
}

}  // namespace

Result<ReportingTriangle> triangleFromReleases(const std::vector<const Drop*>& releases,
                                               const std::string& region,
                                               const std::string& measure, int maxDelay) {
    Result<std::vector<const Drop*>> sorted = sortedReleases(releases);
    if (!sorted)
        return sorted.error();
    if (maxDelay < 0)
        return makeError(ErrorCode::Usage, "the maximum delay must be 0 (chosen) or more");
    const Drop& latest = *sorted->back();
    const TimeAxis& axis = latest.axis;
    const std::int32_t nowPeriod = axis.periods() - 1;
    const int cap = axis.weekly() ? 8 : 28;
    const int D =
        maxDelay > 0 ? maxDelay : std::clamp(static_cast<int>(sorted->size()) - 1, 1, cap);
    ReportingTriangle tri = emptyTriangle(axis, nowPeriod, axis.lastStart(), D, region);
    for (const Drop* release : *sorted) {
        const std::int32_t asOf = axis.periodOnGrid(release->axis.lastStart());
        const std::optional<std::size_t> r = release->regionIndex(region);
        const std::optional<std::size_t> m = release->measureIndex(measure);
        if (!m) {
            Error e =
                makeError(ErrorCode::NotFound, "the release has no measure '" + measure + "'");
            e.file = release->source.path;
            return e;
        }
        for (std::int32_t t = std::max(0, asOf - D); t <= asOf && t <= nowPeriod; ++t) {
            // The release's own period of t's first day (its axis may start elsewhere).
            const std::optional<std::int32_t> own = release->axis.periodOf(axis.periodStart(t));
            double value = 0.0;
            if (r && own && release->cell(*m, *r, *own).reported())
                value = release->cell(*m, *r, *own).value;
            const int d = asOf - t;
            if (d < D || asOf == nowPeriod)
                tri.at(t, std::min(d, D)) = value;
        }
    }
    // Periods older than D at the latest release: their last column is the latest count.
    for (std::int32_t t = 0; t + D <= nowPeriod; ++t) {
        const std::optional<std::int32_t> own = latest.axis.periodOf(axis.periodStart(t));
        const std::optional<std::size_t> r = latest.regionIndex(region);
        const std::size_t m = *latest.measureIndex(measure);
        tri.at(t, D) = (r && own && latest.cell(m, *r, *own).reported())
                           ? latest.cell(m, *r, *own).value
                           : 0.0;
    }
    return tri;
}

}  // namespace siftwave::nowcast
