// A date written as a year column and a week-number column: week W of year Y is the week's
// first day, under ISO 8601 weeks by default or Sunday-start epidemiological weeks with
// --week-start sunday (or MMWR in a column's name). Such a file is weekly by definition; the
// two columns are neither regions nor counts; a wrong cell is an error naming its line and
// column. Read alike in one pass and in two, in any row order.
#include "siftwave/ingest/ingest.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

namespace siftwave::ingest {
namespace {

const std::string kData = std::string(SIFTWAVE_TEST_DATA_DIR);

Date ymd(int y, int m, int d) {
    return Date::fromYmd(y, m, d).value();
}

bool mentions(const Error& e, const std::string& words) {
    return e.message.find(words) != std::string::npos;
}

std::string slurp(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

std::vector<std::string> linesOf(const std::string& text) {
    std::vector<std::string> out;
    std::istringstream in(text);
    std::string line;
    while (std::getline(in, line))
        out.push_back(line);
    return out;
}

std::vector<std::string> fieldsOf(const std::string& line) {
    std::vector<std::string> out;
    std::stringstream ss(line);
    std::string part;
    while (std::getline(ss, part, ','))
        out.push_back(part);
    return out;
}

// (region, week start, count) of every reported cell of the first measure.
std::map<std::tuple<std::string, std::string>, std::int32_t> cellsOf(const Drop& drop) {
    std::map<std::tuple<std::string, std::string>, std::int32_t> out;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r)
        for (std::int32_t p = 0; p < drop.periods(); ++p)
            if (drop.cell(0, r, p).reported())
                out[{drop.regionCodes[r], drop.periodStart(p).iso()}] = drop.cell(0, r, p).value;
    return out;
}

Drop readOk(const std::string& text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "yw.csv", options);
    EXPECT_TRUE(drop.ok()) << drop.error().describe();
    return drop.ok() ? std::move(*drop) : Drop{};
}

Error errorOf(const std::string& text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "yw.csv", options);
    EXPECT_FALSE(drop.ok());
    if (drop.ok())
        return Error{};
    return drop.error();
}

// Real data: r-cran-surveillance 1.20.3, dataset fluBYBW (weekly influenza notifications by
// district, Baden-Wuerttemberg and Bavaria), 16 districts x 156 weeks from 2001-W01, written
// once with ISO year and ISO week columns and once with the weeks' Mondays by
// tools/fixtures/make_real_fixtures.R (tests/data/real/SOURCES.md).
TEST(IngestYearWeek, TheRealYearAndWeekFileReadsAsTheSameIsoWeeksAsItsDatedTwin) {
    Result<Drop> yw = readDrop(kData + "/real/fluBYBW_weekly_year_week.csv");
    ASSERT_TRUE(yw.ok()) << yw.error().describe();
    Result<Drop> dated = readDrop(kData + "/real/fluBYBW_weekly_long_by_date.csv");
    ASSERT_TRUE(dated.ok()) << dated.error().describe();
    EXPECT_EQ(yw->axis.cadence(), Cadence::Weekly);
    EXPECT_EQ(yw->axis.weekStart(), WeekStart::Monday);
    EXPECT_EQ(yw->axis.weekDate(), WeekDate::Start);
    EXPECT_EQ(yw->periods(), 156);
    EXPECT_EQ(yw->axis.first(), ymd(2001, 1, 1));  // 2001-W01 starts on 1 January
    EXPECT_EQ(yw->axis.periodName(155), "2003-W52");
    EXPECT_EQ(yw->regionCodes.size(), 16u);
    EXPECT_EQ(yw->countCells().reported, 16u * 156u);
    EXPECT_EQ(yw->axis, dated->axis);
    EXPECT_EQ(cellsOf(*yw), cellsOf(*dated));
    EXPECT_EQ(yw->source.layout, Layout::Long);
    EXPECT_EQ(yw->source.columns.year, "year");
    EXPECT_EQ(yw->source.columns.week, "week");
    EXPECT_EQ(yw->source.columns.date, "year+week");
    EXPECT_EQ(yw->source.columns.region, "region");
    EXPECT_EQ(yw->source.columns.values, (std::vector<std::string>{"cases"}));
    EXPECT_EQ(yw->source.dateFormat, "year+ISO week");
    EXPECT_TRUE(yw->warnings.empty()) << yw->warnings.front().message;
}

