#pragma once
// The backlog estimate for one period (a day, or a week of weekly data): what
// the surrounding periods make plausible and how much more was reported. The
// scan's `backlog_dump` detector and the ledger's `redistribute --excess auto`
// use the same function.
//
// Baseline: a robust local trend from both sides (issue 14), with a weekday
// adjustment for daily data:
//   f_w        multiplicative weekday factors of the measure, pooled over all
//              regions by the ratio-to-moving-average method (weekday_effect.h);
//              all 1 for weekly data, where every period holds each weekday once
//   y_j        = x_j / f_{w(j)}, the weekday-adjusted values
//   sides      left: the `window` reported periods before t (before the gap or the
//              deficit just before t, when there is one); right: the `window`
//              periods after t (after a gap just after t and its catch-up)
//   m          the line through the two sides' medians (Hampel-style robust
//              location, Hampel 1974, JASA 69:383), evaluated at t
//   s          the larger of the sides' 1.4826 * MAD (a trend does not widen it)
//   expected   e = m * f_{w(t)}
//   scale      sigma = f_{w(t)} * max(sqrt(m + phi m^2), min(s, 1.5 sqrt(m + phi m^2)))
//              (negative-binomial noise; phi is the measure's pooled overdispersion,
//              estimateOverdispersion in core/src/scan/scan_input.h)
//   z          = (x_t - e) / sigma;  excess = x_t - e, rounded, never below 0
// Period t is a backlog dump when z >= threshold, excess >= min_excess and
// x_t >= min_ratio * e, and the excess is not sustained: growth is when the right
// side's median keeps at least a third of the rise of y_t over the left side's (the
// side before the deficit when there is one; needs 3 periods after t; never after a
// gap), and y_t is less than gap_threshold modelled noise sds above the right side's median
// (a dump at a wave's take-off: the next periods rise, but stay far below it). Growth is
// not reported and no count is to be moved. After a gap
// (at least `gap_min` periods just before t with no value, a zero, or at most
// gap_low_fraction of the surrounding level) z >= gap_threshold and x_t >= (1 +
// (min_ratio - 1) / 2) * e suffice. At least 4 neighbours are needed.
//
// The suggested window (WindowBasis): the gap; else the deficit before t: for each
// length L up to max_gap periods, the window's reports scaled up by the excess in
// proportion to them are compared with a geometric trend from the `window` periods
// before the window to the right side; the L whose restoration deviates least (mean
// squared, in noise sds) wins, and is offered when the window falls short of that trend
// by at least 1 noise sd (the left side of the trend at t then moves to before the
// window, and z needs only to reach halfway between threshold and gap_threshold); else
// nothing points to a window and the longest plausible one is offered (max_gap periods,
// with a note). Weights: proportional to the reported counts in a deficit window
// (a withheld share leaves the shape of the curve; tests/bench/scan_restore_bench measured
// it above the expected-level weights there), and by the expected level over a gap
// (redistribute's `level` method, ledger/decision.h: zeros have no shape, the trend
// between the periods around the gap and the weekday factors give it).
//
// Every window counts periods of the drop's cadence: `window_days`,
// `gap_min_days`, `max_gap_days`, `redistribute_days` for daily data,
// `window_weeks`, `gap_min_weeks`, `max_gap_weeks`, `redistribute_weeks` for
// weekly data (defaults and their reasons in scan_options.h).

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/result.h"
#include "siftwave/scan/scan_options.h"

#include <cstdint>
#include <optional>
#include <string_view>

namespace siftwave::scan {

/// What chose the suggested redistribution window.
enum class WindowBasis {
    Default,  // a period too small to be a dump: the `redistribute` periods before it
    Gap,      // the gap just before the period
    Deficit,  // the periods below their expected level before it
    Longest,  // nothing points to a window: the longest plausible one (max_gap periods)
};

struct BacklogEstimate {
    Date day;  // the period's first day
    std::int64_t observed = 0;
    double expected = 0;  // e above
    double scale = 0;     // sigma above
    double z = 0;
    std::int64_t excess = 0;       // round(observed - expected), at least 0
    int neighbours = 0;            // periods the baseline used
    std::optional<Date> gapFirst;  // the gap before the day, when there is one
    std::optional<Date> gapLast;
    Date windowFirst;  // suggested redistribution window (earlier periods, first days)
    Date windowLast;
    WindowBasis window = WindowBasis::Default;
    double deficit = 0;      // Deficit: the shortfall of the window below its expected level
    double levelBefore = 0;  // the trend's sides (medians, times the period's weekday factor)
    double levelAfter = 0;
    bool sustained = false;  // the next periods keep the rise: growth, not a dump
    bool flagged = false;    // meets every condition of the detector
};

/// The estimate for one region, measure and period: `day` may be any day of the
/// period (a date anywhere in a week selects that week). Errors: NotFound for an
/// unknown measure, region or a day outside the calendar; InvalidValue when the
/// period has no reported value or too few neighbours to form a baseline; Usage for
/// bad options. Uses options.backlogDump, and options.weekdayEffect for the weekday
/// factors (daily data), so it gives exactly what the scan reports for that period.
Result<BacklogEstimate> estimateBacklog(const Drop& drop, std::string_view measure,
                                        std::string_view region, Date day,
                                        const ScanOptions& options = {});

}  // namespace siftwave::scan
