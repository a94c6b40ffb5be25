// The release history and the one alignment of two releases' cells (release_history.h), read by
// the scan's revision detector and by the reporting triangle.

#include "siftwave/release_history.h"

#include "siftwave/nowcast/triangle.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <cmath>
#include <set>

namespace siftwave {
namespace {

using testing::handBuiltDrop;
using testing::handBuiltWeeklyDrop;
using testing::kNoRow;

Date day(const char* iso) {
    return *Date::fromIso(iso);
}

// Three daily releases of two regions as of 2026-03-04, 05 and 06; each revises earlier days
// and adds one, the last adds region C and drops nothing.
struct ThreeReleases {
    Drop r1 = handBuiltDrop({"A", "B"}, {{10, 20, 30}, {5, 5, 5}}, "2026-03-02");
    Drop r2 = handBuiltDrop({"A", "B"}, {{10, 25, 31, 8}, {5, 5, 6, 2}}, "2026-03-02");
    Drop r3 = handBuiltDrop({"A", "B", "C"},
                            {{10, 25, 33, 12, 4}, {5, 5, 6, 2, 1}, {1, 1, 1, 1, 1}}, "2026-03-02");
    ThreeReleases() {
        r1.source.path = "r1.csv";
        r2.source.path = "r2.csv";
        r3.source.path = "r3.csv";
    }
    ReleaseHistory history(ReleaseHistory::Order order = ReleaseHistory::Order::ByAsOf) const {
        return ReleaseHistory::borrowing({&r3, &r1, &r2}, order).value();
    }
};

TEST(ReleasePair, MatchesRegionsByCodeMeasuresByNameAndPeriodsByDate) {
    const Drop older = handBuiltDrop({"A", "GONE"}, {{1, 2, 3, 4}, {9, 9, 9, 9}}, "2026-03-02");
    const Drop newer = handBuiltDrop({"NEW", "A"}, {{7, 7, 7}, {3, 40, 5}}, "2026-03-04");
    const ReleasePair pair(older, newer);
    EXPECT_TRUE(pair.sameGrid());
    EXPECT_TRUE(pair.comparable());
    // Common days 2026-03-04 and 05: the newer's periods 0 and 1, the older's 2 and 3.
    EXPECT_EQ(pair.firstCommon(), 0);
    EXPECT_EQ(pair.lastCommon(), 1);
    EXPECT_EQ(pair.olderPeriod(0), 2);
    EXPECT_EQ(pair.olderPeriod(2), std::nullopt);  // 2026-03-06: after the older calendar
    EXPECT_EQ(pair.olderRegion(0), std::nullopt);
    EXPECT_EQ(pair.olderRegion(1), 0u);
    EXPECT_EQ(pair.olderMeasure(0), 0u);
    EXPECT_EQ(pair.regionsGone(), std::vector<std::string>{"GONE"});
    EXPECT_TRUE(pair.measuresGone().empty());
    const std::span<const Cell> a = pair.olderSeries(0, 1);
    ASSERT_EQ(a.size(), 4u);
    EXPECT_EQ(a[static_cast<std::size_t>(*pair.olderPeriod(1))].value, 4);
    EXPECT_TRUE(pair.olderSeries(0, 0).empty());
}

TEST(ReleasePair, CalendarsOffTheSameGridDoNotCompare) {
    const Drop daily = handBuiltDrop({"A"}, {{1, 2, 3}}, "2026-03-02");
    const Drop weekly = handBuiltWeeklyDrop({"A"}, {{10, 20}});
    const ReleasePair pair(daily, weekly);
    EXPECT_FALSE(pair.sameGrid());
    EXPECT_FALSE(pair.comparable());
    EXPECT_LT(pair.lastCommon(), pair.firstCommon());
}

TEST(ReleaseHistory, KeepsTheOrderGivenOrPutsReleasesInOrderOfTheirAsOfDates) {
    const ThreeReleases s;
    const ReleaseHistory byDate = s.history();
    ASSERT_EQ(byDate.size(), 3u);
    EXPECT_EQ(&byDate.release(0), &s.r1);
    EXPECT_EQ(&byDate.latest(), &s.r3);
    EXPECT_EQ(byDate.asOf(1), day("2026-03-05"));
    EXPECT_EQ(&byDate.successive(1).older(), &s.r1);
    EXPECT_EQ(&byDate.againstLatest(0).newer(), &s.r3);
    const ReleaseHistory given = s.history(ReleaseHistory::Order::AsGiven);
    EXPECT_EQ(&given.release(0), &s.r3);
    EXPECT_EQ(&given.latest(), &s.r2);
    EXPECT_FALSE(ReleaseHistory::borrowing({}, ReleaseHistory::Order::AsGiven).ok());
    EXPECT_FALSE(ReleaseHistory::borrowing({&s.r1, nullptr}, ReleaseHistory::Order::AsGiven).ok());
}

// The one path: the triangle's column of release k is what the revision detector compares as
// the older side of the pair (k, k + 1). So for the newest pair every listed revision's old
// and new values are the triangle's cells C[t][a2 - t] and C[t][a3 - t], and every common day
// that was not revised has the same count in both columns.
TEST(ReleaseHistory, TheTriangleAndTheRevisionComparisonAgreeOnEverySharedCell) {
    const ThreeReleases s;
    const ReleaseHistory history = s.history();
    scan::ScanContext context;
    context.history = &history;
    Result<scan::ScanReport> report = scan::scanDrop(history.latest(), {}, context);
    ASSERT_TRUE(report.ok()) << report.error().describe();
    const std::int32_t a2 = 3, a3 = 4;  // the as-of periods of r2 and r3 on r3's calendar
    for (const std::string region : {"A", "B"}) {
        Result<nowcast::ReportingTriangle> tri =
            nowcast::triangleFromReleases(history, region, "cases", 4);
        ASSERT_TRUE(tri.ok()) << tri.error().describe();
        std::set<std::int32_t> revised;
        for (const scan::Finding& f : report->findings) {
            if (f.kind != scan::FindingKind::Revision || f.region != region ||
                f.evidence["change"] != "values_revised")
                continue;
            for (const nlohmann::json& d : f.evidence["dates"]) {
                const std::int32_t t =
                    day(d["date"].get<std::string>().c_str()) - day("2026-03-02");
                revised.insert(t);
                EXPECT_EQ(tri->at(t, a2 - t), d["old"].get<double>()) << region << " " << t;
                EXPECT_EQ(tri->at(t, a3 - t), d["new"].get<double>()) << region << " " << t;
            }
        }
        EXPECT_EQ(revised.empty(), region == "B") << region;  // B: r3 revised nothing
        for (std::int32_t t = 0; t <= a2; ++t)
            if (!revised.contains(t)) {
                EXPECT_EQ(tri->at(t, a2 - t), tri->at(t, a3 - t)) << region << " " << t;
            }
    }
    // By hand (A): 2026-03-04 went 31 -> 33 and 2026-03-05 8 -> 12; 2026-03-03 was revised by
    // r2 (20 -> 25), so r2 and r3 agree on it and r1's column holds 20.
    Result<nowcast::ReportingTriangle> a = nowcast::triangleFromReleases(history, "A", "cases", 4);
    ASSERT_TRUE(a.ok());
    EXPECT_EQ(a->at(2, 1), 31);
    EXPECT_EQ(a->at(2, 2), 33);
    EXPECT_EQ(a->at(1, 1), 20);
    EXPECT_EQ(a->at(1, 2), 25);
    EXPECT_DOUBLE_EQ(report->revisions.netChange, 2 + 4);  // A only: B's 03-05..06 unchanged
}

// Every successive pair of a longer history is summarised, and each summary is what the
// scan of that pair's newer release against its previous one (--previous) gives.
TEST(ReleaseHistory, EachSuccessivePairIsWhatThePreviousReleaseScanOfThatPairGives) {
    const ThreeReleases s;
    const ReleaseHistory history = s.history();
    scan::ScanContext context;
    context.history = &history;
    Result<scan::ScanReport> report = scan::scanDrop(history.latest(), {}, context);
    ASSERT_TRUE(report.ok());
    ASSERT_EQ(report->releaseRevisions.size(), 2u);
    const std::vector<std::pair<const Drop*, const Drop*>> pairs{{&s.r1, &s.r2}, {&s.r2, &s.r3}};
    for (std::size_t k = 0; k < pairs.size(); ++k) {
        const scan::ReleaseRevisions& p = report->releaseRevisions[k];
        EXPECT_EQ(p.previousFile, pairs[k].first->source.path);
        EXPECT_EQ(p.currentFile, pairs[k].second->source.path);
        EXPECT_EQ(p.currentAsOf, pairs[k].second->axis.lastStart());
        Result<scan::ScanReport> alone =
            scan::scanDrop(*pairs[k].second, {}, {pairs[k].first, nullptr});
        ASSERT_TRUE(alone.ok());
        EXPECT_EQ(scan::scanSummaryToJson(*alone)["revisions"],
                  scan::scanSummaryToJson(*report)["release_revisions"][k]["revisions"]);
        std::size_t revisionFindings = 0, counted = 0;
        for (const scan::Finding& f : alone->findings)
            revisionFindings += f.kind == scan::FindingKind::Revision ? 1 : 0;
        for (const auto& [severity, n] : p.bySeverity)
            counted += n;
        EXPECT_EQ(counted, revisionFindings) << k;
    }
    EXPECT_EQ(report->releaseRevisions[1].byChange.at("region_appeared"), 1u);  // C
    EXPECT_EQ(report->releaseRevisions[0].byChange.at("values_revised"), 2u);   // A and B
}

// --previous is the history of two releases: the same report, to the byte, either way.
TEST(ReleaseHistory, APreviousReleaseIsTheHistoryOfTwo) {
    const ThreeReleases s;
    const ReleaseHistory two =
        ReleaseHistory::borrowing({&s.r1, &s.r3}, ReleaseHistory::Order::AsGiven).value();
    scan::ScanContext viaHistory;
    viaHistory.history = &two;
    Result<scan::ScanReport> a = scan::scanDrop(s.r3, {}, viaHistory);
    Result<scan::ScanReport> b = scan::scanDrop(s.r3, {}, {&s.r1, nullptr});
    ASSERT_TRUE(a.ok() && b.ok());
    EXPECT_TRUE(a->releaseRevisions.empty());
    EXPECT_EQ(scan::scanReportToJson(*a).dump(), scan::scanReportToJson(*b).dump());
}

TEST(ReleaseHistory, TheScanRefusesAHistoryThatDoesNotEndWithTheScannedDrop) {
    const ThreeReleases s;
    const ReleaseHistory history = s.history();
    scan::ScanContext context;
    context.history = &history;
    Result<scan::ScanReport> notLatest = scan::scanDrop(s.r2, {}, context);
    ASSERT_FALSE(notLatest.ok());
    EXPECT_EQ(notLatest.error().code, ErrorCode::Usage);
    context.previous = &s.r2;
    EXPECT_FALSE(scan::scanDrop(s.r3, {}, context).ok());
}

TEST(ReleaseHistory, TheTriangleNeedsTheRegionInTheLatestRelease) {
    const ThreeReleases s;
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromReleases(s.history(), "NOWHERE", "cases");
    ASSERT_FALSE(tri.ok());
    EXPECT_EQ(tri.error().code, ErrorCode::NotFound);
    EXPECT_EQ(tri.error().file, "r3.csv");
    // A region new in the latest release counts 0 in the releases before it.
    Result<nowcast::ReportingTriangle> c = nowcast::triangleFromReleases(s.history(), "C", "cases");
    ASSERT_TRUE(c.ok());
    EXPECT_EQ(c->at(3, 0), 0);
    EXPECT_EQ(c->at(4, 0), 1);
}

TEST(ReleaseHistory, ATriangleRefusesReleasesOutOfOrder) {
    const ThreeReleases s;
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromReleases(s.history(ReleaseHistory::Order::AsGiven), "A", "cases");
    ASSERT_FALSE(tri.ok());
    EXPECT_NE(tri.error().message.find("not in order"), std::string::npos);
}

}  // namespace
}  // namespace siftwave
