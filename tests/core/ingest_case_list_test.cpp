// Case lists: detected or forced, counted by event date per region and period, problems kept
// with their lines (core/src/ingest/case_list_reader.h).
#include "siftwave/ingest/ingest.h"
#include "siftwave/scan/scan.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::ingest {
namespace {

const std::string kHus = std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv";

Drop parsed(std::string_view text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "list.csv", options);
    EXPECT_TRUE(drop.ok()) << (drop.ok() ? "" : drop.error().describe());
    return drop.ok() ? std::move(*drop) : Drop{};
}

std::int32_t countOn(const Drop& drop, std::string_view region, const char* day) {
    const auto r = drop.regionIndex(region);
    const auto p = drop.periodOf(*Date::fromIso(day));
    EXPECT_TRUE(r && p);
    return r && p ? drop.cell(0, *r, *p).value : -1;
}

// The real list of 630 HUS cases (r-cran-surveillance's husO104Hosp; tests/data/real/SOURCES.md:
// 630 rows, dHosp 2011-05-07 to 2011-07-04, delays 0 to 15 days, no NA) used to read as 630
// regions of unparsable cells. The per-day counts below were counted with Python's csv module
// from the fixture (an outside count, not this reader).
TEST(IngestCaseList, TheRealHusListIsDetectedAndCountedByHospitalisationDate) {
    Result<Drop> drop = readDrop(kHus);
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.layout, Layout::CaseList);
    ASSERT_TRUE(drop->caseList);
    EXPECT_EQ(drop->caseList->eventColumn, "dHosp");
    EXPECT_EQ(drop->caseList->reportColumn, "dReport");
    EXPECT_EQ(drop->caseList->cases.size(), 630u);
    EXPECT_TRUE(drop->caseList->problems.empty());
    ASSERT_EQ(drop->regionCodes.size(), 1u);
    EXPECT_EQ(drop->axis.first(), *Date::fromIso("2011-05-07"));
    EXPECT_EQ(drop->periods(), 59);
    std::int64_t total = 0;
    for (const Cell& c : drop->series(0, 0)) {
        EXPECT_EQ(c.state, CellState::Reported);
        total += c.value;
    }
    EXPECT_EQ(total, 630);
    EXPECT_EQ(countOn(*drop, "all", "2011-05-21"), 66);  // the peak day
    EXPECT_EQ(countOn(*drop, "all", "2011-05-22"), 42);
    EXPECT_EQ(countOn(*drop, "all", "2011-06-01"), 16);
    // The first day's one case is the file's first data row.
    EXPECT_EQ(drop->cell(0, 0, 0).line, 2u);
}

TEST(IngestCaseList, RegionsComeFromTheRegionColumnAndEveryCaseKeepsItsLine) {
    const Drop drop = parsed(
        "onset,district,report_date\n"
        "2026-03-02,North,2026-03-04\n"
        "2026-03-02,South,2026-03-03\n"
        "2026-03-04,North,2026-03-09\n"
        "2026-03-02,North,2026-03-02\n");
    ASSERT_EQ(drop.source.layout, Layout::CaseList);
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"North", "South"}));
    EXPECT_EQ(drop.caseList->eventColumn, "onset");
    EXPECT_EQ(drop.caseList->reportColumn, "report_date");
    EXPECT_EQ(drop.caseList->regionColumn, "district");
    EXPECT_EQ(countOn(drop, "North", "2026-03-02"), 2);
    EXPECT_EQ(countOn(drop, "North", "2026-03-03"), 0);  // a day with no case is a zero
    EXPECT_EQ(countOn(drop, "North", "2026-03-04"), 1);
    EXPECT_EQ(countOn(drop, "South", "2026-03-02"), 1);
    EXPECT_EQ(drop.cell(0, 0, 0).line, 2u);
    std::vector<std::uint32_t> lines;
    for (const CaseRecord& c : drop.caseList->cases)
        lines.push_back(c.line);
    EXPECT_EQ(lines, (std::vector<std::uint32_t>{2, 3, 4, 5}));
}

TEST(IngestCaseList, ReversedAndMissingDatesAreKeptAsProblemsWithTheirLines) {
    const Drop drop = parsed(
        "event,report\n"
        "2026-03-02,2026-03-04\n"
        ",2026-03-05\n"
        "2026-03-03,2026-03-01\n"
        "2026-03-04,\n"
        "2026-3-x,2026-03-06\n"
        "2026-03-05,2026-03-06\n");
    ASSERT_TRUE(drop.caseList);
    const std::vector<CaseProblem>& p = drop.caseList->problems;
    ASSERT_EQ(p.size(), 4u);
    EXPECT_EQ(p[0].kind, CaseProblemKind::MissingEvent);
    EXPECT_EQ(p[0].line, 3u);
    EXPECT_EQ(p[1].kind, CaseProblemKind::ReportBeforeEvent);
    EXPECT_EQ(p[1].line, 4u);
    EXPECT_EQ(p[1].column, 2u);
    EXPECT_EQ(p[2].kind, CaseProblemKind::MissingReport);
    EXPECT_EQ(p[2].line, 5u);
    // "2026-3-x" is not a date of the column's format: not counted, and a problem too.
    EXPECT_EQ(p[3].kind, CaseProblemKind::UnreadableEvent);
    EXPECT_EQ(p[3].line, 6u);
    EXPECT_EQ(drop.caseList->cases.size(), 4u);
    EXPECT_EQ(drop.rows, 6u);
}

