// A release history and the alignment of two releases (release_history.h).
#include "siftwave/release_history.h"

#include <algorithm>

namespace siftwave {

ReleasePair::ReleasePair(const Drop& older, const Drop& newer) : m_older(&older), m_newer(&newer) {
    const TimeAxis& na = newer.axis;
    const TimeAxis& oa = older.axis;
    m_sameGrid = na.cadence() == oa.cadence() &&
                 (!na.weekly() || na.weekStart() == oa.weekStart()) &&
                 (na.first() - oa.first()) % na.periodDays() == 0;
    if (!comparable())
        return;
    const Date from = std::max(na.first(), oa.first());
    const Date to = std::min(na.lastStart(), oa.lastStart());
    if (to < from)
        return;
    m_firstCommon = na.periodOnGrid(from);
    m_lastCommon = na.periodOnGrid(to);
}

bool ReleasePair::comparable() const {
    return m_sameGrid && !m_newer->axis.empty() && !m_older->axis.empty();
}

std::optional<std::size_t> ReleasePair::olderMeasure(std::size_t newerMeasure) const {
    return m_older->measureIndex(m_newer->measures[newerMeasure]);
}

std::optional<std::size_t> ReleasePair::olderRegion(std::size_t newerRegion) const {
    return m_older->regionIndex(m_newer->regionCodes[newerRegion]);
}

std::vector<std::string> ReleasePair::measuresGone() const {
    std::vector<std::string> gone;
    for (const std::string& name : m_older->measures)
        if (!m_newer->measureIndex(name))
            gone.push_back(name);
    return gone;
}

std::vector<std::string> ReleasePair::regionsGone() const {
    std::vector<std::string> gone;
    for (const std::string& code : m_older->regionCodes)
        if (!m_newer->regionIndex(code))
            gone.push_back(code);
    return gone;
}

std::span<const Cell> ReleasePair::olderSeries(std::size_t m, std::size_t r) const {
    const std::optional<std::size_t> om = olderMeasure(m);
    const std::optional<std::size_t> orr = olderRegion(r);
    if (!om || !orr)
        return {};
    return m_older->series(*om, *orr);
}

std::optional<std::int32_t> ReleasePair::olderPeriod(std::int32_t t) const {
    return m_older->axis.periodOf(m_newer->axis.periodStart(t));
}

Result<ReleaseHistory> ReleaseHistory::of(std::vector<std::shared_ptr<const Drop>> releases,
                                          Order order) {
    if (releases.empty())
        return makeError(ErrorCode::Usage, "a release history needs at least one release");
    if (std::any_of(releases.begin(), releases.end(), [](const auto& d) { return !d; }))
        return makeError(ErrorCode::Usage,
                         "a release history was given a release that is not "
                         "there");
    if (order == Order::ByAsOf) {
        std::stable_sort(releases.begin(), releases.end(), [](const auto& a, const auto& b) {
            return a->axis.lastStart() < b->axis.lastStart();
        });
    }
    ReleaseHistory history;
    history.m_releases = std::move(releases);
    return history;
}

Result<ReleaseHistory> ReleaseHistory::borrowing(const std::vector<const Drop*>& releases,
                                                 Order order) {
    std::vector<std::shared_ptr<const Drop>> shared;
    shared.reserve(releases.size());
    // Aliasing pointers that own nothing: the caller keeps the drops alive.
    for (const Drop* d : releases)
        shared.push_back(d ? std::shared_ptr<const Drop>(std::shared_ptr<const Drop>(), d)
                           : nullptr);
    return of(std::move(shared), order);
}

ReleasePair ReleaseHistory::successive(std::size_t k) const {
    return ReleasePair(*m_releases[k - 1], *m_releases[k]);
}

ReleasePair ReleaseHistory::againstLatest(std::size_t k) const {
    return ReleasePair(*m_releases[k], latest());
}

}  // namespace siftwave
