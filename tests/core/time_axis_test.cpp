// The time axis: daily and weekly periods, ISO 8601 weeks and Sunday-start epidemiological
// weeks, checked against worked dates and against tables computed independently
// (tests/data/reference/calendar_weeks/, made by tools/fixtures/make_week_tables.py with
// Python's datetime.date.isocalendar / fromisocalendar; its README names the sources).
#include "siftwave/time_axis.h"

#include <gtest/gtest.h>

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace siftwave {
namespace {

Date ymd(int y, int m, int d) {
    return Date::fromYmd(y, m, d).value();
}

std::vector<std::vector<std::string>> readTable(const std::string& name) {
    std::ifstream in(std::string(SIFTWAVE_TEST_DATA_DIR) + "/reference/calendar_weeks/" + name);
    EXPECT_TRUE(in.good()) << name;
    std::vector<std::vector<std::string>> rows;
    std::string line;
    std::getline(in, line);  // header
    while (std::getline(in, line)) {
        if (!line.empty() && line.back() == '\r')
            line.pop_back();
        if (line.empty())
            continue;
        std::vector<std::string> fields;
        std::stringstream s(line);
        std::string f;
        while (std::getline(s, f, ','))
            fields.push_back(f);
        rows.push_back(fields);
    }
    return rows;
}

// ISO 8601-1:2019, 3.2.2 / 4.3.2.2: week 1 holds the year's first Thursday; weeks start on
// Monday. Worked dates (weekdays from the Gregorian calendar, checked in the reference table).
TEST(TimeAxis, IsoWeekOneHoldsTheFirstThursday) {
    // 2026-01-01 is a Thursday: it is in 2026-W01, which starts on Monday 2025-12-29.
    EXPECT_EQ(weekNumberOf(ymd(2026, 1, 1), WeekStart::Monday), (WeekNumber{2026, 1}));
    EXPECT_EQ(weekNumberOf(ymd(2025, 12, 29), WeekStart::Monday), (WeekNumber{2026, 1}));
    EXPECT_EQ(weekStartDate({2026, 1}, WeekStart::Monday), ymd(2025, 12, 29));
    // 2021-01-01 is a Friday: it belongs to 2020-W53.
    EXPECT_EQ(weekNumberOf(ymd(2021, 1, 3), WeekStart::Monday), (WeekNumber{2020, 53}));
    EXPECT_EQ(weekNumberOf(ymd(2021, 1, 4), WeekStart::Monday), (WeekNumber{2021, 1}));
    // 2008-12-29 (Monday) starts 2009-W01.
    EXPECT_EQ(weekNumberOf(ymd(2008, 12, 29), WeekStart::Monday), (WeekNumber{2009, 1}));
}

TEST(TimeAxis, SomeIsoYearsHave53Weeks) {
    // ISO 8601: a year has 53 weeks when it starts on a Thursday, or on a Wednesday in a
    // leap year. 2020 (Wednesday, leap) and 2026 (Thursday) do; 2021 and 2025 do not.
    EXPECT_EQ(weeksInYear(2020, WeekStart::Monday), 53);
    EXPECT_EQ(weeksInYear(2026, WeekStart::Monday), 53);
    EXPECT_EQ(weeksInYear(2021, WeekStart::Monday), 52);
    EXPECT_EQ(weeksInYear(2025, WeekStart::Monday), 52);
    EXPECT_EQ(weekNumberOf(ymd(2026, 12, 31), WeekStart::Monday), (WeekNumber{2026, 53}));
    EXPECT_FALSE(weekStartDate({2025, 53}, WeekStart::Monday).has_value());
    EXPECT_FALSE(weekStartDate({2025, 0}, WeekStart::Monday).has_value());
}

// Sunday-start epidemiological weeks (US CDC, MMWR week definition; quoted from memory in
// tests/data/reference/calendar_weeks/README.md): week 1 is the first Sunday-start week
// with at least four days in the new year.
TEST(TimeAxis, EpidemiologicalWeekOneHasFourDaysInTheYear) {
    // 2026-01-01 is a Thursday: the week Sun 2025-12-28 .. Sat 2026-01-03 has only three
    // days in 2026, so it is the last week of 2025 (53), and week 1 starts on 2026-01-04.
    EXPECT_EQ(weekNumberOf(ymd(2026, 1, 3), WeekStart::Sunday), (WeekNumber{2025, 53}));
    EXPECT_EQ(weekNumberOf(ymd(2026, 1, 4), WeekStart::Sunday), (WeekNumber{2026, 1}));
    EXPECT_EQ(weekStartDate({2026, 1}, WeekStart::Sunday), ymd(2026, 1, 4));
    // 2022-01-01 is a Saturday: one day in 2022, so it ends week 52 of 2021.
    EXPECT_EQ(weekNumberOf(ymd(2022, 1, 1), WeekStart::Sunday), (WeekNumber{2021, 52}));
    // 2019-12-29 (Sunday) starts a week with four days in 2020 (Jan 1-4): week 1 of 2020.
    EXPECT_EQ(weekNumberOf(ymd(2019, 12, 29), WeekStart::Sunday), (WeekNumber{2020, 1}));
}

TEST(TimeAxis, IsoWeeksMatchTheIndependentTable) {
    const auto rows = readTable("iso_weeks.csv");
    ASSERT_GT(rows.size(), 300u);
    for (const auto& r : rows) {
        ASSERT_GE(r.size(), 5u);
        const Date d = Date::fromIso(r[0]).value();
        const WeekNumber expected{std::stoi(r[1]), std::stoi(r[2])};
        EXPECT_EQ(weekNumberOf(d, WeekStart::Monday), expected) << r[0];
        EXPECT_EQ(d.isoWeekday(), std::stoi(r[3])) << r[0];
        EXPECT_EQ(weekStartOf(d, WeekStart::Monday), Date::fromIso(r[4]).value()) << r[0];
        EXPECT_EQ(weekStartDate(expected, WeekStart::Monday), Date::fromIso(r[4]).value()) << r[0];
    }
    const auto years = readTable("iso_weeks_per_year.csv");
    ASSERT_GT(years.size(), 40u);
    for (const auto& r : years)
        EXPECT_EQ(weeksInYear(std::stoi(r[0]), WeekStart::Monday), std::stoi(r[1])) << r[0];
}

TEST(TimeAxis, EpidemiologicalWeeksMatchTheIndependentTable) {
    const auto rows = readTable("epi_weeks_sunday.csv");
    ASSERT_GT(rows.size(), 300u);
    for (const auto& r : rows) {
        ASSERT_GE(r.size(), 4u);
        const Date d = Date::fromIso(r[0]).value();
        const WeekNumber expected{std::stoi(r[1]), std::stoi(r[2])};
        EXPECT_EQ(weekNumberOf(d, WeekStart::Sunday), expected) << r[0];
        EXPECT_EQ(weekStartOf(d, WeekStart::Sunday), Date::fromIso(r[3]).value()) << r[0];
        EXPECT_EQ(weekStartDate(expected, WeekStart::Sunday), Date::fromIso(r[3]).value()) << r[0];
    }
    const auto years = readTable("epi_weeks_per_year.csv");
    ASSERT_GT(years.size(), 40u);
    for (const auto& r : years)
        EXPECT_EQ(weeksInYear(std::stoi(r[0]), WeekStart::Sunday), std::stoi(r[1])) << r[0];
}

TEST(TimeAxis, DailyPeriodsAreDays) {
    const TimeAxis a = TimeAxis::daily(ymd(2026, 3, 1), 31);
    EXPECT_EQ(a.periodDays(), 1);
    EXPECT_EQ(a.periodStart(30), ymd(2026, 3, 31));
    EXPECT_EQ(a.periodEnd(30), ymd(2026, 3, 31));
    EXPECT_EQ(a.periodOf(ymd(2026, 3, 15)), 14);
    EXPECT_FALSE(a.periodOf(ymd(2026, 4, 1)).has_value());
    EXPECT_EQ(a.periodNamedBy(ymd(2026, 3, 2)), 1);
    EXPECT_EQ(a.describe(), "daily, 2026-03-01 to 2026-03-31 (31 days)");
}

TEST(TimeAxis, WeeklyPeriodsAreSevenDaysNamedByTheirFirstOrLastDay) {
    // ISO weeks 2026-W01 .. 2026-W10, the file naming each week by its Sunday (last day).
    const TimeAxis a = TimeAxis::weekly(ymd(2025, 12, 29), 10, WeekStart::Monday, WeekDate::End);
    EXPECT_EQ(a.periodDays(), 7);
    EXPECT_EQ(a.spanDays(), 70);
    EXPECT_EQ(a.periodStart(1), ymd(2026, 1, 5));
    EXPECT_EQ(a.periodEnd(1), ymd(2026, 1, 11));
    EXPECT_EQ(a.namedDate(1), ymd(2026, 1, 11));
    // Any day of a week lies in it; only the named day names it.
    EXPECT_EQ(a.periodOf(ymd(2026, 1, 8)), 1);
    EXPECT_EQ(a.periodNamedBy(ymd(2026, 1, 11)), 1);
    EXPECT_FALSE(a.periodNamedBy(ymd(2026, 1, 5)).has_value());
    EXPECT_EQ(a.periodOnGrid(ymd(2025, 12, 28)), -1);
    EXPECT_EQ(a.periodName(0), "2026-W01");
    EXPECT_EQ(a.periodDescription(1), "2026-W02, 2026-01-05 to 2026-01-11");
    EXPECT_EQ(a.describe(),
              "weekly (ISO 8601 weeks from Monday, dates name the last day), 2026-W01 to 2026-W10 "
              "(10 weeks)");
    const TimeAxis epi = TimeAxis::weekly(ymd(2026, 1, 4), 2, WeekStart::Sunday);
    EXPECT_EQ(epi.periodName(1), "2026 epi week 2");
}

TEST(TimeAxis, NamesRoundTrip) {
    for (Cadence c : {Cadence::Daily, Cadence::Weekly})
        EXPECT_EQ(cadenceFromName(cadenceName(c)), c);
    for (WeekStart s : {WeekStart::Monday, WeekStart::Sunday})
        EXPECT_EQ(weekStartFromName(weekStartName(s)), s);
    for (WeekDate d : {WeekDate::Start, WeekDate::End})
        EXPECT_EQ(weekDateFromName(weekDateName(d)), d);
    EXPECT_FALSE(cadenceFromName("monthly").has_value());
}

}  // namespace
}  // namespace siftwave
