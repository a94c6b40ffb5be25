// Dates in drops: the ISO 8601 calendar-date formats, the two slash orders, the
// refusal to guess an ambiguous day/month order, and impossible days.
#include "ingest/date_parsing.h"
#include "siftwave/ingest/ingest.h"

#include <gtest/gtest.h>

namespace siftwave::ingest {
namespace {

using detail::DateFormat;
using detail::parseDateAs;

TEST(IngestDates, ReadsIsoExtendedAndBasicCalendarDates) {
    // ISO 8601-1:2019, calendar date, complete representation: extended YYYY-MM-DD and
    // basic YYYYMMDD (section number from memory: 5.2.2.1).
    EXPECT_EQ(parseDateAs("2026-03-04", DateFormat::Iso)->iso(), "2026-03-04");
    EXPECT_EQ(parseDateAs("20260304", DateFormat::Compact)->iso(), "2026-03-04");
    EXPECT_EQ(parseDateAs("4/3/2026", DateFormat::DayFirst)->iso(), "2026-03-04");
    EXPECT_EQ(parseDateAs("03/04/2026", DateFormat::MonthFirst)->iso(), "2026-03-04");
    EXPECT_FALSE(parseDateAs("2026-3-4", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("2026/03/04", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("04/03/26", DateFormat::DayFirst));  // two-digit years are not read
}

TEST(IngestDates, RejectsImpossibleDaysOfTheGregorianCalendar) {
    // ISO 8601 uses the Gregorian calendar: 2024 is a leap year, 2025 and 1900 are not, 2000 is.
    EXPECT_TRUE(parseDateAs("2024-02-29", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("2025-02-29", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("1900-02-29", DateFormat::Iso));
    EXPECT_TRUE(parseDateAs("2000-02-29", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("2026-02-30", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("2026-04-31", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("2026-13-01", DateFormat::Iso));
    EXPECT_FALSE(parseDateAs("20260001", DateFormat::Compact));
    EXPECT_FALSE(parseDateAs("31/04/2026", DateFormat::DayFirst));
}

TEST(IngestDates, FormatNamesRoundTrip) {
    for (DateFormat f :
         {DateFormat::Iso, DateFormat::Compact, DateFormat::DayFirst, DateFormat::MonthFirst})
        EXPECT_EQ(*detail::dateFormatFromName(detail::dateFormatName(f)), f);
    EXPECT_FALSE(detail::dateFormatFromName("DD.MM.YYYY"));
}

TEST(IngestDates, AnImpossibleDateInADropIsAnErrorWithLineAndColumn) {
    Result<Drop> drop = parseDrop("region,date,cases\nA,2026-02-28,1\nA,2026-02-30,2\n", "d.csv");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::InvalidValue);
    EXPECT_EQ(drop.error().line, 3u);
    EXPECT_EQ(drop.error().column, 2u);
    EXPECT_EQ(drop.error().file, "d.csv");
    EXPECT_NE(drop.error().message.find("'2026-02-30' is not a real day"), std::string::npos);
}

TEST(IngestDates, TextInTheDateColumnIsAnError) {
    Result<Drop> drop =
        parseDrop("date,region,cases\n2026-01-01,A,1\n2026-01-02,A,2\nTotal,A,3\n", "t.csv");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().line, 4u);
    EXPECT_EQ(drop.error().column, 1u);
    EXPECT_NE(drop.error().message.find("'Total' in the date column is not a date"),
              std::string::npos);
}

TEST(IngestDates, ReadsCompactDates) {
    Result<Drop> drop = parseDrop("date,region,cases\n20260101,A,1\n20260103,A,2\n", "c.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.dateFormat, "YYYYMMDD");
    EXPECT_EQ(drop->periods(), 3);
    EXPECT_EQ(drop->axis.lastStart().iso(), "2026-01-03");
}

TEST(IngestDates, RefusesToGuessAnAmbiguousDayMonthOrder) {
    const std::string text = "date,region,cases\n03/04/2026,A,1\n04/04/2026,A,2\n05/04/2026,A,3\n";
    Result<Drop> drop = parseDrop(text, "amb.csv");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::Ambiguous);
    EXPECT_EQ(drop.error().message,
              "dates such as 03/04/2026 could be day/month or month/day (no day of the month in "
              "the file is above 12); rerun with --date-format DD/MM/YYYY or MM/DD/YYYY");
    EXPECT_EQ(drop.error().line, 2u);
    EXPECT_EQ(drop.error().column, 1u);

    IngestOptions dayFirst;
    dayFirst.dateFormat = "DD/MM/YYYY";
    Result<Drop> asDays = parseDrop(text, "amb.csv", dayFirst);
    ASSERT_TRUE(asDays.ok());
    EXPECT_EQ(asDays->axis.first().iso(), "2026-04-03");
    EXPECT_EQ(asDays->periods(), 3);
    IngestOptions monthFirst;
    monthFirst.dateFormat = "MM/DD/YYYY";
    Result<Drop> asMonths = parseDrop(text, "amb.csv", monthFirst);
    ASSERT_TRUE(asMonths.ok());
    EXPECT_EQ(asMonths->axis.first().iso(), "2026-03-04");
    EXPECT_EQ(asMonths->periods(), 31 + 30 + 1);  // 2026-03-04 .. 2026-05-04
}

TEST(IngestDates, ADayAboveTwelveAnywhereSettlesTheOrder) {
    std::string text = "date,region,cases\n";
    for (int d = 1; d <= 12; ++d)
        text += std::to_string(d) + "/01/2026,A," + std::to_string(d) + "\n";
    Result<Drop> ambiguous = parseDrop(text, "x.csv");
    ASSERT_FALSE(ambiguous.ok());
    EXPECT_EQ(ambiguous.error().code, ErrorCode::Ambiguous);
    Result<Drop> dayFirst = parseDrop(text + "13/01/2026,A,13\n", "x.csv");
    ASSERT_TRUE(dayFirst.ok()) << dayFirst.error().describe();
    EXPECT_EQ(dayFirst->source.dateFormat, "DD/MM/YYYY");
    EXPECT_EQ(dayFirst->axis.first().iso(), "2026-01-01");
    EXPECT_EQ(dayFirst->axis.lastStart().iso(), "2026-01-13");
    Result<Drop> monthFirst =
        parseDrop("date,region,cases\n01/02/2026,A,1\n01/13/2026,A,2\n", "y.csv");
    ASSERT_TRUE(monthFirst.ok());
    EXPECT_EQ(monthFirst->source.dateFormat, "MM/DD/YYYY");
    EXPECT_EQ(monthFirst->axis.first().iso(), "2026-01-02");
}

TEST(IngestDates, MixedDayMonthOrdersAreAnError) {
    Result<Drop> drop = parseDrop("date,region,cases\n13/01/2026,A,1\n01/14/2026,A,2\n", "mix.csv");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::InvalidValue);
    EXPECT_EQ(drop.error().line, 3u);
    EXPECT_NE(drop.error().message.find("mix day-first and month-first"), std::string::npos);
}

TEST(IngestDates, AnotherFormatThanTheFilesIsAnError) {
    Result<Drop> drop = parseDrop("date,region,cases\n2026-01-01,A,1\n2/1/2026,A,2\n", "f.csv");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().line, 3u);
    EXPECT_NE(drop.error().message.find("another date format"), std::string::npos);
}

TEST(IngestDates, ADateFormatThatDoesNotFitIsReported) {
    IngestOptions options;
    options.dateFormat = "YYYYMMDD";
    Result<Drop> drop = parseDrop("date,region,cases\n2026-01-01,A,1\n", "g.csv", options);
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().line, 2u);
    EXPECT_EQ(drop.error().column, 1u);
}

}  // namespace
}  // namespace siftwave::ingest
