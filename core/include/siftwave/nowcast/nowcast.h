#pragma once
// The nowcast: at a date "now", the count each recent period will reach once its late reports
// are in, with a 95 % interval and the probability that nothing more will come.
//
// Method: the chain-ladder on the reporting triangle (triangle.h), written as the reverse-time
// discrete hazard of Kalbfleisch & Lawless (1991, JASA 86:1163) and Lawless (1994, Canadian
// Journal of Statistics 22:15). With C[t][d] the cases of period t reported within d periods,
// the reverse-time hazard of delay j (j = 1 .. D) is
//     g_j = P(delay = j | delay <= j)  estimated as  sum_t (C[t][j] - C[t][j-1]) / sum_t C[t][j]
// over the last `window` periods t whose C[t][j] is known (a moving window: the delays may change
// over time, and the estimate follows them within about `window` periods). The share of a
// period's eventual reports that are in after d periods is
//     F(d) = prod_{j=d+1..D} (1 - g_j),
// and the nowcast of a period with R reports after d < D periods is the chain-ladder R / F(d).
//
// Interval (documented choice, after Lawless 1994, section 4): the reports still to come, Y,
// are Poisson with mean lambda (1 - F) given the period's eventual mean lambda; with a Gamma
// posterior for lambda given R (shape R + 1/2: Jeffreys' prior for a Poisson mean) Y is
// negative binomial, P(Y = y) = Gamma(y + r) / (Gamma(r) y!) F^r (1 - F)^y, r = R + 1/2. The
// uncertainty of F from the window is added by mixing over F: log F is normal with the
// delta-method variance sum_j g_j / ((1 - g_j) n_j) (n_j the window's sum of C[t][j]), taken at
// `strata` equal-probability points. The interval is [R + y_lo, R + y_hi] from the mixture's
// (1 - level) / 2 and (1 + level) / 2 quantiles; the probability that the period is complete is
// the mixture's P(Y = 0). With more than 300 reports still expected the mixture is taken as
// normal with its mean and variance (common practice, no source).
//
// Delays that change over time (DelayModel; in the spirit of Hohle & an der Heiden 2014,
// Biometrics 70:993, who let the discrete-time hazard of the delay depend on event time through
// a logistic regression; here on the reverse-time hazards above): over the same window,
//     logit g_j(t) = a_j + b (t - now) / s,   s = 7 periods for daily data, 1 for weekly,
// fitted by maximum likelihood (binomial: of the C[t][j] cases of period t within delay j,
// C[t][j] - C[t][j-1] arrived at delay j; Newton's method). Each recent period t then has its own
// F(d; t), so a delay that shortens (or lengthens) over the window is followed to the latest
// periods instead of being averaged over the window. The delta-method variance of log F(d; t)
// is grad' I^-1 grad with I the Fisher information, d log(1 - g_j) / d a_j = -g_j and
// d / d b = -g_j (t - now) / s. DelayModel::Auto uses the trend only where the data show it:
// when the Wald test of b = 0 rejects at the 5 % level (|b| / se(b) > 1.96); otherwise the
// constant hazards above. On the real husO104Hosp list (cuts 2011-05-20..06-20, last 7 days)
// the constant hazards lost to the count reported so far and the trend beat it (README,
// "Reporting delays and nowcasts"; tests/core/nowcast_test.cpp).
//
// Caution: a nowcast assumes the delays seen so far continue. It estimates reports still to
// come for days already past; it is not a forecast of new infections. Defer to the responsible
// public-health authority.

#include "siftwave/nowcast/triangle.h"
#include "siftwave/result.h"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::nowcast {

/// The caution every front end shows with a nowcast (README, plot, figures, CLI).
extern const char* const kNowcastCaution;

/// How the delays may change over the window (see the header comment).
enum class DelayModel {
    Constant,  // one set of hazards over the window (the chain-ladder)
    Trend,     // logit-linear trend of the hazards in event time
    Auto,      // the trend where its Wald test rejects b = 0 at 5 %, else constant
};
const char* delayModelName(DelayModel model);  // "constant", "trend", "auto"
std::optional<DelayModel> delayModelFromName(std::string_view name);

struct NowcastOptions {
    /// Auto: the trend where the data show one (on husO104Hosp the constant hazards lost to the
    /// naive count; on generated data with steady delays Auto keeps the constant hazards ~95 %
    /// of the time, by the test's level).
    DelayModel delayModel = DelayModel::Auto;
    /// Event periods whose reports estimate each delay's hazard (the moving window). 0: 21 days
    /// or 6 weeks: on generated data whose delays shorten midway a 14-day window follows the
    /// change within three weeks and a 42-day one has not after four (nowcast_bench); the
    /// shorter, the noisier at a few cases a day (common practice, no source).
    int windowPeriods = 0;
    double level = 0.95;  // the interval's probability
    int strata = 40;      // points of F's distribution the interval mixes over
    /// A period whose share already reported is estimated below this is not nowcast: R / F
    /// explodes as F nears 0 (on husO104Hosp, periods with F < 0.1 had a mean absolute error
    /// of 88 cases against 10 for the count reported so far). nowcast, lo, hi are then NaN.
    double minShareReported = 0.1;

    Status validate() const;
    /// windowPeriods, or its default for the cadence.
    int window(const TimeAxis& axis) const;
};

struct NowcastRow {
    Date date;            // the period's first day
    double reported = 0;  // what is reported by now
    double nowcast = 0;   // the eventual count (= reported for a complete period)
    double lo = 0;        // the interval (level): = reported for a complete period
    double hi = 0;
    double shareReported = 1;  // F(d): the share of eventual reports in by now
    double pComplete = 1;      // probability that no more reports will come
    bool estimated = false;    // false: the period is D or more periods old (taken complete)
};

struct NowcastResult {
    std::string region;
    Date now;
    Cadence cadence = Cadence::Daily;
    int maxDelay = 0;  // D, in periods
    int window = 0;    // periods of the moving window
    double level = 0.95;
    std::vector<double> delayShare;  // F(d), d = 0 .. D, as estimated at now (constant model;
                                     // with a trend: for the period of now)
    DelayModel delayModel = DelayModel::Constant;  // the model used (never Auto)
    double trendPerWeek = 0;       // trend: b, the change of logit g_j per 7 days (1 week); else 0
    double trendZ = 0;             // b / se(b) (0 when not fitted)
    std::vector<NowcastRow> rows;  // every period of the triangle, oldest first
    std::size_t casesLeftOut = 0;

    /// "chain-ladder (reverse-time hazard), max delay 15 days, window 42 days; 3 of the last
    /// 15 days not yet complete by >5 %".
    std::string brief() const;
};

/// The nowcast of one region's triangle.
Result<NowcastResult> nowcast(const ReportingTriangle& triangle,
                              const NowcastOptions& options = {});

/// The same, with the delays (the hazards g_j and their variances) estimated from `delaysFrom`,
/// e.g. the regions' triangles summed (pooledTriangle): small regions then borrow the delay
/// distribution of all (common practice, no source). `delaysFrom` must have the triangle's
/// periods and maximum delay (a usage error otherwise).
Result<NowcastResult> nowcast(const ReportingTriangle& triangle,
                              const ReportingTriangle& delaysFrom, const NowcastOptions& options);

/// The cell-by-cell sum of triangles of one calendar and maximum delay (unknown where any is
/// unknown), region "(pooled)"; a usage error when they differ or there are none.
Result<ReportingTriangle> pooledTriangle(const std::vector<ReportingTriangle>& triangles);

}  // namespace siftwave::nowcast
