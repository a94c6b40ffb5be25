#include "fit/likelihood.h"

#include <Eigen/Dense>
#include <boost/math/special_functions/digamma.hpp>

#include <algorithm>
#include <cmath>
#include <limits>

namespace siftwave::fit::detail {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kPoissonSize = std::numeric_limits<double>::infinity();

struct Observations {
    std::vector<double> t, y;  // t: period index from the window's first period
    std::vector<int> weekday;  // 0 = Monday .. 6 = Sunday (daily counts; 0 for weekly ones)
    int periodDays = 1;        // days per period: 1 or 7
};

// Mean parameters: theta (model) then, with weekday factors, gamma_1..gamma_6.
class MeanModel {
public:
    MeanModel(const WaveModel& model, const Observations& obs, bool weekdays)
        : m_model(model),
          m_obs(obs),
          m_weekdays(weekdays),
          m_np(model.parameterCount()),
          m_f(obs.t.size()),
          m_jf(obs.t.size() * static_cast<std::size_t>(m_np)) {}

    int size() const { return m_np + (m_weekdays ? 6 : 0); }
    int modelSize() const { return m_np; }

    /// lambda_i and, when grad is not empty, d lambda_i / dx (row-major n x size()).
    bool evaluate(std::span<const double> x, std::vector<double>& lambda,
                  std::span<double> grad) const {
        const auto theta = x.first(static_cast<std::size_t>(m_np));
        if (!m_model.valid(theta))
            return false;
        if (m_obs.periodDays == 1) {
            m_model.incidence(m_obs.t, theta, m_f,
                              grad.empty() ? std::span<double>{} : std::span<double>(m_jf));
        } else {
            expectedCountsOfPeriods(theta, !grad.empty());
        }
        std::array<double, 7> factor{};
        factor.fill(1.0);
        if (m_weekdays) {
            double sum = 0;
            for (int k = 0; k < 6; ++k) {
                factor[static_cast<std::size_t>(k)] =
                    std::exp(x[static_cast<std::size_t>(m_np + k)]);
                sum += x[static_cast<std::size_t>(m_np + k)];
            }
            factor[6] = std::exp(-sum);
        }
        const std::size_t q = static_cast<std::size_t>(size());
        lambda.resize(m_obs.t.size());
        for (std::size_t i = 0; i < m_obs.t.size(); ++i) {
            const int d = m_obs.weekday[i];
            const double w = factor[static_cast<std::size_t>(d)];
            lambda[i] = std::max(m_f[i] * w, 1e-12);
            if (grad.empty())
                continue;
            double* row = &grad[i * q];
            for (int j = 0; j < m_np; ++j)
                row[j] = m_jf[i * static_cast<std::size_t>(m_np) + static_cast<std::size_t>(j)] * w;
            if (m_weekdays) {
                for (int k = 0; k < 6; ++k) {
                    row[m_np + k] = lambda[i] * ((d == k ? 1.0 : 0.0) - (d == 6 ? 1.0 : 0.0));
                }
            }
        }
        return true;
    }
    std::array<double, 7> factors(std::span<const double> x) const {
        std::array<double, 7> f{};
        f.fill(1.0);
        if (!m_weekdays)
            return f;
        double sum = 0;
        for (int k = 0; k < 6; ++k) {
            f[static_cast<std::size_t>(k)] = std::exp(x[static_cast<std::size_t>(m_np + k)]);
            sum += x[static_cast<std::size_t>(m_np + k)];
        }
        f[6] = std::exp(-sum);
        return f;
    }

private:
    // m_f (and m_jf) for periods of several days: the model's count of each observed period.
    void expectedCountsOfPeriods(std::span<const double> theta, bool withJacobian) const {
        const int L = m_obs.periodDays;
        const std::size_t np = static_cast<std::size_t>(m_np);
        for (std::size_t i = 0; i < m_obs.t.size(); ++i) {
            m_model.countsOnPeriods(
                m_obs.t[i] * L, L, theta, std::span<double>(&m_f[i], 1),
                withJacobian ? std::span<double>(&m_jf[i * np], np) : std::span<double>{});
        }
    }

