// Weekday adjustment by the ratio-to-moving-average method (Hyndman & Athanasopoulos,
// Forecasting: Principles and Practice, 3rd ed., section 3.4, classical multiplicative
// decomposition with m = 7).
#include "siftwave/series/weekday.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

namespace siftwave::series {
namespace {

const Date kMonday = *Date::fromIso("2026-03-02");

TEST(Weekday, RecoversKnownFactorsOnAFlatSeries) {
    // Factors with arithmetic mean 1, as the method normalises them.
    const std::array<double, 7> truth{1.3, 1.1, 1.0, 1.0, 0.9, 0.8, 0.9};
    std::vector<double> x(140);
    for (std::size_t i = 0; i < x.size(); ++i)
        x[i] = 200.0 * truth[i % 7];
    auto f = estimateWeekdayFactors(x, kMonday);
    ASSERT_TRUE(f) << f.error().message;
    for (std::size_t d = 0; d < 7; ++d)
        EXPECT_NEAR(f->factor[d], truth[d], 1e-12) << d;
    const auto adjusted = removeWeekdayEffect(x, kMonday, *f);
    for (double v : adjusted)
        EXPECT_NEAR(v, 200.0, 1e-9);
}

TEST(Weekday, RecoversFactorsOnASmoothWaveWithinAFewPercent) {
    const std::array<double, 7> truth{1.25, 1.1, 1.0, 1.0, 0.95, 0.8, 0.9};
    std::vector<double> x(200);
    for (std::size_t i = 0; i < x.size(); ++i) {
        const double t = static_cast<double>(i) - 100.0;
        x[i] = (50.0 + 1000.0 * std::exp(-t * t / 800.0)) * truth[(i + 2) % 7];
    }
    auto f = estimateWeekdayFactors(x, kMonday + 2);  // day 0 is a Wednesday
    ASSERT_TRUE(f);
    for (std::size_t d = 0; d < 7; ++d)
        EXPECT_NEAR(f->factor[d], truth[d], 0.02) << d;
}

TEST(Weekday, MissingDaysAreSkippedAndTooShortSeriesAreRefused) {
    std::vector<double> x(60, 100.0);
    x[10] = std::numeric_limits<double>::quiet_NaN();
    auto f = estimateWeekdayFactors(x, kMonday);
    ASSERT_TRUE(f);
    for (double v : f->factor)
        EXPECT_NEAR(v, 1.0, 1e-12);
    EXPECT_TRUE(std::isnan(removeWeekdayEffect(x, kMonday, *f)[10]));
    const std::vector<double> shortSeries(8, 5.0);
    EXPECT_FALSE(estimateWeekdayFactors(shortSeries, kMonday));
}

}  // namespace
}  // namespace siftwave::series
