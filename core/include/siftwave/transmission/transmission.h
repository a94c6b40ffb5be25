#pragma once
// Transmission measures of one region's cleaned counts, per period: the growth rate r(t) with
// the doubling or halving time (growth_rate.h) and the instantaneous reproduction number R_t
// by the method of Cori et al. 2013 (reproduction_number.h), on one time axis.
//
// Input: the cleaned series as the fit takes it (ledger::cleanedCounts: the ledger replayed over
// the drop; NaN where a cell holds no value).
//
// Weekly counts. The serial interval is given in days whatever the cadence; for weekly counts
// it is turned into whole-week lags by toWeeks() (serial_interval.h: each onset equally likely
// on any day of its week). A share W_0 of transmission pairs then falls within one week. It
// stays in the renewal sum, Lambda_t = W_0 I_t + W_1 I_{t-1} + ..., so that under steady growth
// the estimate keeps the relation R = 1 / sum_s W_s exp(-r s) of Wallinga & Lipsitch (2007)
// for the weekly distribution. Each estimate is labelled by its week and covers the window of
// `window` weeks ending on it. When W_0 > maxWithinPeriodShare (default 0.5: most
// transmission happens within a week, e.g. influenza's 2.6-day serial interval), the weekly
// counts say little about one generation against the next, and R_t is refused with that reason
// on every row (the growth rate is still given). Daily counts are never refused on this ground
// (W_0 = 0).
//
// The estimates depend on the assumed serial interval and on reporting staying alike over the
// window; `caution` says so wherever they are shown.

#include "siftwave/result.h"
#include "siftwave/time_axis.h"
#include "siftwave/transmission/growth_rate.h"
#include "siftwave/transmission/reproduction_number.h"
#include "siftwave/transmission/serial_interval.h"

#include <optional>
#include <span>
#include <string>
#include <vector>

namespace siftwave::transmission {

/// Shown with every transmission estimate (CLI output, the workbench panel, figures, reports).
inline constexpr char caution[] =
    "Growth rates and reproduction numbers are estimates from reported counts: they depend on "
    "the assumed serial interval and on testing and reporting staying alike over the window, and "
    "they lag behind infections. Do not act on them alone; defer to the responsible public-health "
    "authority and its methods.";

struct TransmissionOptions {
    GrowthOptions growth;  // its window is the same as cori's (setWindow)
    CoriOptions cori;
    /// The serial interval in days; without one there is r(t) but no R_t (reason on every row).
    std::optional<SerialInterval> serialInterval;
    /// Weekly counts: no R_t when more of the serial interval's weight than this falls within
    /// one week (W_0 above).
    double maxWithinPeriodShare = 0.5;

    /// The defaults for a cadence: a window of 7 days for daily counts (Cori et al. 2013's
    /// weekly windows), 4 weeks for weekly counts (common practice, no source: about a month,
    /// so that the dispersion has some degrees of freedom).
    static TransmissionOptions forCadence(Cadence cadence);
    /// Sets the window of both measures (periods).
    void setWindow(int periods) {
        growth.window = periods;
        cori.window = periods;
    }
    Status validate(Cadence cadence) const;
};

struct TransmissionRow {
    std::int32_t period = 0;  // index on the axis
    GrowthEstimate growth;
    CoriEstimate reproduction;
};

struct TransmissionResult {
    TimeAxis axis;
    TransmissionOptions options;
    /// The serial interval per period of the axis (weeks for weekly counts); empty without one.
    SerialInterval serialIntervalUsed;
    /// Set when R_t is refused for the whole series (weekly rule, no serial interval).
    std::string refusal;
    std::vector<TransmissionRow> rows;  // one per period

    /// One line: "window 7 days; serial interval gamma, mean 2.6 d, sd 1.5 d ...; prior mean 5,
    /// sd 5; ...".
    std::string settingsBrief() const;
};

/// Both measures for every period of `counts` (period i of `axis`). The options must be valid
/// for the axis's cadence.
TransmissionResult estimateTransmission(std::span<const double> counts, const TimeAxis& axis,
                                        const TransmissionOptions& options);

}  // namespace siftwave::transmission
