// A narrowed read (IngestOptions::narrowing: --from, --to, --only-regions): rows outside are
// counted, never tabled, in every layout; weeks are kept when they overlap the range; a ledger
// entry records the narrowing and replay refuses another read (issue 19, bounded resources).
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"

#include <gtest/gtest.h>

#include <string>

namespace siftwave::ingest {
namespace {

Date day(const char* iso) {
    return *Date::fromIso(iso);
}

IngestOptions narrowedTo(std::optional<Date> from, std::optional<Date> to,
                         std::vector<std::string> regions = {}) {
    IngestOptions o;
    o.narrowing.from = from;
    o.narrowing.to = to;
    o.narrowing.regions = std::move(regions);
    return o;
}

const char* const kLong =
    "date,region,cases\n"
    "2026-03-01,A,1\n"
    "2026-03-01,B,2\n"
    "2026-03-02,A,3\n"
    "2026-03-03,C,4\n"
    "2026-03-04,A,5\n";

TEST(IngestNarrowing, LongRowsOutsideTheDatesAreCountedNotTabled) {
    auto drop = parseDrop(kLong, "long.csv", narrowedTo(day("2026-03-02"), day("2026-03-03")));
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->axis.first(), day("2026-03-02"));
    EXPECT_EQ(drop->periods(), 2);
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"A", "C"}));  // B has no row kept
    EXPECT_EQ(drop->rows, 2u);
    EXPECT_EQ(drop->source.leftOut.rowsOutsideDates, 3u);
    EXPECT_EQ(drop->source.leftOut.rowsOfOtherRegions, 0u);
    EXPECT_EQ(narrowingNote(drop->source),
              "narrowed read (--from 2026-03-02 --to 2026-03-03): 3 data rows left out (3 outside "
              "2026-03-02 to 2026-03-03)");
}

TEST(IngestNarrowing, RegionsAreKeptAsAskedAndUnknownCodesAreWarned) {
    auto drop = parseDrop(kLong, "long.csv", narrowedTo({}, {}, {"C", "A", "a"}));
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"A", "C"}));
    EXPECT_EQ(drop->source.narrowing.regions, (std::vector<std::string>{"A", "C", "a"}));
    EXPECT_EQ(drop->source.leftOut.rowsOfOtherRegions, 1u);
    EXPECT_EQ(drop->source.leftOut.regionsNotFound, (std::vector<std::string>{"a"}));
    // The calendar is that of the rows kept: 1 to 4 March.
    EXPECT_EQ(drop->periods(), 4);
    bool warned = false;
    for (const Warning& w : drop->warnings)
        warned = warned || w.message.find("'a'") != std::string::npos;
    EXPECT_TRUE(warned);
}

TEST(IngestNarrowing, NoRowLeftIsAnErrorThatNamesTheFilesDates) {
    auto drop = parseDrop(kLong, "long.csv", narrowedTo(day("2027-01-01"), {}));
    ASSERT_FALSE(drop.ok());
    EXPECT_NE(drop.error().message.find("no data row is left by --from 2027-01-01"),
              std::string::npos)
        << drop.error().message;
    EXPECT_NE(drop.error().message.find("the file's dates run from 2026-03-01 to 2026-03-04"),
              std::string::npos)
        << drop.error().message;
}

TEST(IngestNarrowing, WeeksThatOverlapTheRangeAreKept) {
    // Monday dates: ISO weeks. --from a Wednesday keeps the week it falls in.
    const char* weekly =
        "week,region,cases\n"
        "2026-01-05,A,1\n"
        "2026-01-12,A,2\n"
        "2026-01-19,A,3\n"
        "2026-01-26,A,4\n";
    auto drop = parseDrop(weekly, "weekly.csv", narrowedTo(day("2026-01-14"), day("2026-01-19")));
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_TRUE(drop->axis.weekly());
    EXPECT_EQ(drop->axis.first(), day("2026-01-12"));
    EXPECT_EQ(drop->periods(), 2);
    EXPECT_EQ(drop->source.leftOut.rowsOutsideDates, 2u);
    // One week kept stays weekly: the cadence is the whole file's.
    auto one = parseDrop(weekly, "weekly.csv", narrowedTo(day("2026-01-20"), day("2026-01-20")));
    ASSERT_TRUE(one.ok()) << one.error().describe();
    EXPECT_TRUE(one->axis.weekly());
    EXPECT_EQ(one->axis.first(), day("2026-01-19"));
}

TEST(IngestNarrowing, DatesDownLeavesOutRegionColumnsAndDateRows) {
    const char* wide =
        "date,A,B,C\n"
        "2026-03-01,1,2,3\n"
        "2026-03-02,4,5,6\n"
        "2026-03-03,7,8,9\n";
    auto drop = parseDrop(wide, "down.csv", narrowedTo(day("2026-03-02"), {}, {"C", "A"}));
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.layout, Layout::DatesDown);
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"A", "C"}));
    EXPECT_EQ(drop->periods(), 2);
    EXPECT_EQ(drop->cell(0, 1, 0).value, 6);  // C on 2 March
    EXPECT_EQ(drop->source.leftOut.regionColumns, 1u);
    EXPECT_EQ(drop->source.leftOut.rowsOutsideDates, 1u);
}

