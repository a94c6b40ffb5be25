// Scratch memory passed by argument (FitWorkspace, SolverWorkspace, GuessWorkspace): a workspace
// reused from one fit to the next changes no result, and solves that run at once, even nested
// on one thread, each with their own workspace, do not disturb each other.
#include "siftwave/fit/fit.h"
#include "siftwave/fit/levenberg_marquardt.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <vector>

namespace siftwave::fit {
namespace {

const Date kFirst = *Date::fromIso("2026-03-02");

// y = a + b t through fixed points.
class LineProblem final : public LeastSquaresProblem {
public:
    int residualCount() const override { return 5; }
    int parameterCount() const override { return 2; }
    bool evaluate(std::span<const double> x, std::span<double> r,
                  std::span<double> jacobian) const override {
        static const double y[5] = {1.0, 3.1, 4.9, 7.2, 8.8};
        for (int i = 0; i < 5; ++i) {
            const auto k = static_cast<std::size_t>(i);
            r[k] = x[0] + x[1] * i - y[k];
            if (!jacobian.empty()) {
                jacobian[2 * k] = 1.0;
                jacobian[2 * k + 1] = i;
            }
        }
        return true;
    }
};

// Residuals x - (the line's solution), the line solved afresh inside every evaluation with a
// workspace of its own: a solve nested in another on the same thread.
class NestedProblem final : public LeastSquaresProblem {
public:
    int residualCount() const override { return 2; }
    int parameterCount() const override { return 2; }
    bool evaluate(std::span<const double> x, std::span<double> r,
                  std::span<double> jacobian) const override {
        const std::vector<double> start{0.0, 0.0};
        solveLeastSquares(m_line, start, {}, m_inner, m_innerWorkspace);
        for (std::size_t k = 0; k < 2; ++k)
            r[k] = x[k] - m_inner.parameters[k];
        if (!jacobian.empty()) {
            jacobian[0] = jacobian[3] = 1.0;
            jacobian[1] = jacobian[2] = 0.0;
        }
        return true;
    }

private:
    LineProblem m_line;
    mutable SolverResult m_inner;
    mutable SolverWorkspace m_innerWorkspace;
};

TEST(FitWorkspace, ASolveNestedInAnotherWithItsOwnWorkspaceLeavesTheOuterSolveIntact) {
    const SolverResult line = solveLeastSquares(LineProblem{}, std::vector<double>{0.0, 0.0});
    ASSERT_TRUE(line.summary.converged());
    SolverWorkspace outerWorkspace;
    SolverResult outer;
    solveLeastSquares(NestedProblem{}, std::vector<double>{10.0, -3.0}, {}, outer, outerWorkspace);
    ASSERT_TRUE(outer.summary.converged()) << outer.summary.brief();
    EXPECT_NEAR(outer.parameters[0], line.parameters[0], 1e-9);
    EXPECT_NEAR(outer.parameters[1], line.parameters[1], 1e-9);
    EXPECT_EQ(outer.residuals.size(), 2u);  // the outer problem's, not the line's five
}

TEST(FitWorkspace, AReusedWorkspaceGivesTheResultsOfAFreshOne) {
    const std::vector<double> a = test::generateCounts({}, 3);
    const std::vector<double> b = test::generateCounts({}, 8);
    FitOptions poisson;
    poisson.method = FitMethod::Poisson;
    FitWorkspace shared;
    const auto first = fitSeries({kFirst, a}, {}, std::nullopt, shared);
    const auto other = fitSeries({kFirst, b}, poisson, std::nullopt, shared);
    const auto again = fitSeries({kFirst, a}, {}, std::nullopt, shared);
    const auto fresh = fitSeries({kFirst, a});
    ASSERT_TRUE(first && other && again && fresh);
    EXPECT_EQ(again->parameterValues(), first->parameterValues());
    EXPECT_EQ(again->parameterValues(), fresh->parameterValues());
    EXPECT_EQ(again->covariance, fresh->covariance);
    EXPECT_EQ(again->fittedUpper, fresh->fittedUpper);
    EXPECT_EQ(again->summary.evaluations, fresh->summary.evaluations);
}

TEST(FitWorkspace, AGuessWithAReusedWorkspaceMatchesAFreshOne) {
    const auto& model = waveModel(ModelKind::LogNormal);
    std::vector<double> t, y, shortT, shortY;
    for (int i = 0; i < 120; ++i) {
        t.push_back(i);
        y.push_back(model.incidenceAt(i, std::vector<double>{5000, 3.8, 0.4}));
    }
    for (int i = 0; i < 40; ++i) {
        shortT.push_back(i);
        shortY.push_back(y[static_cast<std::size_t>(i)] + 1.0);
    }
    GuessWorkspace workspace;
    ASSERT_TRUE(model.initialGuess(shortT, shortY, workspace));
    const auto reused = model.initialGuess(t, y, workspace);
    const auto fresh = model.initialGuess(t, y);
    ASSERT_TRUE(reused && fresh);
    EXPECT_EQ(*reused, *fresh);
}

}  // namespace
}  // namespace siftwave::fit
