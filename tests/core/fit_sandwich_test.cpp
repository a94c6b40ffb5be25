// The least-squares sandwich covariance (fit.h, step 4) rebuilt independently in the test, for
// the unweighted and the weighted fit: residuals r_i = w_i ((A f)(t_i) - (A y)_i) on the target
// days, J by central differences of r, B = J^T J, G_d = sum_i a w_i J_i over the targets whose
// centred 7-day average reaches day d, meat = sum_d e_d^2 G_d G_d^T * m / (m - p) with e the
// raw-count residual, Cov = B^-1 meat B^-1 (White 1980, Econometrica 48, 817-838, with the HC1
// factor; the smoothing operator makes G the residuals' loadings on the raw days).
#include "siftwave/fit/fit.h"
#include "siftwave/series/smoothing.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>
#include <Eigen/Dense>

#include <algorithm>
#include <cmath>

namespace siftwave::fit {
namespace {

const Date kMonday = *Date::fromIso("2026-03-02");

Eigen::MatrixXd independentSandwich(const FitResult& fit, const std::vector<double>& counts,
                                    bool weighted) {
    const WaveModel& model = waveModel(fit.model);
    const std::vector<double> p = fit.parameterValues();
    const int np = static_cast<int>(p.size());
    const int n = static_cast<int>(counts.size());
    const std::vector<double> smooth = series::centredMovingAverage(counts, 7);
    std::vector<int> days;  // target days (series indices)
    for (int d = std::max(fit.first, 3); d <= std::min(fit.last, n - 4); ++d)
        days.push_back(d);
    const int m = static_cast<int>(days.size());
    auto weight = [&](int d) {
        return weighted ? 1.0 / std::sqrt(std::max(smooth[static_cast<std::size_t>(d)], 1.0)) : 1.0;
    };
    auto smoothedModel = [&](const std::vector<double>& q, int d) {
        double s = 0;
        for (int k = -3; k <= 3; ++k)
            s += model.incidenceAt(d + k - fit.first, q) / 7.0;
        return s;
    };
    Eigen::MatrixXd J(m, np);
    for (int j = 0; j < np; ++j) {
        std::vector<double> up = p, down = p;
        const double h = 1e-6 * std::max(std::abs(p[static_cast<std::size_t>(j)]), 1.0);
        up[static_cast<std::size_t>(j)] += h;
        down[static_cast<std::size_t>(j)] -= h;
        for (int i = 0; i < m; ++i) {
            const int d = days[static_cast<std::size_t>(i)];
            J(i, j) = weight(d) * (smoothedModel(up, d) - smoothedModel(down, d)) / (2 * h);
        }
    }
    const Eigen::MatrixXd Binv = (J.transpose() * J).inverse();
    Eigen::MatrixXd meat = Eigen::MatrixXd::Zero(np, np);
    for (int d = 0; d < n; ++d) {
        Eigen::VectorXd g = Eigen::VectorXd::Zero(np);
        for (int i = 0; i < m; ++i) {
            const int target = days[static_cast<std::size_t>(i)];
            if (std::abs(target - d) <= 3)
                g += (weight(target) / 7.0) * J.row(i).transpose();
        }
        const double e = counts[static_cast<std::size_t>(d)] - model.incidenceAt(d - fit.first, p);
        meat += e * e * g * g.transpose();
    }
    meat *= static_cast<double>(m) / (m - np);
    return Binv * meat * Binv;
}

void expectSandwich(bool weighted) {
    const auto g = test::weekdayWave();
    const auto counts = test::generateCounts(g, 21);
    FitOptions o;
    o.weighted = weighted;
    o.window = std::pair{5, 130};
    auto fit = fitSeries({kMonday, counts}, o);
    ASSERT_TRUE(fit) << fit.error().message;
    ASSERT_TRUE(fit->summary.converged());
    ASSERT_EQ(fit->covariance.size(), 9u);
    const Eigen::MatrixXd expected = independentSandwich(*fit, counts, weighted);
    for (int a = 0; a < 3; ++a) {
        for (int b = 0; b < 3; ++b) {
            const double scale = std::sqrt(expected(a, a) * expected(b, b));
            EXPECT_NEAR(fit->covariance[static_cast<std::size_t>(a * 3 + b)], expected(a, b),
                        1e-5 * scale)
                << "entry " << a << "," << b << (weighted ? " (weighted)" : "");
        }
    }
}

TEST(FitSandwich, UnweightedLeastSquaresCovarianceMatchesAnIndependentSandwich) {
    expectSandwich(false);
}

TEST(FitSandwich, WeightedLeastSquaresCovarianceMatchesAnIndependentSandwich) {
    expectSandwich(true);
}

}  // namespace
}  // namespace siftwave::fit
