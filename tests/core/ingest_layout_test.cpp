// Long or dates-down, from the content and not from the row order (role_detection.h).
#include "siftwave/ingest/ingest.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <tuple>
#include <vector>

namespace siftwave::ingest {
namespace {

// More weeks per region than the reader samples records (400), so that a file sorted by region
// shows one region only in its sample.
constexpr int kWeeks = 450;

struct LongRow {
    std::string week;
    std::string region;
    int cases = 0;
};

int casesOf(int week, int region) {
    return (week * 7 + region * 13) % 23;  // counts with zeros, never constant for long
}

/// Three regions x kWeeks weeks, sorted by region then week.
std::vector<LongRow> weeklyRowsByRegion(const std::vector<std::string>& codes) {
    std::vector<LongRow> rows;
    const Date first = *Date::fromIso("2001-01-01");
    for (std::size_t r = 0; r < codes.size(); ++r) {
        for (int w = 0; w < kWeeks; ++w)
            rows.push_back({(first + 7 * w).iso(), codes[r], casesOf(w, static_cast<int>(r))});
    }
    return rows;
}

std::vector<LongRow> sortedByDate(std::vector<LongRow> rows) {
    std::stable_sort(rows.begin(), rows.end(),
                     [](const LongRow& a, const LongRow& b) { return a.week < b.week; });
    return rows;
}

std::string longCsv(const std::string& header, const std::vector<LongRow>& rows,
                    char delimiter = ',') {
    std::string text = header + "\n";
    for (const LongRow& row : rows) {
        text += row.week + delimiter + row.region + delimiter + std::to_string(row.cases) + "\n";
    }
    return text;
}

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

/// Every row of `rows` is in `drop` as a reported count, under `measure`.
void expectEveryRowRead(const Drop& drop, const std::vector<LongRow>& rows,
                        const std::string& measure) {
    ASSERT_EQ(drop.rows, rows.size());
    for (const LongRow& row : rows) {
        const Cell& c = cellOf(drop, measure, row.region, row.week);
        ASSERT_EQ(c.state, CellState::Reported) << row.region << " " << row.week;
        ASSERT_EQ(c.value, row.cases) << row.region << " " << row.week;
    }
}

const std::vector<std::string> kFourDigitCodes = {"8336", "8337", "8315"};

TEST(IngestLayout, ALongWeeklyFileSortedByRegionWithFourDigitCodesIsReadAsLong) {
    const std::vector<LongRow> rows = weeklyRowsByRegion(kFourDigitCodes);
    const Drop drop = readOk(longCsv("week_start,region,cases", rows));
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.source.columns.date, "week_start");
    EXPECT_EQ(drop.source.columns.region, "region");
    EXPECT_EQ(drop.source.columns.values, (std::vector<std::string>{"cases"}));
    EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
    EXPECT_EQ(drop.measures, (std::vector<std::string>{"cases"}));
    expectEveryRowRead(drop, rows, "cases");
}

TEST(IngestLayout, ALongWeeklyFileSortedByRegionWithLeadingZeroCodesIsReadAsLong) {
    const std::vector<std::string> codes = {"08336", "08337", "08315"};
    const std::vector<LongRow> rows = weeklyRowsByRegion(codes);
    const Drop drop = readOk(longCsv("week_start,region,cases", rows));
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.regionCodes, codes);  // verbatim, leading zeros kept
    expectEveryRowRead(drop, rows, "cases");
}

TEST(IngestLayout, TheSameFileSortedByDateIsReadTheSameWay) {
    const std::vector<LongRow> rows = sortedByDate(weeklyRowsByRegion(kFourDigitCodes));
    const Drop drop = readOk(longCsv("week_start,region,cases", rows));
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.source.columns.region, "region");
    EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
    expectEveryRowRead(drop, rows, "cases");
}

TEST(IngestLayout, ARegionSortedFileIsReadAsLongFromItsContentWhenTheHeaderHasNoKnownWords) {
    const std::vector<LongRow> rows = weeklyRowsByRegion(kFourDigitCodes);
    const Drop drop = readOk(longCsv("t,loc,y", rows));
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.source.columns.date, "t");
    EXPECT_EQ(drop.source.columns.region, "loc");
    EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
    expectEveryRowRead(drop, rows, "y");
}

TEST(IngestLayout, ARegionSortedFileWithoutAHeaderIsReadAsLong) {
    const std::vector<LongRow> rows = weeklyRowsByRegion(kFourDigitCodes);
    std::string text = longCsv("", rows);
    text.erase(0, 1);  // the empty header line
    const Drop drop = readOk(text);
    EXPECT_FALSE(drop.source.dialect.header);
    EXPECT_EQ(drop.source.layout, Layout::Long);
    EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
    expectEveryRowRead(drop, rows, "column 3");
}