TEST(IngestYearWeek, AnyRowOrderAndEitherReadingPathGiveTheSameDrop) {
    const std::string text = slurp(kData + "/real/fluBYBW_weekly_year_week.csv");
    const Drop sorted = readOk(text);
    std::vector<std::string> lines = linesOf(text);
    const std::string header = lines.front();
    lines.erase(lines.begin());

    // Shuffled by a fixed stride (7 is prime to 2496 rows): every row once, weeks in no order.
    std::string shuffled = header + "\n";
    for (std::size_t i = 0, k = 0; i < lines.size(); ++i, k = (k + 7) % lines.size())
        shuffled += lines[k] + "\n";
    const Drop fromShuffled = readOk(shuffled);
    EXPECT_EQ(fromShuffled.axis, sorted.axis);
    EXPECT_EQ(cellsOf(fromShuffled), cellsOf(sorted));

    // The one pass predicts the calendar from the first rows and the last 64 KiB; a file
    // larger than that with earlier weeks in its middle abandons it and is read in two
    // passes (drop_reader.h). Padding regions in weeks 2002-W10 to W20, the real rows, and
    // more padding.
    std::string twoPass = header + "\n";
    for (int r = 0; r < 600; ++r)
        for (int w = 10; w <= 20; ++w)
            twoPass += "2002," + std::to_string(w) + ",P" + std::to_string(r) + ",1\n";
    for (const std::string& line : lines)
        twoPass += line + "\n";
    for (int r = 600; r < 1200; ++r)
        for (int w = 10; w <= 20; ++w)
            twoPass += "2002," + std::to_string(w) + ",P" + std::to_string(r) + ",1\n";
    ASSERT_GT(twoPass.size(), std::size_t{3} * 65536);
    const Drop fromTwoPasses = readOk(twoPass);
    EXPECT_EQ(fromTwoPasses.axis, sorted.axis);
    std::map<std::tuple<std::string, std::string>, std::int32_t> real = cellsOf(fromTwoPasses);
    std::erase_if(real, [](const auto& kv) { return std::get<0>(kv.first).starts_with("P"); });
    EXPECT_EQ(real, cellsOf(sorted));
    EXPECT_EQ(fromTwoPasses.regionCodes.size(), 16u + 1200u);
}

// Reference: tests/data/reference/calendar_weeks/iso_weeks.csv and epi_weeks_sunday.csv,
// computed from ISO 8601-1:2019 and the CDC's MMWR week definition and cross-checked two
// ways (tools/fixtures/make_week_tables.py; see that folder's README.md). Every (year, week)
// in a table is written as a row; its period must start on the table's Monday or Sunday.
void checkEveryWeekOfTheTable(const std::string& table, const IngestOptions& options,
                              WeekStart start) {
    std::vector<std::string> lines = linesOf(slurp(kData + "/reference/calendar_weeks/" + table));
    ASSERT_GT(lines.size(), 400u);
    const std::vector<std::string> header = fieldsOf(lines.front());
    const std::size_t startColumn = header.size() - 1;  // week_monday or week_sunday
    std::map<std::pair<std::string, std::string>, std::string> weeks;
    for (std::size_t i = 1; i < lines.size(); ++i) {
        const std::vector<std::string> f = fieldsOf(lines[i]);
        weeks[{f[1], f[2]}] = f[startColumn];
    }
    std::string text = "year,week,region,cases\n";
    std::vector<std::string> expected;
    for (const auto& [yearWeek, first] : weeks) {
        text +=
            yearWeek.first + "," + yearWeek.second + ",A," + std::to_string(expected.size()) + "\n";
        expected.push_back(first);
    }
    const Drop drop = readOk(text, options);
    EXPECT_EQ(drop.axis.weekStart(), start) << table;
    std::size_t checked = 0;
    for (std::int32_t p = 0; p < drop.periods(); ++p) {
        const Cell& cell = drop.cell(0, 0, p);
        if (!cell.reported())
            continue;
        EXPECT_EQ(drop.periodStart(p).iso(), expected.at(static_cast<std::size_t>(cell.value)))
            << table << " row " << cell.line;
        ++checked;
    }
    EXPECT_EQ(checked, expected.size()) << table;
}

