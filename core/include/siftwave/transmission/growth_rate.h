#pragma once
// The epidemic growth rate r(t) over a sliding window, with the doubling or halving time.
//
// Model. For the window of `window` periods ending on period t (periods t-window+1 .. t), the
// counts y_i are Poisson with log-linear mean
//     log mu_i = alpha + r x_i  [+ gamma_{weekday(i)}],
// x_i the first day of period i in days from the window's first, so r is per day on daily and
// weekly counts alike. The optional weekday terms (daily counts only) are six indicators, one
// per weekday but the window's first, and need a window of at least 14 days. The fit is
// iteratively reweighted least squares (McCullagh & Nelder 1989, Generalized Linear Models,
// 2nd ed., section 2.5), started from the least-squares line of log(y + 0.5).
//
// Uncertainty. The Poisson standard error of r comes from the inverse Fisher information. The
// dispersion phi = Pearson chi^2 / (n - p) (McCullagh & Nelder, section 4.5.2) is reported;
// when phi > 1 the counts are overdispersed and the fit is quasi-Poisson: the standard error is
// multiplied by sqrt(phi) and the 95% interval uses Student t with n - p degrees of freedom
// (as a quasi-likelihood fit is summarised; common practice). When phi <= 1 the Poisson
// error and the normal quantile stand: the error is only ever inflated, never shrunk.
//
// Doubling and halving time. While r > 0 the doubling time is ln 2 / r days, its interval
// [ln 2 / r_hi, ln 2 / r_lo]; while r < 0 the halving time is ln 2 / |r| with interval
// [ln 2 / |r_lo|, ln 2 / |r_hi|]. Where r's interval holds 0 the far end is +infinity (open:
// the data do not exclude no growth at all).
//
// No estimate (the reason is a sentence): fewer than `window` periods so far; a missing count
// in the window; fewer than `minCases` cases in the window; a regression that does not
// converge (counts concentrated at one end of the window, e.g. only the last period non-zero).

#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <limits>
#include <span>
#include <string>
#include <vector>

namespace siftwave::transmission {

inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

/// A value with its 95% interval; `upper` may be +infinity (open-ended).
struct Interval {
    double value = kNaN;
    double lower = kNaN;
    double upper = kNaN;
};

struct GrowthOptions {
    /// Periods in the window ending on t (default 7: a week of daily counts). At least 3, so
    /// that the dispersion has a degree of freedom; at least 14 with weekday terms.
    int window = 7;
    /// Six weekday indicators in the regression (daily counts only).
    bool weekdayTerms = false;
    /// No estimate when the window holds fewer cases (common practice, no source: a log-linear
    /// slope from a handful of cases is mostly noise).
    double minCases = 10.0;

    Status validate(Cadence cadence) const;
};

struct GrowthEstimate {
    Interval r;                 // per day
    double se = kNaN;           // of r, per day, after the dispersion (quasi-Poisson)
    double dispersion = kNaN;   // Pearson chi^2 / (n - p); NaN when n == p
    bool quasiPoisson = false;  // dispersion > 1: the error was inflated by sqrt(dispersion)
    Interval doublingDays;      // while r > 0 (else NaN)
    Interval halvingDays;       // while r < 0 (else NaN)
    std::string reason;         // why there is no estimate; empty when there is one

    bool ok() const { return reason.empty(); }
};

/// One estimate per period of `counts` (period i of `axis`; NaN counts are missing). The
/// options must be valid for the axis's cadence.
std::vector<GrowthEstimate> growthRates(std::span<const double> counts, const TimeAxis& axis,
                                        const GrowthOptions& options);

/// The one estimate of the window ending on period `t` (0 <= t < counts.size()): what
/// growthRates() gives at t, by the same regression, without the other periods' windows (for
/// one number per wave, such as the fit's doubling time on the observed rise).
GrowthEstimate growthRateAt(std::span<const double> counts, const TimeAxis& axis, std::int32_t t,
                            const GrowthOptions& options);

}  // namespace siftwave::transmission
