// The wave models against Boost.Math's distributions (a general-purpose reference library) and
// handbook formulas.
#include "siftwave/fit/models.h"

#include <gtest/gtest.h>
#include <boost/math/distributions/extreme_value.hpp>
#include <boost/math/distributions/logistic.hpp>
#include <boost/math/distributions/lognormal.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>
#include <string>
#include <utility>
#include <vector>

namespace siftwave::fit {
namespace {

// Boost.Math extreme_value(location a, scale b) is the Gumbel (maximum) distribution.
TEST(FitModels, GumbelDensityCumulativeAndQuantileAgreeWithBoostExtremeValue) {
    const auto& m = waveModel(ModelKind::Gumbel);
    const double K = 5000, mu = 40, beta = 9;
    const std::vector<double> p{K, mu, beta};
    const boost::math::extreme_value_distribution<double> ref(mu, beta);
    for (double t = 0; t <= 120; t += 3.5) {
        EXPECT_NEAR(m.incidenceAt(t, p) / K, boost::math::pdf(ref, t), 1e-14) << t;
        EXPECT_NEAR(m.cumulative(t, p) / K, boost::math::cdf(ref, t), 1e-14) << t;
    }
    for (double q : {0.001, 0.025, 0.5, 0.975, 0.999}) {
        EXPECT_NEAR(m.quantileTime(q, p), boost::math::quantile(ref, q), 1e-10) << q;
    }
}

// The day-grid evaluation the fits use (a recurrence for exp(-z), a short series for exp(-u)
// far into the right tail) against Boost.Math's extreme_value density, relative to each value
// down to the far tail, and against the model's per-time evaluation with its Jacobian.
TEST(FitModels, GumbelDayGridAgreesWithBoostExtremeValueIntoTheFarTail) {
    const auto& m = waveModel(ModelKind::Gumbel);
    const double K = 25000, mu = 80.3, beta = 7.7;
    const std::vector<double> p{K, mu, beta};
    const boost::math::extreme_value_distribution<double> ref(mu, beta);
    // Grids of both parities (the right tail, z > ln 1000, is evaluated two days at a time),
    // one starting inside the tail and one ending before it. 300 days from -3 reach mu + 28 beta,
    // where u falls below 1e-12.
    const std::pair<std::size_t, double> grids[] = {{300, -3}, {301, -3}, {120, 150}, {71, 40}};
    for (const auto& [days, t0] : grids) {
        SCOPED_TRACE("grid of " + std::to_string(days) + " days from " + std::to_string(t0));
        std::vector<double> grid(days), gridJac(3 * days), single(days), singleJac(3 * days),
            t(days), valuesOnly(days);
        m.incidenceOnDays(t0, p, grid, gridJac);
        m.incidenceOnDays(t0, p, valuesOnly, {});
        for (std::size_t i = 0; i < days; ++i)
            t[i] = t0 + static_cast<double>(i);
        m.incidence(t, p, single, singleJac);
        // Relative to each value, except far into the rising side (below 1e-10 of the peak),
        // where the recurrence for u loses relative digits in numbers that are nothing next to
        // the peak.
        const double peak = K / beta * std::exp(-1.0);
        std::array<double, 3> columnTop{};  // the largest |entry| of each Jacobian column
        for (std::size_t i = 0; i < days; ++i) {
            for (std::size_t j = 0; j < 3; ++j)
                columnTop[j] = std::max(columnTop[j], std::abs(singleJac[3 * i + j]));
        }
        for (std::size_t i = 0; i < days; ++i) {
            const double expected = K * boost::math::pdf(ref, t[i]);
            EXPECT_NEAR(grid[i], expected, std::max(1e-13 * expected, 1e-23 * peak)) << t[i];
            EXPECT_NEAR(grid[i], single[i], std::max(1e-13 * single[i], 1e-23 * peak)) << t[i];
            EXPECT_EQ(valuesOnly[i], grid[i]) << t[i];  // the same values without the Jacobian
            for (std::size_t j = 0; j < 3; ++j) {
                const double v = singleJac[3 * i + j];
                EXPECT_NEAR(gridJac[3 * i + j], v,
                            std::max(1e-12 * std::abs(v), 1e-22 * columnTop[j]))
                    << t[i] << " " << j;
            }
        }
    }
}

// The contract the least-squares problem relies on (models.h): Jacobian column 0 is exactly
// the incidence divided by K, for every model, on the day grid and per time (common practice,
// no source: K scales a unit curve).
TEST(FitModels, JacobianColumnOfTheSizeIsTheIncidenceOverK) {
    const std::vector<std::pair<ModelKind, std::vector<double>>> cases = {
        {ModelKind::Gumbel, {5000, 40, 9}},
        {ModelKind::Logistic, {800, 30, 4}},
        {ModelKind::Richards, {3000, 50, 6, 0.7}},
        {ModelKind::LogNormal, {2000, 3.5, 0.4}}};
    for (const auto& [kind, p] : cases) {
        const auto& m = waveModel(kind);
        const std::size_t n = p.size(), days = 120;
        std::vector<double> f(days), jac(days * n), t(days);
        m.incidenceOnDays(0.0, p, f, jac);
        for (std::size_t i = 0; i < days; ++i)
            EXPECT_DOUBLE_EQ(jac[i * n], f[i] / p[0]) << modelName(kind) << " day " << i;
        for (std::size_t i = 0; i < days; ++i)
            t[i] = static_cast<double>(i) + 0.25;
        m.incidence(t, p, f, jac);
        for (std::size_t i = 0; i < days; ++i)
            EXPECT_DOUBLE_EQ(jac[i * n], f[i] / p[0]) << modelName(kind) << " t " << t[i];
    }
}

TEST(FitModels, LogisticDensityCumulativeAndQuantileAgreeWithBoostLogistic) {
    const auto& m = waveModel(ModelKind::Logistic);
    const std::vector<double> p{800, 30, 4};
    const boost::math::logistic_distribution<double> ref(30, 4);
    for (double t = -10; t <= 80; t += 2.5) {
        EXPECT_NEAR(m.incidenceAt(t, p) / 800, boost::math::pdf(ref, t), 1e-14) << t;
        EXPECT_NEAR(m.cumulative(t, p) / 800, boost::math::cdf(ref, t), 1e-14) << t;
    }
    for (double q : {0.01, 0.025, 0.5, 0.975}) {
        EXPECT_NEAR(m.quantileTime(q, p), boost::math::quantile(ref, q), 1e-10) << q;
    }
}

// Our log-normal counts time from the day before the window: tau = t + 1.
TEST(FitModels, LogNormalDensityCumulativeAndQuantileAgreeWithBoostLognormal) {
    const auto& m = waveModel(ModelKind::LogNormal);
    const std::vector<double> p{1200, 3.2, 0.4};
    const boost::math::lognormal_distribution<double> ref(3.2, 0.4);
    for (double t = 0; t <= 100; t += 2.5) {
        EXPECT_NEAR(m.incidenceAt(t, p) / 1200, boost::math::pdf(ref, t + 1), 1e-14) << t;
        EXPECT_NEAR(m.cumulative(t, p) / 1200, boost::math::cdf(ref, t + 1), 1e-13) << t;
    }
    for (double q : {0.025, 0.5, 0.975}) {
        EXPECT_NEAR(m.quantileTime(q, p) + 1, boost::math::quantile(ref, q), 1e-9) << q;
    }
    EXPECT_NEAR(m.peakTime(p) + 1, boost::math::mode(ref), 1e-9);
}

// NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.6.16 (Extreme Value Type I):
// mode mu, mean mu + gamma beta (Euler's gamma), variance pi^2 beta^2 / 6. Checked here by
// integrating our density numerically.
TEST(FitModels, GumbelMomentsMatchTheHandbook) {
    const auto& m = waveModel(ModelKind::Gumbel);
    const double mu = 50, beta = 7;
    const std::vector<double> p{1, mu, beta};
    double mass = 0, mean = 0, second = 0;
    const double h = 0.001;
    for (double t = mu - 30 * beta; t <= mu + 60 * beta; t += h) {
        const double f = m.incidenceAt(t, p) * h;
        mass += f;
        mean += t * f;
        second += t * t * f;
    }
    mean /= mass;
    EXPECT_NEAR(mass, 1.0, 1e-9);
    EXPECT_NEAR(mean, mu + std::numbers::egamma * beta, 1e-6);
    EXPECT_NEAR(second / mass - mean * mean, std::numbers::pi * std::numbers::pi * beta * beta / 6,
                1e-5);
    EXPECT_DOUBLE_EQ(m.peakTime(p), mu);
    // The mode: the density falls on both sides of mu.
    EXPECT_GT(m.incidenceAt(mu, p), m.incidenceAt(mu - 0.01, p));
    EXPECT_GT(m.incidenceAt(mu, p), m.incidenceAt(mu + 0.01, p));
}

// Closed form: the Richards curve's share of K at peak incidence is (1 + a)^(-1/a); 1/2 for the
// logistic (a = 1), tending to 1/e (the Gumbel) as a -> 0. Derived in models.h.
TEST(FitModels, RichardsShareAtPeakIsTheClosedForm) {
    const auto& m = waveModel(ModelKind::Richards);
    for (double a : {0.01, 0.2, 0.5, 1.0, 2.0, 5.0}) {
        const std::vector<double> p{1000, 60, 8, a};
        const double peak = m.peakTime(p);
        // the peak is a maximum of the incidence
        EXPECT_GT(m.incidenceAt(peak, p), m.incidenceAt(peak - 0.05, p)) << a;
        EXPECT_GT(m.incidenceAt(peak, p), m.incidenceAt(peak + 0.05, p)) << a;
        EXPECT_NEAR(m.cumulative(peak, p) / 1000, std::pow(1 + a, -1 / a), 1e-12) << a;
    }
    const std::vector<double> logistic{1000, 60, 8, 1.0};
    EXPECT_NEAR(m.cumulative(60, logistic) / 1000, 0.5, 1e-14);
    const std::vector<double> nearGumbel{1000, 60, 8, 1e-4};
    EXPECT_NEAR(m.cumulative(60, nearGumbel) / 1000, std::exp(-1.0), 1e-4);
}

// Every analytic Jacobian agrees with central differences.
TEST(FitModels, AnalyticJacobiansAgreeWithCentralDifferences) {
    const std::vector<std::vector<double>> params{
        {5000, 40, 9}, {800, 30, 4}, {1000, 60, 8, 0.6}, {1200, 3.2, 0.4}};
    for (std::size_t k = 0; k < kAllModels.size(); ++k) {
        const auto& m = waveModel(kAllModels[k]);
        const auto& p = params[k];
        const std::size_t np = p.size();
        std::vector<double> t;
        for (double x = 1; x < 100; x += 7)
            t.push_back(x);
        std::vector<double> f(t.size()), jac(t.size() * np), fu(t.size()), fd(t.size());
        m.incidence(t, p, f, jac);
        for (std::size_t j = 0; j < np; ++j) {
            auto up = p, down = p;
            const double h = 1e-6 * std::max(1.0, std::abs(p[j]));
            up[j] += h;
            down[j] -= h;
            m.incidence(t, up, fu);
            m.incidence(t, down, fd);
            for (std::size_t i = 0; i < t.size(); ++i) {
                const double numeric = (fu[i] - fd[i]) / (2 * h);
                EXPECT_NEAR(jac[i * np + j], numeric, 1e-6 * (std::abs(numeric) + f[i] + 1e-3))
                    << modelName(kAllModels[k]) << " param " << j << " t " << t[i];
            }
        }
    }
}

TEST(FitModels, InitialGuessByLinearisationIsCloseToTheTruthOnAFullWave) {
    for (ModelKind kind : {ModelKind::Gumbel, ModelKind::Logistic}) {
        const auto& m = waveModel(kind);
        const std::vector<double> truth{10000, 50, 8};
        std::vector<double> t, y;
        for (int i = 0; i < 150; ++i) {
            t.push_back(i);
            y.push_back(m.incidenceAt(i, truth));
        }
        auto g = m.initialGuess(t, y);
        ASSERT_TRUE(g);
        EXPECT_NEAR((*g)[0], 10000, 500) << modelName(kind);
        EXPECT_NEAR((*g)[1], 50, 2) << modelName(kind);
        EXPECT_NEAR((*g)[2], 8, 1.5) << modelName(kind);
    }
}

}  // namespace
}  // namespace siftwave::fit
