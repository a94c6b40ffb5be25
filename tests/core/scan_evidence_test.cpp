// Evidence kept compact (issue 14, step 5): once scanDrop() has ranked the findings, each
// evidence is stored as its CBOR bytes (RFC 8949, Concise Binary Object Representation) instead
// of a JSON tree. What is read back, and the text the scan prints, must not change.

#include "siftwave/scan/finding.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <limits>

namespace siftwave::scan {
namespace {

TEST(Evidence, ReadsBackTheSameValuesAndTextOnceCompact) {
    Evidence e;
    e = {{"observed", 2643},
         {"expected", 163.6},
         {"negative", -33},
         {"huge", std::numeric_limits<std::uint64_t>::max()},
         {"tiny", 1.5692923852557387e-213},
         {"whole_float", 31075.0},
         {"name", "0412 \"quoted\" \u00e9"},
         {"flag", true},
         {"nothing", nullptr},
         {"lines", {3, 7, 11}},
         {"after_gap", {{"first", "2026-04-22"}, {"days", 5}}}};
    const nlohmann::json before = e.json();
    const std::string text = e.dump();
    const auto scalars = e.scalars();
    e.compact();
    ASSERT_TRUE(e.isCompact());
    EXPECT_EQ(e.json(), before);
    EXPECT_EQ(e.dump(), text);
    EXPECT_EQ(e.scalars(), scalars);
    const Evidence& view = e;
    EXPECT_EQ(view["observed"].get<int>(), 2643);
    EXPECT_EQ(view["whole_float"].dump(), "31075.0");
    EXPECT_TRUE(view.contains("after_gap"));
    EXPECT_FALSE(view.contains("absent"));

    // Writing expands it again; a copy keeps its own bytes.
    const Evidence copy = e;
    e["observed"] = 1;
    EXPECT_FALSE(e.isCompact());
    EXPECT_EQ(e.json()["expected"], 163.6);
    EXPECT_TRUE(copy.isCompact());
    EXPECT_EQ(copy["observed"].get<int>(), 2643);
}

TEST(Evidence, AScanLeavesEveryFindingsEvidenceCompact) {
    testing::SyntheticOptions o;
    o.regions = 6;
    o.days = 120;
    testing::SyntheticDrop s = testing::makeSyntheticDrop(o);
    testing::plantBacklogDump(s, 1, 80, 14, 0.6);
    testing::plantNegative(s, 2, 50, -30);
    const Result<ScanReport> report = scanDrop(s.drop);
    ASSERT_TRUE(report.ok());
    ASSERT_FALSE(report->findings.empty());
    for (const Finding& f : report->findings) {
        EXPECT_TRUE(f.evidence.isCompact() || f.evidence.json().empty()) << f.id;
        EXPECT_TRUE(f.evidence.json().is_object()) << f.id;
    }
}

}  // namespace
}  // namespace siftwave::scan