    const WaveModel& m_model;
    const Observations& m_obs;
    bool m_weekdays;
    int m_np;
    mutable std::vector<double> m_f, m_jf;
};

double unitDeviance(double y, double lambda, double r) {
    const double ylog = y > 0 ? y * std::log(y / lambda) : 0.0;
    if (!std::isfinite(r))
        return 2.0 * (ylog - (y - lambda));
    return 2.0 * (ylog - (y + r) * std::log((y + r) / (lambda + r)));
}

// d l_i / d lambda_i.
double scoreLambda(double y, double lambda, double r) {
    if (!std::isfinite(r))
        return y / lambda - 1.0;
    return (y - lambda) * r / (lambda * (lambda + r));
}

double logLikelihood(const std::vector<double>& y, const std::vector<double>& lambda, double r) {
    double l = 0;
    for (std::size_t i = 0; i < y.size(); ++i) {
        if (!std::isfinite(r)) {
            l += y[i] * std::log(lambda[i]) - lambda[i] - std::lgamma(y[i] + 1.0);
        } else {
            l += std::lgamma(y[i] + r) - std::lgamma(r) - std::lgamma(y[i] + 1.0) +
                 r * std::log(r / (r + lambda[i])) + y[i] * std::log(lambda[i] / (r + lambda[i]));
        }
    }
    return l;
}

class DevianceProblem final : public LeastSquaresProblem {
public:
    DevianceProblem(const MeanModel& mean, const Observations& obs, double r)
        : m_mean(mean),
          m_obs(obs),
          m_r(r),
          m_grad(obs.t.size() * static_cast<std::size_t>(mean.size())) {}
    int residualCount() const override { return static_cast<int>(m_obs.t.size()); }
    int parameterCount() const override { return m_mean.size(); }
    bool evaluate(std::span<const double> x, std::span<double> res,
                  std::span<double> jac) const override {
        if (!m_mean.evaluate(x, m_lambda,
                             jac.empty() ? std::span<double>{} : std::span<double>(m_grad))) {
            return false;
        }
        const std::size_t q = static_cast<std::size_t>(m_mean.size());
        for (std::size_t i = 0; i < m_obs.t.size(); ++i) {
            const double y = m_obs.y[i], lam = m_lambda[i];
            const double dev = std::max(0.0, unitDeviance(y, lam, m_r));
            const double d = (y >= lam ? 1.0 : -1.0) * std::sqrt(dev);
            res[i] = d;
            if (jac.empty())
                continue;
            const double variance = std::isfinite(m_r) ? lam * (1.0 + lam / m_r) : lam;
            const double dd = std::abs(y - lam) < 1e-6 * (lam + 1.0)
                                  ? -1.0 / std::sqrt(variance)
                                  : -scoreLambda(y, lam, m_r) / d;
            for (std::size_t j = 0; j < q; ++j)
                jac[i * q + j] = dd * m_grad[i * q + j];
        }
        return true;
    }

private:
    const MeanModel& m_mean;
    const Observations& m_obs;
    double m_r;
    mutable std::vector<double> m_lambda;
    mutable std::vector<double> m_grad;
};

// Score of the full log-likelihood in (x, ln r).
bool score(const MeanModel& mean, const Observations& obs, std::span<const double> x, double r,
           bool withSize, Eigen::VectorXd& out) {
    std::vector<double> lambda;
    std::vector<double> grad(obs.t.size() * static_cast<std::size_t>(mean.size()));
    if (!mean.evaluate(x, lambda, grad))
        return false;
    const int q = mean.size();
    out = Eigen::VectorXd::Zero(q + (withSize ? 1 : 0));
    for (std::size_t i = 0; i < obs.t.size(); ++i) {
        const double s = scoreLambda(obs.y[i], lambda[i], r);
        for (int j = 0; j < q; ++j)
            out[j] += s * grad[i * static_cast<std::size_t>(q) + static_cast<std::size_t>(j)];
        if (withSize) {
            const double y = obs.y[i], lam = lambda[i];
            out[q] += r * (boost::math::digamma(y + r) - boost::math::digamma(r) +
                           std::log(r / (r + lam)) + 1.0 - (y + r) / (r + lam));
        }
    }
    return true;
}

}  // namespace

