// The scan report: options, ids, ranking and the JSON shape.

#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <set>

namespace siftwave::scan {
namespace {

TEST(ScanOptions, DefaultsValidateAndEveryDescribedNameCanBeSetToItsDefault) {
    ScanOptions options;
    EXPECT_TRUE(options.validate().ok());
    const auto names = describeScanOptions();
    EXPECT_GE(names.size(), 30u);
    for (const OptionDescription& d : names) {
        EXPECT_TRUE(options.set(d.name, d.defaultValue).ok()) << d.name << "=" << d.defaultValue;
    }
}

TEST(ScanOptions, SetRejectsUnknownNamesBadTextAndValuesOutOfRange) {
    ScanOptions options;
    EXPECT_EQ(options.set("backlog_dump.nope", "1").error().code, ErrorCode::Usage);
    EXPECT_EQ(options.set("backlog_dump.min_excess", "many").error().code, ErrorCode::Usage);
    EXPECT_EQ(options.set("backlog_dump.window_days", "1").error().code, ErrorCode::Usage);
    EXPECT_EQ(options.backlogDump.windowDays, 7);  // left as it was
    EXPECT_EQ(options.set("stale_values.enabled", "perhaps").error().code, ErrorCode::Usage);
    ASSERT_TRUE(options.set("backlog_dump.min_excess", "50").ok());
    EXPECT_DOUBLE_EQ(options.backlogDump.minExcess, 50);
    ASSERT_TRUE(options.set("stale_values.enabled", "false").ok());
    EXPECT_FALSE(options.staleValues.enabled);
    ScanOptions bad;
    bad.backlogDump.threshold = -1;
    EXPECT_FALSE(scanDrop(testing::handBuiltDrop({"A"}, {{1}}), bad).ok());
}

TEST(FindingKind, NamesRoundTrip) {
    for (FindingKind kind : kAllFindingKinds) {
        EXPECT_EQ(findingKindFromName(findingKindName(kind)), kind);
    }
    EXPECT_FALSE(findingKindFromName("no_such_kind"));
}

class ScanReportOnPlantedDrop : public ::testing::Test {
protected:
    void SetUp() override {
        testing::SyntheticOptions o;
        o.seed = 21;
        o.regions = 12;
        m_s = testing::makeSyntheticDrop(o);
        testing::plantBacklogDump(m_s, 2, 100, 6);
        testing::plantNegative(m_s, 4, 150, -3);
        testing::plantDuplicate(m_s, 5, 60);
        m_s.drop.regionCodes[7] = "NA";
        m_s.drop.indexRegions();
    }
    testing::SyntheticDrop m_s;
};

TEST_F(ScanReportOnPlantedDrop, IdsAreUniqueAndTheSameOnEveryRun) {
    auto a = scanDrop(m_s.drop);
    auto b = scanDrop(m_s.drop);
    ASSERT_TRUE(a.ok() && b.ok());
    ASSERT_EQ(a->findings.size(), b->findings.size());
    std::set<std::string> ids;
    for (std::size_t i = 0; i < a->findings.size(); ++i) {
        EXPECT_EQ(a->findings[i].id, b->findings[i].id);
        EXPECT_TRUE(ids.insert(a->findings[i].id).second) << a->findings[i].id;
        EXPECT_EQ(a->findings[i].id.rfind(findingKindName(a->findings[i].kind), 0), 0u);
    }
}

TEST_F(ScanReportOnPlantedDrop, RanksBySeverityThenCountsInDoubt) {
    auto report = scanDrop(m_s.drop);
    ASSERT_TRUE(report.ok());
    const auto& f = report->findings;
    ASSERT_GE(f.size(), 3u);
    for (std::size_t i = 0; i < f.size(); ++i) {
        EXPECT_EQ(f[i].rank, static_cast<int>(i) + 1);
        if (i == 0)
            continue;
        EXPECT_GE(static_cast<int>(f[i - 1].severity), static_cast<int>(f[i].severity));
        if (f[i - 1].severity == f[i].severity) {
            EXPECT_GE(f[i - 1].impact, f[i].impact);
        }
    }
    EXPECT_EQ(f[0].kind, FindingKind::BacklogDump);
    EXPECT_EQ(f.back().severity, Severity::Info);
}

TEST_F(ScanReportOnPlantedDrop, JsonHasTheAgreedShape) {
    auto report = scanDrop(m_s.drop);
    ASSERT_TRUE(report.ok());
    const nlohmann::json j = scanReportToJson(*report);
    ASSERT_TRUE(j["findings"].is_array());
    for (const auto& f : j["findings"]) {
        for (const char* key :
             {"id", "kind", "severity", "rank", "region", "measure", "evidence", "suggestion"}) {
            EXPECT_TRUE(f.contains(key)) << key;
        }
        EXPECT_TRUE(f["evidence"].is_object());
        EXPECT_TRUE(f["suggestion"].is_object());
        if (f["kind"] == "code_collision") {
            EXPECT_FALSE(f.contains("first"));
            EXPECT_EQ(f["region"], "NA");  // the code, verbatim, never null
        }
        if (f["kind"] == "backlog_dump") {
            EXPECT_EQ(f["first"], f["last"]);
        }
    }
    EXPECT_EQ(j["summary"]["by_kind"].size(), std::size(kAllFindingKinds));
    EXPECT_EQ(j["summary"]["by_severity"].size(), 3u);
    EXPECT_FALSE(j["summary"].contains("revisions"));
    EXPECT_FALSE(describeFinding(report->findings[0]).empty());
}

}  // namespace
}  // namespace siftwave::scan
