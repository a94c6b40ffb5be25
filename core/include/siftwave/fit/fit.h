#pragma once
// Fitting one wave of a daily or weekly series: options, result, summary, and the model
// comparison.
//
// Periods. A series is a run of periods of L days, L = 1 (daily) or 7 (weekly,
// Series::periodDays). The model's time stays in days whatever the cadence (models.h): t = 0 is
// the first day of the window's first period, and the parameters, the peak, start and end days
// and every duration are in days, so a peak can fall inside a week. The model's expected count
// for period j of the window is its incidence summed over that period's days,
//     E_j = sum_{k<L} K f(j L + k)
// (WaveModel::countsOnPeriods; for L = 1 simply K f(j)). Everything below that speaks of "the
// counts", "the model" or "a period" means these per-period values; for daily data nothing
// changes.
//
// Pipeline (fitSeries):
//   1. the window: FitOptions::window (period indices) or the wave chosen among detectWaves();
//   2. the target: least squares (LSQ) fits the centred moving average of the model, A E, to the
//      *centred* moving average of the counts, A y (no lag, so peak dates are unbiased;
//      smoothing the model too keeps the width unbiased; periods whose averaging window is
//      incomplete are left out). The window is FitOptions::smoothingWindow periods, chosen per
//      cadence (FitOptions::forCadence): 7 days for daily counts (it removes the weekday
//      effect), 1 week for weekly counts, i.e. no smoothing: a weekly count already is a 7-day
//      sum with no weekday effect, and a wider average would drop a week at each end of a
//      season that is often only 10-20 weeks long. Poisson and negative-binomial maximum
//      likelihood fit the raw counts of each period, for daily counts optionally with one
//      multiplicative factor per weekday (geometric mean 1; weekly counts hold every weekday
//      once, so they have none);
//   3. the start: the model's linearisation (models.h) of the smoothed counts, as a rate per
//      day (weekly counts: each period's count divided by 7, interpolated linearly between the
//      middle days of the weeks); the solver: Levenberg-Marquardt
//      (levenberg_marquardt.h). Likelihood fits minimise the deviance, the sum of squared
//      deviance residuals (McCullagh & Nelder, "Generalized Linear Models", 2nd ed. 1989,
//      section 2.3), which is the same as maximising the likelihood; the negative-binomial
//      size r is then re-estimated by a one-dimensional search, alternating to convergence;
//   4. uncertainty: LSQ uses the sandwich (White 1980, Econometrica 48, 817-838) through the
//      smoothing operator: Cov = B^-1 (sum_k g_k g_k^T e_k^2) B^-1 with B = J^T J, g_k the
//      Jacobian rows smoothed back onto raw period k and e_k the raw-count residual, because
//      residuals of a moving average are correlated and s^2 (J^T J)^-1 would be too narrow.
//      Likelihood fits use the inverse observed information (numerical Hessian of the
//      log-likelihood). Intervals are estimate +- q se, q the 97.5% Student-t quantile with
//      n - p degrees of freedom (LSQ) or the normal quantile (likelihood). Derived quantities
//      get their standard errors by the delta method (numerical gradient); the intervals of
//      those that cannot be negative (peak incidence, K, the infectious load) are cut at 0 and
//      the fraction observed at [0, 1] (common practice, no source).
//   5. the fitted curve's pointwise interval (FitResult::fittedLower/fittedUpper, curveBand()):
//      the delta method applied to the expected count of each period itself, h(theta) = E_j:
//          var(h) ~= g^T Cov g,   g = d E_j / d theta at the estimate,
//      g the model's analytic Jacobian (models.h), Cov the covariance of step 4 (the sandwich for
//      LSQ, the inverse observed information for likelihood fits), and the interval
//      h +- q sqrt(var) with the same quantile q as the parameter intervals (Student t with
//      n - p degrees of freedom for LSQ, normal for likelihood), cut at 0 below (incidence
//      cannot be negative; the cut keeps the coverage). Weekday factors, where estimated, scale
//      the fitted value and its interval and are treated as known (their own uncertainty is not
//      included). This is a confidence interval of the *mean* curve, not a prediction interval
//      for the counts (those scatter far more). Sources: D. M. Bates & D. G. Watts,
//      "Nonlinear Regression Analysis and Its Applications" (1988), section 2.3 (approximate
//      inference bands for the expected response); G. Casella & R. L. Berger, "Statistical
//      Inference", 2nd ed. (2002), section 5.5.4 (the delta method) -- both cited from memory.
//   6. goodness of fit: R^2 and RMSE on the fitted target; AIC = -2 ln L + 2k and
//      AICc = AIC + 2k(k+1)/(n-k-1) (Burnham & Anderson, "Model Selection and Multimodel
//      Inference", 2nd ed. 2002, sections 2.2 and 2.4), with the Gaussian likelihood for LSQ
//      (k counts the variance). Compare AIC only between fits of the same window and target.
//
// Derived quantities (days are counted from the window's first day; FitResult::dateOf()):
//   peak day; peak incidence in cases per period (FitResult::incidenceUnit()): daily, K f at the
//   peak; weekly, the expected count of the 7 days centred on the peak day, sum_{k=-3}^{3}
//   K f(peak + k), what a week that has the peak in its middle would hold (7 K f(peak) would
//   overstate it, the curve being lower on either side of its top); wave size K in cases;
//   fraction observed = C(end of the last day with data) / K (for weekly data the last day of
//   the last week with a count); start and end = quantiles of F
//   (FitOptions::startQuantile/endQuantile); fastest growth = day of the largest f'(t);
//   model's doubling time = ln 2 / (d ln f / dt) at the fastest-growth day, in days; peak infectious load = the
//   largest rolling sum, over days d, of the fitted incidence of the W days ending on d,
//   sum_{k=0}^{W-1} K f(d - k) (W = infectiousWindowDays, default 14: people are infectious
//   for about ten days after infection -- common practice, no source), per 100,000 and as
//   log10 of the population share when the population is known. The load is read from the
//   model's daily curve for weekly data too (it is not two weekly counts added: its 14 days
//   need not begin on a week's first day), so it stays a number of cases in 14 days.

