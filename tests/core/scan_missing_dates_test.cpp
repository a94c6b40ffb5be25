// missing_dates: runs of days with no value inside a region's reporting span.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>

namespace siftwave::scan {
namespace {

using siftwave::testing::handBuiltDrop;
using siftwave::testing::kBlank;
using siftwave::testing::kNoRow;
constexpr std::int32_t X = kNoRow;

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findMissingDates);
}

TEST(MissingDates, OneFindingPerRunInsideTheSpanNoneForTheTails) {
    const Drop drop = handBuiltDrop({"A"}, {{X, X, 5, 6, X, X, 7, 8, X, 9, X, X}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 2u);
    EXPECT_EQ(*found[0].first, drop.periodStart(4));
    EXPECT_EQ(*found[0].last, drop.periodStart(5));
    EXPECT_EQ(found[0].evidence["days"], 2);
    EXPECT_EQ(found[0].evidence["absent"], 2);
    EXPECT_EQ(*found[1].first, drop.periodStart(8));
    EXPECT_EQ(*found[1].last, drop.periodStart(8));
    EXPECT_EQ(found[0].suggestion["decision"], "fill_missing");
    EXPECT_EQ(*found[0].region, "A");
    EXPECT_EQ(*found[0].measure, "cases");  // a drop with one measure names it
}

TEST(MissingDates, CountsBlankCellsAndSuggestsShareBeforeACatchUp) {
    const Drop drop = handBuiltDrop({"A"}, {{10, 11, 9, 10, kBlank, X, 32, 10, 11, 9}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_EQ(found[0].evidence["blank"], 1);
    EXPECT_EQ(found[0].evidence["absent"], 1);
    EXPECT_EQ(found[0].evidence["value_after"], 32);
    EXPECT_EQ(found[0].suggestion["method"], "share");
}

TEST(MissingDates, NoMeasureWhenTheRowIsMissingForEveryMeasure) {
    const Drop drop = handBuiltDrop({"A"}, {"cases", "deaths"},
                                    {{{5, 6, X, 7, 8, 9, 4}}, {{1, 0, X, 0, X, 1, 0}}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 2u);
    EXPECT_FALSE(found[0].measure.has_value());  // no row at all on day 2
    EXPECT_EQ(*found[0].first, drop.periodStart(2));
    ASSERT_TRUE(found[1].measure.has_value());  // day 4 is missing for deaths only
    EXPECT_EQ(*found[1].measure, "deaths");
    EXPECT_EQ(*found[1].first, drop.periodStart(4));
}

TEST(MissingDates, AFullyReportedRegionHasNone) {
    EXPECT_TRUE(run(handBuiltDrop({"A", "B"}, {{1, 2, 3}, {0, 0, 0}})).empty());
}

}  // namespace
}  // namespace siftwave::scan
