// The fastest-growth day of the Richards and log-normal curves, which the models find by a
// numerical search, against closed forms, and its standard error checked two ways:
// - against the same propagation done independently, by pushing draws of the parameters from
//   N(theta, Cov) through the model's own fastestGrowthTime and taking the standard deviation
//   (Monte Carlo propagation of uncertainty: JCGM 101:2008, "Evaluation of measurement data -
//   Supplement 1 to the GUM: propagation of distributions using a Monte Carlo method");
// - for stability: counts changed at rounding level (1e-12 of each) must not move the standard
//   error by more than a small fraction. A delta method that differentiates a search with too
//   fine a step picks up the search's own tolerance and jumps.
#include "siftwave/fit/fit.h"

#include <gtest/gtest.h>

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <random>
#include <vector>

namespace siftwave::fit {
namespace {

FitResult fitModel(ModelKind kind, const std::vector<double>& counts) {
    FitOptions o;
    o.model = kind;
    o.window = std::pair{0, static_cast<int>(counts.size()) - 1};
    auto r = fitSeries({*Date::fromIso("2026-03-02"), counts}, o);
    EXPECT_TRUE(r.ok()) << (r ? "" : r.error().message);
    return r ? *r : FitResult{};
}

// Counts from a wave of the model itself (truth `p`), with negative-binomial noise of size 30:
// a Gumbel wave would put the Richards shape at its bound (the Gumbel is its a -> 0 limit).
std::vector<double> countsFrom(ModelKind kind, const std::vector<double>& p, int days,
                               unsigned seed) {
    const auto& model = waveModel(kind);
    std::mt19937_64 rng(seed);
    std::vector<double> out(static_cast<std::size_t>(days));
    for (int i = 0; i < days; ++i) {
        const double mean = model.incidenceAt(i, p);
        std::gamma_distribution<double> gamma(30.0, std::max(mean, 1e-9) / 30.0);
        std::poisson_distribution<long long> poisson(std::max(gamma(rng), 1e-12));
        out[static_cast<std::size_t>(i)] = static_cast<double>(poisson(rng));
    }
    return out;
}

struct SearchedCase {
    ModelKind kind;
    std::vector<double> truth;
};

std::vector<double> caseCounts(const SearchedCase& c, unsigned seed) {
    return countsFrom(c.kind, c.truth, 140, seed);
}

// sqrt(g^T Cov g) with g the gradient of fastestGrowthTime by central differences of a tenth of
// each parameter's standard error: the same first-order propagation as the fit's, written
// separately here with a ten times larger step (a check of the fit's step, not of the method;
// the method is checked against Monte Carlo below).
double linearPropagationSe(ModelKind kind, const FitResult& fit) {
    const auto& model = waveModel(kind);
    const std::vector<double> p = fit.parameterValues();
    const std::size_t n = p.size();
    std::vector<double> g(n);
    for (std::size_t j = 0; j < n; ++j) {
        const double h = 0.1 * std::sqrt(fit.covariance[j * n + j]);
        std::vector<double> up = p, down = p;
        up[j] += h;
        down[j] -= h;
        g[j] = (model.fastestGrowthTime(up) - model.fastestGrowthTime(down)) / (2 * h);
    }
    double var = 0;
    for (std::size_t a = 0; a < n; ++a) {
        for (std::size_t b = 0; b < n; ++b)
            var += g[a] * g[b] * fit.covariance[a * n + b];
    }
    return std::sqrt(var);
}

// The standard deviation of fastestGrowthTime over `draws` parameter vectors from N(p, cov).
double monteCarloSd(ModelKind kind, const FitResult& fit, int draws) {
    const auto& model = waveModel(kind);
    const std::vector<double> p = fit.parameterValues();
    const int n = static_cast<int>(p.size());
    const Eigen::Map<const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>
        cov(fit.covariance.data(), n, n);
    const Eigen::LLT<Eigen::MatrixXd> llt(cov);
    EXPECT_EQ(llt.info(), Eigen::Success) << "the covariance is not positive definite";
    const Eigen::MatrixXd L = llt.matrixL();
    std::mt19937_64 rng(20261202);
    std::normal_distribution<double> z(0, 1);
    double sum = 0, sum2 = 0;
    int used = 0;
    for (int k = 0; k < draws; ++k) {
        Eigen::VectorXd e(n);
        for (int j = 0; j < n; ++j)
            e[j] = z(rng);
        const Eigen::VectorXd d = L * e;
        std::vector<double> q(p);
        for (int j = 0; j < n; ++j)
            q[static_cast<std::size_t>(j)] += d[j];
        if (!model.valid(q))
            continue;
        const double t = model.fastestGrowthTime(q);
        sum += t;
        sum2 += t * t;
        ++used;
    }
    EXPECT_GT(used, draws * 99 / 100) << "too many draws fell outside the model's domain";
    const double mean = sum / used;
    return std::sqrt(std::max(0.0, sum2 / used - mean * mean));
}

const SearchedCase kRichards{ModelKind::Richards, {20000, 60, 8, 1.0}};   // a = 1: logistic
const SearchedCase kLogNormal{ModelKind::LogNormal, {20000, 4.0, 0.35}};  // peak near day 47

// Closed forms of the rising inflection point (derived here; no source): the Richards curve with
// a = 1 is the logistic, whose density has its inflections at mu -+ s ln(2 + sqrt 3); the
// log-normal density in tau = t + 1 has, with x = ln tau and f ~ exp(-x - (x - mu)^2 / 2 sigma^2),
// f'' = 0 where y = (x - mu) / sigma^2 solves (y + 1)(y + 2) = 1 / sigma^2, the rising one at
// x = mu - 1.5 sigma^2 - (sigma / 2) sqrt(sigma^2 + 4).
TEST(FitDerivedSearch, FastestGrowthMatchesTheClosedForms) {
    const auto& richards = waveModel(ModelKind::Richards);
    for (double s : {3.0, 8.0, 15.0}) {
        const std::vector<double> p{20000, 60, s, 1.0};
        EXPECT_NEAR(richards.fastestGrowthTime(p), 60 - s * std::log(2 + std::sqrt(3.0)), 1e-8 * s)
            << s;
    }
    const auto& logNormal = waveModel(ModelKind::LogNormal);
    for (double sigma : {0.2, 0.35, 0.6, 1.2}) {
        const double mu = 4.0;
        const std::vector<double> p{20000, mu, sigma};
        const double x = mu - 1.5 * sigma * sigma - 0.5 * sigma * std::sqrt(sigma * sigma + 4);
        const double expected = std::exp(x) - 1.0;
        EXPECT_NEAR(logNormal.fastestGrowthTime(p), expected, 1e-8 * (1 + expected)) << sigma;
    }
}

TEST(FitDerivedSearch, RichardsFastestGrowthSeIsTheLinearPropagation) {
    const auto counts = caseCounts(kRichards, 7);
    const FitResult fit = fitModel(ModelKind::Richards, counts);
    ASSERT_TRUE(fit.summary.converged()) << fit.summary.brief();
    ASSERT_FALSE(fit.covariance.empty());
    const double se = fit.derived.fastestGrowthDay.se;
    ASSERT_TRUE(std::isfinite(se));
    EXPECT_NEAR(se / linearPropagationSe(ModelKind::Richards, fit), 1.0, 0.01) << se;
}

TEST(FitDerivedSearch, LogNormalFastestGrowthSeAgreesWithMonteCarloPropagation) {
    const SearchedCase& c = kLogNormal;
    const FitResult fit = fitModel(c.kind, caseCounts(c, 7));
    ASSERT_TRUE(fit.summary.converged()) << fit.summary.brief();
    ASSERT_FALSE(fit.covariance.empty());
    const double se = fit.derived.fastestGrowthDay.se;
    const double mc = monteCarloSd(c.kind, fit, 4000);
    ASSERT_TRUE(std::isfinite(se));
    // 4000 draws estimate a standard deviation to about 1.1%; the delta method is a first-order
    // propagation, so allow 5% between the two.
    EXPECT_NEAR(se / mc, 1.0, 0.05) << "delta method " << se << ", Monte Carlo " << mc;
    EXPECT_NEAR(se / linearPropagationSe(c.kind, fit), 1.0, 0.01) << se;
}

void expectStableUnderRoundingChanges(const SearchedCase& c) {
    const auto counts = caseCounts(c, 11);
    const FitResult base = fitModel(c.kind, counts);
    ASSERT_TRUE(base.summary.converged()) << base.summary.brief();
    const double se = base.derived.fastestGrowthDay.se;
    ASSERT_TRUE(std::isfinite(se));
    double worst = 0;
    for (int k = 1; k <= 6; ++k) {
        std::vector<double> nudged = counts;
        for (std::size_t i = 0; i < nudged.size(); ++i)
            nudged[i] *= 1.0 + 1e-12 * static_cast<double>((static_cast<int>(i) * k) % 7 - 3);
        const FitResult f = fitModel(c.kind, nudged);
        ASSERT_TRUE(f.summary.converged());
        worst = std::max(worst, std::abs(f.derived.fastestGrowthDay.se / se - 1.0));
    }
    EXPECT_LT(worst, 1e-3) << "the standard error moved by " << worst << " of itself";
}

TEST(FitDerivedSearch, RichardsFastestGrowthSeDoesNotJumpWithRoundingLevelChanges) {
    expectStableUnderRoundingChanges(kRichards);
}

TEST(FitDerivedSearch, LogNormalFastestGrowthSeDoesNotJumpWithRoundingLevelChanges) {
    expectStableUnderRoundingChanges(kLogNormal);
}

}  // namespace
}  // namespace siftwave::fit