#include "siftwave/date.h"
#include "siftwave/fit/levenberg_marquardt.h"
#include "siftwave/fit/models.h"
#include "siftwave/fit/waves.h"
#include "siftwave/result.h"

#include <memory>
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

/// Which model a fit uses. Every front end (GUI, batch, CLI) passes the choice in FitOptions;
/// the fit applies it, so none of them compares AICc itself.
enum class ModelChoice {
    Given,       // FitOptions::model (default)
    LowestAicc,  // the four models on the same window and method (compareModels), keeping the
                 // converged fit with the lowest AICc (bestByAicc)
};

/// The defaults are those of daily series; FitOptions::forCadence(Cadence::Weekly) gives the
/// weekly ones (smoothingWindow 1, the weekly wave-detection thresholds of waves.h).
struct FitOptions {
    ModelKind model = ModelKind::Gumbel;  // with ModelChoice::Given
    ModelChoice modelChoice = ModelChoice::Given;
    FitMethod method = FitMethod::LeastSquares;
    int smoothingWindow = 7;      // LSQ target: centred average of this many periods (1: raw)
    bool weighted = false;        // LSQ: weights 1 / max(y, 1) (Poisson-like variance)
    bool weekdayFactors = false;  // likelihood fits on daily series: one factor per weekday
    std::optional<std::pair<int, int>> window;  // periods first..last (inclusive); none: auto
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

    /// The defaults for a cadence: daily, FitOptions{}; weekly, no smoothing (smoothingWindow 1,
    /// see step 2 above) and WaveDetectionOptions::forCadence(Cadence::Weekly).
    static FitOptions forCadence(Cadence cadence);
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
    Estimate peakDay;           // days from the window's first day
    Estimate peakIncidence;     // cases per period at the peak (FitResult::incidenceUnit())
    Estimate waveSize;          // K, cases
    Estimate fractionObserved;  // C(end of the last day with data) / K
    Estimate startDay;          // F = startQuantile
    Estimate endDay;            // F = endQuantile
    Estimate fastestGrowthDay;  // argmax f'
    // The model's instantaneous doubling time: ln 2 / (d log f / dt) at its fastest-growth day
    // (fastestGrowthDay). A property of the fitted curve's shape, not the growth the counts
    // showed (issue 15: the curve's relative growth falls from the start to the peak, so the
    // value depends on the day it is read; observedDoublingTimeDays is the one to brief).
    Estimate doublingTimeDays;
    // The doubling time to brief (issue 15): ln 2 / r of a log-linear Poisson regression
    // (quasi-Poisson when the counts are overdispersed) of the counts over the observed rise,
    // from the start day to the peak (or the last day with data before it), by the growth-rate
    // code of the transmission capability (transmission::growthRateAt, that one window), with
    // its 95% interval (upper +infinity when r's interval holds 0). NaN when the rise is too
    // short or holds too few cases (observedDoublingNote says why).
    Estimate observedDoublingTimeDays;
    int observedRiseFirst = 0;  // period indices into the series (inclusive)
    int observedRiseLast = -1;
    std::string observedDoublingNote;
    Estimate peakInfectiousLoad;  // max over days d of sum_{k<W} K f(d - k)
    std::optional<Estimate> peakInfectiousLoadPer100k;
    std::optional<Estimate> log10InfectiousShare;  // log10(load / population)
};

