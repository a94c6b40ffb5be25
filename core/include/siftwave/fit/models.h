#pragma once
// Wave models: the incidence curve K f(t; theta) of one outbreak wave.
//
// Time t is in days from the first day of the fit window (t = 0 on that day).
// Every model has a final size K (cases), a density f (per day) that integrates
// to one, its cumulative form C(t) = K F(t), an analytic Jacobian of the
// incidence with respect to the parameters, and a closed-form quantile of F
// (start and end dates of the wave). Incidence on day t is compared with
// K f(t) at the day itself.
//
// Periods longer than a day (weekly counts): the expected count of a period of
// L consecutive days d, d + 1, ..., d + L - 1 is the incidence summed over them,
//     E(period) = sum_{k=0}^{L-1} K f(d + k),
// the same day rule as above, so a weekly series made by summing a daily one is
// expected to hold exactly the sums of the daily model (countsOnPeriods()). It is
// the integral of K f over the period's days by the midpoint rule,
// C(d + L - 1/2) - C(d - 1/2), with day t covering t - 1/2 .. t + 1/2; the two
// differ by the sum of K f''(d + k) / 24 over the days (the midpoint rule's error:
// common practice, no source), under 1% of the peak week's count for curves at least
// 3 days wide (fit_weekly_test checks it). The Jacobian is the sum of the days' rows.
// Time, parameters, the peak and every duration stay in days.
//
// Gumbel (maximum, "type I extreme value"), parameters K, mu (days), beta (days, > 0):
//     z = (t - mu) / beta,   f(t) = exp(-z - exp(-z)) / beta,   F(t) = exp(-exp(-z))
//     mode mu, mean mu + gamma beta (gamma = 0.5772... Euler's constant), variance pi^2 beta^2 / 6,
//     quantile  t_q = mu - beta ln(-ln q).
//     Linearisation: -ln(-ln(C(t) / K)) = (t - mu) / beta is a straight line in t.
//     Source: NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.6.16
//     "Extreme Value Type I Distribution" (the maximum case).
//
// Logistic, parameters K, mu (days), s (days, > 0):
//     z = (t - mu) / s,   F(t) = 1 / (1 + exp(-z)),   f(t) = F (1 - F) / s
//     mode = median = mu, variance pi^2 s^2 / 3, quantile t_q = mu + s ln(q / (1 - q)).
//     Linearisation: ln(C / (K - C)) = (t - mu) / s.
//     Source: N. L. Johnson, S. Kotz & N. Balakrishnan, "Continuous Univariate Distributions",
//     vol. 2, 2nd ed. (1995), chapter 23 "Logistic distributions" (cited from memory).
//
// Richards (generalised logistic), parameters K, mu (days, the peak), s (days, > 0), a (> 0):
//     z = (t - mu) / s,   v = a exp(-z),   F(t) = (1 + v)^(-1/a),
//     f(t) = v (1 + v)^(-1/a - 1) / (a s)
//     The peak of f is at t = mu for every a, where F = (1 + a)^(-1/a): 1/2 for a = 1 (the
//     logistic), tending to 1/e as a -> 0 (the Gumbel). Quantile t_q = mu - s ln((q^-a - 1) / a).
//     Source: F. J. Richards (1959), "A flexible growth function for empirical use", Journal of
//     Experimental Botany 10(2), 290-300. This is the generalised logistic
//     K (1 + Q exp(-(t - M) / s))^(-1/nu) with Q = nu = a, the choice that puts the peak at M = mu.
//     Initial guess: the logistic linearisation, with a = 1.
//
// Log-normal, parameters K, mu (log-days), sigma (> 0). Time is counted from the day
// before the window: tau = t + 1 (> 0).
//     w = (ln tau - mu) / sigma,  f(t) = exp(-w^2 / 2) / (tau sigma sqrt(2 pi)),  F(t) = Phi(w)
//     mode tau = exp(mu - sigma^2), median exp(mu), quantile tau_q = exp(mu + sigma Phi^-1(q)).
//     Linearisation: Phi^-1(C / K) = (ln tau - mu) / sigma is a straight line in ln tau.
//     Source: NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.6.9 "Lognormal
//     Distribution"; its use for epidemic curves: P. E. Sartwell (1950), "The distribution of
//     incubation periods of infectious disease", American Journal of Hygiene 51, 310-318.

