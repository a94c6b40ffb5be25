// hierarchy_mismatch: a parent that differs from the sum of its children.

#include "scan/scan_input.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

using siftwave::testing::kNoRow;

TEST(HierarchyMismatch, ComparesDaysWhereParentAndEveryChildAreReported) {
    const Drop drop = siftwave::testing::handBuiltDrop(
        {"P", "A", "B"}, {{10, 12, 9, 20, 15}, {4, 5, kNoRow, 6, 7}, {6, 7, 3, 10, 8}});
    RegionRegister reg;
    reg.entries = {{"P", "Province", "", std::nullopt, 2},
                   {"A", "District A", "P", std::nullopt, 3},
                   {"B", "District B", "P", std::nullopt, 4},
                   {"C", "District C", "P", std::nullopt, 5}};
    reg.index();
    const ScanOptions options;
    std::vector<Finding> out;
    detail::findHierarchyMismatches(detail::prepareScanInput(drop, options, {nullptr, &reg}), out);
    ASSERT_EQ(out.size(), 1u);
    const Finding& f = out[0];
    EXPECT_EQ(*f.region, "P");
    EXPECT_EQ(*f.first, drop.periodStart(3));  // day 2 has no value for A: not compared
    EXPECT_EQ(*f.last, drop.periodStart(3));
    EXPECT_EQ(f.evidence["days_compared"], 4);
    EXPECT_EQ(f.evidence["days_mismatched"], 1);
    EXPECT_EQ(f.evidence["dates"][0]["difference"], 4.0);
    EXPECT_EQ(f.evidence["children_not_in_drop"][0], "C");
}

TEST(HierarchyMismatch, NothingWithoutParentsInTheRegister) {
    const Drop drop = siftwave::testing::handBuiltDrop({"P", "A"}, {{10}, {3}});
    RegionRegister reg;
    reg.entries = {{"P", "P", "", std::nullopt, 2}, {"A", "A", "", std::nullopt, 3}};
    reg.index();
    const ScanOptions options;
    std::vector<Finding> out;
    detail::findHierarchyMismatches(detail::prepareScanInput(drop, options, {nullptr, &reg}), out);
    EXPECT_TRUE(out.empty());
}

}  // namespace
}  // namespace siftwave::scan
