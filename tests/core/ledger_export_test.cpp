// The cleaned CSV (RFC 4180, spreadsheet-safe) and the audit report.
#include "ledger_test_support.h"

#include "siftwave/csv_field.h"
#include "siftwave/ledger/export.h"

#include <gtest/gtest.h>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;

// RFC 4180, section 2, rules 6 and 7: fields with commas, quotes or line breaks are
// enclosed in double quotes, and a double quote inside is escaped by doubling it.
TEST(CleanedCsv, QuotesFieldsPerRfc4180) {
    EXPECT_EQ(csvField("plain", true), "plain");
    EXPECT_EQ(csvField("a,b", true), "\"a,b\"");
    EXPECT_EQ(csvField("say \"hi\"", true), "\"say \"\"hi\"\"\"");
    EXPECT_EQ(csvField("two\nlines", true), "\"two\nlines\"");
}

// Spreadsheet formula injection: text cells beginning with = + - @ TAB or CR are
// prefixed with an apostrophe (common practice, no source).
TEST(CleanedCsv, NeutralisesTextThatASpreadsheetWouldReadAsAFormula) {
    EXPECT_EQ(csvField("=SUM(A1:A9)", true), "'=SUM(A1:A9)");
    EXPECT_EQ(csvField("+41", true), "'+41");
    EXPECT_EQ(csvField("-", true), "'-");
    EXPECT_EQ(csvField("@cmd", true), "'@cmd");
    EXPECT_EQ(csvField("\tx", true), "'\tx");
    EXPECT_EQ(csvField("-12", false), "-12") << "numbers are never altered";
    EXPECT_EQ(csvField("=1,2", true), "\"'=1,2\"");
}

class Export : public ::testing::Test {
protected:
    void SetUp() override {
        drop = makeDrop({"0412", "=HYPERLINK(\"x\")", "B"}, {"cases"}, "2026-03-01", 4);
        setSeries(drop, 0, 0, {1, 0, 30, 2});
        setAbsent(drop, 0, 0, 1);
        setSeries(drop, 0, 1, {5, 5, 5, 5});
        setSeries(drop, 0, 2, {7, 8, 9, 10});
        cleaned = Cleaned(drop);
        record(drop, ledger, cleaned,
               redistribution("0412", "2026-03-03", 20, "2026-03-01", "2026-03-02",
                              RedistributeMethod::Uniform),
               "backlog | after the weekend <confirmed>");
        Decision ex;
        ex.kind = DecisionKind::Exclude;
        ex.region = "B";
        ex.window = DayRange{day("2026-03-04"), day("2026-03-04")};
        record(drop, ledger, cleaned, ex, "last day incomplete");
    }
    Drop drop;
    Cleaned cleaned;
    Ledger ledger;
};

TEST_F(Export, CleanedCsvHasOneRowPerCellWithRawValueAndEntries) {
    const std::string csv = cleanedCsv(drop, cleaned);
    EXPECT_EQ(csv.rfind("date,region,measure,value,raw_value,entries\r\n", 0), 0u);
    EXPECT_NE(csv.find("2026-03-01,0412,cases,11,1,1\r\n"), std::string::npos) << csv;
    EXPECT_NE(csv.find("2026-03-02,0412,cases,10,,1\r\n"), std::string::npos)
        << "absent day given a value";
    EXPECT_NE(csv.find("2026-03-03,0412,cases,10,30,1\r\n"), std::string::npos);
    EXPECT_NE(csv.find("2026-03-01,\"'=HYPERLINK(\"\"x\"\")\",cases,5,5,\r\n"), std::string::npos)
        << csv;
    EXPECT_NE(csv.find("2026-03-04,B,cases,,10,2\r\n"), std::string::npos) << "excluded: no value";
}

TEST_F(Export, ReconciliationExplainsEachDifferenceByTheEntriesInEffect) {
    const auto rows = reconcile(drop, cleaned, ledger);
    ASSERT_EQ(rows.size(), 3u);
    EXPECT_EQ(rows[0].region, "0412");
    EXPECT_EQ(rows[0].difference(), 0);
    EXPECT_TRUE(rows[0].entries.empty()) << "a conserving entry explains no difference";
    EXPECT_EQ(rows[2].rawTotal, 34);
    EXPECT_EQ(rows[2].cleanedTotal, 24);
    EXPECT_EQ(rows[2].entries, (std::vector<std::uint64_t>{2}));
    const auto fromLedger = reconcileFromLedger(ledger);
    ASSERT_EQ(fromLedger.size(), 2u);
    EXPECT_EQ(fromLedger[1].region, "B");
    EXPECT_EQ(fromLedger[1].difference(), -10);
}

TEST_F(Export, WithdrawnEntriesExplainNothing) {
    record(drop, ledger, cleaned, withdrawal(2), "the last day arrived after all");
    const auto rows = reconcile(drop, cleaned, ledger);
    EXPECT_EQ(rows[2].difference(), 0);
    EXPECT_TRUE(rows[2].entries.empty());
    EXPECT_EQ(entriesInEffect(ledger), (std::vector<bool>{true, false, true}));
}

