// Reading whole drops: dialects, layouts, roles, cells, duplicates, provenance.
#include "siftwave/ingest/ingest.h"
#include "siftwave/sha256.h"

#include "support/temp_path.h"
#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <string>
#include <utility>
#include <vector>

namespace siftwave::ingest {
namespace {

Drop readOk(const std::string& text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "test.csv", options);
    EXPECT_TRUE(drop.ok()) << (drop.ok() ? "" : drop.error().describe());
    if (!drop.ok())
        return Drop{};
    return std::move(drop).value();
}

const Cell& cellOf(const Drop& drop, const std::string& measure, const std::string& region,
                   const std::string& date) {
    static const Cell none;
    auto m = drop.measureIndex(measure);
    auto r = drop.regionIndex(region);
    auto d = drop.periodOf(*Date::fromIso(date));
    EXPECT_TRUE(m && r && d) << measure << " " << region << " " << date;
    if (!m || !r || !d)
        return none;
    return drop.cell(*m, *r, *d);
}

TEST(IngestDrop, ReadsALongFileWithTwoMeasures) {
    const Drop drop = readOk(
        "date,region,cases,deaths\n"
        "2026-03-01,NA,5,0\n"
        "2026-03-01,004,3,1\n"
        "2026-03-03,NA,7,2\n");
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.source.columns.date, "date");
    EXPECT_EQ(drop.source.columns.region, "region");
    EXPECT_EQ(drop.source.columns.values, (std::vector<std::string>{"cases", "deaths"}));
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"cases", "deaths"}));
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"NA", "004"}));
    EXPECT_EQ(drop.axis.first().iso(), "2026-03-01");
    EXPECT_EQ(drop.periods(), 3);
    EXPECT_EQ(drop.rows, 3u);
    EXPECT_EQ(drop.source.dateFormat, "YYYY-MM-DD");
    const Cell& c = cellOf(drop, "deaths", "004", "2026-03-01");
    EXPECT_EQ(c.state, CellState::Reported);
    EXPECT_EQ(c.value, 1);
    EXPECT_EQ(c.line, 3u);
    EXPECT_EQ(cellOf(drop, "cases", "NA", "2026-03-02").state, CellState::Absent);
    EXPECT_EQ(cellOf(drop, "cases", "NA", "2026-03-03").value, 7);
    const CellCounts counts = drop.countCells();
    EXPECT_EQ(counts.reported, 6u);
    EXPECT_EQ(counts.absent, 6u);  // 2 regions x 3 days x 2 measures - 6 reported
    ASSERT_EQ(drop.tables.size(), 2u);
    EXPECT_EQ(drop.tables[0].regions(), 2u);
    EXPECT_EQ(drop.tables[0].days(), 3u);
}

TEST(IngestDrop, KeepsRegionCodesVerbatim) {
    // A missing-value token, leading zeros, a boolean word, case and spaces: all codes as written.
    const Drop drop = readOk(
        "date,region,cases\n"
        "2026-01-01,NA,1\n"
        "2026-01-01,007,2\n"
        "2026-01-01,TRUE,3\n"
        "2026-01-01,na,4\n"
        "2026-01-01, NA ,5\n"
        "2026-01-01,1e3,6\n"
        "2026-01-01,null,7\n");
    EXPECT_EQ(drop.regionCodes,
              (std::vector<std::string>{"NA", "007", "TRUE", "na", " NA ", "1e3", "null"}));
    EXPECT_EQ(cellOf(drop, "cases", " NA ", "2026-01-01").value, 5);
    bool warnedAboutSpaces = false;
    for (const Warning& w : drop.warnings)
        warnedAboutSpaces = warnedAboutSpaces || w.message.find("' NA '") != std::string::npos;
    EXPECT_TRUE(warnedAboutSpaces);
}