TEST(IngestCaseList, AnUnreadableEventDateIsAProblemNotACount) {
    const Drop drop = parsed("onset,report\n2026-03-02,2026-03-04\n2026-02-30,2026-03-05\n");
    ASSERT_EQ(drop.caseList->problems.size(), 1u);
    EXPECT_EQ(drop.caseList->problems[0].kind, CaseProblemKind::UnreadableEvent);
    EXPECT_EQ(drop.caseList->problems[0].text, "2026-02-30");
    EXPECT_EQ(drop.caseList->problems[0].line, 3u);
}

TEST(IngestCaseList, TheScanReportsDateProblemsAsFindingsWithLines) {
    const Drop drop = parsed(
        "event,report\n2026-03-02,2026-03-04\n2026-03-03,2026-03-01\n2026-03-04,2026-03-04\n");
    Result<scan::ScanReport> scanned = scan::scanDrop(drop);
    ASSERT_TRUE(scanned.ok());
    const scan::ScanReport& report = *scanned;
    const auto it =
        std::find_if(report.findings.begin(), report.findings.end(),
                     [](const scan::Finding& f) { return f.kind == scan::FindingKind::CaseDates; });
    ASSERT_NE(it, report.findings.end());
    EXPECT_EQ(it->evidence.json()["problem"], "report_before_event");
    EXPECT_EQ(it->evidence.json()["lines"], nlohmann::json::array({3}));
    EXPECT_EQ(it->first, *Date::fromIso("2026-03-03"));
    EXPECT_EQ(it->severity, scan::Severity::Critical);  // 1 of 3 rows
}

TEST(IngestCaseList, WeeklyCadenceCountsEachCaseInTheWeekOfItsEvent) {
    IngestOptions o;
    o.cadence = Cadence::Weekly;
    // 2026-03-02 is a Monday; 03-08 a Sunday of the same ISO week; 03-09 the next week.
    const Drop drop = parsed(
        "onset,report\n2026-03-02,2026-03-04\n2026-03-08,2026-03-10\n"
        "2026-03-09,2026-03-12\n",
        o);
    ASSERT_TRUE(drop.axis.weekly());
    ASSERT_EQ(drop.periods(), 2);
    EXPECT_EQ(drop.cell(0, 0, 0).value, 2);
    EXPECT_EQ(drop.cell(0, 0, 1).value, 1);
}

TEST(IngestCaseList, ALongReleaseWithACountColumnIsNotACaseList) {
    const Drop drop = parsed("date,region,cases\n2026-03-02,North,4\n2026-03-03,North,5\n");
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_FALSE(drop.caseList);
}

TEST(IngestCaseList, NamedColumnsForceACaseListAndAnUnknownNameIsAnError) {
    IngestOptions o;
    o.eventColumn = "sampled";
    o.reportColumn = "notified";
    const Drop drop = parsed("notified,sampled,age\n2026-03-05,2026-03-02,34\n", o);
    EXPECT_EQ(drop.caseList->eventColumn, "sampled");
    EXPECT_EQ(drop.caseList->cases.front().report, *Date::fromIso("2026-03-05"));
    o.eventColumn = "onset";
    Result<Drop> bad = parseDrop("notified,sampled\n2026-03-05,2026-03-02\n", "l.csv", o);
    ASSERT_FALSE(bad.ok());
    EXPECT_EQ(bad.error().code, ErrorCode::Layout);
    EXPECT_NE(bad.error().message.find("'onset'"), std::string::npos);
}

TEST(IngestCaseList, AShortRowIsAnErrorWithItsLine) {
    Result<Drop> bad =
        parseDrop("onset,report\n2026-03-02,2026-03-04\n2026-03-03\n", "l.csv", IngestOptions{});
    ASSERT_FALSE(bad.ok());
    EXPECT_EQ(bad.error().line, 3u);
}

TEST(IngestCaseList, SlashDatesNeedAnOrderThatTheDataSettle) {
    Result<Drop> ambiguous =
        parseDrop("onset,report\n03/02/2026,04/02/2026\n", "l.csv", IngestOptions{});
    ASSERT_FALSE(ambiguous.ok());
    EXPECT_EQ(ambiguous.error().code, ErrorCode::Ambiguous);
    const Drop drop = parsed("onset,report\n13/02/2026,14/02/2026\n03/02/2026,04/02/2026\n");
    EXPECT_EQ(drop.caseList->cases[1].event, *Date::fromIso("2026-02-03"));
    // One column settles the order for both: the file writes its dates one way.
    const Drop both = parsed("onset,report\n01/03/2026,13/03/2026\n02/03/2026,04/03/2026\n");
    EXPECT_EQ(both.caseList->cases[0].event, *Date::fromIso("2026-03-01"));
}

}  // namespace
}  // namespace siftwave::ingest