TEST(IngestLayout, HeadersInFrenchGermanSpanishPortugueseAndItalianAreReadAsLong) {
    const std::vector<LongRow> rows = weeklyRowsByRegion(kFourDigitCodes);
    // header, region column, value column, delimiter
    const std::vector<std::tuple<std::string, std::string, std::string, char>> headers = {
        {"semaine;département;cas", "département", "cas", ';'},
        {"date,Région,Décès", "Région", "Décès", ','},
        {"Meldewoche;Landkreis;Fälle", "Landkreis", "Fälle", ';'},
        {"Datum,IdLandkreis,AnzahlFall", "IdLandkreis", "AnzahlFall", ','},
        {"fecha,provincia,casos", "provincia", "casos", ','},
        {"semana;concelho;óbitos", "concelho", "óbitos", ';'},
        {"data,comune,casi", "comune", "casi", ','},
    };
    for (const auto& [header, region, value, delimiter] : headers) {
        SCOPED_TRACE(header);
        for (const std::vector<LongRow>& order : {rows, sortedByDate(rows)}) {
            const Drop drop = readOk(longCsv(header, order, delimiter));
            EXPECT_EQ(drop.source.layout, Layout::Long);
            EXPECT_EQ(drop.source.columns.region, region);
            EXPECT_EQ(drop.source.columns.values, (std::vector<std::string>{value}));
            EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
            expectEveryRowRead(drop, order, value);
        }
    }
}

TEST(IngestLayout, ADatesDownFileWithNumericRegionNamesStaysDatesDown) {
    std::string text = "date,8336,8337,8315\n";
    const Date first = *Date::fromIso("2026-01-01");
    for (int d = 0; d < 60; ++d) {
        text += (first + d).iso() + "," + std::to_string(casesOf(d, 0)) + "," +
                std::to_string(casesOf(d, 1)) + "," + std::to_string(casesOf(d, 2)) + "\n";
    }
    const Drop drop = readOk(text);
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.regionCodes, kFourDigitCodes);
    EXPECT_EQ(cellOf(drop, "cases", "8337", "2026-01-11").value, casesOf(10, 1));
}

TEST(IngestLayout, ADatesDownFileWithPositiveCountsAndAConstantTotalStaysDatesDown) {
    // Counts that never reach zero look like codes; a constant column after them is a total.
    std::string text = "date,Region Hannover,Landkreis Göttingen,Total\n";
    const Date first = *Date::fromIso("2026-01-01");
    for (int d = 0; d < 30; ++d) {
        text += (first + d).iso() + "," + std::to_string(1 + casesOf(d, 0)) + "," +
                std::to_string(1 + casesOf(d, 1)) + ",5\n";
    }
    const Drop drop = readOk(text);
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.regionCodes,
              (std::vector<std::string>{"Region Hannover", "Landkreis Göttingen", "Total"}));
}

TEST(IngestLayout, RegionsNamedWithARegionWordAndANumberAreRegionsOfADatesDownFile) {
    const Drop drop = readOk(
        "date,Region 1,Region 2,District of Columbia\n"
        "2026-01-01,1,0,4\n"
        "2026-01-02,3,2,0\n");
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.regionCodes,
              (std::vector<std::string>{"Region 1", "Region 2", "District of Columbia"}));
}

TEST(IngestLayout, AColumnNameOfTheTradeNeverBecomesARegionCode) {
    // Read as dates-down, 'cases' would be a region; there is no region column for a long
    // reading either: refused, and --layout dates-down reads it as one series on demand.
    const std::string series = "date,cases\n2026-01-01,3\n2026-01-02,0\n2026-01-03,7\n";
    Result<Drop> refused = parseDrop(series, "series.csv");
    ASSERT_FALSE(refused.ok());
    EXPECT_EQ(refused.error().code, ErrorCode::Layout);
    EXPECT_NE(refused.error().message.find("'cases' is a column name, not a region code"),
              std::string::npos)
        << refused.error().message;
    EXPECT_NE(refused.error().message.find("--layout dates-down"), std::string::npos);
    IngestOptions forced;
    forced.layout = Layout::DatesDown;
    EXPECT_EQ(readOk(series, forced).regionCodes, (std::vector<std::string>{"cases"}));

    // A two-row long file with numeric codes: 'region' and 'cases' are not regions, so long.
    const Drop small = readOk("date,region,cases\n2026-01-01,8336,4\n2026-01-02,8336,5\n");
    EXPECT_EQ(small.source.layout, Layout::Long);
    EXPECT_EQ(small.regionCodes, (std::vector<std::string>{"8336"}));

    // A header line repeated in the data would make 'region' a region code of a long file.
    Result<Drop> repeated = parseDrop(
        "date,region,cases\n2026-01-01,NA,4\ndate,region,cases\n2026-01-02,NA,5\n", "rep.csv");
    ASSERT_FALSE(repeated.ok());
    EXPECT_EQ(repeated.error().code, ErrorCode::Layout);
    EXPECT_EQ(repeated.error().line, 3u);
    EXPECT_NE(repeated.error().message.find("holds 'region', a column name"), std::string::npos)
        << repeated.error().message;
}