TEST(IngestDrop, MissingTokensApplyToValuesOnlyAndAreExplicit) {
    const std::string text =
        "date,region,cases\n"
        "2026-01-01,NA,NA\n"
        "2026-01-02,NA,\n"
        "2026-01-03,NA,n/a\n";
    const Drop byDefault = readOk(text);
    EXPECT_EQ(byDefault.regionCodes, (std::vector<std::string>{"NA"}));
    EXPECT_EQ(cellOf(byDefault, "cases", "NA", "2026-01-01").state, CellState::Unparsable);
    EXPECT_EQ(cellOf(byDefault, "cases", "NA", "2026-01-02").state, CellState::Blank);
    EXPECT_EQ(cellOf(byDefault, "cases", "NA", "2026-01-03").state, CellState::Unparsable);

    IngestOptions options;
    options.missingTokens = {"", "NA"};
    const Drop withNa = readOk(text, options);
    EXPECT_EQ(withNa.regionCodes, (std::vector<std::string>{"NA"}));  // the code is untouched
    EXPECT_EQ(cellOf(withNa, "cases", "NA", "2026-01-01").state, CellState::Blank);
    EXPECT_EQ(cellOf(withNa, "cases", "NA", "2026-01-03").state, CellState::Unparsable);
}

TEST(IngestDrop, UnparsableCellsAreWarnedWithLineAndColumn) {
    const Drop drop = readOk(
        "date,region,cases,deaths\n"
        "2026-01-01,A,12.5,1\n"
        "2026-01-02,A,<5,99999999999\n");
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-01").state, CellState::Unparsable);
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-02").state, CellState::Unparsable);
    EXPECT_EQ(cellOf(drop, "deaths", "A", "2026-01-02").state, CellState::Unparsable);
    EXPECT_EQ(cellOf(drop, "deaths", "A", "2026-01-01").value, 1);
    auto find = [&](std::uint64_t line, std::uint64_t column) -> const Warning* {
        for (const Warning& w : drop.warnings)
            if (w.line == line && w.column == column)
                return &w;
        return nullptr;
    };
    ASSERT_NE(find(2, 3), nullptr);
    EXPECT_NE(find(2, 3)->message.find("'12.5' is not a whole number"), std::string::npos);
    ASSERT_NE(find(3, 3), nullptr);
    EXPECT_NE(find(3, 3)->message.find("'<5' is not a number"), std::string::npos);
    ASSERT_NE(find(3, 4), nullptr);
    EXPECT_NE(find(3, 4)->message.find("too large"), std::string::npos);
}

TEST(IngestDrop, NegativeCorrectionsAreReported) {
    const Drop drop = readOk("date,region,cases\n2026-01-01,A,-3\n2026-01-02,A,+4\n");
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-01").value, -3);
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-02").value, 4);
}

TEST(IngestDrop, DuplicateRowsAreKeptAsideWithTheirLines) {
    const Drop drop = readOk(
        "date,region,cases\n"
        "2026-01-01,A,1\n"
        "2026-01-02,A,2\n"
        "2026-01-01,A,9\n");
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-01").value, 1);  // the first one is kept
    ASSERT_EQ(drop.duplicates.size(), 1u);
    EXPECT_EQ(drop.duplicates[0].cell.value, 9);
    EXPECT_EQ(drop.duplicates[0].cell.line, 4u);
    EXPECT_EQ(drop.duplicates[0].firstLine, 2u);
    EXPECT_EQ(drop.duplicates[0].day, 0);
}

TEST(IngestDrop, ReadsSemicolonFilesWithDecimalComma) {
    // Common practice in locales that write decimals with a comma (no published source).
    const Drop drop = readOk(
        "datum;gebiet;faelle\n"
        "2026-01-01;A;1.234\n"
        "2026-01-02;A;12,5\n"
        "2026-01-03;A;7\n",
        {});
    EXPECT_EQ(drop.source.dialect.delimiter, ';');
    EXPECT_EQ(drop.source.dialect.decimalSeparator, ',');
    EXPECT_EQ(drop.source.dialect.thousandsSeparator, '.');
    EXPECT_EQ(drop.source.columns.region, "gebiet");
    EXPECT_EQ(cellOf(drop, "faelle", "A", "2026-01-01").value, 1234);
    EXPECT_EQ(cellOf(drop, "faelle", "A", "2026-01-02").state, CellState::Unparsable);
    EXPECT_EQ(cellOf(drop, "faelle", "A", "2026-01-03").value, 7);
}