TEST_F(Export, ReportsCarryEveryReasonEscapedForTheirFormat) {
    const auto rows = reconcile(drop, cleaned, ledger);
    ReportContext ctx{"decisions.jsonl", "drop.csv", drop.source.sha256, true};
    const std::string md = renderReport(ledger, rows, ctx, ReportFormat::Markdown);
    // CommonMark 0.30: raw HTML passes through a renderer (section 6.6), so < > & are entity
    // references; link, emphasis and table punctuation is backslash-escaped (section 2.4).
    EXPECT_NE(md.find("backlog \\| after the weekend &lt;confirmed&gt;"), std::string::npos) << md;
    EXPECT_EQ(md.find("<confirmed>"), std::string::npos) << md;
    EXPECT_NE(md.find("=HYPERLINK\\(\"x\"\\)"), std::string::npos) << md;
    EXPECT_NE(md.find("| B | cases | 34 | 24 | -10 | 2 |"), std::string::npos) << md;
    const std::string html = renderReport(ledger, rows, ctx, ReportFormat::Html);
    EXPECT_NE(html.find("&lt;confirmed&gt;"), std::string::npos);
    EXPECT_EQ(html.find("<confirmed>"), std::string::npos);
    EXPECT_NE(html.find("=HYPERLINK(&quot;x&quot;)"), std::string::npos);
    const std::string csv = renderReport(ledger, rows, ctx, ReportFormat::Csv);
    EXPECT_NE(csv.find("reconciliation,,,,,,,,B,cases,34,24,-10,2\r\n"), std::string::npos) << csv;
    EXPECT_NE(csv.find("\"'=HYPERLINK(\"\"x\"\")\""), std::string::npos);
    EXPECT_EQ(reportFormatFromPath("audit.HTML"), ReportFormat::Html);
    EXPECT_FALSE(reportFormatFromPath("audit.txt").has_value());
}

TEST_F(Export, MovingAndLoweringCountsAddsNone) {
    // Entry 1 moves counts within a region, entry 2 excludes a day: neither adds.
    EXPECT_FALSE(countsAddedByDecisions(ledger).any());
    EXPECT_EQ(countsAddedByDecisions(ledger).describe(), "");
    const auto rows = reconcile(drop, cleaned, ledger);
    ReportContext ctx{"decisions.jsonl", "drop.csv", drop.source.sha256, true};
    EXPECT_EQ(renderReport(ledger, rows, ctx, ReportFormat::Markdown).find("- Totals:"),
              std::string::npos);
}

TEST(CountsAdded, ListsTheEntriesInEffectThatAddCountsWithTheirSum) {
    Drop drop = makeDrop({"A", "B"}, {"cases"}, "2026-03-01", 6);
    setSeries(drop, 0, 0, {10, 0, 0, 16, 0, 20});
    setAbsent(drop, 0, 0, 1);
    setAbsent(drop, 0, 0, 2);
    setAbsent(drop, 0, 0, 4);
    setSeries(drop, 0, 1, {1, 2, 3, 4, 5, 6});
    Cleaned cleaned(drop);
    Ledger ledger;
    Decision linear;
    linear.kind = DecisionKind::FillMissing;
    linear.region = "A";
    linear.measure = "cases";
    linear.window = DayRange{day("2026-03-02"), day("2026-03-03")};
    linear.fillMethod = FillMethod::Linear;  // 12 and 14 between 10 and 16: +26
    record(drop, ledger, cleaned, linear);
    Decision zero = linear;
    zero.window = DayRange{day("2026-03-05"), day("2026-03-05")};
    zero.fillMethod = FillMethod::Zero;  // adds nothing
    record(drop, ledger, cleaned, zero);
    Decision merge;
    merge.kind = DecisionKind::MergeCodes;
    merge.variant = "B";
    merge.into = "A";  // +21 in A, -21 in B: moves counts, adds none
    record(drop, ledger, cleaned, merge);

    CountsAdded added = countsAddedByDecisions(ledger);
    EXPECT_EQ(added.total, 26);
    EXPECT_EQ(added.entries, (std::vector<std::uint64_t>{1}));
    EXPECT_EQ(added.describe(), "totals changed by decisions that add counts: +26 (entries #1)");
    const auto rows = reconcile(drop, cleaned, ledger);
    ReportContext ctx{"decisions.jsonl", "drop.csv", drop.source.sha256, true};
    EXPECT_NE(renderReport(ledger, rows, ctx, ReportFormat::Markdown)
                  .find("- Totals: totals changed by decisions that add counts: +26 (entries #1)"),
              std::string::npos);

    // Withdrawn, the fill adds nothing any more; restored, it is listed again.
    record(drop, ledger, cleaned, withdrawal(3));
    record(drop, ledger, cleaned, withdrawal(1));
    EXPECT_FALSE(countsAddedByDecisions(ledger).any());
    record(drop, ledger, cleaned, withdrawal(5));
    added = countsAddedByDecisions(ledger);
    EXPECT_EQ(added.total, 26);
    EXPECT_EQ(added.entries, (std::vector<std::uint64_t>{1}));
}

}  // namespace
}  // namespace siftwave::ledger
