// duplicate_row: the same region, date and measure more than once.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findDuplicateRows);
}

DuplicateRow repeat(const Drop& drop, std::size_t region, std::int32_t day, std::int32_t value,
                    std::uint32_t line) {
    DuplicateRow d;
    d.region = region;
    d.day = day;
    d.cell.state = CellState::Reported;
    d.cell.value = value;
    d.cell.line = line;
    d.firstLine = drop.cell(0, region, day).line;
    return d;
}

TEST(DuplicateRow, SaysWhetherValuesAgreeAndListsEverySourceLine) {
    Drop drop = siftwave::testing::handBuiltDrop({"A", "B"}, {{4, 5, 6}, {7, 8, 9}});
    drop.duplicates.push_back(repeat(drop, 0, 1, 5, 40));   // agrees
    drop.duplicates.push_back(repeat(drop, 1, 2, 12, 41));  // differs
    drop.duplicates.push_back(repeat(drop, 1, 2, 9, 42));   // a third row, agrees with the first
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 2u);
    EXPECT_EQ(*found[0].region, "A");
    EXPECT_EQ(found[0].severity, Severity::Info);
    EXPECT_TRUE(found[0].evidence["values_agree"].get<bool>());
    EXPECT_EQ(found[0].evidence["rows"][0]["line"], drop.cell(0, 0, 1).line);
    EXPECT_EQ(found[0].evidence["rows"][1]["line"], 40);
    EXPECT_EQ(suggestionToJson(found[0])["keep"], "first");

    EXPECT_EQ(*found[1].region, "B");
    EXPECT_EQ(found[1].severity, Severity::Warning);
    EXPECT_FALSE(found[1].evidence["values_agree"].get<bool>());
    EXPECT_EQ(found[1].evidence["occurrences"], 3);
    EXPECT_EQ(found[1].evidence["spread"], 3.0);
    EXPECT_EQ(suggestionToJson(found[1])["decision"], "resolve_duplicate");
    EXPECT_EQ(*found[1].first, drop.periodStart(2));
}

}  // namespace
}  // namespace siftwave::scan
