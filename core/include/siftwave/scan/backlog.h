#pragma once
// The backlog estimate for one day: what the surrounding days make plausible
// and how much more was reported. The scan's `backlog_dump` detector and the
// ledger's `redistribute --excess auto` use the same function.
//
// Baseline (a Hampel-style robust identifier, Hampel 1974, JASA 69:383;
// Pearson 2002, IEEE Trans. Control Systems Technology 10:55, with a weekday
// adjustment):
//   f_w        multiplicative weekday factors of the measure, pooled over all
//              regions by the ratio-to-moving-average method (weekday_effect.h)
//   y_j        = x_j / f_{w(j)}, the weekday-adjusted neighbours: the `window_days`
//              reported days on each side of day t, never day t itself, and never
//              the days of a gap just before t (zeros, low values or no value)
//   m          = median(y_j)
//   s          = 1.4826 * median(|y_j - m|)           (MAD scaled to a normal sd)
//   expected   e = m * f_{w(t)}
//   scale      sigma = f_{w(t)} * max(s, sqrt(m + phi m^2))
//              (never below negative-binomial noise; phi is the measure's pooled
//              overdispersion, estimateOverdispersion in core/src/scan/scan_input.h)
//   z          = (x_t - e) / sigma
//   excess     = x_t - e, rounded to an integer count, never below 0
// Day t is a backlog dump when z >= threshold, excess >= min_excess and
// x_t >= min_ratio * e. After a gap (at least gap_min_days days just before t
// with no value, a zero, or at most gap_low_fraction of the surrounding level)
// the gap is evidence already: z >= gap_threshold and x_t >= (1 + (min_ratio -
// 1) / 2) * e suffice. The baseline then uses the window_days days before the
// gap and after t. The suggested redistribution window is the gap, or else the
// redistribute_days days before t. At least 4 neighbours are needed.

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/result.h"
#include "siftwave/scan/scan_options.h"

#include <cstdint>
#include <optional>
#include <string_view>

namespace siftwave::scan {

struct BacklogEstimate {
    Date day;
    std::int64_t observed = 0;
    double expected = 0;  // e above
    double scale = 0;     // sigma above
    double z = 0;
    std::int64_t excess = 0;       // round(observed - expected), at least 0
    int neighbours = 0;            // days the baseline used
    std::optional<Date> gapFirst;  // the gap before the day, when there is one
    std::optional<Date> gapLast;
    Date windowFirst;  // suggested redistribution window (earlier days)
    Date windowLast;
    bool flagged = false;  // meets every condition of the detector
};

/// The estimate for one region, measure and day. Errors: NotFound for an unknown
/// measure, region or a day outside the calendar; InvalidValue when the day has no
/// reported value or too few neighbours to form a baseline; Usage for bad options.
/// Uses options.backlogDump, and options.weekdayEffect for the weekday factors, so
/// it gives exactly what the scan reports for that day.
Result<BacklogEstimate> estimateBacklog(const Drop& drop, std::string_view measure,
                                        std::string_view region, Date day,
                                        const ScanOptions& options = {});

}  // namespace siftwave::scan
