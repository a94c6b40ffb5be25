#pragma once
// Fitting one wave of a daily series: options, result, summary, and the model comparison.
//
// Pipeline (fitSeries):
//   1. the window: FitOptions::window (day indices) or the wave chosen among detectWaves();
//   2. the target: least squares (LSQ) fits the centred moving average of the model, A(K f),
//      to the *centred* moving average of the counts, A y (no lag, so peak dates are unbiased;
//      smoothing the model too keeps the width unbiased; days whose averaging window is
//      incomplete are left out); Poisson and negative-binomial maximum likelihood fit the raw daily
//      counts, optionally with one multiplicative factor per weekday (geometric mean 1);
//   3. the start: the model's linearisation (models.h); the solver: Levenberg-Marquardt
//      (levenberg_marquardt.h). Likelihood fits minimise the deviance, the sum of squared
//      deviance residuals (McCullagh & Nelder, "Generalized Linear Models", 2nd ed. 1989,
//      section 2.3), which is the same as maximising the likelihood; the negative-binomial
//      size r is then re-estimated by a one-dimensional search, alternating to convergence;
//   4. uncertainty: LSQ uses the sandwich (White 1980, Econometrica 48, 817-838) through the
//      smoothing operator: Cov = B^-1 (sum_k g_k g_k^T e_k^2) B^-1 with B = J^T J, g_k the
//      Jacobian rows smoothed back onto raw day k and e_k the raw-count residual, because
//      residuals of a moving average are correlated and s^2 (J^T J)^-1 would be too narrow.
//      Likelihood fits use the inverse observed information (numerical Hessian of the
//      log-likelihood). Intervals are estimate +- q se, q the 97.5% Student-t quantile with
//      n - p degrees of freedom (LSQ) or the normal quantile (likelihood). Derived quantities
//      get their standard errors by the delta method (numerical gradient); the intervals of
//      those that cannot be negative (peak incidence, K, the infectious load) are cut at 0 and
//      the fraction observed at [0, 1] (common practice, no source).
//   5. the fitted curve's pointwise interval (FitResult::fittedLower/fittedUpper, curveBand()):
//      the delta method applied to the incidence itself, h(theta) = K f(t; theta):
//          var(h(t)) ~= g(t)^T Cov g(t),   g(t) = d (K f(t)) / d theta at the estimate,
//      g the model's analytic Jacobian (models.h), Cov the covariance of step 4 (the sandwich for
//      LSQ, the inverse observed information for likelihood fits), and the interval
//      h(t) +- q sqrt(var) with the same quantile q as the parameter intervals (Student t with
//      n - p degrees of freedom for LSQ, normal for likelihood), cut at 0 below (incidence
//      cannot be negative; the cut keeps the coverage). Weekday factors, where estimated, scale
//      the fitted value and its interval and are treated as known (their own uncertainty is not
//      included). This is a confidence interval of the *mean* curve, not a prediction interval
//      for daily counts (those scatter far more). Sources: D. M. Bates & D. G. Watts,
//      "Nonlinear Regression Analysis and Its Applications" (1988), section 2.3 (approximate
//      inference bands for the expected response); G. Casella & R. L. Berger, "Statistical
//      Inference", 2nd ed. (2002), section 5.5.4 (the delta method) -- both cited from memory.
//   6. goodness of fit: R^2 and RMSE on the fitted target; AIC = -2 ln L + 2k and
//      AICc = AIC + 2k(k+1)/(n-k-1) (Burnham & Anderson, "Model Selection and Multimodel
//      Inference", 2nd ed. 2002, sections 2.2 and 2.4), with the Gaussian likelihood for LSQ
//      (k counts the variance). Compare AIC only between fits of the same window and target.
//
// Derived quantities (days are counted from the window's first day; FitResult::dateOf()):
//   peak day and incidence; wave size K; fraction observed = C(last day with data) / K; start
//   and end = quantiles of F (FitOptions::startQuantile/endQuantile); fastest growth = day of
//   the largest f'(t); doubling time = ln 2 / (d ln f / dt) at the start day; peak infectious
//   load = the largest rolling sum, over days d, of the fitted incidence of the W days ending
//   on d, sum_{k=0}^{W-1} K f(d - k) (W = infectiousWindowDays, default 14: people are
//   infectious for about ten days after infection -- common practice, no source), per 100,000
//   and as log10 of the population share when the population is known.