#include <array>
#include <optional>
#include <span>
#include <string_view>
#include <vector>

namespace siftwave::fit {

enum class ModelKind { Gumbel, Logistic, Richards, LogNormal };

/// "gumbel", "logistic", "richards", "lognormal".
const char* modelName(ModelKind kind);
std::optional<ModelKind> modelFromName(std::string_view name);
inline constexpr std::array<ModelKind, 4> kAllModels{ModelKind::Gumbel, ModelKind::Logistic,
                                                     ModelKind::Richards, ModelKind::LogNormal};

/// A wave model as a small value: parameters are passed as spans in the order of names().
/// The scratch memory of WaveModel::initialGuess(): the points used, their running cumulative,
/// and the points of the lines drawn through them. Kept by the caller (one per fit or batch
/// worker), so that thousands of starts allocate once; it serves one guess at a time.
struct GuessWorkspace {
    std::vector<double> t, y, cumulative;
    std::vector<double> xs, ys, g;
};

class WaveModel {
public:
    virtual ~WaveModel() = default;

    virtual ModelKind kind() const = 0;
    /// Parameter names, e.g. {"K", "mu", "beta"}.
    virtual std::span<const char* const> names() const = 0;
    int parameterCount() const { return static_cast<int>(names().size()); }
    /// False when the parameters are outside the model's domain (K <= 0, scale <= 0, ...).
    virtual bool valid(std::span<const double> p) const = 0;

    /// Incidence K f(t_i) for every t_i; when `jacobian` is not empty also its derivatives,
    /// row-major (t.size() x parameterCount()). Parameters must be valid(). Contract: p[0] is
    /// the size K and the incidence is K times a curve that does not depend on it, so Jacobian
    /// column 0 is exactly the incidence divided by K (the least-squares problem relies on it).
    virtual void incidence(std::span<const double> t, std::span<const double> p,
                           std::span<double> out, std::span<double> jacobian = {}) const = 0;
    /// Incidence on the consecutive days t0, t0 + 1, ..., t0 + out.size() - 1: the same values
    /// as incidence() on that grid (the Gumbel uses a recurrence for exp(-z) there, re-anchored
    /// every 32 days, which halves its exponentials).
    virtual void incidenceOnDays(double t0, std::span<const double> p, std::span<double> out,
                                 std::span<double> jacobian = {}) const;
    /// Expected counts of consecutive periods of `periodDays` days (1..7), the first starting on
    /// day t0: out[i] = sum_{k<periodDays} K f(t0 + i periodDays + k), and when `jacobian` is
    /// not empty its derivatives (row-major, out.size() x parameterCount()), each the sum of
    /// the days' rows (see the header comment). With periodDays 1 it is incidenceOnDays().
    void countsOnPeriods(double t0, int periodDays, std::span<const double> p,
                         std::span<double> out, std::span<double> jacobian = {}) const;
    /// The day of fastest growth (largest f') before the peak. Closed forms for the Gumbel,
    /// t = mu - beta ln((3 + sqrt 5)/2), and the logistic, t = mu - s ln(2 + sqrt 3) (zeros of
    /// f''); otherwise bisection on the sign of f'' (a central second difference) between the
    /// 1e-6 quantile and the peak.
    virtual double fastestGrowthTime(std::span<const double> p) const;
    /// Cumulative incidence K F(t).
    virtual double cumulative(double t, std::span<const double> p) const = 0;
    /// The day t at which F(t) = q, 0 < q < 1.
    virtual double quantileTime(double q, std::span<const double> p) const = 0;
    /// The day of peak incidence.
    virtual double peakTime(std::span<const double> p) const = 0;

    /// Initial guess by linearising the cumulative form (see the header comment) from
    /// incidence values y_i on days t_i (NaN skipped). nullopt when the data give no guess.
    /// `workspace` holds the points and lines on the way (one per fit or batch worker).
    virtual std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                            std::span<const double> y,
                                                            GuessWorkspace& workspace) const = 0;
    /// The same with a workspace of its own (for a single guess).
    std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                    std::span<const double> y) const;

    /// Incidence at one day (convenience).
    double incidenceAt(double t, std::span<const double> p) const;
};

/// The model object for a kind (stateless singletons).
const WaveModel& waveModel(ModelKind kind);

}  // namespace siftwave::fit
