// stale_values: a run of one repeated non-zero value.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findStaleValues);
}

TEST(StaleValues, ReportsACopiedForwardRunWithItsChance) {
    const Drop drop =
        siftwave::testing::handBuiltDrop({"A"}, {{41, 38, 45, 52, 52, 52, 52, 52, 47, 44}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_EQ(*found[0].first, drop.periodStart(3));
    EXPECT_EQ(*found[0].last, drop.periodStart(7));
    EXPECT_EQ(found[0].evidence["value"], 52);
    EXPECT_EQ(found[0].evidence["days"], 5);
    EXPECT_LT(found[0].evidence["chance_under_poisson"].get<double>(), 1e-4);
    // The first day may be genuine; the copies after it are suspect.
    EXPECT_EQ(suggestionToJson(found[0])["first"], drop.periodStart(4).iso());
}

TEST(StaleValues, SmallCountsAndZerosRepeatByChance) {
    EXPECT_TRUE(run(siftwave::testing::handBuiltDrop({"A"}, {{1, 1, 1, 1, 0, 0, 0, 0, 0, 2, 2, 2}}))
                    .empty());
}

TEST(StaleValues, ThreeDaysOfAMidSizedCountAreNotEnoughByDefault) {
    // q(52)^2 is about 1.5e-3, above max_chance 1e-4.
    EXPECT_TRUE(run(siftwave::testing::handBuiltDrop({"A"}, {{41, 52, 52, 52, 47, 44}})).empty());
}

}  // namespace
}  // namespace siftwave::scan
