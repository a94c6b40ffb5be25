#include "siftwave/series/smoothing.h"

#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

namespace siftwave::series {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

TEST(Smoothing, CentredAverageOfOddWindowMatchesHandComputedValues) {
    const std::vector<double> x{1, 2, 3, 10, 5, 6, 7};
    const auto s = centredMovingAverage(x, 3);
    ASSERT_EQ(s.size(), x.size());
    EXPECT_DOUBLE_EQ(s[0], 1.5);  // partial window: (1 + 2) / 2
    EXPECT_DOUBLE_EQ(s[1], 2.0);
    EXPECT_DOUBLE_EQ(s[2], 5.0);
    EXPECT_DOUBLE_EQ(s[3], 6.0);
    EXPECT_DOUBLE_EQ(s[4], 7.0);
    EXPECT_DOUBLE_EQ(s[5], 6.0);
    EXPECT_DOUBLE_EQ(s[6], 6.5);
}

TEST(Smoothing, TrailingAverageMatchesHandComputedValues) {
    const std::vector<double> x{1, 2, 3, 10, 5, 6, 7};
    const auto s = trailingMovingAverage(x, 3);
    EXPECT_DOUBLE_EQ(s[0], 1.0);
    EXPECT_DOUBLE_EQ(s[1], 1.5);
    EXPECT_DOUBLE_EQ(s[2], 2.0);
    EXPECT_DOUBLE_EQ(s[3], 5.0);
    EXPECT_DOUBLE_EQ(s[6], 6.0);
}

// The 2 x m centred average of even order (Hyndman & Athanasopoulos, Forecasting:
// Principles and Practice, 3rd ed., section 3.3): weights 1/8, 1/4, 1/4, 1/4, 1/8 for m = 4.
TEST(Smoothing, CentredAverageOfEvenWindowIsTheTwoByMAverage) {
    const std::vector<double> x{4, 8, 2, 6, 10, 0, 12};
    const auto s = centredMovingAverage(x, 4, EdgeRule::Missing);
    EXPECT_TRUE(std::isnan(s[0]));
    EXPECT_TRUE(std::isnan(s[1]));
    EXPECT_DOUBLE_EQ(s[2], 4.0 / 8 + (8 + 2 + 6) / 4.0 + 10.0 / 8);
    EXPECT_DOUBLE_EQ(s[3], 8.0 / 8 + (2 + 6 + 10) / 4.0 + 0.0 / 8);
    EXPECT_DOUBLE_EQ(s[4], 2.0 / 8 + (6 + 10 + 0) / 4.0 + 12.0 / 8);
    EXPECT_TRUE(std::isnan(s[5]));
}

TEST(Smoothing, MissingEdgeRuleLeavesIncompleteWindowsEmpty) {
    const std::vector<double> x{1, 2, 3, 4, 5, 6, 7, 8, 9};
    const auto c = centredMovingAverage(x, 7, EdgeRule::Missing);
    for (int i = 0; i < 9; ++i)
        EXPECT_EQ(std::isnan(c[i]), i < 3 || i > 5) << i;
    const auto t = trailingMovingAverage(x, 7, EdgeRule::Missing);
    for (int i = 0; i < 9; ++i)
        EXPECT_EQ(std::isnan(t[i]), i < 6) << i;
}

// A symmetric average reproduces a straight line exactly; a trailing one shifts it
// by (w - 1) / 2 days (arithmetic, no source needed).
TEST(Smoothing, CentredAverageKeepsALineAndTrailingAverageLagsByHalfItsWindow) {
    std::vector<double> x(60);
    for (std::size_t i = 0; i < x.size(); ++i)
        x[i] = 3.0 + 2.0 * static_cast<double>(i);
    for (int w : {3, 4, 7, 8, 14}) {
        const auto c = centredMovingAverage(x, w, EdgeRule::Missing);
        const auto t = trailingMovingAverage(x, w, EdgeRule::Missing);
        for (std::size_t i = 20; i < 40; ++i) {
            EXPECT_NEAR(c[i], x[i], 1e-12) << "w=" << w;
            EXPECT_NEAR(t[i], x[i] - 2.0 * trailingLagDays(w), 1e-12) << "w=" << w;
        }
    }
}

TEST(Smoothing, CentredAverageKeepsTheDayOfASymmetricPeakAndTrailingMovesIt) {
    std::vector<double> x(101);
    for (std::size_t i = 0; i < x.size(); ++i) {
        const double d = static_cast<double>(i) - 50.0;
        x[i] = 1000.0 * std::exp(-d * d / 200.0);
    }
    const auto c = centredMovingAverage(x, 7);
    const auto t = trailingMovingAverage(x, 7);
    EXPECT_EQ(std::max_element(c.begin(), c.end()) - c.begin(), 50);
    EXPECT_EQ(std::max_element(t.begin(), t.end()) - t.begin(), 53);
}

TEST(Smoothing, NaNInputsAreSkippedAndAWindowOfOnlyNaNGivesNaN) {
    const std::vector<double> x{2, kNaN, 4, kNaN, kNaN, kNaN, 9};
    const auto s = centredMovingAverage(x, 3);
    EXPECT_DOUBLE_EQ(s[0], 2.0);
    EXPECT_DOUBLE_EQ(s[1], 3.0);
    EXPECT_DOUBLE_EQ(s[2], 4.0);
    EXPECT_DOUBLE_EQ(s[3], 4.0);
    EXPECT_TRUE(std::isnan(s[4]));
    EXPECT_DOUBLE_EQ(s[5], 9.0);
}

TEST(Smoothing, WindowOfOneReturnsTheInputAndEmptyInputGivesEmptyOutput) {
    const std::vector<double> x{5, 1, 7};
    EXPECT_EQ(centredMovingAverage(x, 1), x);
    EXPECT_EQ(trailingMovingAverage(x, 1), x);
    EXPECT_TRUE(centredMovingAverage(std::span<const double>{}, 7).empty());
}

TEST(Smoothing, OptionsRejectWindowsOutsideOneTo365Days) {
    MovingAverageOptions o;
    EXPECT_TRUE(o.validate().ok());
    EXPECT_EQ(o.window, 7);
    o.window = 0;
    EXPECT_FALSE(o.validate().ok());
    EXPECT_EQ(o.validate().error().code, ErrorCode::Usage);
    o.window = 366;
    EXPECT_FALSE(o.validate().ok());
}

TEST(Smoothing, WindowLongerThanTheSeriesAveragesEverythingWithPartialEdges) {
    const std::vector<double> x{1, 2, 3};
    const auto s = centredMovingAverage(x, 9);
    for (double v : s)
        EXPECT_DOUBLE_EQ(v, 2.0);
}

// The running sums must give what a direct sum gives, on a long series with gaps (beyond the
// 256-day re-anchoring) and for both edge rules.
TEST(Smoothing, RunningSumsAgreeWithDirectSumsOnALongSeriesWithGaps) {
    std::vector<double> x(1500);
    for (std::size_t i = 0; i < x.size(); ++i) {
        x[i] = (i % 97 == 5 || i % 131 < 3) ? kNaN : static_cast<double>((i * 7919) % 1000) / 7.0;
    }
    for (int w : {1, 3, 7, 15}) {
        for (EdgeRule edges : {EdgeRule::Partial, EdgeRule::Missing}) {
            const auto c = centredMovingAverage(x, w, edges);
            const auto t = trailingMovingAverage(x, w, edges);
            const int n = static_cast<int>(x.size());
            for (int i = 0; i < n; ++i) {
                auto direct = [&](int first) {
                    double sum = 0;
                    int count = 0;
                    const int last = first + w - 1;
                    if (edges == EdgeRule::Missing && (first < 0 || last >= n))
                        return kNaN;
                    for (int k = std::max(0, first); k <= std::min(n - 1, last); ++k) {
                        if (std::isfinite(x[k])) {
                            sum += x[k];
                            ++count;
                        }
                    }
                    return count ? sum / count : kNaN;
                };
                const double dc = direct(i - w / 2), dt = direct(i - w + 1);
                ASSERT_EQ(std::isnan(c[i]), std::isnan(dc)) << w << " " << i;
                ASSERT_EQ(std::isnan(t[i]), std::isnan(dt)) << w << " " << i;
                ASSERT_TRUE(std::isnan(dc) || std::abs(c[i] - dc) < 1e-9) << w << " " << i;
                ASSERT_TRUE(std::isnan(dt) || std::abs(t[i] - dt) < 1e-9) << w << " " << i;
            }
        }
    }
}

// The running sums are re-summed in blocks of 256 days and four blocks advance together: on long
// series with gaps, both edge rules and windows of every size, each average must be the plain
// mean of the finite values in its window -- exactly for integer counts (their sums are exact),
// to 1e-12 for fractional values.
TEST(Smoothing, RunningAveragesEqualThePlainWindowMeansOnLongSeriesWithGaps) {
    siftwave::testing::Xorshift64 rng(7);
    for (int n : {1, 5, 255, 256, 257, 1023, 1024, 1025, 2500}) {
        for (bool integers : {true, false}) {
            std::vector<double> x(static_cast<std::size_t>(n));
            for (double& v : x) {
                v = static_cast<double>(rng.below(5000));
                if (!integers)
                    v /= 7.0;
                if (rng.below(40) == 0)
                    v = kNaN;
            }
            for (int window : {1, 3, 7, 28, 365}) {
                for (EdgeRule edges : {EdgeRule::Partial, EdgeRule::Missing}) {
                    for (bool centred : {true, false}) {
                        if (centred && window % 2 == 0)
                            continue;  // even centred windows are the weighted 2 x m average
                        const auto got = centred ? centredMovingAverage(x, window, edges)
                                                 : trailingMovingAverage(x, window, edges);
                        ASSERT_EQ(got.size(), x.size());
                        const int offset = centred ? window / 2 : window - 1;
                        for (int i = 0; i < n; ++i) {
                            const int first = i - offset, end = first + window;
                            double sum = 0;
                            int count = 0;
                            for (int j = std::max(0, first); j < std::min(n, end); ++j) {
                                if (std::isfinite(x[static_cast<std::size_t>(j)])) {
                                    sum += x[static_cast<std::size_t>(j)];
                                    ++count;
                                }
                            }
                            const bool complete = first >= 0 && end <= n;
                            const double v = got[static_cast<std::size_t>(i)];
                            if (count == 0 || (edges == EdgeRule::Missing && !complete)) {
                                EXPECT_TRUE(std::isnan(v)) << n << " " << window << " " << i;
                            } else if (integers) {
                                EXPECT_EQ(v, sum / count) << n << " " << window << " " << i;
                            } else {
                                EXPECT_NEAR(v, sum / count, 1e-12 * std::max(1.0, sum / count))
                                    << n << " " << window << " " << i;
                            }
                        }
                    }
                }
            }
        }
    }
}

}  // namespace
}  // namespace siftwave::series
