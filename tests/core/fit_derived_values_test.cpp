// The derived quantities of a fit, checked by value against closed forms of the Gumbel curve,
// fitting a noiseless wave (the least-squares fit then recovers K, mu and beta to solver
// precision, so every derived value must equal its closed form at the true parameters):
//   cumulative C(t) = K exp(-exp(-z)), z = (t - mu) / beta; density peak K / (beta e) at mu;
//   the q-quantile mu - beta ln(-ln q) (the Gumbel percent point function: NIST/SEMATECH
//   e-Handbook of Statistical Methods, section 1.3.6.6.16, "Extreme Value Type I Distribution",
//   cited from memory); with u = exp(-z), f'(t) = 0 at u = 1 and f''(t) = 0 at
//   u^2 - 3u + 1 = 0, the rising inflection u = (3 + sqrt 5) / 2; the growth rate
//   d ln f / dt = (u - 1) / beta, so the model's instantaneous doubling time at the fastest
//   growth (u = (3 + sqrt 5) / 2) is beta ln 2 / ((1 + sqrt 5) / 2) = beta ln 2 / phi (derived
//   here from the density, no source needed).
// The peak infectious load (the largest W-day rolling sum of the incidence over days) is found
// independently by summing the closed-form density over every day.
// Also: fitting the waves of a series one by one, and the options' validation.
#include "siftwave/fit/fit.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <vector>

