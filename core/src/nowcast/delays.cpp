// The reporting-delay distribution (delays.h).
#include "siftwave/nowcast/delays.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

namespace siftwave::nowcast {

Status DelayOptions::validate() const {
    if (windowDays < 1 || stepDays < 1)
        return makeError(ErrorCode::Usage, "the window and its step must be at least 1 day");
    if (truncationDays < 0)
        return makeError(ErrorCode::Usage, "the truncation days must be 0 (default) or more");
    return Ok{};
}

double quantileType7(const std::vector<int>& sorted, double p) {
    if (sorted.empty())
        return std::numeric_limits<double>::quiet_NaN();
    const double h = (static_cast<double>(sorted.size()) - 1.0) * p;
    const auto lo = static_cast<std::size_t>(std::floor(h));
    const std::size_t hi = std::min(lo + 1, sorted.size() - 1);
    return sorted[lo] + (h - static_cast<double>(lo)) * (sorted[hi] - sorted[lo]);
}

namespace {

struct Delay {
    Date event;
    int days;
};

DelaySummary summarise(std::vector<int> delays) {
    DelaySummary s;
    s.cases = delays.size();
    if (delays.empty())
        return s;
    std::sort(delays.begin(), delays.end());
    s.mean = std::accumulate(delays.begin(), delays.end(), 0.0) / static_cast<double>(s.cases);
    s.q05 = quantileType7(delays, 0.05);
    s.q25 = quantileType7(delays, 0.25);
    s.median = quantileType7(delays, 0.5);
    s.q75 = quantileType7(delays, 0.75);
    s.q95 = quantileType7(delays, 0.95);
    s.max = delays.back();
    return s;
}

DelayGroup groupOf(const std::vector<Delay>& all, Date first, Date last) {
    std::vector<int> in;
    for (const Delay& d : all) {
        if (d.event >= first && d.event <= last)
            in.push_back(d.days);
    }
    return DelayGroup{first, last, summarise(std::move(in)), false};
}

Date monthStart(Date d) {
    return *Date::fromYmd(d.year(), d.month(), 1);
}

Date nextMonth(Date d) {
    return d.month() == 12 ? *Date::fromYmd(d.year() + 1, 1, 1)
                           : *Date::fromYmd(d.year(), d.month() + 1, 1);
}

std::vector<DelayGroup> groupsOf(const std::vector<Delay>& all, Date firstEvent, Date lastEvent,
                                 const DelayOptions& o) {
    std::vector<DelayGroup> groups;
    if (o.grouping == DelayOptions::Grouping::Month) {
        for (Date m = monthStart(firstEvent); m <= lastEvent; m = nextMonth(m))
            groups.push_back(groupOf(all, m, nextMonth(m) - 1));
        return groups;
    }
    for (Date end = firstEvent + (o.windowDays - 1);; end = end + o.stepDays) {
        const Date clipped = std::min(end, lastEvent);
        groups.push_back(groupOf(all, clipped - (o.windowDays - 1), clipped));
        if (end >= lastEvent)
            break;
    }
    return groups;
}

}  // namespace

Result<DelayReport> delayDistribution(const Drop& drop, std::optional<std::size_t> region,
                                      const DelayOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    if (!drop.caseList || drop.caseList->reportColumn.empty())
        return makeError(ErrorCode::Usage,
                         "reporting delays need a case list with an event and a report date "
                         "(name them with --event-col and --report-col)");
    DelayReport report;
    report.region = region ? drop.regionCodes[*region] : std::string();
    std::vector<Delay> all;
    for (const CaseRecord& c : drop.caseList->cases) {
        if (region && c.region != *region)
            continue;
        if (!c.hasReport || c.reportBeforeEvent) {
            ++report.casesLeftOut;
            continue;
        }
        all.push_back({c.event, c.report - c.event});
        report.lastReport = std::max(report.lastReport, c.report);
    }
    if (all.empty())
        return makeError(ErrorCode::NotFound, "no case has both an event and a report date");
    std::vector<int> days;
    for (const Delay& d : all)
        days.push_back(d.days);
    report.overall = summarise(days);
    report.histogram.assign(static_cast<std::size_t>(report.overall.max) + 1, 0);
    for (int d : days)
        ++report.histogram[static_cast<std::size_t>(d)];
    const auto [lo, hi] = std::minmax_element(
        all.begin(), all.end(), [](const Delay& a, const Delay& b) { return a.event < b.event; });
    report.groups = groupsOf(all, lo->event, hi->event, options);
    const int cut = options.truncationDays > 0 ? options.truncationDays
                                               : static_cast<int>(std::ceil(report.overall.q95));
    for (DelayGroup& g : report.groups)
        g.truncated = g.last > report.lastReport - cut;
    return report;
}

}  // namespace siftwave::nowcast
