// The reporting triangle from a case list or from a release history (triangle.h).
#include "siftwave/nowcast/triangle.h"

#include <algorithm>
#include <memory>
#include <span>

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

/// The history checked for a triangle: one calendar, one release per period, oldest first.
Status checkSuccessive(const ReleaseHistory& history) {
    const TimeAxis& axis = history.latest().axis;
    for (std::size_t k = 0; k < history.size(); ++k) {
        const Drop& r = history.release(k);
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
        const Drop& before = history.release(k - 1);
        const int step =
            axis.periodOnGrid(r.axis.lastStart()) - axis.periodOnGrid(before.axis.lastStart());
        if (step == 1)
            continue;
        Error e = makeError(
            ErrorCode::InvalidValue,
            step == 0 ? "two releases end on the same " + std::string(axis.unitName()) + " (" +
                            r.axis.lastStart().iso() + "), also " + before.source.path
            : step < 0
                ? "the releases are not in order of their last " + std::string(axis.unitName()) +
                      ": " + before.source.path + " ends after this one"
                : "the releases skip from " + before.axis.lastStart().iso() + " to " +
                      r.axis.lastStart().iso() + ": a release history needs one release per " +
                      axis.unitName());
        e.file = r.source.path;
        return e;
    }
    return Ok{};
}

/// Release k's count of each period t of the latest's calendar within D periods of its as-of
/// (read through the pair that aligns it with the latest; 0 where it has no such cell): the
/// triangle's cells C[t][asOf - t], and for the latest also C[t][D] of every older period.
void addReleaseColumn(const ReleaseHistory& history, std::size_t k, std::size_t region,
                      std::size_t measure, ReportingTriangle& tri) {
    const ReleasePair pair = history.againstLatest(k);
    const std::span<const Cell> series = pair.olderSeries(measure, region);
    const TimeAxis& axis = pair.newer().axis;
    const std::int32_t asOf = axis.periodOnGrid(history.asOf(k));
    const bool latest = k + 1 == history.size();
    const int D = tri.maxDelay;
    for (std::int32_t t = latest ? 0 : std::max(0, asOf - D); t <= asOf && t <= tri.nowPeriod;
         ++t) {
        const std::optional<std::int32_t> own = pair.olderPeriod(t);
        double value = 0.0;
        if (!series.empty() && own && series[static_cast<std::size_t>(*own)].reported())
            value = series[static_cast<std::size_t>(*own)].value;
        const int d = asOf - t;
        if (d < D || latest)
            tri.at(t, std::min(d, D)) = value;
    }
}

}  // namespace

Result<ReportingTriangle> triangleFromReleases(const ReleaseHistory& history,
                                               const std::string& region,
                                               const std::string& measure, int maxDelay) {
    if (Status s = checkSuccessive(history); !s)
        return s.error();
    if (maxDelay < 0)
        return makeError(ErrorCode::Usage, "the maximum delay must be 0 (chosen) or more");
    const Drop& latest = history.latest();
    for (const std::shared_ptr<const Drop>& release : history.releases()) {
        if (!release->measureIndex(measure)) {
            Error e =
                makeError(ErrorCode::NotFound, "the release has no measure '" + measure + "'");
            e.file = release->source.path;
            return e;
        }
    }
    const TimeAxis& axis = latest.axis;
    const std::int32_t nowPeriod = axis.periods() - 1;
    const int cap = axis.weekly() ? 8 : 28;
    const int D =
        maxDelay > 0 ? maxDelay : std::clamp(static_cast<int>(history.size()) - 1, 1, cap);
    // The triangle is in the latest release's terms (its calendar, regions and measures).
    const std::optional<std::size_t> r = latest.regionIndex(region);
    if (!r) {
        Error e =
            makeError(ErrorCode::NotFound, "no region '" + region + "' in the latest release");
        e.file = latest.source.path;
        return e;
    }
    ReportingTriangle tri = emptyTriangle(axis, nowPeriod, axis.lastStart(), D, region);
    const std::size_t m = *latest.measureIndex(measure);
    for (std::size_t k = 0; k < history.size(); ++k)
        addReleaseColumn(history, k, *r, m, tri);
    return tri;
}

Result<ReportingTriangle> triangleFromReleases(const std::vector<const Drop*>& releases,
                                               const std::string& region,
                                               const std::string& measure, int maxDelay) {
    Result<ReleaseHistory> history =
        ReleaseHistory::borrowing(releases, ReleaseHistory::Order::ByAsOf);
    if (!history)
        return history.error();
    return triangleFromReleases(*history, region, measure, maxDelay);
}

}  // namespace siftwave::nowcast
