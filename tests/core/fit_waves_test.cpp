// Automatic wave detection on generated series with known waves.
#include "siftwave/fit/waves.h"

#include "siftwave/fit/models.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

namespace siftwave::fit {
namespace {

std::vector<double> gumbelWaves(const std::vector<std::vector<double>>& waves, int days,
                                double baseline = 2.0) {
    const auto& m = waveModel(ModelKind::Gumbel);
    std::vector<double> x(static_cast<std::size_t>(days), baseline);
    for (int d = 0; d < days; ++d) {
        for (const auto& p : waves)
            x[static_cast<std::size_t>(d)] += m.incidenceAt(d, p);
    }
    return x;
}

TEST(FitWaves, FindsThreeWavesInTimeOrderWithTheirPeaks) {
    const auto x = gumbelWaves({{20000, 80, 10}, {40000, 250, 12}, {15000, 420, 9}}, 520);
    const auto waves = detectWaves(x);
    ASSERT_EQ(waves.size(), 3u);
    const int peaks[] = {80, 250, 420};
    for (std::size_t k = 0; k < 3; ++k) {
        EXPECT_NEAR(waves[k].peak, peaks[k], 2) << k;
        EXPECT_LT(waves[k].first, waves[k].peak);
        EXPECT_GT(waves[k].last, waves[k].peak);
        EXPECT_TRUE(waves[k].peakConfirmed);
        EXPECT_TRUE(k == 0 || waves[k].first >= waves[k - 1].last) << k;
    }
    EXPECT_TRUE(waves[0].troughSeen);
    EXPECT_FALSE(waves[2].troughSeen);  // the series ends in the last decline
    // The rise starts before the wave's 2.5% quantile (mu - beta ln(-ln 0.025) = 80 - 13.1).
    EXPECT_LT(waves[0].first, 67);
}

TEST(FitWaves, AWaveStillRisingAtTheEndHasAnUnconfirmedPeak) {
    // The series ends on day 249, ten days before the second wave's peak.
    const auto x = gumbelWaves({{20000, 80, 10}, {30000, 260, 12}}, 250);
    const auto waves = detectWaves(x);
    ASSERT_EQ(waves.size(), 2u);
    EXPECT_TRUE(waves[0].peakConfirmed);
    EXPECT_FALSE(waves[1].peakConfirmed);
    EXPECT_EQ(waves[1].last, 249);
}

TEST(FitWaves, SmallRipplesAndFlatSeriesGiveNoWave) {
    std::vector<double> flat(200, 3.0);
    EXPECT_TRUE(detectWaves(flat).empty());
    std::vector<double> ripples(200);
    for (std::size_t i = 0; i < ripples.size(); ++i)
        ripples[i] = 100.0 + 5.0 * std::sin(i / 9.0);
    EXPECT_TRUE(detectWaves(ripples).empty());  // 10% swings stay below the 20% prominence
}

TEST(FitWaves, MissingDaysDoNotBreakDetection) {
    auto x = gumbelWaves({{20000, 80, 10}, {40000, 250, 12}}, 360);
    for (int d = 100; d < 110; ++d)
        x[static_cast<std::size_t>(d)] = std::numeric_limits<double>::quiet_NaN();
    const auto waves = detectWaves(x);
    ASSERT_EQ(waves.size(), 2u);
    EXPECT_NEAR(waves[1].peak, 250, 2);
}

TEST(FitWaves, OptionsAreValidated) {
    WaveDetectionOptions o;
    EXPECT_TRUE(o.validate().ok());
    o.minProminenceShare = 1.5;
    EXPECT_FALSE(o.validate().ok());
    o = {};
    o.minDays = 1;
    EXPECT_FALSE(o.validate().ok());
}

}  // namespace
}  // namespace siftwave::fit
