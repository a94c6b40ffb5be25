#pragma once
// A release history: successive releases of one series, each kept whole (a Drop with its file,
// calendar and cells), and the one alignment of two releases' cells that everything comparing
// releases reads.
//
// Who reads it:
//   - the scan's revision detector (core/src/scan/revision.cpp) compares each release with the
//     one before it: `scan --previous P FILE` is the history of two releases {P, FILE} and
//     reports its newest pair; `scan --releases F1 F2 ...` reports every successive pair;
//   - the reporting triangle (nowcast/triangle.h) reads each release's count of each period of
//     the latest release's calendar: column as-of minus period of the triangle.
// Both go through ReleasePair: regions matched by verbatim code, measures by name, periods by
// date (the newer release's period t is the older release's period holding t's first day).
//
// "As of": a release is as of the first day of its last period (TimeAxis::lastStart()), the
// latest date it counts.

#include "siftwave/drop.h"
#include "siftwave/result.h"

#include <cstddef>
#include <cstdint>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace siftwave {

/// Two releases of one series, aligned cell by cell: the older one's cells in terms of the newer
/// one's measures, regions and periods. A view: both drops must outlive it. Cheap to make (no
/// table is built; lookups are hash lookups on demand).
class ReleasePair {
public:
    ReleasePair(const Drop& older, const Drop& newer);

    const Drop& older() const { return *m_older; }
    const Drop& newer() const { return *m_newer; }

    /// Both calendars count the same periods: one cadence, one week start, and period boundaries
    /// that fall on the same days. Only then do cells compare one to one.
    bool sameGrid() const { return m_sameGrid; }
    /// On the same grid and both with periods.
    bool comparable() const;
    /// The periods both releases count, as the newer release's period indices
    /// [firstCommon, lastCommon]; empty (lastCommon < firstCommon) when none or not comparable.
    std::int32_t firstCommon() const { return m_firstCommon; }
    std::int32_t lastCommon() const { return m_lastCommon; }

    /// The older release's index of the newer one's measure / region (nullopt: not there, the
    /// measure or region appeared since).
    std::optional<std::size_t> olderMeasure(std::size_t newerMeasure) const;
    std::optional<std::size_t> olderRegion(std::size_t newerRegion) const;
    /// Measures / region codes of the older release that the newer one no longer has.
    std::vector<std::string> measuresGone() const;
    std::vector<std::string> regionsGone() const;

    /// The older release's series of the newer one's measure m and region r (indexed by the
    /// older release's periods, see olderPeriod); empty when the older release lacks either.
    std::span<const Cell> olderSeries(std::size_t m, std::size_t r) const;
    /// The older release's period holding the first day of the newer one's period t (nullopt
    /// outside the older calendar).
    std::optional<std::int32_t> olderPeriod(std::int32_t t) const;

private:
    const Drop* m_older;
    const Drop* m_newer;
    bool m_sameGrid = false;
    std::int32_t m_firstCommon = 0;
    std::int32_t m_lastCommon = -1;
};

/// Successive releases of one series, oldest first, each kept whole.
class ReleaseHistory {
public:
    /// How the releases are put in order: as given (the order they were issued, e.g. the
    /// previous release and then the current one) or by their as-of date (stable: releases as
    /// of the same date keep the order given).
    enum class Order { AsGiven, ByAsOf };

    /// Error: no release, or a null one.
    static Result<ReleaseHistory> of(std::vector<std::shared_ptr<const Drop>> releases,
                                     Order order);
    /// The same over drops the caller keeps alive for the history's lifetime.
    static Result<ReleaseHistory> borrowing(const std::vector<const Drop*>& releases, Order order);

    std::size_t size() const { return m_releases.size(); }
    const Drop& release(std::size_t k) const { return *m_releases[k]; }
    const Drop& latest() const { return *m_releases.back(); }
    const std::vector<std::shared_ptr<const Drop>>& releases() const { return m_releases; }
    /// The first day of release k's last period (its latest date).
    Date asOf(std::size_t k) const { return m_releases[k]->axis.lastStart(); }

    /// Release k - 1 against release k (1 <= k < size()): what release k revised.
    ReleasePair successive(std::size_t k) const;
    /// Release k against the latest (k < size(); k = size() - 1 pairs the latest with itself):
    /// what release k counted for the latest's periods, the reporting triangle's column.
    ReleasePair againstLatest(std::size_t k) const;

private:
    std::vector<std::shared_ptr<const Drop>> m_releases;
};

}  // namespace siftwave