TEST(IngestDrop, ReadsThousandsSeparatorsAndSaysSo) {
    const Drop drop = readOk(
        "date,region,cases\n"
        "2026-01-01,A,\"1,234\"\n"
        "2026-01-02,A,\"12,345,678\"\n"
        "2026-01-03,A,0.5\n");
    EXPECT_EQ(drop.source.dialect.thousandsSeparator, ',');
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-01").value, 1234);
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-02").value, 12345678);
    bool said = false;
    for (const Warning& w : drop.warnings)
        said = said || w.message.find("thousands separator") != std::string::npos;
    EXPECT_TRUE(said);
}

TEST(IngestDrop, ReadsTabAndPipeDelimitedFiles) {
    const Drop tab = readOk("date\tregion\tcases\n2026-01-01\tA\t1\n2026-01-01\tB\t2\n");
    EXPECT_EQ(tab.source.dialect.delimiter, '\t');
    EXPECT_EQ(tab.regionCodes, (std::vector<std::string>{"A", "B"}));
    const Drop pipe = readOk("date|region|cases\n2026-01-01|A|1\n2026-01-01|B|2\n");
    EXPECT_EQ(pipe.source.dialect.delimiter, '|');
    EXPECT_EQ(cellOf(pipe, "cases", "B", "2026-01-01").value, 2);
}

TEST(IngestDrop, ReadsBomAndCrlf) {
    const Drop drop = readOk(
        "\xEF\xBB\xBF"
        "date,region,cases\r\n2026-01-01,A,1\r\n2026-01-02,A,2\r\n");
    EXPECT_TRUE(drop.source.dialect.bom);
    EXPECT_TRUE(drop.source.dialect.crlf);
    EXPECT_EQ(drop.source.columns.date, "date");  // the BOM is not part of the first name
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-02").value, 2);
    EXPECT_EQ(cellOf(drop, "cases", "A", "2026-01-02").line, 3u);
}

TEST(IngestDrop, ReadsQuotedFieldsWithDelimitersAndLineBreaks) {
    const Drop drop = readOk(
        "date,region,note,cases\n"
        "2026-01-01,\"A,B\",\"two\nlines\",1\n"
        "2026-01-02,\"A,B\",\"say \"\"hi\"\"\",2\n");
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"A,B"}));
    EXPECT_EQ(cellOf(drop, "cases", "A,B", "2026-01-02").line, 4u);  // physical line
    bool unusedNote = false;
    for (const Warning& w : drop.warnings)
        unusedNote = unusedNote || w.message.find("'note' is not used") != std::string::npos;
    EXPECT_TRUE(unusedNote);
}

TEST(IngestDrop, DetectsAHeaderlessFile) {
    const Drop drop = readOk("2026-01-01,A,1\n2026-01-02,A,2\n2026-01-01,B,3\n");
    EXPECT_FALSE(drop.source.dialect.header);
    EXPECT_EQ(drop.rows, 3u);
    EXPECT_EQ(drop.source.columns.date, "column 1");
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"A", "B"}));
    EXPECT_EQ(cellOf(drop, "column 3", "A", "2026-01-01").line, 1u);
}

TEST(IngestDrop, HeaderCanBeForced) {
    IngestOptions options;
    options.header = false;
    options.dateColumn = "column 2";
    options.regionColumn = "column 1";
    options.valueColumns = {"column 3"};
    const Drop drop = readOk("R1,2026-01-01,5\nR2,2026-01-01,6\n", options);
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"R1", "R2"}));
    EXPECT_EQ(cellOf(drop, "column 3", "R2", "2026-01-01").value, 6);
}

TEST(IngestDrop, ReadsTheDatesDownLayout) {
    const Drop drop = readOk(
        "date,NA,007,ZA\n"
        "2026-01-01,1,2,3\n"
        "2026-01-02,4,,6\n");
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"NA", "007", "ZA"}));
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"cases"}));
    EXPECT_EQ(cellOf(drop, "cases", "ZA", "2026-01-02").value, 6);
    EXPECT_EQ(cellOf(drop, "cases", "007", "2026-01-02").state, CellState::Blank);
    EXPECT_EQ(cellOf(drop, "cases", "007", "2026-01-01").line, 2u);
}

