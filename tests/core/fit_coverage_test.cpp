// Interval coverage over many generated waves: 95% intervals should cover the truth in about
// 95% of repetitions. With 200 seeds the binomial standard error of a 95% rate is 1.5 points, so
// we accept 0.90 .. 0.99 (about -3.3 .. +2.7 standard errors). Statistical check of our own; the
// nominal-coverage criterion is the textbook meaning of a confidence interval (no source needed).
#include "siftwave/fit/fit.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <cmath>

namespace siftwave::fit {
namespace {

const Date kMonday = *Date::fromIso("2026-03-02");
constexpr int kSeeds = 200;

struct Coverage {
    int fits = 0;
    int K = 0, mu = 0, beta = 0;
};

Coverage coverage(FitMethod method, bool weekdays) {
    // Weekday factors of geometric mean 1 (K is the weekday-free size), as the fit states them.
    const test::GeneratedWave g = test::weekdayWave();
    Coverage c;
    for (int seed = 1; seed <= kSeeds; ++seed) {
        const auto counts = test::generateCounts(g, static_cast<unsigned>(seed));
        FitOptions o;
        o.method = method;
        o.weekdayFactors = weekdays;
        o.window = std::pair{0, g.days - 1};
        o.derivedIntervals = false;
        auto r = fitSeries({kMonday, counts}, o);
        if (!r || !r->summary.converged())
            continue;
        ++c.fits;
        auto covers = [](const Estimate& e, double truth) {
            return e.lower <= truth && truth <= e.upper;
        };
        c.K += covers(r->parameters[0].estimate, g.K);
        c.mu += covers(r->parameters[1].estimate, g.mu);
        c.beta += covers(r->parameters[2].estimate, g.beta);
    }
    return c;
}

void expectNominal(const Coverage& c) {
    ASSERT_GE(c.fits, kSeeds - 2);
    for (int hits : {c.K, c.mu, c.beta}) {
        const double rate = static_cast<double>(hits) / c.fits;
        EXPECT_GE(rate, 0.90);
        EXPECT_LE(rate, 0.99);
    }
    std::printf("coverage over %d fits: K %.3f  mu %.3f  beta %.3f\n", c.fits,
                static_cast<double>(c.K) / c.fits, static_cast<double>(c.mu) / c.fits,
                static_cast<double>(c.beta) / c.fits);
}

TEST(FitCoverage, NegativeBinomialIntervalsWithWeekdayFactorsCoverTheTruthAtTheNominalRate) {
    expectNominal(coverage(FitMethod::NegativeBinomial, true));
}

TEST(FitCoverage, LeastSquaresSandwichIntervalsCoverTheTruthAtCloseToTheNominalRate) {
    expectNominal(coverage(FitMethod::LeastSquares, false));
}

}  // namespace
}  // namespace siftwave::fit
