// Automatic wave detection on generated series with known waves.
#include "siftwave/fit/waves.h"

#include "siftwave/fit/models.h"
#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <algorithm>
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

// The zig-zag written the plain way, one day at a time with the state in one loop: the
// reference that the phase-by-phase loops of waves.cpp must reproduce exactly.
struct ZigZag {
    std::vector<int> troughs, peaks;
    bool openRise = false;
};
ZigZag plainZigZag(const std::vector<double>& s, double delta) {
    ZigZag z;
    const int n = static_cast<int>(s.size());
    bool seekingPeak = true;
    int minIndex = -1, maxIndex = -1;
    double lo = 0, hi = 0;
    int begin = 0;
    while (begin < n && !std::isfinite(s[static_cast<std::size_t>(begin)]))
        ++begin;
    if (begin < n) {
        minIndex = maxIndex = begin;
        lo = hi = s[static_cast<std::size_t>(begin)];
    }
    for (int i = begin + 1; i < n; ++i) {
        const double v = s[static_cast<std::size_t>(i)];
        if (!std::isfinite(v))
            continue;
        if (seekingPeak) {
            if (v > hi) {
                maxIndex = i;
                hi = v;
            }
            if (hi - lo >= delta && v < hi - delta) {
                z.troughs.push_back(minIndex);
                z.peaks.push_back(maxIndex);
                seekingPeak = false;
                minIndex = i;
                lo = v;
            } else if (v < lo) {
                minIndex = maxIndex = i;
                lo = hi = v;
            }
        } else {
            if (v < lo) {
                minIndex = i;
                lo = v;
            }
            if (v > lo + delta) {
                seekingPeak = true;
                maxIndex = i;
                hi = v;
            }
        }
    }
    if (seekingPeak && maxIndex > minIndex && minIndex >= 0 &&
        s[static_cast<std::size_t>(maxIndex)] - s[static_cast<std::size_t>(minIndex)] >= delta) {
        z.troughs.push_back(minIndex);
        z.peaks.push_back(maxIndex);
        z.openRise = true;
    }
    return z;
}

TEST(FitWaves, MatchesThePlainZigZagOnNoisySeriesWithGaps) {
    siftwave::testing::Xorshift64 rng(20261204);
    const WaveDetectionOptions o;  // minPeak 5, minPeriods 14: waves with tiny prominence are kept
    int compared = 0, wavesSeen = 0;
    for (int trial = 0; trial < 400; ++trial) {
        const int n = 20 + static_cast<int>(rng.below(600));
        std::vector<double> s(static_cast<std::size_t>(n));
        // A random walk with plateaus (ties), occasional jumps and runs of missing days.
        double level = static_cast<double>(rng.below(50));
        for (int i = 0; i < n; ++i) {
            const auto r = rng.below(100);
            if (r < 30)
                level += static_cast<double>(rng.below(7));
            else if (r < 60)
                level -= static_cast<double>(rng.below(7));
            else if (r < 62)
                level += static_cast<double>(rng.below(200));
            level = std::max(level, 0.0);
            s[static_cast<std::size_t>(i)] = level;
        }
        for (int gaps = static_cast<int>(rng.below(4)); gaps > 0; --gaps) {
            const int from = static_cast<int>(rng.below(static_cast<std::uint64_t>(n)));
            const int len = 1 + static_cast<int>(rng.below(12));
            for (int i = from; i < std::min(n, from + len); ++i)
                s[static_cast<std::size_t>(i)] = std::numeric_limits<double>::quiet_NaN();
        }
        double top = 0;
        for (double v : s)
            top = std::isfinite(v) ? std::max(top, v) : top;
        if (!(top >= o.minPeak))
            continue;
        const double delta = std::max(o.minProminenceShare * top, o.minPeak / 2.0);
        const ZigZag z = plainZigZag(s, delta);
        int lastFinite = n - 1;
        while (lastFinite > 0 && !std::isfinite(s[static_cast<std::size_t>(lastFinite)]))
            --lastFinite;
        // The waves the reference zig-zag implies, by the rules of waves.h.
        std::vector<Wave> expected;
        for (std::size_t k = 0; k < z.peaks.size(); ++k) {
            Wave w;
            w.peak = z.peaks[k];
            w.peakValue = s[static_cast<std::size_t>(w.peak)];
            const int trough = z.troughs[k];
            const double tv = s[static_cast<std::size_t>(trough)];
            const double riseLevel = tv + o.riseShare * (w.peakValue - tv);
            w.first = trough;
            for (int i = trough; i < w.peak; ++i) {
                const double v = s[static_cast<std::size_t>(i)];
                if (std::isfinite(v) && v <= riseLevel)
                    w.first = i;
            }
            w.last = k + 1 < z.peaks.size() ? z.troughs[k + 1] : lastFinite;
            w.troughSeen = k + 1 < z.peaks.size();
            w.peakConfirmed = !(z.openRise && k + 1 == z.peaks.size());
            if (w.peakValue >= o.minPeak && w.last - w.first + 1 >= o.minPeriods)
                expected.push_back(w);
        }
        const auto got = detectWavesInSmoothed(s, o);
        ASSERT_EQ(got.size(), expected.size()) << "trial " << trial;
        for (std::size_t k = 0; k < got.size(); ++k) {
            EXPECT_EQ(got[k].first, expected[k].first) << trial << " wave " << k;
            EXPECT_EQ(got[k].peak, expected[k].peak) << trial << " wave " << k;
            EXPECT_EQ(got[k].last, expected[k].last) << trial << " wave " << k;
            EXPECT_EQ(got[k].peakValue, expected[k].peakValue) << trial << " wave " << k;
            EXPECT_EQ(got[k].peakConfirmed, expected[k].peakConfirmed) << trial << " wave " << k;
            EXPECT_EQ(got[k].troughSeen, expected[k].troughSeen) << trial << " wave " << k;
        }
        ++compared;
        wavesSeen += static_cast<int>(got.size());
    }
    // The generator must exercise the comparison, not pass it vacuously.
    EXPECT_GT(compared, 300);
    EXPECT_GT(wavesSeen, 300);
}

TEST(FitWaves, OptionsAreValidated) {
    WaveDetectionOptions o;
    EXPECT_TRUE(o.validate().ok());
    o.minProminenceShare = 1.5;
    EXPECT_FALSE(o.validate().ok());
    o = {};
    o.minPeriods = 1;
    EXPECT_FALSE(o.validate().ok());
}

}  // namespace
}  // namespace siftwave::fit