TEST(IngestDrop, ReadsTheDatesAcrossLayout) {
    const Drop drop = readOk(
        "region,name,2026-01-01,2026-01-02,2026-01-04\n"
        "NA,North,1,2,3\n"
        "004,South,4,5,\n");
    EXPECT_EQ(drop.source.layout, Layout::DatesAcross);
    EXPECT_EQ(drop.source.columns.region, "region");
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"NA", "004"}));
    EXPECT_EQ(drop.periods(), 4);
    EXPECT_EQ(cellOf(drop, "cases", "004", "2026-01-02").value, 5);
    EXPECT_EQ(cellOf(drop, "cases", "004", "2026-01-04").state, CellState::Blank);
    EXPECT_EQ(cellOf(drop, "cases", "NA", "2026-01-03").state, CellState::Absent);
}

TEST(IngestDrop, LayoutAndMeasureNameCanBeForced) {
    IngestOptions options;
    options.layout = Layout::DatesDown;
    options.measureName = "deaths";
    const Drop drop = readOk("date,A,B\n2026-01-01,1,2\n2026-01-01,3,4\n", options);
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"deaths"}));
    EXPECT_EQ(drop.duplicates.size(), 2u);  // the second row repeats the date for A and B
}

TEST(IngestDrop, ReadsALongFileWithAMeasureColumn) {
    const Drop drop = readOk(
        "date,region,measure,value\n"
        "2026-01-01,A,cases,10\n"
        "2026-01-01,A,deaths,1\n"
        "2026-01-02,A,cases,12\n"
        "2026-01-02,B,hospitalised,3\n");
    EXPECT_EQ(drop.source.columns.measure, "measure");
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"cases", "deaths", "hospitalised"}));
    EXPECT_EQ(cellOf(drop, "deaths", "A", "2026-01-01").value, 1);
    EXPECT_EQ(cellOf(drop, "hospitalised", "B", "2026-01-02").value, 3);
    EXPECT_EQ(cellOf(drop, "deaths", "B", "2026-01-02").state, CellState::Absent);
}

TEST(IngestDrop, RolesCanBeNamed) {
    IngestOptions options;
    options.dateColumn = "reported_on";
    options.regionColumn = "unit";
    options.valueColumns = {"n"};
    const Drop drop = readOk(
        "reported_on,onset,unit,n,other\n"
        "2026-01-05,2026-01-01,X,3,9\n"
        "2026-01-06,2026-01-02,X,4,9\n",
        options);
    EXPECT_EQ(drop.axis.first().iso(), "2026-01-05");
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"n"}));
    EXPECT_EQ(cellOf(drop, "n", "X", "2026-01-06").value, 4);
}

std::vector<std::uint64_t> unusedColumnsWarned(const Drop& drop) {
    std::vector<std::uint64_t> columns;
    for (const Warning& w : drop.warnings) {
        if (w.message.find("is not used") != std::string::npos)
            columns.push_back(w.column);
    }
    return columns;
}

TEST(IngestDrop, EveryColumnWithoutARoleIsReportedInEveryLayout) {
    IngestOptions named;
    named.dateColumn = "reported_on";
    named.regionColumn = "unit";
    named.valueColumns = {"n"};
    EXPECT_EQ(unusedColumnsWarned(readOk("reported_on,onset,unit,n,other\n"
                                         "2026-01-05,2026-01-01,X,3,9\n"
                                         "2026-01-06,2026-01-02,X,4,9\n",
                                         named)),
              (std::vector<std::uint64_t>{2, 5}));
    EXPECT_EQ(unusedColumnsWarned(readOk("region,name,2026-01-01,2026-01-02\n"
                                         "NA,North,1,2\n")),
              (std::vector<std::uint64_t>{2}));
    IngestOptions someRegions;
    someRegions.valueColumns = {"B", "D"};
    EXPECT_EQ(unusedColumnsWarned(readOk("date,A,B,C,D\n"
                                         "2026-01-01,1,2,3,4\n"
                                         "2026-01-02,1,2,3,4\n",
                                         someRegions)),
              (std::vector<std::uint64_t>{2, 4}));
}

std::string row(int day, int region, int value) {
    return (*Date::fromIso("2026-01-01") + day).iso() + ",R" + std::to_string(region) + "," +
           std::to_string(value) + "\n";
}

