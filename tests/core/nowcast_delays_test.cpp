// The reporting-delay distribution (delays.h) on the real husO104Hosp case list.
#include "siftwave/ingest/ingest.h"
#include "siftwave/nowcast/delays.h"

#include <gtest/gtest.h>

namespace siftwave::nowcast {
namespace {

const std::string kHus = std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv";

// Reference: Python's statistics.quantiles(delays, n=20, method="inclusive") (the standard
// library's Hyndman & Fan type 7) on dReport - dHosp of the fixture: q05 2, q25 4, median 7,
// q75 10, q95 15, mean 7.4333; by month of dHosp: May 535 cases (median 7, q95 15), June 93
// (median 5, q95 10.4), July 2 (median 1.5).
TEST(NowcastDelays, HusO104QuantilesMatchTheStandardLibrarysType7) {
    Result<Drop> drop = ingest::readDrop(kHus);
    ASSERT_TRUE(drop.ok());
    Result<DelayReport> r = delayDistribution(*drop, std::nullopt);
    ASSERT_TRUE(r.ok()) << r.error().describe();
    EXPECT_EQ(r->overall.cases, 630u);
    EXPECT_DOUBLE_EQ(r->overall.q05, 2.0);
    EXPECT_DOUBLE_EQ(r->overall.q25, 4.0);
    EXPECT_DOUBLE_EQ(r->overall.median, 7.0);
    EXPECT_DOUBLE_EQ(r->overall.q75, 10.0);
    EXPECT_DOUBLE_EQ(r->overall.q95, 15.0);
    EXPECT_NEAR(r->overall.mean, 7.433333333, 1e-9);
    EXPECT_EQ(r->overall.max, 15);  // SOURCES.md: delays above 15 days were set to 15
    ASSERT_EQ(r->groups.size(), 3u);
    EXPECT_EQ(r->groups[0].summary.cases, 535u);
    EXPECT_DOUBLE_EQ(r->groups[0].summary.median, 7.0);
    EXPECT_DOUBLE_EQ(r->groups[1].summary.median, 5.0);
    EXPECT_NEAR(r->groups[1].summary.q95, 10.4, 1e-12);
    EXPECT_DOUBLE_EQ(r->groups[2].summary.median, 1.5);
    EXPECT_FALSE(r->groups[0].truncated);
    EXPECT_TRUE(r->groups[2].truncated);  // July: long delays could not be seen yet
    std::size_t sum = 0;
    for (std::size_t n : r->histogram)
        sum += n;
    EXPECT_EQ(sum, 630u);
}

TEST(NowcastDelays, AMovingWindowEndsOnTheLastEvent) {
    Result<Drop> drop = ingest::readDrop(kHus);
    ASSERT_TRUE(drop.ok());
    DelayOptions o;
    o.grouping = DelayOptions::Grouping::MovingWindow;
    o.windowDays = 14;
    o.stepDays = 7;
    Result<DelayReport> r = delayDistribution(*drop, std::nullopt, o);
    ASSERT_TRUE(r.ok());
    ASSERT_FALSE(r->groups.empty());
    EXPECT_EQ(r->groups.back().last, *Date::fromIso("2011-07-04"));
    EXPECT_EQ(r->groups.front().last - r->groups.front().first, 13);
}

TEST(NowcastDelays, ACountReleaseHasNoDelays) {
    Result<Drop> drop =
        ingest::parseDrop("date,region,cases\n2026-03-01,A,3\n2026-03-02,A,4\n", "r.csv");
    ASSERT_TRUE(drop.ok());
    EXPECT_FALSE(delayDistribution(*drop, std::nullopt).ok());
}

}  // namespace
}  // namespace siftwave::nowcast
