#include "siftwave/ledger/apportion.h"

#include <gtest/gtest.h>

#include <numeric>
#include <random>

namespace siftwave::ledger {
namespace {

std::vector<std::int64_t> apportion(std::int64_t total, std::vector<std::int64_t> weights) {
    auto r = apportionLargestRemainder(total, weights);
    EXPECT_TRUE(r.ok());
    return r.ok() ? *r : std::vector<std::int64_t>{};
}

// Worked example of Hamilton's method: the "Republic of Parador", 250 seats over six
// states, in P. Tannenbaum, "Excursions in Modern Mathematics", chapter "The Mathematics
// of Apportionment". Figures quoted from memory; the quotas are re-derived here:
// standard divisor 12,500,000 / 250 = 50,000; quotas 32.92, 138.72, 3.08, 41.82, 13.70,
// 19.76; lower quotas sum to 246; the 4 surplus seats go to A (.92), D (.82), F (.76), B (.72).
TEST(LargestRemainder, ReproducesTheParadorWorkedExample) {
    const std::vector<std::int64_t> populations{1'646'000, 6'936'000, 154'000,
                                                2'091'000, 685'000,   988'000};
    EXPECT_EQ(apportion(250, populations), (std::vector<std::int64_t>{33, 139, 3, 42, 13, 20}));
}

// The Hare-quota example of the largest remainder method on Wikipedia ("Largest remainder
// method", 10 seats, 100,000 votes), quoted from memory: quotas 4.70, 1.60, 1.58, 1.20,
// 0.61, 0.31 give automatic seats 4, 1, 1, 1, 0, 0 and the 3 remaining seats go to the
// remainders .70, .61 and .60.
TEST(LargestRemainder, ReproducesTheHareQuotaExample) {
    EXPECT_EQ(apportion(10, {47'000, 16'000, 15'800, 12'000, 6'100, 3'100}),
              (std::vector<std::int64_t>{5, 2, 1, 1, 1, 0}));
}

// The Alabama paradox (Hamilton's method can give a part fewer units when the total
// grows) is a known property of the method; this small case shows it happens here too:
// weights 6, 6, 2 with 10 units give 4, 4, 2; with 11 units they give 5, 5, 1 (worked by hand).
TEST(LargestRemainder, ShowsTheAlabamaParadoxOfHamiltonsMethod) {
    // 10 units: quotas 60/14 = 4.286, 4.286, 20/14 = 1.429 -> floors 4, 4, 1 (9), one left
    // for the largest remainder: 1.429 (.429) > .286 -> the third part.
    EXPECT_EQ(apportion(10, {6, 6, 2}), (std::vector<std::int64_t>{4, 4, 2}));
    // 11 units: quotas 66/14 = 4.714, 4.714, 22/14 = 1.571 -> floors 4, 4, 1 (9), two left
    // for .714 and .714 -> the third part drops from 2 to 1 although the total grew.
    EXPECT_EQ(apportion(11, {6, 6, 2}), (std::vector<std::int64_t>{5, 5, 1}));
}

TEST(LargestRemainder, BreaksTiesTowardTheLowerIndex) {
    EXPECT_EQ(apportion(2, {1, 1, 1}), (std::vector<std::int64_t>{1, 1, 0}));
    EXPECT_EQ(apportion(7, {1, 1, 1, 1, 1}), (std::vector<std::int64_t>{2, 2, 1, 1, 1}));
}

TEST(LargestRemainder, GivesNothingToZeroWeights) {
    EXPECT_EQ(apportion(5, {0, 3, 0, 1}), (std::vector<std::int64_t>{0, 4, 0, 1}));
}

TEST(LargestRemainder, RefusesNegativeTotalsNegativeWeightsAndAllZeroWeights) {
    const std::vector<std::int64_t> ok{1, 2};
    EXPECT_FALSE(apportionLargestRemainder(-1, ok).ok());
    const std::vector<std::int64_t> negative{1, -2};
    EXPECT_FALSE(apportionLargestRemainder(3, negative).ok());
    const std::vector<std::int64_t> zeros{0, 0};
    EXPECT_FALSE(apportionLargestRemainder(3, zeros).ok());
    EXPECT_EQ(apportion(0, {0, 0}), (std::vector<std::int64_t>{0, 0}));
}

TEST(LargestRemainder, AlwaysSumsToTheTotalAndKeepsTheQuotaRule) {
    std::mt19937_64 rng(20260301);
    for (int trial = 0; trial < 2000; ++trial) {
        const int n = 1 + static_cast<int>(rng() % 12);
        std::vector<std::int64_t> w(static_cast<std::size_t>(n));
        for (auto& x : w)
            x = static_cast<std::int64_t>(rng() % 1000);
        w[rng() % w.size()] += 1;  // at least one positive weight
        const std::int64_t total = static_cast<std::int64_t>(rng() % 100000);
        const auto parts = apportion(total, w);
        ASSERT_EQ(parts.size(), w.size());
        EXPECT_EQ(std::accumulate(parts.begin(), parts.end(), std::int64_t{0}), total);
        const std::int64_t sum = std::accumulate(w.begin(), w.end(), std::int64_t{0});
        for (std::size_t i = 0; i < w.size(); ++i) {
            const std::int64_t lower = total * w[i] / sum;
            EXPECT_TRUE(parts[i] == lower || parts[i] == lower + 1)
                << "quota rule broken at part " << i;
        }
    }
}

TEST(LargestRemainder, IsExactForCountsWhoseProductsOverflowSixtyFourBits) {
    // total * weight = 3e9 * 4e9 = 1.2e19 > 2^63: computed in 128-bit integers.
    EXPECT_EQ(apportion(3'000'000'000, {4'000'000'000, 2'000'000'000}),
              (std::vector<std::int64_t>{2'000'000'000, 1'000'000'000}));
}

}  // namespace
}  // namespace siftwave::ledger
