#pragma once
// The reporting triangle: for each event period t and each delay d (in periods), how many
// cases of period t had been reported within d periods, as known at a date "now".
//
// Cumulative form (the chain-ladder's; Kalbfleisch & Lawless 1991, Lawless 1994):
//   C[t][d] = cases of period t reported with a delay of at most d periods, d = 0 .. D-1;
//   C[t][D] = cases of period t reported by now, known once now - t >= D (the last column holds
//             every report at delay D or later, so an old period's count is what was reported).
// A cell is known when its delay has passed by now (t + d <= now) and, for a release history,
// when a release existed at t + d. D is the maximum delay: the nowcast estimates the count a
// period reaches after D periods, and takes any period D or more periods old as complete.
//
// Two sources give the same triangle:
//   - a case list (Drop::caseList): each case with an event and a report date (in periods of the
//     drop's axis: delay = period of the report - period of the event) and reported by now;
//     cases with no report date or reported before their event stay out (the scan's case_dates);
//   - a release history (release_history.h): successive releases of one series, release k
//     holding the counts as of its last period a_k. Then C[t][a_k - t] = release k's count of
//     period t (Lawless 1994's "reporting triangle" from successive data). Release k's counts
//     are read through ReleasePair(k, latest), the same alignment of two releases' cells the
//     scan's revision detector compares (`scan --previous` is a history of two releases), so
//     the triangle's two newest columns hold exactly the old and new values of its revisions.
//     Releases must come one per period in the history's order (a daily series a release a
//     day, a weekly one a week); a missing release is an error naming the gap.

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/release_history.h"
#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <cmath>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <vector>

namespace siftwave::nowcast {

struct ReportingTriangle {
    TimeAxis axis;                   // the event periods: the source's first period to now's
    std::int32_t nowPeriod = 0;      // the period that holds "now" (the axis's last)
    Date now;                        // the date the triangle is as of
    int maxDelay = 0;                // D, in periods
    std::string region;              // the region code, verbatim
    std::size_t casesLeftOut = 0;    // case list: cases with no usable report date
    std::vector<double> cumulative;  // periods x (D + 1), row-major; NaN where unknown

    std::int32_t periods() const { return axis.periods(); }
    double at(std::int32_t t, int d) const {
        return cumulative[static_cast<std::size_t>(t) * static_cast<std::size_t>(maxDelay + 1) +
                          static_cast<std::size_t>(d)];
    }
    double& at(std::int32_t t, int d) {
        return cumulative[static_cast<std::size_t>(t) * static_cast<std::size_t>(maxDelay + 1) +
                          static_cast<std::size_t>(d)];
    }
    bool known(std::int32_t t, int d) const { return !std::isnan(at(t, d)); }
    /// Periods since t as of now: the delay observed so far.
    int elapsed(std::int32_t t) const { return nowPeriod - t; }
    /// What is reported for period t by now (the last known cell of its row).
    double reported(std::int32_t t) const;
};

/// The latest usable report date of a case list (the default "now"); the first period's day when
/// it has none.
Date lastReportDate(const Drop& drop);

/// The maximum delay, in periods, chosen from a case list: the smallest d that covers 99 % of
/// the delays of the cases reported by `now` (common practice, no source), at least 1.
int maxDelayFromCases(const Drop& drop, Date now);

/// The triangle of one region of a case list as of `now` (a date on or after the first
/// event). `maxDelay` in periods; 0 chooses it (maxDelayFromCases).
Result<ReportingTriangle> triangleFromCases(const Drop& drop, std::size_t region, Date now,
                                            int maxDelay = 0);

/// The triangle of one region and measure from a release history, oldest first (now is the
/// latest's as-of date). `maxDelay` in periods; 0 chooses the number of releases less one, at
/// most 28 days (8 weeks) (common practice, no source). The releases share a cadence; the region
/// and measure must be in the latest release; a region missing from an older release counts as
/// 0 there. Every release must have the measure.
Result<ReportingTriangle> triangleFromReleases(const ReleaseHistory& history,
                                               const std::string& region,
                                               const std::string& measure, int maxDelay = 0);
/// The same over releases in any order (put in order of their as-of dates), kept alive by the
/// caller.
Result<ReportingTriangle> triangleFromReleases(const std::vector<const Drop*>& releases,
                                               const std::string& region,
                                               const std::string& measure, int maxDelay = 0);

}  // namespace siftwave::nowcast