#include "siftwave/date.h"
#include "siftwave/fit/levenberg_marquardt.h"
#include "siftwave/fit/models.h"
#include "siftwave/fit/waves.h"
#include "siftwave/result.h"

#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace siftwave::fit {

/// Shown with every fit (CLI output, the fit pane, exported figures).
inline constexpr char caution[] =
    "A fitted curve describes reported counts under the assumption that conditions stayed "
    "constant. It is not a forecast to act on by itself; defer to the responsible public-health "
    "authority and its methods.";

enum class FitMethod {
    LeastSquares,      // "lsq": smoothed incidence
    Poisson,           // "poisson": raw counts, Poisson likelihood
    NegativeBinomial,  // "negbin": raw counts, negative-binomial likelihood (extra-Poisson noise)
};
const char* methodName(FitMethod method);
std::optional<FitMethod> methodFromName(std::string_view name);

enum class WaveChoice {
    Largest,  // the wave with the highest smoothed peak (default)
    Latest,   // the last wave of the series
    Index,    // FitOptions::waveIndex (0-based, time order)
};

struct FitOptions {
    ModelKind model = ModelKind::Gumbel;
    FitMethod method = FitMethod::LeastSquares;
    int smoothingWindow = 7;      // LSQ target: centred average of this many days (1: raw)
    bool weighted = false;        // LSQ: weights 1 / max(y, 1) (Poisson-like variance)
    bool weekdayFactors = false;  // likelihood fits: one factor per weekday
    std::optional<std::pair<int, int>> window;  // day indices first..last (inclusive); none: auto
    WaveChoice wave = WaveChoice::Largest;
    int waveIndex = 0;               // with WaveChoice::Index
    WaveDetectionOptions detection;  // for the automatic window
    double startQuantile = 0.025;    // wave start = this quantile of F
    double endQuantile = 0.975;      // wave end = this quantile of F
    int infectiousWindowDays = 14;   // W of the peak infectious load (common practice, no source)
    bool derivedIntervals = true;    // delta-method intervals for derived quantities
    // Solver: the defaults of levenberg_marquardt.h, but with the normal equations (wave fits
    // have 3-4 well-scaled parameters; the NIST checks use QR).
    SolverOptions solver{.linearSolver = LinearSolver::NormalEquations};

    /// Usage errors for inconsistent values (quantiles outside (0, 1), window reversed, ...).
    Status validate() const;
};

/// A value with its standard error and 95% interval (NaN when not available).
struct Estimate {
    double value = 0;
    double se = 0;
    double lower = 0;
    double upper = 0;
};

struct NamedEstimate {
    std::string name;
    Estimate estimate;
};

struct DerivedQuantities {
    Estimate peakDay;             // days from the window's first day
    Estimate peakIncidence;       // cases per day at the peak
    Estimate waveSize;            // K
    Estimate fractionObserved;    // C(last day with data) / K
    Estimate startDay;            // F = startQuantile
    Estimate endDay;              // F = endQuantile
    Estimate fastestGrowthDay;    // argmax f'
    Estimate doublingTimeDays;    // ln 2 / growth rate at the start day
    Estimate peakInfectiousLoad;  // max over days d of sum_{k<W} K f(d - k)
    std::optional<Estimate> peakInfectiousLoadPer100k;
    std::optional<Estimate> log10InfectiousShare;  // log10(load / population)
};

