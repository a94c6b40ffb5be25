// The model choice is an option of the fit (FitOptions::modelChoice): the lowest-AICc model is
// kept by fitSeries itself, and fitWithComparison returns the comparison it came from.
#include "siftwave/fit/fit.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <vector>

namespace siftwave::fit {
namespace {

const Date kFirst = *Date::fromIso("2026-03-02");

TEST(FitModelChoice, LowestAiccKeepsTheConvergedModelWithTheSmallestAicc) {
    const std::vector<double> counts = test::generateCounts({}, 3);
    FitOptions o;
    o.modelChoice = ModelChoice::LowestAicc;
    const auto fit = fitSeries({kFirst, counts}, o);
    ASSERT_TRUE(fit) << fit.error().message;
    const auto rows = compareModels({kFirst, counts}, o);
    const ModelComparisonRow* best = bestByAicc(rows);
    ASSERT_NE(best, nullptr);
    EXPECT_EQ(fit->model, best->model);
    EXPECT_EQ(fit->goodness.aicc, best->fit->goodness.aicc);
    EXPECT_EQ(fit->options.modelChoice, ModelChoice::LowestAicc);
}

TEST(FitModelChoice, GivenModelIsFittedAsAsked) {
    const std::vector<double> counts = test::generateCounts({}, 3);
    FitOptions o;
    o.model = ModelKind::Logistic;
    const auto fit = fitSeries({kFirst, counts}, o);
    ASSERT_TRUE(fit);
    EXPECT_EQ(fit->model, ModelKind::Logistic);
}

TEST(FitModelChoice, ComparisonGivesTheChosenRowWithoutFittingItTwice) {
    const std::vector<double> counts = test::generateCounts({}, 5);
    FitOptions o;
    o.model = ModelKind::Richards;
    const ComparedFit compared = fitWithComparison({kFirst, counts}, o, std::nullopt, true);
    ASSERT_EQ(compared.comparison.size(), kAllModels.size());
    ASSERT_TRUE(compared.fit);
    EXPECT_EQ(compared.fit->model, ModelKind::Richards);
    const auto alone = fitSeries({kFirst, counts}, o);
    ASSERT_TRUE(alone);
    EXPECT_EQ(compared.fit->parameterValues(), alone->parameterValues());

    const ComparedFit without = fitWithComparison({kFirst, counts}, o, std::nullopt, false);
    EXPECT_TRUE(without.comparison.empty());
    ASSERT_TRUE(without.fit);
    EXPECT_EQ(without.fit->parameterValues(), alone->parameterValues());
}

TEST(FitModelChoice, NoConvergedModelIsANumericalErrorNamingTheFirstFailure) {
    const std::vector<double> zeros(60, 0.0);  // no wave for any model
    FitOptions o;
    o.modelChoice = ModelChoice::LowestAicc;
    const auto fit = fitSeries({kFirst, zeros}, o);
    ASSERT_FALSE(fit);
    EXPECT_EQ(fit.error().code, ErrorCode::Numerical);
    EXPECT_EQ(fit.error().message.rfind("gumbel: no wave found", 0), 0u) << fit.error().message;
}

}  // namespace
}  // namespace siftwave::fit