struct GoodnessOfFit {
    int observations = 0;  // periods fitted
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

/// Whether a fit can be briefed (issue 15). ok: converged and plausible. not_converged: the
/// solver stopped before convergence. implausible: converged, but the numbers cannot describe
/// the wave (FitResult::statusReasons says which check failed: the peak outside the window while
/// less than half the wave is observed; a size over 20 x the window's counts; a 95% interval of
/// the size or the peak incidence wider than the estimate itself, or none at all; a parameter at a
/// bound of its model's domain). no_wave: there was no wave to fit (the fitted curve stays above
/// half its top across the whole window, as on noise or a plateau; or a region's fit failed with
/// not_found).
enum class FitStatus { Ok, NotConverged, Implausible, NoWave };

/// "ok", "not_converged", "implausible", "no_wave" (stable names for JSON and CSV).
const char* fitStatusName(FitStatus status);
/// What to try for a status other than ok, to follow "try ": another window, model or method.
const char* fitStatusAdvice(FitStatus status);

struct FitResult {
    FitStatus status = FitStatus::Ok;
    std::vector<std::string> statusReasons;  // empty when ok
    ModelKind model = ModelKind::Gumbel;     // with ModelChoice::Given
    ModelChoice modelChoice = ModelChoice::Given;
    FitMethod method = FitMethod::LeastSquares;
    Date seriesFirstDay;
    int periodDays = 1;  // days per period of the series: 1 (daily) or 7 (weekly)
    int first = 0;       // window, period indices into the series (inclusive)
    int last = 0;
    std::vector<NamedEstimate> parameters;  // model parameters in WaveModel::names() order
    std::vector<double> weekdayFactors;     // Monday..Sunday when estimated, else empty
    std::optional<double> dispersion;       // negative-binomial size r
    DerivedQuantities derived;
    GoodnessOfFit goodness;
    FitSummary summary;
    // The model's expected count for each window period (weekday factors applied).
    std::vector<double> fitted;
    // Covariance of the model parameters (names() order), row-major p x p; empty when not
    // available (singular information).
    std::vector<double> covariance;
    // Pointwise 95% confidence interval of the expected count for each window period (same
    // length as `fitted`), by the delta method: var(E) = g^T Cov g, g = d E / d theta (see
    // step 5 above). Empty when the covariance is unavailable.
    std::vector<double> fittedLower;
    std::vector<double> fittedUpper;
    std::vector<Wave> waves;  // every wave detected in the series
    FitOptions options;

