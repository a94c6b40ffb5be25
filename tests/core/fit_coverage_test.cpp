// Interval coverage over many generated waves: 95% intervals should cover the truth in about
// 95% of repetitions, for the parameters and for the derived quantities whose intervals come
// from the delta method (peak height, start and end quantiles, doubling time; their true values
// are the Gumbel closed forms at the true parameters). With 200 seeds the binomial standard error
// of a 95% rate is 1.5 points, so we accept 0.90 .. 0.99 (about -3.3 .. +2.7 standard errors).
// Statistical check of our own; the nominal-coverage criterion is the textbook meaning of a
// confidence interval (no source needed).
#include "siftwave/fit/fit.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

namespace siftwave::fit {
namespace {

const Date kMonday = *Date::fromIso("2026-03-02");
constexpr int kSeeds = 200;

struct Coverage {
    int fits = 0;
    int K = 0, mu = 0, beta = 0;
    // Derived quantities (delta method): peak height, start and end quantiles, doubling time.
    int height = 0, start = 0, end = 0, doubling = 0;
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
        // The Gumbel closed forms at the truth (see fit_derived_values_test.cpp).
        const DerivedQuantities& d = r->derived;
        const double q0 = o.startQuantile, q1 = o.endQuantile;
        c.height += covers(d.peakIncidence, g.K / (g.beta * std::exp(1.0)));
        c.start += covers(d.startDay, g.mu - g.beta * std::log(-std::log(q0)));
        c.end += covers(d.endDay, g.mu - g.beta * std::log(-std::log(q1)));
        // At the fastest growth: beta ln 2 / golden ratio (fit_derived_values_test.cpp).
        c.doubling += covers(d.doublingTimeDays, g.beta * std::log(2.0) / std::numbers::phi);
    }
    return c;
}

void expectNominal(const Coverage& c) {
    ASSERT_GE(c.fits, kSeeds - 2);
    for (int hits : {c.K, c.mu, c.beta, c.height, c.start, c.end, c.doubling}) {
        const double rate = static_cast<double>(hits) / c.fits;
        EXPECT_GE(rate, 0.90);
        EXPECT_LE(rate, 0.99);
    }
    auto rate = [&](int hits) { return static_cast<double>(hits) / c.fits; };
    std::printf(
        "coverage over %d fits: K %.3f  mu %.3f  beta %.3f  peak height %.3f  start %.3f  "
        "end %.3f  doubling time %.3f\n",
        c.fits, rate(c.K), rate(c.mu), rate(c.beta), rate(c.height), rate(c.start), rate(c.end),
        rate(c.doubling));
}

TEST(FitCoverage, NegativeBinomialIntervalsWithWeekdayFactorsCoverTheTruthAtTheNominalRate) {
    expectNominal(coverage(FitMethod::NegativeBinomial, true));
}

TEST(FitCoverage, LeastSquaresSandwichIntervalsCoverTheTruthAtCloseToTheNominalRate) {
    expectNominal(coverage(FitMethod::LeastSquares, false));
}

}  // namespace
}  // namespace siftwave::fit
