// negative_count: a negative daily value.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findNegativeCounts);
}

TEST(NegativeCount, ReportsEachNegativeDayWithASpreadWindowOfEarlierDays) {
    std::vector<std::int32_t> series(30, 40);
    for (std::size_t t = 0; t < series.size(); ++t)
        series[t] += static_cast<std::int32_t>(t % 3);
    series[20] = -12;
    const Drop drop = siftwave::testing::handBuiltDrop({"A"}, {series});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    const Finding& f = found[0];
    EXPECT_EQ(*f.first, drop.periodStart(20));
    EXPECT_EQ(f.evidence["value"], -12);
    EXPECT_EQ(f.evidence["earlier_days"], 14);
    EXPECT_EQ(f.severity, Severity::Warning);  // 12 of ~1,150 is about 1 %
    EXPECT_EQ(suggestionToJson(f)["decision"], "spread_negative");
    EXPECT_EQ(suggestionToJson(f)["window_first"], drop.periodStart(6).iso());
    EXPECT_EQ(suggestionToJson(f)["window_last"], drop.periodStart(19).iso());
    EXPECT_TRUE(suggestionToJson(f)["absorbable"].get<bool>());
}

TEST(NegativeCount, IsCriticalWhenTheEarlierDaysCannotAbsorbIt) {
    const Drop drop =
        siftwave::testing::handBuiltDrop({"A"}, {{3, 2, -50, 4, 5, 3, 2, 4, 3, 5, 2, 4}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_EQ(found[0].severity, Severity::Critical);
    EXPECT_FALSE(suggestionToJson(found[0])["absorbable"].get<bool>());
}

TEST(NegativeCount, ZeroIsNotNegative) {
    EXPECT_TRUE(run(siftwave::testing::handBuiltDrop({"A"}, {{0, 0, 1, 0, 2}})).empty());
}

}  // namespace
}  // namespace siftwave::scan