namespace siftwave::fit {
namespace {

const Date kFirstDay = *Date::fromIso("2026-01-05");

std::vector<double> gumbelSeries(const std::vector<std::vector<double>>& waves, int days) {
    const auto& gumbel = waveModel(ModelKind::Gumbel);
    std::vector<double> x(static_cast<std::size_t>(days), 0.0);
    for (int d = 0; d < days; ++d) {
        for (const auto& p : waves)
            x[static_cast<std::size_t>(d)] += gumbel.incidenceAt(d, p);
    }
    return x;
}

double gumbelC(double t, double K, double mu, double beta) {
    return K * std::exp(-std::exp(-(t - mu) / beta));
}

void expectRelative(double got, double expected, double tolerance, const char* what) {
    EXPECT_NEAR(got, expected, tolerance * std::abs(expected)) << what;
}

struct Truth {
    double K, mu, beta;
};

// Fits the whole series (window 0 .. n - 1) and checks every derived value at the truth.
void checkDerivedValues(const Truth& g, int days, double population) {
    const auto counts = gumbelSeries({{g.K, g.mu, g.beta}}, days);
    FitOptions o;
    o.window = std::pair{0, days - 1};
    auto fit = fitSeries({kFirstDay, counts}, o, population);
    ASSERT_TRUE(fit.ok()) << fit.error().message;
    const FitResult& r = *fit;
    ASSERT_TRUE(r.summary.converged()) << r.summary.brief();
    const DerivedQuantities& d = r.derived;
    const double tol = 1e-6;

    expectRelative(r.parameters[0].estimate.value, g.K, tol, "K");
    expectRelative(d.waveSize.value, g.K, tol, "wave size");
    EXPECT_NEAR(d.peakDay.value, g.mu, 1e-5) << "peak day";  // window starts at day 0
    EXPECT_EQ(r.dateOf(d.peakDay.value), kFirstDay + static_cast<int>(std::lround(g.mu)));
    expectRelative(d.peakIncidence.value, g.K / (g.beta * std::numbers::e), tol, "peak height");

    const double q0 = o.startQuantile, q1 = o.endQuantile;  // 2.5% and 97.5% by default
    EXPECT_NEAR(d.startDay.value, g.mu - g.beta * std::log(-std::log(q0)), 1e-5) << "start";
    EXPECT_NEAR(d.endDay.value, g.mu - g.beta * std::log(-std::log(q1)), 1e-5) << "end";
    EXPECT_NEAR(d.fastestGrowthDay.value, g.mu - g.beta * std::log((3.0 + std::sqrt(5.0)) / 2.0),
                1e-5)
        << "fastest growth";
    // The model's instantaneous doubling time at its fastest growth. Hand derivation from the
    // Gumbel density: with u = exp(-(t - mu) / beta), f is proportional to u exp(-u), so
    // d log f / dt = (u - 1) / beta; f' peaks where u = (3 + sqrt 5) / 2 (the fastest-growth
    // check above), where the rate is (1 + sqrt 5) / (2 beta): doubling = beta ln 2 / golden ratio.
    expectRelative(d.doublingTimeDays.value, g.beta * std::numbers::ln2 / std::numbers::phi, 1e-5,
                   "model's doubling time at its fastest growth");

    // C at the middle of the last day with data, over K.
    expectRelative(d.fractionObserved.value, gumbelC(days - 1 + 0.5, g.K, g.mu, g.beta) / g.K, tol,
                   "fraction observed");

    // The peak infectious load, by brute force: every day's sum of the closed-form incidence
    // over the W days ending on it, the largest over all days of the series.
    const int W = o.infectiousWindowDays;
    double load = 0;
    for (int day = 0; day < days + W; ++day) {
        double sum = 0;
        for (int k = 0; k < W; ++k) {
            const double u = std::exp(-(day - k - g.mu) / g.beta);
            sum += g.K / g.beta * u * std::exp(-u);
        }
        load = std::max(load, sum);
    }
    expectRelative(d.peakInfectiousLoad.value, load, 1e-6, "infectious load");
    ASSERT_TRUE(d.peakInfectiousLoadPer100k && d.log10InfectiousShare);
    expectRelative(d.peakInfectiousLoadPer100k->value, load * 1e5 / population, 1e-6, "per 100k");
    EXPECT_NEAR(d.log10InfectiousShare->value, std::log10(load / population), 1e-6) << "share";

    // Intervals bracket their values (a noiseless fit has tiny but non-negative widths).
    for (const Estimate* e : {&d.peakDay, &d.peakIncidence, &d.waveSize, &d.startDay, &d.endDay,
                              &d.fastestGrowthDay, &d.doublingTimeDays, &d.peakInfectiousLoad}) {
        EXPECT_LE(e->lower, e->value);
        EXPECT_GE(e->upper, e->value);
    }
}

TEST(FitDerivedValues, AWholeGumbelWaveGivesTheClosedFormsOfEveryDerivedQuantity) {
    checkDerivedValues({40000, 120, 11}, 400, 2.5e6);
}

TEST(FitDerivedValues, AWaveSeenOnlyPastItsPeakGivesTheObservedFractionOfTheClosedForm) {
    // The series ends 8 days after the peak: C(day 127.5) / K = exp(-exp(-7.5 / 11)) = 0.61.
    checkDerivedValues({25000, 120, 11}, 128, 8.0e5);
}

TEST(FitDerivedValues, WavesOfOneSeriesAreFittedOneByOne) {
    // Two separate waves; the second is the larger.
    const auto counts = gumbelSeries({{15000, 90, 8}, {40000, 260, 12}}, 420);
    const DailySeries series{kFirstDay, counts};
    FitOptions o;
    auto byDefault = fitSeries(series, o);  // the largest wave
    ASSERT_TRUE(byDefault.ok()) << byDefault.error().message;
    ASSERT_EQ(byDefault->waves.size(), 2u);
    EXPECT_NEAR(byDefault->first + byDefault->derived.peakDay.value, 260, 0.5);

    o.wave = WaveChoice::Index;
    o.waveIndex = 0;
    auto first = fitSeries(series, o);
    ASSERT_TRUE(first.ok()) << first.error().message;
    EXPECT_NEAR(first->first + first->derived.peakDay.value, 90, 0.5);
    EXPECT_NEAR(first->derived.waveSize.value, 15000, 0.02 * 15000);
    EXPECT_LE(first->last, byDefault->first);  // the first wave's window ends where the next begins

    o.waveIndex = 1;
    auto second = fitSeries(series, o);
    ASSERT_TRUE(second.ok()) << second.error().message;
    EXPECT_EQ(second->first, byDefault->first);
    EXPECT_EQ(second->last, byDefault->last);

    o.wave = WaveChoice::Latest;
    auto latest = fitSeries(series, o);
    ASSERT_TRUE(latest.ok());
    EXPECT_EQ(latest->first, second->first);

    o.wave = WaveChoice::Index;
    o.waveIndex = 2;  // there is no third wave
    auto missing = fitSeries(series, o);
    ASSERT_FALSE(missing.ok());
    EXPECT_EQ(missing.error().code, ErrorCode::NotFound);
}

TEST(FitDerivedValues, OptionsRejectInconsistentValuesAsUsageErrors) {
    EXPECT_TRUE(FitOptions{}.validate().ok());
    auto rejected = [](auto change) {
        FitOptions o;
        change(o);
        const auto s = o.validate();
        return !s.ok() && s.error().code == ErrorCode::Usage;
    };
    EXPECT_TRUE(rejected([](FitOptions& o) { o.smoothingWindow = 0; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.smoothingWindow = 366; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.startQuantile = 0.98; }));  // above the end quantile
    EXPECT_TRUE(rejected([](FitOptions& o) { o.endQuantile = 1.0; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.infectiousWindowDays = 0; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.window = std::pair{10, 5}; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.weekdayFactors = true; }));  // with LSQ
    EXPECT_TRUE(rejected([](FitOptions& o) { o.solver.maxIterations = 0; }));
    EXPECT_TRUE(rejected([](FitOptions& o) { o.detection.minPeriods = 1; }));
    // Weekday factors are fine with a likelihood method.
    FitOptions poisson;
    poisson.method = FitMethod::Poisson;
    poisson.weekdayFactors = true;
    EXPECT_TRUE(poisson.validate().ok());
    // fitSeries refuses invalid options before it reads the series.
    std::vector<double> counts(50, 3.0);
    FitOptions bad;
    bad.smoothingWindow = 0;
    auto r = fitSeries({kFirstDay, counts}, bad);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Usage);
}

}  // namespace
}  // namespace siftwave::fit
