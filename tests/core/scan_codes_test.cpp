// The code detectors: code_collision, code_variant and unknown_code.

#include "scan/code_text.h"
#include "scan/scan_input.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

using detail::codeCollision;
using detail::foldCode;

// Tokens that common data-frame readers and spreadsheets take as missing or as
// booleans (common practice, no source; the list is issue 3's).
TEST(CodeCollision, RecognisesMissingTokensBooleansAndNumberOrDateShapes) {
    for (const char* code : {"NA", "N/A", "NULL", "None", "NaN", "nan", "#N/A", "-", "", "na"}) {
        auto c = codeCollision(code);
        ASSERT_TRUE(c) << code;
        EXPECT_EQ(c->reason, "missing_token") << code;
    }
    for (const char* code : {"TRUE", "false", "YES", "No", "ON", "off"}) {
        auto c = codeCollision(code);
        ASSERT_TRUE(c) << code;
        EXPECT_EQ(c->reason, "boolean") << code;
    }
    EXPECT_EQ(codeCollision("0412")->reason, "leading_zero");
    EXPECT_EQ(codeCollision("0412")->readAs, "412");
    EXPECT_EQ(codeCollision("1E5")->reason, "scientific");
    EXPECT_EQ(codeCollision("1E5")->readAs, "100000");
    EXPECT_EQ(codeCollision("MAR1")->reason, "date_like");
    EXPECT_EQ(codeCollision("MAR1")->readAs, "1 March");
    EXPECT_EQ(codeCollision("1-Mar")->reason, "date_like");
    EXPECT_EQ(codeCollision("3/4")->reason, "date_like");
    EXPECT_EQ(codeCollision(" K01")->reason, "whitespace");
    EXPECT_EQ(codeCollision("1234567890123456")->reason, "long_number");
}

TEST(CodeCollision, LeavesOrdinaryCodesAlone) {
    for (const char* code : {"K01", "1102", "VE", "KV", "412", "MARSH", "E12X", "12-34", "0"}) {
        EXPECT_FALSE(codeCollision(code)) << code;
    }
}

TEST(CodeCollision, OneInfoFindingPerCodeWithoutDates) {
    const Drop drop = siftwave::testing::handBuiltDrop({"NA", "K01", "0412"}, {{1}, {2}, {3}});
    const ScanOptions options;
    const auto in = detail::prepareScanInput(drop, options);
    std::vector<Finding> out;
    detail::findCodeCollisions(in, out);
    ASSERT_EQ(out.size(), 2u);
    EXPECT_EQ(*out[0].region, "NA");
    EXPECT_EQ(out[0].severity, Severity::Info);
    EXPECT_FALSE(out[0].first.has_value());
    EXPECT_EQ(out[0].evidence["read_as"], "missing");
    EXPECT_EQ(*out[1].region, "0412");
}

TEST(CodeVariant, FoldsCaseWhitespaceAndLeadingZeros) {
    EXPECT_EQ(foldCode("0412"), foldCode("412"));
    EXPECT_EQ(foldCode(" k01 "), foldCode("K01"));
    EXPECT_NE(foldCode("K01"), foldCode("K1"));  // only leading zeros are folded
    EXPECT_EQ(foldCode("000"), "0");
}

TEST(CodeVariant, SuggestsMergingIntoTheCodeWithMostDataOrTheRegisteredOne) {
    using siftwave::testing::kNoRow;
    const Drop drop = siftwave::testing::handBuiltDrop(
        {"0412", "K01", "412"}, {{5, 6, 7, kNoRow}, {1, 1, 1, 1}, {kNoRow, kNoRow, kNoRow, 8}});
    const ScanOptions options;
    std::vector<Finding> out;
    detail::findCodeVariants(detail::prepareScanInput(drop, options), out);
    ASSERT_EQ(out.size(), 1u);
    EXPECT_EQ(*out[0].region, "412");
    EXPECT_EQ(suggestionToJson(out[0])["decision"], "merge_codes");
    EXPECT_EQ(suggestionToJson(out[0])["from"], "412");
    EXPECT_EQ(suggestionToJson(out[0])["into"], "0412");
    EXPECT_EQ(out[0].evidence["overlap_cells"], 0);

    RegionRegister reg;
    reg.entries.push_back({"412", "Somewhere", "", std::nullopt, 2});
    reg.index();
    std::vector<Finding> withRegister;
    detail::findCodeVariants(detail::prepareScanInput(drop, options, {nullptr, &reg}),
                             withRegister);
    ASSERT_EQ(withRegister.size(), 1u);
    EXPECT_EQ(suggestionToJson(withRegister[0])["into"], "412");
}

TEST(UnknownCode, ReportsCodesNotInTheRegisterAndNamesASimilarOne) {
    const Drop drop = siftwave::testing::handBuiltDrop({"0412", "412", "ZZ"}, {{1}, {2}, {3}});
    RegionRegister reg;
    reg.path = "regions.csv";
    reg.entries.push_back({"0412", "Skaldrin", "", std::nullopt, 2});
    reg.index();
    const ScanOptions options;
    std::vector<Finding> out;
    detail::findUnknownCodes(detail::prepareScanInput(drop, options, {nullptr, &reg}), out);
    ASSERT_EQ(out.size(), 2u);
    EXPECT_EQ(*out[0].region, "412");
    EXPECT_EQ(out[0].evidence["similar"], "0412");
    EXPECT_EQ(suggestionToJson(out[0])["decision"], "merge_codes");
    EXPECT_EQ(*out[1].region, "ZZ");
    EXPECT_EQ(suggestionToJson(out[1])["decision"], "exclude");
}

}  // namespace
}  // namespace siftwave::scan
