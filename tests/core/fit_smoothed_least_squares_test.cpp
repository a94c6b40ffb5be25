// The least-squares problem on the centred 7-day average (core/src/fit/smoothed_least_squares.h):
// its residuals and Jacobian against window sums written out here, over the model's own
// day-grid values. Two checks: to the bit against the documented order of additions (re-summed
// every 64 target days, otherwise one day in and one day out), and to 1e-12 against a plain
// average of each window (an independent form of the same quantity).
#include "fit/smoothed_least_squares.h"

#include "siftwave/fit/models.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <vector>

namespace siftwave::fit::detail {
namespace {

struct Evaluated {
    std::vector<double> r, jac;
};

struct Case {
    ModelKind model;
    std::vector<double> p;
};

class SmoothedLeastSquaresSums : public ::testing::TestWithParam<Case> {};

TEST_P(SmoothedLeastSquaresSums, ResidualsAndJacobianAreTheWindowSumsOfTheModelDays) {
    const Case c = GetParam();
    const WaveModel& model = waveModel(c.model);
    const std::size_t np = c.p.size();
    const int span = 300;  // window days; targets on every day that has a whole average
    const auto kernel = centredKernel(7);
    const int h = 3;
    std::vector<double> t, y, w;
    for (int i = h; i < span - h; ++i) {
        t.push_back(i);
        y.push_back(40.0 + 30.0 * std::sin(0.05 * i));          // any target
        w.push_back(1.0 / std::sqrt(std::max(y.back(), 1.0)));  // weighted, as the option does
    }
    SmoothedLeastSquares::Workspace workspace;
    const SmoothedLeastSquares problem(model, t, y, w, kernel, span, workspace);
    const std::size_t m = t.size();
    Evaluated got{std::vector<double>(m), std::vector<double>(m * np)};
    ASSERT_TRUE(problem.evaluate(c.p, got.r, got.jac));

    // The model and its Jacobian on the model days -h .. span - 1 + h.
    const std::size_t days = static_cast<std::size_t>(span + 2 * h);
    std::vector<double> f(days), jf(days * np);
    model.incidenceOnDays(-h, c.p, f, jf);
    auto column = [&](std::size_t d, std::size_t j) { return j == 0 ? f[d] : jf[d * np + j - 1]; };
    const double a = 1.0 / 7.0;
    std::vector<double> sum(np + 1, 0.0);
    for (std::size_t i = 0; i < m; ++i) {
        const std::size_t lo = static_cast<std::size_t>(t[i]);  // model day of window day t_i - h
        for (std::size_t j = 0; j <= np; ++j) {
            if (j == 1)
                continue;  // K's column is the model's own sum over K
            if (i % 64 == 0) {
                sum[j] = 0.0;
                for (std::size_t d = lo; d < lo + 7; ++d)
                    sum[j] += column(d, j);
            } else {
                sum[j] += column(lo + 6, j) - column(lo - 1, j);
            }
        }
        EXPECT_EQ(got.r[i], w[i] * (a * sum[0] - y[i])) << i;
        EXPECT_EQ(got.jac[i * np], w[i] * a * sum[0] * (1.0 / c.p[0])) << i;
        for (std::size_t j = 2; j <= np; ++j)
            EXPECT_EQ(got.jac[i * np + j - 1], w[i] * a * sum[j]) << i << " column " << j;

        // Independently: the plain average of the window.
        for (std::size_t j = 0; j <= np; ++j) {
            double plain = 0.0;
            for (std::size_t d = lo; d < lo + 7; ++d)
                plain += column(d, j);
            plain *= a;
            const double value = j == 0 ? got.r[i] / w[i] + y[i] : got.jac[i * np + j - 1] / w[i];
            EXPECT_NEAR(value, plain, 1e-12 * std::max(1.0, std::abs(plain))) << i << " " << j;
        }
    }
}

INSTANTIATE_TEST_SUITE_P(WaveModels, SmoothedLeastSquaresSums,
                         ::testing::Values(Case{ModelKind::Gumbel, {30000, 140, 12}},
                                           Case{ModelKind::Logistic, {30000, 150, 9}},
                                           Case{ModelKind::Richards, {30000, 150, 9, 0.6}},
                                           Case{ModelKind::LogNormal, {30000, 4.9, 0.3}}));

}  // namespace
}  // namespace siftwave::fit::detail
