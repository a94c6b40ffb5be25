// Fits of generated waves: the truth is known, so recovery and interval coverage can be checked.
#include "siftwave/fit/fit.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <cmath>

namespace siftwave::fit {
namespace {

const Date kMonday = *Date::fromIso("2026-03-02");  // a Monday

TEST(FitWave, LeastSquaresOnTheCentredAverageRecoversANoiselessGumbelWave) {
    test::GeneratedWave g;
    const auto counts = test::expectedCounts(g);
    FitOptions o;
    o.window = std::pair{0, g.days - 1};
    auto r = fitSeries({kMonday, counts}, o);
    ASSERT_TRUE(r) << r.error().message;
    EXPECT_TRUE(r->summary.converged()) << r->summary.brief();
    const auto p = r->parameterValues();
    // The model is averaged like the data, so noiseless data give the truth back exactly.
    EXPECT_NEAR(p[0], g.K, 1e-6 * g.K);
    EXPECT_NEAR(p[1], g.mu, 1e-6);
    EXPECT_NEAR(p[2], g.beta, 1e-6);
    EXPECT_EQ(r->dateOf(r->derived.peakDay.value), kMonday + 60);
}

TEST(FitWave, EveryModelAndMethodFitsANoisyWave) {
    test::GeneratedWave g;
    g.weekday = {1.2, 1.1, 1.0, 1.0, 1.0, 0.9, 0.8};
    const auto counts = test::generateCounts(g, 7);
    for (ModelKind model : kAllModels) {
        for (FitMethod method :
             {FitMethod::LeastSquares, FitMethod::Poisson, FitMethod::NegativeBinomial}) {
            FitOptions o;
            o.model = model;
            o.method = method;
            o.weekdayFactors = method != FitMethod::LeastSquares;
            auto r = fitSeries({kMonday, counts}, o, 1e6);
            ASSERT_TRUE(r) << modelName(model) << " " << methodName(method) << ": "
                           << r.error().message;
            EXPECT_TRUE(r->summary.converged())
                << modelName(model) << " " << methodName(method) << " " << r->summary.brief();
            ASSERT_TRUE(r->derived.peakInfectiousLoadPer100k);
            if (model != ModelKind::Gumbel)
                continue;  // the others are misspecified here
            EXPECT_NEAR(r->derived.peakDay.value + r->first, 60.0, 2.0) << methodName(method);
            EXPECT_NEAR(r->derived.waveSize.value, g.K, 0.05 * g.K) << methodName(method);
            EXPECT_GT(r->goodness.r2, 0.8) << methodName(method);
        }
    }
}

}  // namespace
}  // namespace siftwave::fit

namespace siftwave::fit {
namespace {

// A wave seen only on its rise, in noisy counts: K and the peak are poorly determined, and
// estimate - 1.96 se falls below zero. A count cannot be negative, so the reported interval is
// cut at 0 (and the fraction observed kept within [0, 1]); common practice, no source.
TEST(FitWave, IntervalsOfCountsAreCutAtZeroAndTheFractionObservedAtOne) {
    test::GeneratedWave g;
    g.K = 3000;
    g.days = 52;  // the truth peaks on day 60: only the rise is observed
    g.size = 4;
    int cut = 0;
    for (unsigned seed = 1; seed <= 30; ++seed) {
        const auto counts = test::generateCounts(g, seed);
        FitOptions o;
        o.window = std::pair{0, g.days - 1};
        auto r = fitSeries({kMonday, counts}, o);
        if (!r)
            continue;
        const DerivedQuantities& d = r->derived;
        for (const Estimate* e : {&d.peakIncidence, &d.waveSize, &d.peakInfectiousLoad}) {
            if (!std::isfinite(e->se))
                continue;
            EXPECT_GE(e->lower, 0.0) << "seed " << seed;
            EXPECT_GE(e->upper, e->lower) << "seed " << seed;
            cut += e->value - 1.96 * e->se < 0 ? 1 : 0;
        }
        if (std::isfinite(d.fractionObserved.se)) {
            EXPECT_GE(d.fractionObserved.lower, 0.0) << "seed " << seed;
            EXPECT_LE(d.fractionObserved.upper, 1.0) << "seed " << seed;
        }
    }
    // The fixture must exercise the cut, or the checks above prove nothing.
    EXPECT_GT(cut, 0);
}

}  // namespace
}  // namespace siftwave::fit
