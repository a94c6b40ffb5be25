// The reader's calendar: daily or weekly, detected from the dates (every date 7 days apart on
// one weekday) or from ISO week labels, with the week convention taken from the dates' weekday
// and the options' overrides. Dates that fit neither grid are an error that names their lines.
#include "siftwave/ingest/ingest.h"

#include <gtest/gtest.h>

#include <map>
#include <string>
#include <tuple>

namespace siftwave::ingest {
namespace {

const std::string kReal = std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/";

Date ymd(int y, int m, int d) {
    return Date::fromYmd(y, m, d).value();
}

// (region, week start, count) of every reported cell.
std::map<std::tuple<std::string, std::string>, std::int32_t> cellsOf(const Drop& drop) {
    std::map<std::tuple<std::string, std::string>, std::int32_t> out;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r)
        for (std::int32_t p = 0; p < drop.periods(); ++p)
            if (drop.cell(0, r, p).reported())
                out[{drop.regionCodes[r], drop.periodStart(p).iso()}] = drop.cell(0, r, p).value;
    return out;
}

// Real data: r-cran-surveillance, dataset fluBYBW (weekly influenza notifications by district,
// Baden-Wuerttemberg and Bavaria; 16 districts x 156 weeks from 2001-W01, exported by
// tools/fixtures/make_real_fixtures.R, see tests/data/real/SOURCES.md).
TEST(IngestCadence, RealWeeklyNotificationsReadAsIsoWeeksInEveryLayout) {
    std::map<std::tuple<std::string, std::string>, std::int32_t> reference;
    for (const char* file : {"fluBYBW_weekly_long_by_date.csv", "fluBYBW_weekly_long_by_region.csv",
                             "fluBYBW_weekly_isoweek.csv", "fluBYBW_weekly_wide.csv"}) {
        Result<Drop> drop = readDrop(kReal + file);
        ASSERT_TRUE(drop.ok()) << file << ": " << drop.error().describe();
        EXPECT_EQ(drop->axis.cadence(), Cadence::Weekly) << file;
        EXPECT_EQ(drop->axis.weekStart(), WeekStart::Monday) << file;
        EXPECT_EQ(drop->axis.weekDate(), WeekDate::Start) << file;
        EXPECT_EQ(drop->periods(), 156) << file;
        EXPECT_EQ(drop->axis.first(), ymd(2001, 1, 1)) << file;  // 2001-W01 starts on 1 January
        EXPECT_EQ(drop->axis.periodName(155), "2003-W52") << file;
        EXPECT_EQ(drop->regionCodes.size(), 16u) << file;
        const CellCounts counts = drop->countCells();
        EXPECT_EQ(counts.reported, 16u * 156u) << file;
        EXPECT_EQ(counts.absent, 0u) << file;
        if (reference.empty())
            reference = cellsOf(*drop);
        else
            EXPECT_EQ(cellsOf(*drop), reference) << file;
    }
    std::int64_t total = 0;
    for (const auto& [key, value] : reference)
        total += value;
    EXPECT_EQ(total, 260);  // SOURCES.md: 260 cases in the subset
}

TEST(IngestCadence, DailyDataStaysDaily) {
    Result<Drop> d =
        parseDrop("date,region,cases\n2026-03-01,A,1\n2026-03-02,A,2\n2026-03-04,A,3\n", "d.csv");
    ASSERT_TRUE(d.ok()) << d.error().describe();
    EXPECT_EQ(d->axis.cadence(), Cadence::Daily);
    EXPECT_EQ(d->periods(), 4);
}

std::string weekly(const std::string& header, Date first, int weeks) {
    std::string text = header + ",region,cases\n";
    for (int w = 0; w < weeks; ++w)
        text += (first + 7 * w).iso() + ",A," + std::to_string(10 + w) + "\n";
    return text;
}

// The weekday of the dates picks the convention (common practice, no source: Monday dates
// start ISO weeks; Sunday dates start epidemiological weeks unless the column says they end
// a week; Saturday dates end epidemiological weeks).
TEST(IngestCadence, TheDatesWeekdayPicksTheWeekConvention) {
    struct Case {
        std::string header;
        Date first;
        WeekStart start;
        WeekDate named;
    } cases[] = {
        {"week_start", ymd(2026, 1, 5), WeekStart::Monday, WeekDate::Start},  // Mondays
        {"week_start", ymd(2026, 1, 4), WeekStart::Sunday, WeekDate::Start},  // Sundays
        {"week_ending", ymd(2026, 1, 11), WeekStart::Monday, WeekDate::End},  // Sundays, "end"
        {"week_ending", ymd(2026, 1, 10), WeekStart::Sunday, WeekDate::End},  // Saturdays
    };
    for (const Case& c : cases) {
        Result<Drop> d = parseDrop(weekly(c.header, c.first, 6), "w.csv");
        ASSERT_TRUE(d.ok()) << d.error().describe();
        EXPECT_EQ(d->axis.cadence(), Cadence::Weekly);
        EXPECT_EQ(d->axis.weekStart(), c.start) << c.first.iso();
        EXPECT_EQ(d->axis.weekDate(), c.named) << c.first.iso();
        EXPECT_EQ(d->periods(), 6);
        EXPECT_EQ(d->axis.namedDate(0), c.first);
        EXPECT_EQ(d->cell(0, 0, 5).value, 15);
        EXPECT_TRUE(d->warnings.empty());
    }
}

TEST(IngestCadence, OverridesSetTheConventionAndOtherWeekdaysAreCountedInTheirWeek) {
    IngestOptions o;
    o.weekStart = WeekStart::Monday;
    o.weekDate = WeekDate::End;
    Result<Drop> d = parseDrop(weekly("week", ymd(2026, 1, 11), 3), "w.csv", o);
    ASSERT_TRUE(d.ok()) << d.error().describe();
    EXPECT_EQ(d->axis.weekStart(), WeekStart::Monday);
    EXPECT_EQ(d->axis.first(), ymd(2026, 1, 5));
    // Wednesdays: weekly, each in the ISO week that holds it, and said so.
    Result<Drop> wed = parseDrop(weekly("week", ymd(2026, 1, 7), 3), "w.csv");
    ASSERT_TRUE(wed.ok()) << wed.error().describe();
    EXPECT_EQ(wed->axis.cadence(), Cadence::Weekly);
    EXPECT_EQ(wed->axis.first(), ymd(2026, 1, 5));
    ASSERT_EQ(wed->warnings.size(), 1u);
    EXPECT_NE(wed->warnings[0].message.find("Wednesdays"), std::string::npos);
    // --cadence daily reads weekly dates as days with the days between them absent.
    IngestOptions daily;
    daily.cadence = Cadence::Daily;
    Result<Drop> asDays = parseDrop(weekly("week", ymd(2026, 1, 5), 3), "w.csv", daily);
    ASSERT_TRUE(asDays.ok());
    EXPECT_EQ(asDays->axis.cadence(), Cadence::Daily);
    EXPECT_EQ(asDays->periods(), 15);
}

// ISO 8601-1:2019, 5.2.3.3: a week written as YYYY-Www (extended) or YYYYWww (basic).
TEST(IngestCadence, IsoWeekLabelsAreWeeksFromMonday) {
    Result<Drop> d =
        parseDrop("week,region,cases\n2026W52,A,1\n2026W53,A,2\n2027W01,A,3\n", "w.csv");
    ASSERT_TRUE(d.ok()) << d.error().describe();
    EXPECT_EQ(d->axis.cadence(), Cadence::Weekly);
    EXPECT_EQ(d->axis.first(), ymd(2026, 12, 21));  // 2026 has 53 ISO weeks
    EXPECT_EQ(d->periods(), 3);
    EXPECT_EQ(d->source.dateFormat, "YYYY-Www");
    Result<Drop> bad = parseDrop("week,region,cases\n2025-W52,A,1\n2025-W53,A,2\n", "w.csv");
    ASSERT_FALSE(bad.ok());  // 2025 has 52 ISO weeks
    EXPECT_EQ(bad.error().line, 3u);
    EXPECT_NE(bad.error().message.find("2025 has 52 ISO weeks"), std::string::npos)
        << bad.error().message;
    IngestOptions daily;
    daily.cadence = Cadence::Daily;
    Result<Drop> refused = parseDrop("week,region,cases\n2026-W01,A,1\n", "w.csv", daily);
    ASSERT_FALSE(refused.ok());
    EXPECT_EQ(refused.error().code, ErrorCode::Usage);
}

TEST(IngestCadence, DatesOffTheWeeklyGridAreNamedWithTheirLines) {
    std::string text = weekly("week_start", ymd(2026, 1, 5), 12);
    // Line 8 (the 7th week) moved to the Tuesday.
    const std::string monday = (ymd(2026, 1, 5) + 42).iso();
    text.replace(text.find(monday), 10, (ymd(2026, 1, 5) + 43).iso());
    Result<Drop> d = parseDrop(text, "w.csv");
    ASSERT_FALSE(d.ok());
    EXPECT_EQ(d.error().code, ErrorCode::InvalidValue);
    EXPECT_EQ(d.error().line, 8u);
    EXPECT_NE(d.error().message.find("line 8 (2026-02-17, a Tuesday)"), std::string::npos)
        << d.error().message;
    EXPECT_NE(d.error().message.find("--cadence daily"), std::string::npos);
    // Forced weekly with two dates in one week: refused, both named.
    IngestOptions o;
    o.cadence = Cadence::Weekly;
    Result<Drop> two = parseDrop("date,region,cases\n2026-01-05,A,1\n2026-01-06,A,2\n", "w.csv", o);
    ASSERT_FALSE(two.ok());
    EXPECT_NE(two.error().message.find("two dates fall in one week (2026-W02"), std::string::npos)
        << two.error().message;
}

TEST(IngestCadence, WeeklyDuplicatesAndDatesAcrossUseWeeks) {
    Result<Drop> d = parseDrop(
        "week_start,region,cases\n2026-01-05,A,1\n2026-01-12,A,2\n2026-01-12,A,9\n2026-01-19,A,3\n",
        "w.csv");
    ASSERT_TRUE(d.ok()) << d.error().describe();
    ASSERT_EQ(d->duplicates.size(), 1u);
    EXPECT_EQ(d->duplicates[0].day, 1);  // the period, not the day
    EXPECT_EQ(d->cell(0, 0, 1).value, 2);
    Result<Drop> across =
        parseDrop("region,2026-01-04,2026-01-11,2026-01-18\nA,1,2,3\nB,4,5,6\n", "w.csv");
    ASSERT_TRUE(across.ok()) << across.error().describe();
    EXPECT_EQ(across->axis.weekStart(), WeekStart::Sunday);
    EXPECT_EQ(across->periods(), 3);
    EXPECT_EQ(across->cell(0, 1, 2).value, 6);
}

}  // namespace
}  // namespace siftwave::ingest