TEST(IngestYearWeek, EveryWeekOfTheReferenceTablesStartsOnItsDay) {
    checkEveryWeekOfTheTable("iso_weeks.csv", {}, WeekStart::Monday);
    IngestOptions sunday;
    sunday.weekStart = WeekStart::Sunday;
    checkEveryWeekOfTheTable("epi_weeks_sunday.csv", sunday, WeekStart::Sunday);
}

// Worked dates (tests/data/reference/calendar_weeks/epi_weeks_sunday.csv and
// epi_weeks_per_year.csv, MMWR week definition): epi week 1 of 2026 starts on Sunday
// 2026-01-04; epi 2025 has 53 weeks, its week 53 starting on 2025-12-28.
TEST(IngestYearWeek, SundayStartWeeksAreReadWithWeekStartSunday) {
    const std::string text =
        "year,week,region,cases\n2025,52,A,1\n2025,53,A,2\n2026,1,A,3\n2026,2,A,4\n";
    IngestOptions sunday;
    sunday.weekStart = WeekStart::Sunday;
    const Drop drop = readOk(text, sunday);
    EXPECT_EQ(drop.axis.cadence(), Cadence::Weekly);
    EXPECT_EQ(drop.axis.weekStart(), WeekStart::Sunday);
    EXPECT_EQ(drop.periods(), 4);
    EXPECT_EQ(drop.axis.first(), ymd(2025, 12, 21));
    EXPECT_EQ(drop.periodStart(1), ymd(2025, 12, 28));
    EXPECT_EQ(drop.periodStart(2), ymd(2026, 1, 4));
    EXPECT_EQ(drop.cell(0, 0, 2).value, 3);
    EXPECT_EQ(drop.axis.periodName(2), "2026 epi week 1");
    EXPECT_EQ(drop.source.dateFormat, "year+epi week");
    EXPECT_TRUE(drop.warnings.empty());

    // The same file read as ISO weeks stops at 2025 week 53 and says what to pass.
    const Error iso = errorOf(text);
    EXPECT_EQ(iso.line, 3u);
    EXPECT_EQ(iso.column, 2u);
    EXPECT_TRUE(mentions(iso, "2025 has 52 ISO 8601 weeks")) << iso.message;
    EXPECT_TRUE(mentions(iso, "--week-start sunday")) << iso.message;
}

// The CDC's MMWR weeks start on Sunday by definition; "epi" alone does not say which day
// (Sunday in the Americas, Monday in Europe): ISO weeks and a warning that names the flag.
TEST(IngestYearWeek, MmwrInANameMeansSundayAndEpiAloneIsReadAsIsoWithAWarning) {
    const Drop mmwr = readOk("MMWRyear,MMWRweek,region,cases\n2026,1,A,1\n2026,2,A,2\n");
    EXPECT_EQ(mmwr.axis.weekStart(), WeekStart::Sunday);
    EXPECT_EQ(mmwr.axis.first(), ymd(2026, 1, 4));

    const Drop epi = readOk("year,epiweek,region,cases\n2026,1,A,1\n2026,2,A,2\n");
    EXPECT_EQ(epi.axis.weekStart(), WeekStart::Monday);
    EXPECT_EQ(epi.axis.first(), ymd(2025, 12, 29));  // 2026-W01 (iso_weeks.csv)
    ASSERT_EQ(epi.warnings.size(), 1u);
    EXPECT_NE(epi.warnings[0].message.find("--week-start sunday"), std::string::npos);
    EXPECT_EQ(epi.warnings[0].column, 2u);

    IngestOptions monday;
    monday.weekStart = WeekStart::Monday;
    const Drop confirmed = readOk("year,epiweek,region,cases\n2026,1,A,1\n2026,2,A,2\n", monday);
    EXPECT_TRUE(confirmed.warnings.empty());
}