TEST(IngestLayout, NamingTheRegionColumnsOfADatesDownFileSkipsATradeNameColumn) {
    const std::string text =
        "date,NA,ZA,new_cases\n2026-01-01,1,2,3\n2026-01-02,4,5,9\n2026-01-03,0,1,1\n";
    Result<Drop> refused = parseDrop(text, "wide.csv");
    ASSERT_FALSE(refused.ok());
    EXPECT_NE(refused.error().message.find("'new_cases' would be a region"), std::string::npos)
        << refused.error().message;
    IngestOptions named;
    named.valueColumns = {"NA", "ZA"};
    const Drop drop = readOk(text, named);
    EXPECT_EQ(drop.source.layout, Layout::DatesDown);
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"NA", "ZA"}));
}

TEST(IngestLayout, TwoCloseReadingsAreRefusedWithBothReadingsAndTheFlagInTheMessage) {
    // Numbers in the header (dates-down) and a column holding one number in a run (long).
    std::string text = "date,8336,8337\n";
    const Date first = *Date::fromIso("2026-01-01");
    for (int d = 0; d < 40; ++d)
        text += (first + d).iso() + ",7," + std::to_string(casesOf(d, 1)) + "\n";
    Result<Drop> refused = parseDrop(text, "ambiguous.csv");
    ASSERT_FALSE(refused.ok());
    EXPECT_EQ(refused.error().code, ErrorCode::Ambiguous);
    const std::string& message = refused.error().message;
    EXPECT_NE(message.find("as long, column '8336' holds the region codes"), std::string::npos)
        << message;
    EXPECT_NE(message.find("as dates-down, '8336' and '8337' are regions"), std::string::npos)
        << message;
    EXPECT_NE(message.find("--layout long"), std::string::npos) << message;
    EXPECT_NE(message.find("--layout dates-down"), std::string::npos) << message;

    IngestOptions asLong;
    asLong.layout = Layout::Long;
    const Drop longDrop = readOk(text, asLong);
    EXPECT_EQ(longDrop.regionCodes, (std::vector<std::string>{"7"}));
    IngestOptions asDatesDown;
    asDatesDown.layout = Layout::DatesDown;
    EXPECT_EQ(readOk(text, asDatesDown).regionCodes, (std::vector<std::string>{"8336", "8337"}));
}

// Real data: fluBYBW (weekly influenza counts by district in Bavaria and Baden-Wuerttemberg,
// 2001-2008) from the R package surveillance 1.20.3, Debian package r-cran-surveillance
// 1.20.3-1; the first 16 districts x 156 weeks, written by tools/fixtures/make_real_fixtures.R
// (tests/data/real/SOURCES.md). The reader has no weekly cadence yet: the weeks are read as days
// with gaps between them, so the checks are the layout, the codes, the rows and the cells.
TEST(IngestLayout, TheFluBybwFileSortedByRegionIsReadAsLongWithSixteenDistricts) {
    Result<Drop> drop =
        readDrop(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/fluBYBW_weekly_long_by_region.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.layout, Layout::Long);
    EXPECT_EQ(drop->source.columns.region, "region");
    EXPECT_EQ(drop->regionCodes.size(), 16u);
    EXPECT_EQ(drop->regionCodes.front(), "8311");  // the file is sorted by region code
    EXPECT_EQ(drop->rows, 2496u);
    EXPECT_EQ(cellOf(*drop, "cases", "8311", "2001-02-05").value, 6);
    EXPECT_EQ(cellOf(*drop, "cases", "8315", "2003-02-24").value, 11);
    EXPECT_EQ(cellOf(*drop, "cases", "9776", "2003-12-22").value, 0);
}

// The same districts and weeks as above, one column per district (same source).
TEST(IngestLayout, TheFluBybwFileWithOneColumnPerDistrictIsReadAsDatesDown) {
    Result<Drop> drop =
        readDrop(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/fluBYBW_weekly_wide.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.layout, Layout::DatesDown);
    EXPECT_EQ(drop->regionCodes.size(), 16u);
    EXPECT_EQ(drop->regionCodes.front(), "8336");  // the dataset's column order
    EXPECT_EQ(drop->rows, 156u);
    EXPECT_EQ(cellOf(*drop, "cases", "8311", "2001-02-05").value, 6);
    EXPECT_EQ(cellOf(*drop, "cases", "8315", "2003-02-24").value, 11);
}

}  // namespace
}  // namespace siftwave::ingest
