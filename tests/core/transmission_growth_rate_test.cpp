// The growth rate r(t): Poisson log-linear regression over a sliding window (growth_rate.h).
#include "siftwave/transmission/growth_rate.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace siftwave::transmission {
namespace {

TimeAxis dailyAxis(std::size_t n, const char* first = "2026-03-02") {
    return TimeAxis::daily(*Date::fromIso(first), static_cast<std::int32_t>(n));
}

std::vector<double> exponential(std::size_t n, double start, double r) {
    std::vector<double> y(n);
    for (std::size_t t = 0; t < n; ++t)
        y[t] = start * std::exp(r * static_cast<double>(t));
    return y;
}

// An exact exponential (non-integer expected counts) is a perfect fit of the log-linear model:
// the Poisson score equations hold at the true parameters, so IRLS returns r to rounding.
TEST(TransmissionGrowthRate, ExactExponentialSeriesGivesRToNumericalPrecision) {
    for (double r : {0.08, -0.03, 0.0}) {
        const auto y = exponential(40, 30.0, r);
        const auto est = growthRates(y, dailyAxis(y.size()), GrowthOptions{});
        for (std::size_t t = 6; t < y.size(); ++t) {
            ASSERT_TRUE(est[t].ok()) << est[t].reason;
            EXPECT_NEAR(est[t].r.value, r, 1e-12) << "t " << t;
            EXPECT_NEAR(est[t].dispersion, 0.0, 1e-12);
            EXPECT_FALSE(est[t].quasiPoisson);
        }
    }
}

// The Poisson standard error from the Fisher information (McCullagh & Nelder 1989, 2.5): with
// mu = y exactly, Var(r) = [X^T diag(mu) X]^{-1}_{11} = 1 / sum mu_i (x_i - xbar_mu)^2, xbar_mu
// the mu-weighted mean of x. Doubling time ln 2 / r with interval [ln 2 / r_hi, ln 2 / r_lo].
TEST(TransmissionGrowthRate, PoissonErrorAndDoublingTimeFollowTheirFormulas) {
    const auto y = exponential(7, 100.0, 0.1);
    const auto est = growthRates(y, dailyAxis(7), GrowthOptions{});
    const GrowthEstimate& e = est[6];
    ASSERT_TRUE(e.ok());
    double s = 0, sx = 0;
    for (int i = 0; i < 7; ++i) {
        s += y[static_cast<std::size_t>(i)];
        sx += y[static_cast<std::size_t>(i)] * i;
    }
    const double xbar = sx / s;
    double sxx = 0;
    for (int i = 0; i < 7; ++i)
        sxx += y[static_cast<std::size_t>(i)] * (i - xbar) * (i - xbar);
    EXPECT_NEAR(e.se, 1.0 / std::sqrt(sxx), 1e-12);
    const double z = 1.959963984540054;  // standard normal 97.5% quantile (any table)
    EXPECT_NEAR(e.r.lower, 0.1 - z * e.se, 1e-12);
    EXPECT_NEAR(e.doublingDays.value, std::log(2.0) / 0.1, 1e-10);
    EXPECT_NEAR(e.doublingDays.lower, std::log(2.0) / e.r.upper, 1e-12);
    EXPECT_NEAR(e.doublingDays.upper, std::log(2.0) / e.r.lower, 1e-12);
    EXPECT_TRUE(std::isnan(e.halvingDays.value));
}

// Overdispersed counts (alternating around a flat level) inflate the error by sqrt(phi) and use
// Student t with n - 2 degrees of freedom (t_{0.975, 5} = 2.5706, any table); counts closer than
// Poisson keep the Poisson error: it is never shrunk.
TEST(TransmissionGrowthRate, QuasiPoissonOnlyInflatesTheError) {
    const std::vector<double> wild{20, 60, 15, 70, 25, 55, 30};
    const std::vector<double> tame{40, 41, 40, 41, 40, 41, 40};
    const auto w = growthRates(wild, dailyAxis(7), GrowthOptions{})[6];
    const auto c = growthRates(tame, dailyAxis(7), GrowthOptions{})[6];
    ASSERT_TRUE(w.ok() && c.ok());
    EXPECT_GT(w.dispersion, 5.0);
    EXPECT_TRUE(w.quasiPoisson);
    EXPECT_NEAR((w.r.upper - w.r.lower) / (2.0 * w.se), 2.5706, 1e-4);
    EXPECT_LT(c.dispersion, 1.0);
    EXPECT_FALSE(c.quasiPoisson);
    EXPECT_NEAR((c.r.upper - c.r.lower) / (2.0 * c.se), 1.96, 1e-3);
    // Open-ended: r's interval holds 0, so the far end of the doubling or halving time is +inf.
    const Interval& t = w.r.value > 0 ? w.doublingDays : w.halvingDays;
    EXPECT_TRUE(std::isfinite(t.value));
    EXPECT_TRUE(std::isinf(t.upper));
    EXPECT_LT(w.r.lower, 0.0);
    EXPECT_GT(w.r.upper, 0.0);
}

TEST(TransmissionGrowthRate, ShrinkingCountsGiveAHalvingTime) {
    const auto y = exponential(14, 500.0, -0.07);
    const auto e = growthRates(y, dailyAxis(14), GrowthOptions{})[13];
    ASSERT_TRUE(e.ok());
    EXPECT_NEAR(e.halvingDays.value, std::log(2.0) / 0.07, 1e-9);
    EXPECT_LT(e.halvingDays.lower, e.halvingDays.value);
    EXPECT_GT(e.halvingDays.upper, e.halvingDays.value);
    EXPECT_TRUE(std::isfinite(e.halvingDays.upper));
    EXPECT_TRUE(std::isnan(e.doublingDays.value));
}

// A planted weekday effect (reporting factors per weekday; common practice, no source, for the
// shape: fewer reports at the weekend, a Monday catch-up). With weekday terms the model holds
// exactly and r is recovered to rounding; without them the sliding estimate swings with the
// weekday the window ends on.
TEST(TransmissionGrowthRate, WeekdayTermsRemoveAPlantedWeekdayEffect) {
    const double factor[8] = {0, 1.4, 1.1, 1.0, 1.0, 0.95, 0.6, 0.45};  // ISO weekday 1..7
    const TimeAxis axis = dailyAxis(56);
    std::vector<double> y = exponential(56, 200.0, 0.04);
    for (std::size_t t = 0; t < y.size(); ++t)
        y[t] *= factor[axis.periodStart(static_cast<std::int32_t>(t)).isoWeekday()];
    GrowthOptions with;
    with.window = 14;
    with.weekdayTerms = true;
    GrowthOptions without = with;
    without.weekdayTerms = false;
    without.window = 10;  // a window of whole weeks would hide part of the effect
    const auto a = growthRates(y, axis, with);
    const auto b = growthRates(y, axis, without);
    double worstWith = 0.0, worstWithout = 0.0;
    for (std::size_t t = 13; t < y.size(); ++t) {
        ASSERT_TRUE(a[t].ok() && b[t].ok());
        worstWith = std::max(worstWith, std::abs(a[t].r.value - 0.04));
        worstWithout = std::max(worstWithout, std::abs(b[t].r.value - 0.04));
    }
    EXPECT_LT(worstWith, 1e-10);
    EXPECT_GT(worstWithout, 0.01);
}

TEST(TransmissionGrowthRate, ThinOrBrokenWindowsAreReasons) {
    EXPECT_TRUE(growthRates({}, dailyAxis(0), GrowthOptions{}).empty());
    const std::vector<double> shortSeries{5, 6, 7};
    for (const auto& e : growthRates(shortSeries, dailyAxis(3), GrowthOptions{}))
        EXPECT_NE(e.reason.find("not yet full"), std::string::npos);
    std::vector<double> y(10, 1.0);
    y[8] = std::numeric_limits<double>::quiet_NaN();
    const auto est = growthRates(y, dailyAxis(10), GrowthOptions{});
    EXPECT_NE(est[6].reason.find("fewer than 10 cases"), std::string::npos) << est[6].reason;
    EXPECT_NE(est[9].reason.find("missing (2026-03-10)"), std::string::npos) << est[9].reason;
    const std::vector<double> oneEnd{0, 0, 0, 0, 0, 0, 50};
    const auto e = growthRates(oneEnd, dailyAxis(7), GrowthOptions{})[6];
    EXPECT_NE(e.reason.find("does not converge"), std::string::npos) << e.reason;
}

// The single-window entry point is the same regression as the sliding one: every period's
// estimate, reason and interval are the same (bit for bit: one code path), weekday terms too.
TEST(TransmissionGrowthRate, OneWindowEqualsTheSlidingEstimateAtItsLastPeriod) {
    const std::vector<double> y{3,  5,  4,  9,   12,  10,  19,  25,  21,  40,  38,  55,  61,
                                58, 90, 84, 120, 131, 118, 170, 160, 240, 230, 199, 310, 280};
    for (const bool weekdays : {false, true}) {
        GrowthOptions o;
        o.window = weekdays ? 14 : 7;
        o.weekdayTerms = weekdays;
        const TimeAxis axis = dailyAxis(y.size());
        const auto all = growthRates(y, axis, o);
        for (std::size_t t = 0; t < y.size(); ++t) {
            const GrowthEstimate one = growthRateAt(y, axis, static_cast<std::int32_t>(t), o);
            EXPECT_EQ(one.reason, all[t].reason) << "t " << t;
            if (!one.ok())
                continue;
            EXPECT_EQ(one.r.value, all[t].r.value) << "t " << t;
            EXPECT_EQ(one.r.lower, all[t].r.lower) << "t " << t;
            EXPECT_EQ(one.se, all[t].se) << "t " << t;
            EXPECT_EQ(one.dispersion, all[t].dispersion) << "t " << t;
            EXPECT_EQ(one.doublingDays.upper, all[t].doublingDays.upper) << "t " << t;
        }
    }
}

TEST(TransmissionGrowthRate, OptionsAreValidatedForTheCadence) {
    GrowthOptions o;
    o.weekdayTerms = true;
    EXPECT_FALSE(o.validate(Cadence::Daily).ok());  // window 7 < 14
    o.window = 14;
    EXPECT_TRUE(o.validate(Cadence::Daily).ok());
    EXPECT_FALSE(o.validate(Cadence::Weekly).ok());
    o.weekdayTerms = false;
    o.window = 2;
    EXPECT_FALSE(o.validate(Cadence::Weekly).ok());
}

// Weekly counts: r stays per day (x in days), so a weekly series growing by exp(7 r) a week
// gives r.
TEST(TransmissionGrowthRate, WeeklyCountsGiveRPerDay) {
    const TimeAxis axis = TimeAxis::weekly(*Date::fromIso("2026-01-05"), 20, WeekStart::Monday);
    const auto y = exponential(20, 100.0, 0.35);  // per week
    const auto est = growthRates(y, axis, GrowthOptions{});
    EXPECT_NEAR(est[19].r.value, 0.05, 1e-12);
    EXPECT_NEAR(est[19].doublingDays.value, std::log(2.0) / 0.05, 1e-9);
}

}  // namespace
}  // namespace siftwave::transmission