TEST(IngestYearWeek, WrongCellsAreErrorsWithTheirLineAndColumn) {
    const std::string header = "region,year,week,cases\n";
    const std::string good = "A,2026,1,5\nA,2026,2,6\nA,2026,3,7\n";
    struct Case {
        std::string row;
        std::uint64_t column;
        std::string says;
    } cases[] = {
        {"A,2026,0,1", 3, "week 0 in the week column 'week' does not exist"},
        {"A,2026,54,1", 3, "week 54 in the week column 'week' does not exist"},
        // iso_weeks_per_year.csv: 2025 has 52 ISO weeks.
        {"A,2025,53,1", 3, "2025 has 52 ISO 8601 weeks"},
        {"A,2026,5a,1", 3, "'5a' in the week column 'week' is not a week number"},
        {"A,2026,5.0,1", 3, "'5.0' in the week column 'week' is not a week number"},
        {"A,20x6,5,1", 2, "'20x6' in the year column 'year' is not a year"},
        {"A,26,5,1", 2, "'26' in the year column 'year' is not a year"},
        {"A,2026,,1", 3, "the cell in the week column 'week' is empty"},
        {"A,,5,1", 2, "the cell in the year column 'year' is empty"},
    };
    for (const Case& c : cases) {
        // Line 3, inside the sample; and line 5 after the good rows.
        for (const std::string& text :
             {header + "A,2026,4,1\n" + c.row + "\n" + good, header + good + c.row + "\n"}) {
            const Error e = errorOf(text);
            const std::uint64_t line = text.starts_with(header + "A,2026,4") ? 3u : 5u;
            EXPECT_EQ(e.code, ErrorCode::InvalidValue) << c.row;
            EXPECT_EQ(e.file, "yw.csv");
            EXPECT_EQ(e.line, line) << c.row;
            EXPECT_EQ(e.column, c.column) << c.row;
            EXPECT_TRUE(mentions(e, c.says)) << c.row << ": " << e.message;
        }
    }
}

TEST(IngestYearWeek, TheYearAndWeekColumnsAreNeverRegionsOrCounts) {
    // Long with two measures: the counts are cases and deaths, not year or week.
    const Drop twoMeasures =
        readOk("year,week,region,cases,deaths\n2026,1,A,5,0\n2026,1,B,3,1\n2026,2,A,7,2\n");
    EXPECT_EQ(twoMeasures.measures, (std::vector<std::string>{"cases", "deaths"}));
    EXPECT_EQ(twoMeasures.regionCodes, (std::vector<std::string>{"A", "B"}));

    // Dates-down: one column per region; year and week are not regions.
    const Drop down =
        readOk("Jahr,KW,8311,8315\n2026,1,5,0\n2026,2,3,1\n2026,3,7,2\n2026,4,1,1\n2026,5,0,0\n");
    EXPECT_EQ(down.source.layout, Layout::DatesDown);
    EXPECT_EQ(down.regionCodes, (std::vector<std::string>{"8311", "8315"}));
    EXPECT_EQ(down.source.columns.year, "Jahr");
    EXPECT_EQ(down.source.columns.week, "KW");
    EXPECT_EQ(down.periods(), 5);
    EXPECT_EQ(down.cell(0, 1, 2).value, 2);

    // Beside a column of dates, the date column wins and the year and week are unused.
    const Drop dated =
        readOk("week_start,year,week,region,cases\n2026-01-05,2026,2,A,5\n2026-01-12,2026,3,A,6\n");
    EXPECT_EQ(dated.source.columns.date, "week_start");
    EXPECT_TRUE(dated.source.columns.year.empty());
    EXPECT_EQ(dated.measures, (std::vector<std::string>{"cases"}));
    EXPECT_EQ(dated.warnings.size(), 2u);  // 'year' and 'week' are not used

    // Named as a value column: refused.
    IngestOptions asValue;
    asValue.valueColumns = {"week", "cases"};
    const Error e = errorOf("year,week,region,cases\n2026,1,A,5\n2026,2,A,6\n", asValue);
    EXPECT_EQ(e.code, ErrorCode::Usage);
    EXPECT_TRUE(mentions(e, "column 'week' is the year or the week of the date")) << e.message;
}