void expectSameCells(const Drop& a, const Drop& b) {
    ASSERT_EQ(a.periods(), b.periods());
    EXPECT_EQ(a.axis.first(), b.axis.first());
    ASSERT_EQ(a.regionCodes.size(), b.regionCodes.size());
    for (const std::string& code : a.regionCodes) {
        ASSERT_TRUE(b.regionIndex(code)) << code;
        const auto ra = *a.regionIndex(code);
        const auto rb = *b.regionIndex(code);
        for (int d = 0; d < a.periods(); ++d) {
            ASSERT_EQ(a.cell(0, ra, d).value, b.cell(0, rb, d).value) << code << " " << d;
            ASSERT_EQ(a.cell(0, ra, d).state, b.cell(0, rb, d).state) << code << " " << d;
        }
    }
}

TEST(IngestDrop, UnsortedFilesGiveTheSameDropAsSortedOnes) {
    // The one-pass read guesses the calendar from the first and the last rows. Here the
    // earliest days sit in the middle of a file too long for either end to show them,
    // so the reader must notice and fall back to two passes; both must agree.
    std::string sorted = "date,region,cases\n";
    std::string rotated = "date,region,cases\n";
    for (int d = 0; d < 200; ++d)
        for (int r = 0; r < 50; ++r)
            sorted += row(d, r, d * 100 + r);
    for (int k = 0; k < 200; ++k) {
        const int d = (k + 100) % 200;  // days 100..199, then 0..99
        for (int r = 0; r < 50; ++r)
            rotated += row(d, r, d * 100 + r);
    }
    ASSERT_GT(rotated.size(), std::size_t{150} << 10);  // well beyond the 400 + 64 KiB looked at
    const Drop a = readOk(sorted);
    const Drop b = readOk(rotated);
    EXPECT_EQ(b.periods(), 200);
    EXPECT_EQ(b.axis.first().iso(), "2026-01-01");
    expectSameCells(a, b);
    EXPECT_EQ(b.cell(0, *b.regionIndex("R7"), 3).value, 307);
    EXPECT_EQ(b.cell(0, *b.regionIndex("R7"), 3).line, 5000u + 3 * 50 + 7 + 2);
}

TEST(IngestDrop, SparseFilesWithManyRegionsAreReadCompletely) {
    // Many regions with one row each: more regions than the one-pass read reserves room
    // for, so it must fall back to two passes without losing any.
    std::string text = "date,region,cases\n";
    for (int r = 0; r < 3000; ++r)
        text += row((r * 7) % 365, r, r);
    const Drop drop = readOk(text);
    ASSERT_EQ(drop.regionCodes.size(), 3000u);
    EXPECT_EQ(drop.regionCodes[2999], "R2999");
    EXPECT_EQ(drop.periods(), 365);
    for (int r = 0; r < 3000; r += 499) {
        const Cell& c = drop.cell(0, static_cast<std::size_t>(r), (r * 7) % 365);
        EXPECT_EQ(c.value, r);
        EXPECT_EQ(c.line, static_cast<std::uint32_t>(r + 2));
    }
    EXPECT_EQ(drop.countCells().reported, 3000u);
}

// The cells a file of (day, region, value) rows must give, worked out the plain way: the
// first row of a region and day is kept, every later one is a duplicate, in file order.
struct ExpectedDrop {
    std::map<std::pair<int, int>, std::pair<int, std::uint32_t>>
        cells;  // (region, day) -> value, line
    std::vector<std::pair<std::uint32_t, std::uint32_t>> duplicates;  // line, first line
};

std::string longFile(const std::vector<std::array<int, 3>>& rows, ExpectedDrop& expected) {
    std::string text = "date,region,cases\n";
    std::uint32_t line = 1;
    for (const auto& [day, region, value] : rows) {
        text += row(day, region, value);
        ++line;
        auto [it, added] = expected.cells.try_emplace({region, day}, value, line);
        if (!added)
            expected.duplicates.emplace_back(line, it->second.second);
    }
    return text;
}