TEST(IngestNarrowing, DatesAcrossLeavesOutDateColumnsAndRegionRows) {
    const char* wide =
        "region,2026-03-01,2026-03-02,2026-03-03\n"
        "A,1,2,3\n"
        "B,4,5,6\n";
    auto drop = parseDrop(wide, "across.csv", narrowedTo({}, day("2026-03-02"), {"B"}));
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.layout, Layout::DatesAcross);
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"B"}));
    EXPECT_EQ(drop->periods(), 2);
    EXPECT_EQ(drop->cell(0, 0, 1).value, 5);
    EXPECT_EQ(drop->source.leftOut.dateColumns, 1u);
    EXPECT_EQ(drop->source.leftOut.rowsOfOtherRegions, 1u);
}

TEST(IngestNarrowing, CaseListCountsOnlyTheCasesKept) {
    const char* cases =
        "id,onset,region\n"
        "1,2026-03-01,A\n"
        "2,2026-03-02,A\n"
        "3,2026-03-02,B\n"
        "4,2026-03-05,A\n";
    IngestOptions o = narrowedTo(day("2026-03-02"), {}, {"A"});
    o.caseList = true;
    auto drop = parseDrop(cases, "cases.csv", o);
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    ASSERT_TRUE(drop->caseList);
    EXPECT_EQ(drop->caseList->cases.size(), 2u);
    EXPECT_EQ(drop->axis.first(), day("2026-03-02"));
    EXPECT_EQ(drop->source.leftOut.rowsOutsideDates, 1u);
    EXPECT_EQ(drop->source.leftOut.rowsOfOtherRegions, 1u);
}

TEST(IngestNarrowing, ABackwardRangeIsAUsageError) {
    auto drop = parseDrop(kLong, "long.csv", narrowedTo(day("2026-03-03"), day("2026-03-01")));
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::Usage);
}

// A table the file does not justify is refused with the options to type, built from its own
// dates and codes; the suggested window then reads.
TEST(IngestNarrowing, TheRefusalSuggestsAWindowThatThenReads) {
    std::string text = "date,region,cases\n";
    for (int i = 0; i < 2000; ++i) {
        const std::string code = "R" + std::to_string(i);
        text += "1926-03-01," + code + ",1\n2026-03-01," + code + ",2\n2026-03-02," + code + ",3\n";
    }
    auto refused = parseDrop(text, "century.csv");
    ASSERT_FALSE(refused.ok());
    const std::string& m = refused.error().message;
    EXPECT_NE(m.find("asks for a table of 36527 days x 2000 regions"), std::string::npos) << m;
    EXPECT_NE(m.find("--from 2026-03-01 --to 2026-03-02"), std::string::npos) << m;
    EXPECT_NE(m.find("--only-regions R0,R1,R2"), std::string::npos) << m;
    auto read = parseDrop(text, "century.csv", narrowedTo(day("2026-03-01"), day("2026-03-02")));
    ASSERT_TRUE(read.ok()) << read.error().describe();
    EXPECT_EQ(read->periods(), 2);
    EXPECT_EQ(read->source.leftOut.rowsOutsideDates, 2000u);
}

}  // namespace
}  // namespace siftwave::ingest

namespace siftwave::ledger {
namespace {

TEST(LedgerNarrowing, AnEntryRecordsItsNarrowedReadAndReplaysOnlyOnTheSameRead) {
    const char* text =
        "date,region,cases\n"
        "2026-03-01,A,1\n"
        "2026-03-02,A,3\n"
        "2026-03-03,B,4\n";
    ingest::IngestOptions narrowed;
    narrowed.narrowing.from = Date::fromIso("2026-03-02");
    auto part = ingest::parseDrop(text, "d.csv", narrowed);
    auto whole = ingest::parseDrop(text, "d.csv");
    ASSERT_TRUE(part.ok() && whole.ok());
    Decision accept;
    accept.kind = DecisionKind::Accept;
    accept.region = "A";
    Ledger ledger;
    auto entry = draftEntry(*part, ledger, Cleaned(*part), accept,
                            EntryMeta{"ana", "2026-03-21T08:00:00Z", "checked"});
    ASSERT_TRUE(entry.ok()) << entry.error().describe();
    EXPECT_EQ(entry->narrowing, part->source.narrowing);
    // Written and read back, the narrowing is part of what the hash covers.
    auto line = entryLine(*entry);
    ASSERT_TRUE(line.ok());
    EXPECT_NE(line->find("\"narrowed_read\":{\"from\":\"2026-03-02\"}"), std::string::npos)
        << *line;
    auto back = parseEntryLine(*line, 1);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    EXPECT_EQ(back->narrowing, entry->narrowing);
    ledger.entries.push_back(*back);
    EXPECT_TRUE(replay(*part, ledger).ok());
    auto mixed = replay(*whole, ledger);
    ASSERT_FALSE(mixed.ok());
    EXPECT_NE(mixed.error().message.find("--from 2026-03-02"), std::string::npos)
        << mixed.error().message;
    // Editing the recorded narrowing breaks the hash.
    LedgerEntry edited = ledger.entries[0];
    edited.narrowing.from = Date::fromIso("2026-03-01");
    EXPECT_FALSE(verifyChain(Ledger{{edited}}).ok());
    // An entry made on the whole file does not replay on a narrowed read either.
    auto wholeEntry = draftEntry(*whole, Ledger{}, Cleaned(*whole), accept,
                                 EntryMeta{"ana", "2026-03-21T08:00:00Z", "checked"});
    ASSERT_TRUE(wholeEntry.ok());
    EXPECT_EQ(entryLine(*wholeEntry)->find("narrowed_read"), std::string::npos);
    EXPECT_FALSE(replay(*part, Ledger{{*wholeEntry}}).ok());
}

}  // namespace
}  // namespace siftwave::ledger