namespace {

// The window's counts that enter the likelihood: finite and not negative (a negative value is a
// correction, not a count), rounded, with their day and weekday.
Observations observationsIn(const Series& series, int first, int last) {
    Observations obs;
    obs.periodDays = series.periodDays;
    const bool daily = series.periodDays == 1;
    for (int i = first; i <= last; ++i) {
        const double v = series.counts[static_cast<std::size_t>(i)];
        if (!std::isfinite(v) || v < 0)
            continue;  // missing, or a negative correction
        obs.t.push_back(i - first);
        obs.y.push_back(std::round(v));
        obs.weekday.push_back(daily ? (series.firstDay + i).isoWeekday() - 1 : 0);
    }
    return obs;
}

// The negative-binomial size that maximises the profile log-likelihood at the means `lambda`:
// golden-section search in ln r over [ln 0.01, ln 1e7].
double mostLikelyLogSize(const Observations& obs, const std::vector<double>& lambda) {
    auto profile = [&](double lr) { return logLikelihood(obs.y, lambda, std::exp(lr)); };
    double a = std::log(1e-2), b = std::log(1e7);
    const double g = (std::sqrt(5.0) - 1.0) / 2.0;
    double c = b - g * (b - a), d = a + g * (b - a);
    double fc = profile(c), fd = profile(d);
    while (b - a > 1e-6) {
        if (fc > fd) {
            b = d;
            d = c;
            fd = fc;
            c = b - g * (b - a);
            fc = profile(c);
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + g * (b - a);
            fd = profile(d);
        }
    }
    return 0.5 * (a + b);
}

// The model parameters' block (np x np) of the inverse observed information, the Hessian of
// the log-likelihood by central differences of the score in every parameter (mean, weekday and
// ln r); NaN when the information is not positive definite.
std::vector<double> observedInformationCovariance(const MeanModel& mean, const Observations& obs,
                                                  const std::vector<double>& x, double r,
                                                  bool negbin, int np) {
    const int q = mean.size() + (negbin ? 1 : 0);
    Eigen::MatrixXd hessian(q, q);
    bool hessianOk = true;
    for (int j = 0; j < q && hessianOk; ++j) {
        std::vector<double> xu = x, xd = x;
        double ru = r, rd = r;
        double step;
        if (j < mean.size()) {
            step = 1e-5 * std::max(std::abs(x[static_cast<std::size_t>(j)]), 1e-2);
            xu[static_cast<std::size_t>(j)] += step;
            xd[static_cast<std::size_t>(j)] -= step;
        } else {
            step = 1e-4;
            ru = r * std::exp(step);
            rd = r * std::exp(-step);
        }
        Eigen::VectorXd su, sd;
        hessianOk = score(mean, obs, xu, ru, negbin, su) && score(mean, obs, xd, rd, negbin, sd);
        if (hessianOk)
            hessian.col(j) = (su - sd) / (2 * step);
    }
    std::vector<double> covariance(static_cast<std::size_t>(np * np), kNaN);
    if (!hessianOk)
        return covariance;
    const Eigen::MatrixXd info = -0.5 * (hessian + hessian.transpose());
    Eigen::LDLT<Eigen::MatrixXd> ldlt(info);
    if (ldlt.info() != Eigen::Success || !ldlt.isPositive())
        return covariance;
    const Eigen::MatrixXd cov = ldlt.solve(Eigen::MatrixXd::Identity(q, q));
    bool positive = true;
    for (int j = 0; j < np; ++j)
        positive = positive && cov(j, j) > 0;
    if (positive && cov.allFinite()) {
        for (int a = 0; a < np; ++a) {
            for (int b = 0; b < np; ++b)
                covariance[static_cast<std::size_t>(a * np + b)] = cov(a, b);
        }
    }
    return covariance;
}

// Goodness of fit on the raw counts, at the fitted means `lambda`.
GoodnessOfFit likelihoodGoodness(const Observations& obs, const std::vector<double>& lambda,
                                 double r, int parameters) {
    GoodnessOfFit g;
    g.observations = static_cast<int>(obs.y.size());
    g.parameters = parameters;
    double ybar = 0;
    for (double v : obs.y)
        ybar += v;
    ybar /= static_cast<double>(obs.y.size());
    double rss = 0, tss = 0;
    for (std::size_t i = 0; i < obs.y.size(); ++i) {
        rss += (obs.y[i] - lambda[i]) * (obs.y[i] - lambda[i]);
        tss += (obs.y[i] - ybar) * (obs.y[i] - ybar);
    }
    g.rss = rss;
    g.r2 = tss > 0 ? 1.0 - rss / tss : kNaN;
    g.rmse = std::sqrt(rss / static_cast<double>(obs.y.size()));
    g.logLikelihood = logLikelihood(obs.y, lambda, r);
    return g;
}

}  // namespace