void expectDrop(const Drop& drop, const ExpectedDrop& expected) {
    std::size_t reported = 0;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        const int region = std::stoi(drop.regionCodes[r].substr(1));
        for (int d = 0; d < drop.periods(); ++d) {
            const Cell& c = drop.cell(0, r, d);
            const int day = d + (drop.axis.first().serial - Date::fromIso("2026-01-01")->serial);
            auto it = expected.cells.find({region, day});
            if (it == expected.cells.end()) {
                ASSERT_EQ(c.state, CellState::Absent) << region << " " << day;
                continue;
            }
            ++reported;
            ASSERT_EQ(c.state, CellState::Reported) << region << " " << day;
            ASSERT_EQ(c.value, it->second.first) << region << " " << day;
            ASSERT_EQ(c.line, it->second.second) << region << " " << day;
        }
    }
    EXPECT_EQ(reported, expected.cells.size());
    ASSERT_EQ(drop.duplicates.size(), expected.duplicates.size());
    for (std::size_t i = 0; i < drop.duplicates.size(); ++i) {
        EXPECT_EQ(drop.duplicates[i].cell.line, expected.duplicates[i].first) << i;
        EXPECT_EQ(drop.duplicates[i].firstLine, expected.duplicates[i].second) << i;
    }
}

TEST(IngestDrop, EveryRowOrderGivesTheCellsAndDuplicatesOfAPlainReading) {
    // Cells are gathered in blocks of days before they reach the region-major tables
    // (cell_table_builder.h). Rows date by date, region by region, backwards, shuffled,
    // with repeats inside a block, across blocks and after a block was written out, and
    // with regions that first appear late must all give what a plain reading gives.
    siftwave::testing::Xorshift64 random(0x2545F4914F6CDD1Dull);
    auto next = [&](std::uint64_t bound) { return static_cast<int>(random.below(bound)); };
    constexpr int kDays = 70, kRegions = 23;
    for (int order = 0; order < 5; ++order) {
        std::vector<std::array<int, 3>> rows;
        for (int a = 0; a < (order == 1 ? kRegions : kDays); ++a)
            for (int b = 0; b < (order == 1 ? kDays : kRegions); ++b) {
                const int day = order == 1 ? b : (order == 2 ? kDays - 1 - a : a);
                const int region = order == 1 ? a : b;
                if (order == 4 && region > 10 && day < 40)
                    continue;  // these regions appear on day 40 only
                rows.push_back({day, region, next(500)});
            }
        if (order == 3) {
            for (std::size_t i = rows.size() - 1; i > 0; --i)
                std::swap(rows[i], rows[static_cast<std::size_t>(next(i + 1))]);
        }
        // Repeats: of the row just before (same block), of a row 20 days back (a block
        // already written out), and a few at random.
        for (int k = 0; k < 12; ++k) {
            const std::size_t at = 1 + static_cast<std::size_t>(next(rows.size() - 1));
            std::array<int, 3> repeat = rows[at - (k % 3 == 0 ? 1 : 0)];
            if (k % 3 == 1 && at > 20 * kRegions)
                repeat = rows[at - 20 * kRegions];
            repeat[2] = 1000 + k;
            rows.insert(rows.begin() + static_cast<std::ptrdiff_t>(at), repeat);
        }
        ExpectedDrop expected;
        const std::string text = longFile(rows, expected);
        SCOPED_TRACE("row order " + std::to_string(order));
        const Drop drop = readOk(text);
        EXPECT_EQ(drop.regionCodes.size(), static_cast<std::size_t>(kRegions));
        EXPECT_EQ(drop.periods(), kDays);
        expectDrop(drop, expected);
    }
}

TEST(IngestDrop, RecordsProvenanceOfTheFile) {
    const std::filesystem::path path =
        siftwave::testing::testTempPath("siftwave_ingest_provenance.csv");
    const std::string text = "date,region,cases\n2026-01-01,A,1\n";
    {
        std::ofstream out(path, std::ios::binary);
        out << text;
    }
    const auto before = std::filesystem::last_write_time(path);
    Result<Drop> drop = readDrop(path.string());
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.path, path.string());
    EXPECT_EQ(drop->source.bytes, text.size());
    EXPECT_EQ(drop->source.sha256, sha256Hex(text));
    EXPECT_EQ(std::filesystem::last_write_time(path), before);  // the input is never written
    std::filesystem::remove(path);
}

TEST(IngestDrop, Sha256MatchesThePublishedTestVectors) {
    // FIPS 180-2, appendix B.1 and B.2 (the "abc" and the 448-bit message examples).
    EXPECT_EQ(sha256Hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    EXPECT_EQ(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
              "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    EXPECT_EQ(sha256Hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

}  // namespace
}  // namespace siftwave::ingest
