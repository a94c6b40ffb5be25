// revision: what changed since the previous release.

#include "scan/scan_input.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

using siftwave::testing::handBuiltDrop;
using siftwave::testing::kNoRow;

TEST(Revision, OneFindingPerRegionWithOldAndNewValuesAndASummary) {
    const Drop before = handBuiltDrop({"A", "B", "GONE"},
                                      {{10, 20, 30, 40}, {5, 5, 5, 5}, {1, 1, 1, 1}}, "2026-03-01");
    const Drop now = handBuiltDrop(
        {"A", "B", "NEW"}, {{10, 25, 30, 44, 50}, {5, 5, 5, 5, 6}, {2, 2, 2, 2, 2}}, "2026-03-01");
    auto report = scanDrop(now, {}, {&before, nullptr});
    ASSERT_TRUE(report.ok());
    std::vector<const Finding*> revisions;
    for (const Finding& f : report->findings) {
        if (f.kind == FindingKind::Revision)
            revisions.push_back(&f);
    }
    ASSERT_EQ(revisions.size(), 3u);
    const Finding* a = nullptr;
    bool appeared = false, vanished = false;
    for (const Finding* f : revisions) {
        if (f->evidence["change"] == "values_revised")
            a = f;
        appeared = appeared || (f->evidence["change"] == "region_appeared" && *f->region == "NEW");
        vanished = vanished || (f->evidence["change"] == "region_vanished" && *f->region == "GONE");
    }
    EXPECT_TRUE(appeared);
    EXPECT_TRUE(vanished);
    ASSERT_NE(a, nullptr);
    EXPECT_EQ(*a->region, "A");
    EXPECT_EQ(*a->first, *Date::fromIso("2026-03-02"));
    EXPECT_EQ(*a->last, *Date::fromIso("2026-03-04"));
    EXPECT_EQ(a->evidence["changed"], 2);
    EXPECT_EQ(a->evidence["dates"][0]["old"], 20);
    EXPECT_EQ(a->evidence["dates"][0]["new"], 25);
    EXPECT_EQ(a->evidence["net_change"], 9.0);
    // The new day 2026-03-05 is new data, not a revision.
    const RevisionSummary& s = report->revisions;
    EXPECT_TRUE(s.compared);
    EXPECT_EQ(s.cellsCompared, 8u);
    EXPECT_EQ(s.cellsChanged, 2u);
    EXPECT_EQ(s.regionsRevised, 1u);
    EXPECT_DOUBLE_EQ(s.absoluteChange, 9.0);
    EXPECT_DOUBLE_EQ(s.previousTotal, 120.0);
}

TEST(Revision, ReportsCellsThatVanishedAndHistoryThatMoved) {
    const Drop before = handBuiltDrop({"A"}, {{10, 20, 30, 40}}, "2026-03-01");
    const Drop now = handBuiltDrop({"A"}, {{20, kNoRow, 40, 41}}, "2026-03-02");
    auto report = scanDrop(now, {}, {&before, nullptr});
    ASSERT_TRUE(report.ok());
    bool datesVanished = false, cellVanished = false;
    for (const Finding& f : report->findings) {
        if (f.kind != FindingKind::Revision)
            continue;
        if (f.evidence["change"] == "dates_vanished") {
            datesVanished = true;
            EXPECT_EQ(*f.first, *Date::fromIso("2026-03-01"));
            EXPECT_EQ(*f.last, *Date::fromIso("2026-03-01"));
        }
        if (f.evidence["change"] == "values_revised") {
            cellVanished = f.evidence["vanished"] == 1;
            EXPECT_EQ(f.evidence["dates"][0]["new"], "absent");
        }
    }
    EXPECT_TRUE(datesVanished);
    EXPECT_TRUE(cellVanished);
}

TEST(Revision, NothingWithoutAPreviousDrop) {
    const Drop now = handBuiltDrop({"A"}, {{1, 2, 3}});
    auto report = scanDrop(now);
    ASSERT_TRUE(report.ok());
    EXPECT_FALSE(report->revisions.compared);
    EXPECT_EQ(report->byKind.at("revision"), 0u);
}

}  // namespace
}  // namespace siftwave::scan