// The steps: the observations, the mean parameters at the Poisson size, for the negative
// binomial the size and the means in turn until the size settles, then the covariance and the
// goodness of fit.
LikelihoodFit fitLikelihood(const WaveModel& model, const Series& series, int first, int last,
                            const std::vector<double>& start, const FitOptions& o,
                            SolverWorkspace& workspace) {
    LikelihoodFit out;
    const Observations obs = observationsIn(series, first, last);
    const int np = model.parameterCount();
    if (static_cast<int>(obs.t.size()) <= np + (o.weekdayFactors ? 7 : 1)) {
        out.message = series.periodDays == 1
                          ? "the window has too few days with counts for this model"
                          : "the window has too few weeks with counts for this model";
        return out;
    }
    const bool negbin = o.method == FitMethod::NegativeBinomial;
    MeanModel mean(model, obs, o.weekdayFactors);
    std::vector<double> x = start;
    x.resize(static_cast<std::size_t>(mean.size()), 0.0);
    SolverResult sr;
    auto solveMean = [&](double size) {
        DevianceProblem problem(mean, obs, size);
        solveLeastSquares(problem, x, o.solver, sr, workspace);
        if (sr.summary.termination != Termination::InvalidStart)
            x = sr.parameters;
        return sr.summary;
    };
    double r = kPoissonSize;
    SolverSummary summary = solveMean(r);
    if (summary.termination == Termination::InvalidStart) {
        out.message = "the model cannot be evaluated at its start";
        return out;
    }
    int iterations = summary.iterations, evaluations = summary.evaluations;
    std::vector<double> lambda;
    if (negbin) {
        double logR = std::log(10.0);
        for (int round = 0; round < 20; ++round) {
            mean.evaluate(x, lambda, {});
            const double newLogR = mostLikelyLogSize(obs, lambda);
            const bool settled = std::abs(newLogR - logR) < 1e-5;
            logR = newLogR;
            r = std::exp(logR);
            summary = solveMean(r);
            iterations += summary.iterations;
            evaluations += summary.evaluations;
            if (settled)
                break;
        }
        out.dispersion = r;
    }
    summary.iterations = iterations;
    summary.evaluations = evaluations;
    out.summary = summary;
    out.parameters.assign(x.begin(), x.begin() + np);
    if (o.weekdayFactors) {
        const auto f = mean.factors(x);
        out.weekdayFactors.assign(f.begin(), f.end());
    }
    out.modelCovariance = observedInformationCovariance(mean, obs, x, r, negbin, np);
    mean.evaluate(x, lambda, {});
    out.goodness = likelihoodGoodness(obs, lambda, r, mean.size() + (negbin ? 1 : 0));
    out.ok = true;
    return out;
}

}  // namespace siftwave::fit::detail