struct GoodnessOfFit {
    int observations = 0;  // days fitted
    int parameters = 0;    // k of AIC (model + weekday + dispersion [+ variance for LSQ])
    double rss = 0;        // on the fitted target
    double r2 = 0;
    double rmse = 0;
    double logLikelihood = 0;
    double aic = 0;
    double aicc = 0;
};

struct FitSummary {
    Termination termination = Termination::InvalidStart;
    int iterations = 0;
    int evaluations = 0;
    std::string message;
    std::vector<std::string> notes;  // e.g. "the peak is at the window's edge"

    bool converged() const { return isConverged(termination); }
    /// One line for the GUI, the ledger and the CLI.
    std::string brief() const;
};

struct FitResult {
    ModelKind model = ModelKind::Gumbel;
    FitMethod method = FitMethod::LeastSquares;
    Date seriesFirstDay;
    int first = 0;  // window, day indices into the series (inclusive)
    int last = 0;
    std::vector<NamedEstimate> parameters;  // model parameters in WaveModel::names() order
    std::vector<double> weekdayFactors;     // Monday..Sunday when estimated, else empty
    std::optional<double> dispersion;       // negative-binomial size r
    DerivedQuantities derived;
    GoodnessOfFit goodness;
    FitSummary summary;
    std::vector<double> fitted;  // model incidence for each window day (weekday factors applied)
    // Covariance of the model parameters (names() order), row-major p x p; empty when not
    // available (singular information).
    std::vector<double> covariance;
    // Pointwise 95% confidence interval of the fitted incidence for each window day (same length
    // as `fitted`), by the delta method: var(f(t)) = g(t)^T Cov g(t), g = d f / d theta (see
    // step 5 above). Empty when the covariance is unavailable.
    std::vector<double> fittedLower;
    std::vector<double> fittedUpper;
    std::vector<Wave> waves;  // every wave detected in the series
    FitOptions options;

    Date windowFirst() const { return seriesFirstDay + first; }
    Date windowLast() const { return seriesFirstDay + last; }
    /// The date of a day counted from the window's first day (rounded to the nearest day).
    Date dateOf(double day) const;
    /// Model parameter values in names() order.
    std::vector<double> parameterValues() const;
};

/// A plain daily series: counts[i] is day firstDay + i; NaN marks a missing day.
struct DailySeries {
    Date firstDay;
    std::span<const double> counts;
};

/// Fits one wave. Errors: usage (options), not_found (no wave / empty window), numerical
/// (the solver could not start). A fit that stops before convergence is returned with its
/// summary saying so.
Result<FitResult> fitSeries(const DailySeries& series, const FitOptions& options = {},
                            std::optional<double> population = std::nullopt);

/// The fitted incidence and its pointwise interval on days firstDay..lastDay (day indices into
/// the series, may extend past the window, e.g. to draw the curve over the whole plot).
struct CurveBand {
    int first = 0;               // day index of values[0]
    std::vector<double> fitted;  // the wave itself, K f(t): no weekday factors (draw this)
    std::vector<double> lower;   // empty when the covariance is unavailable
    std::vector<double> upper;
};

/// The band of step 5 (fit.h header) at confidence `level` (0 < level < 1; 0.95 matches the
/// parameter intervals). Usage errors: level outside (0, 1), lastDay < firstDay, more than
/// 100,000 days, or a fit without parameters.
Result<CurveBand> curveBand(const FitResult& fit, int firstDay, int lastDay, double level = 0.95);

struct ModelComparisonRow {
    ModelKind model = ModelKind::Gumbel;
    std::optional<FitResult> fit;  // empty when this model failed
    std::string error;             // why, when it failed
};

/// The four models on the same window and method, in kAllModels order.
std::vector<ModelComparisonRow> compareModels(const DailySeries& series, const FitOptions& options,
                                              std::optional<double> population = std::nullopt);

/// The comparison row with the lowest AICc among converged fits; nullptr when none.
const ModelComparisonRow* bestByAicc(const std::vector<ModelComparisonRow>& rows);

}  // namespace siftwave::fit