    /// First day of series period i.
    Date periodStart(int i) const { return seriesFirstDay + i * periodDays; }
    /// First day of the window (of its first period).
    Date windowFirst() const { return periodStart(first); }
    /// First day of the window's last period (the day that names it; for daily data its day).
    Date windowLast() const { return periodStart(last); }
    /// "day" or "week": the period of `fitted`, the band and the peak incidence.
    const char* incidenceUnit() const { return periodDays == 7 ? "week" : "day"; }
    /// The date of a day counted from the window's first day (rounded to the nearest day).
    Date dateOf(double day) const;
    /// Model parameter values in names() order.
    std::vector<double> parameterValues() const;
};

/// A plain series of counts per period: counts[i] holds the days firstDay + i * periodDays ..
/// firstDay + (i + 1) * periodDays - 1; NaN marks a missing period. From a Drop:
/// {drop.axis.first(), counts, drop.axis.periodDays()}.
struct Series {
    Date firstDay;
    std::span<const double> counts;
    int periodDays = 1;  // 1 (daily) or 7 (weekly); anything else is a usage error
};
/// The name from before weekly series, for callers that still use it.
using DailySeries = Series;

/// Fits one wave with the model options.modelChoice names. Errors: usage (options, a period that is
/// neither 1 nor 7 days, weekday factors on weekly counts), not_found (no wave / empty window),
/// numerical (the solver could not start). A fit that stops before convergence is returned with its
/// summary saying so. With ModelChoice::LowestAicc: numerical when no model converged (naming the
/// first model that failed and why, where one did).
Result<FitResult> fitSeries(const Series& series, const FitOptions& options = {},
                            std::optional<double> population = std::nullopt);

namespace detail {
struct FitBuffers;  // core/src/fit/fit_workspace.h
}

/// The scratch memory of a fit: the smoothed counts, the target, the start, the solver's
/// matrices (SolverWorkspace) and the covariance's sums. Made once per fit, or once per batch
/// worker and passed to each of its fits, it keeps its storage from one fit to the next, so a
/// batch allocates it once. A workspace serves one fit at a time (fits that run at once hold one
/// each), which makes re-entrancy a property of the arguments.
class FitWorkspace {
public:
    FitWorkspace();
    ~FitWorkspace();
    FitWorkspace(FitWorkspace&&) noexcept;
    FitWorkspace& operator=(FitWorkspace&&) noexcept;

    detail::FitBuffers& buffers() { return *m_buffers; }

private:
    std::unique_ptr<detail::FitBuffers> m_buffers;
};

/// fitSeries() with the scratch memory of `workspace` (the batch fit passes one per worker).
Result<FitResult> fitSeries(const Series& series, const FitOptions& options,
                            std::optional<double> population, FitWorkspace& workspace);

/// The expected count per period and its pointwise interval on periods firstDay..lastDay
/// (period indices into the series, may extend past the window, e.g. to draw the curve over the
/// whole plot): for daily series the incidence K f(t) of each day, for weekly series each week's
/// sum of it (fit.h header, "Periods").
struct CurveBand {
    int first = 0;               // period index of values[0]
    std::vector<double> fitted;  // the wave itself: no weekday factors (draw this)
    std::vector<double> lower;   // empty when the covariance is unavailable
    std::vector<double> upper;
};

/// The band of step 5 (fit.h header) at confidence `level` (0 < level < 1; 0.95 matches the
/// parameter intervals). Usage errors: level outside (0, 1), lastDay < firstDay, more than
/// 100,000 periods, or a fit without parameters.
Result<CurveBand> curveBand(const FitResult& fit, int firstDay, int lastDay, double level = 0.95);

struct ModelComparisonRow {
    ModelKind model = ModelKind::Gumbel;
    std::optional<FitResult> fit;  // empty when this model failed
    std::string error;             // why, when it failed
};

/// The four models on the same window and method, in kAllModels order (options.modelChoice
/// does not enter: each row fits its own model).
std::vector<ModelComparisonRow> compareModels(const Series& series, const FitOptions& options,
                                              std::optional<double> population = std::nullopt);

/// A fit and, where asked for, the comparison of the four models beside it.
struct ComparedFit {
    Result<FitResult> fit;                       // the model options.modelChoice names
    std::vector<ModelComparisonRow> comparison;  // kAllModels order; empty unless compared
};

/// fitSeries() with the comparison table when `compare`: the four models are fitted once and
/// the chosen fit is taken from them (with ModelChoice::Given the row of options.model, whose
/// failure is then a numerical error with the row's message). Without `compare` the same as
/// fitSeries(), with an empty comparison.
ComparedFit fitWithComparison(const Series& series, const FitOptions& options,
                              std::optional<double> population, bool compare);
/// The same with the scratch memory of `workspace`.
ComparedFit fitWithComparison(const Series& series, const FitOptions& options,
                              std::optional<double> population, bool compare,
                              FitWorkspace& workspace);

/// The comparison row with the lowest AICc among converged fits; nullptr when none.
const ModelComparisonRow* bestByAicc(const std::vector<ModelComparisonRow>& rows);

}  // namespace siftwave::fit
