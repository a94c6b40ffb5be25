// reporting_gap: a run of zeros inside an active period.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findReportingGaps);
}

TEST(ReportingGap, ReportsZerosInsideAnActivePeriodAndTheCatchUp) {
    const Drop drop = siftwave::testing::handBuiltDrop(
        {"A"}, {{0, 0, 20, 22, 19, 21, 0, 0, 0, 83, 20, 18, 22, 0, 0}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);  // the leading and trailing zeros are tails, not gaps
    const Finding& f = found[0];
    EXPECT_EQ(*f.first, drop.periodStart(6));
    EXPECT_EQ(*f.last, drop.periodStart(8));
    EXPECT_EQ(f.evidence["days"], 3);
    EXPECT_TRUE(f.evidence["catch_up"].get<bool>());
    EXPECT_EQ(suggestionToJson(f)["decision"], "redistribute");
    EXPECT_EQ(suggestionToJson(f)["date"], drop.periodStart(9).iso());
    EXPECT_EQ(suggestionToJson(f)["window_first"], drop.periodStart(6).iso());
}

TEST(ReportingGap, ZerosAreUnremarkableWhereCountsAreLow) {
    // Around 1 a day, two zeros in a row happen by chance (exp(-2) = 0.14).
    EXPECT_TRUE(run(siftwave::testing::handBuiltDrop(
                        {"A"}, {{1, 2, 1, 0, 0, 1, 3, 0, 1, 2, 0, 0, 0, 1, 2}}))
                    .empty());
}

TEST(ReportingGap, ASingleZeroIsBelowTheDefaultRunLength) {
    EXPECT_TRUE(
        run(siftwave::testing::handBuiltDrop({"A"}, {{30, 31, 29, 0, 30, 32, 28}})).empty());
}

}  // namespace
}  // namespace siftwave::scan