TEST(IngestYearWeek, TheColumnsCanBeNamedAndTheFlagsAreChecked) {
    // Names without a year or week word, and a file without a header.
    IngestOptions named;
    named.yearColumn = "J";
    named.weekColumn = "W";
    const Drop odd = readOk("J,W,region,cases\n2026,1,A,5\n2026,2,A,6\n", named);
    EXPECT_EQ(odd.axis.first(), ymd(2025, 12, 29));
    EXPECT_EQ(odd.source.columns.year, "J");
    IngestOptions headerless;
    headerless.header = false;
    headerless.yearColumn = "column 1";
    headerless.weekColumn = "column 2";
    const Drop plain = readOk("2026,1,A,5\n2026,2,A,6\n2026,3,A,7\n", headerless);
    EXPECT_EQ(plain.periods(), 3);
    EXPECT_EQ(plain.cell(0, 0, 2).value, 7);

    // One named: the other is detected, or the error says which flag is missing.
    IngestOptions yearOnly;
    yearOnly.yearColumn = "annee";
    const Drop fr = readOk("annee,semaine,region,cas\n2026,1,A,5\n2026,2,A,6\n", yearOnly);
    EXPECT_EQ(fr.source.columns.week, "semaine");
    const Error missing = errorOf("annee,n,region,cas\n2026,1,A,5\n2026,2,A,6\n", yearOnly);
    EXPECT_EQ(missing.code, ErrorCode::Usage);
    EXPECT_TRUE(mentions(missing, "name it with --week-col")) << missing.message;

    IngestOptions both;
    both.dateColumn = "date";
    both.yearColumn = "year";
    EXPECT_EQ(both.validate().error().code, ErrorCode::Usage);
    IngestOptions daily;
    daily.cadence = Cadence::Daily;
    const Error notDays = errorOf("year,week,region,cases\n2026,1,A,5\n2026,2,A,6\n", daily);
    EXPECT_EQ(notDays.code, ErrorCode::Usage);
    EXPECT_TRUE(mentions(notDays, "a year and a week number")) << notDays.message;

    // A week column without a year: the error says what was found.
    const Error noYear = errorOf("week,region,cases\n1,A,5\n2,A,6\n");
    EXPECT_EQ(noYear.code, ErrorCode::Layout);
    EXPECT_TRUE(
        mentions(noYear, "column 'week' holds week numbers, but no column holds their year"))
        << noYear.message;
}

TEST(IngestYearWeek, OneWeekWrittenTwoWaysIsOneWeek) {
    // "5" and "05" are the same week: one period, the second row a duplicate.
    const Drop drop = readOk("year,week,region,cases\n2026,5,A,1\n2026,05,A,2\n2026,6,A,3\n");
    EXPECT_EQ(drop.periods(), 2);
    EXPECT_EQ(drop.cell(0, 0, 0).value, 1);
    EXPECT_EQ(drop.duplicates.size(), 1u);
}

}  // namespace
}  // namespace siftwave::ingest
