// cumulative_decrease: a cumulative measure that goes down.

#include "scan/scan_input.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

TEST(CumulativeDecrease, DetectsACumulativeMeasureAndEachDropBelowItsRunningPeak) {
    std::vector<std::int32_t> a, b;
    for (int t = 0; t < 30; ++t) {
        a.push_back(10 * t);
        b.push_back(7 * t);
    }
    a[12] = 95;  // below 110 on day 11
    a[13] = 100;
    b[20] = 0;  // a reset
    const Drop drop = siftwave::testing::handBuiltDrop({"A", "B"}, {"total"}, {{a, b}});
    const ScanOptions options;
    const auto in = detail::prepareScanInput(drop, options);
    ASSERT_TRUE(in.measures[0].cumulative);
    std::vector<Finding> out;
    detail::findCumulativeDecreases(in, out);
    ASSERT_EQ(out.size(), 2u);
    EXPECT_EQ(*out[0].region, "A");
    EXPECT_EQ(*out[0].first, drop.periodStart(12));
    EXPECT_EQ(*out[0].last, drop.periodStart(13));
    EXPECT_EQ(out[0].evidence["before"], 110);
    EXPECT_EQ(out[0].evidence["lowest"], 95);
    EXPECT_EQ(out[0].evidence["decrease"], 15);
    EXPECT_EQ(suggestionToJson(out[0])["action"], "use_daily_differences");
    EXPECT_EQ(*out[1].region, "B");
    EXPECT_EQ(*out[1].first, drop.periodStart(20));
    EXPECT_EQ(*out[1].last, drop.periodStart(20));
}

TEST(CumulativeDecrease, DailyCountsAreNotCumulative) {
    siftwave::testing::SyntheticOptions o;
    o.regions = 5;
    const auto s = siftwave::testing::makeSyntheticDrop(o);
    const ScanOptions options;
    const auto in = detail::prepareScanInput(s.drop, options);
    EXPECT_FALSE(in.measures[0].cumulative);
    std::vector<Finding> out;
    detail::findCumulativeDecreases(in, out);
    EXPECT_TRUE(out.empty());
}

}  // namespace
}  // namespace siftwave::scan
