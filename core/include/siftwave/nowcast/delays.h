#pragma once
// The reporting-delay distribution of a case list: report date minus event date, in days.
//
// Quantiles are Hyndman & Fan (1996, The American Statistician 50:361) type 7, the linear
// interpolation of R's and numpy's default. Over time the cases are grouped by their event
// date, by calendar month or in windows of `windowDays` days ending every `stepDays` days.
// A group whose event dates lie within `truncationDays` of the last report date is marked
// `truncated`: its long delays cannot have been seen yet, so its quantiles are biased short
// (right truncation; Lawless 1994). Cases with no report date or reported before their event
// are left out and counted (the scan's case_dates).

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/result.h"

#include <optional>
#include <string>
#include <vector>

namespace siftwave::nowcast {

struct DelaySummary {
    std::size_t cases = 0;
    double mean = 0;
    double q05 = 0, q25 = 0, median = 0, q75 = 0, q95 = 0;
    int max = 0;
};

struct DelayGroup {
    Date first;  // first and last event dates of the group (calendar bounds, inclusive)
    Date last;
    DelaySummary summary;
    bool truncated = false;  // long delays not seen yet: quantiles biased short
};

struct DelayOptions {
    enum class Grouping { Month, MovingWindow };
    Grouping grouping = Grouping::Month;
    int windowDays = 28;  // moving window: its length in days of event dates
    int stepDays = 7;     // moving window: days between the ends of two windows
    /// Days before the last report date within which a group counts as truncated; 0: the
    /// overall 95th percentile of the delays (common practice, no source).
    int truncationDays = 0;
    Status validate() const;
};

struct DelayReport {
    std::string region;  // verbatim; "" for every region together
    DelaySummary overall;
    std::vector<std::size_t> histogram;  // cases per delay in days, 0 .. max
    std::vector<DelayGroup> groups;
    Date lastReport;
    std::size_t casesLeftOut = 0;
};

/// Hyndman & Fan type 7 quantile of sorted values (p in [0, 1]); NaN when empty.
double quantileType7(const std::vector<int>& sorted, double p);

/// The delays of a case list's cases, of one region (index) or of all (nullopt).
Result<DelayReport> delayDistribution(const Drop& drop, std::optional<std::size_t> region,
                                      const DelayOptions& options = {});

}  // namespace siftwave::nowcast
