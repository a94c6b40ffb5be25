#pragma once
// Dates as drops write them.
//
// Accepted formats (ISO 8601-1:2019 calendar dates and the two slash orders):
//   YYYY-MM-DD   ISO 8601 extended format, e.g. 2026-03-04
//   YYYYMMDD     ISO 8601 basic format, e.g. 20260304
//   DD/MM/YYYY   day first (1 or 2 digits for day and month), e.g. 4/3/2026
//   MM/DD/YYYY   month first, e.g. 3/4/2026
//   YYYY-Www     an ISO 8601 week (ISO 8601-1:2019, 5.2.3.3 reduced precision week
//                date: extended 2026-W05 or basic 2026W05); read as the week's Monday.
//                A file of week labels is weekly by definition.
// A slash date whose two first numbers are both 12 or less reads either way.
// The reader never guesses: if no date in the file has a first number above
// 12 (then it must be month first) or a second number above 12 (day first),
// the order is ambiguous and the analyst has to name it.
//
// A date may also be written in two cells, a year and a week number (a year
// column and a week column; see role_detection.h): week W of year Y, read as
// the week's first day (weekStartDate in time_axis.h) under ISO 8601 weeks or
// Sunday-start epidemiological weeks, whichever the reader settled on. The
// year is four digits, the week one or two ("5" or "05"), 1 to 52 or 53 as the
// year has weeks (weeksInYear). Such a file is weekly by definition.

#include "siftwave/date.h"
#include "siftwave/time_axis.h"

#include <cstdint>

#include <optional>
#include <string_view>

namespace siftwave::ingest::detail {

enum class DateShape { None, Iso, Compact, Slash, IsoWeek };
/// YearWeek: a year cell and a week-number cell (read with readYearWeek, not parseDateAs).
enum class DateFormat { Unknown, Iso, Compact, DayFirst, MonthFirst, IsoWeek, YearWeek };

/// The syntactic shape of a text (no calendar check). Compact means 8 digits.
DateShape dateShapeOf(std::string_view text);

/// The three numbers of a date text of the given shape, in written order
/// (year, month, day for Iso/Compact; first, second, year for Slash).
bool splitDate(std::string_view text, DateShape shape, int& n1, int& n2, int& n3);

/// "YYYY-MM-DD", "YYYYMMDD", "DD/MM/YYYY", "MM/DD/YYYY", "YYYY-Www", "year+week" ("" for
/// Unknown).
const char* dateFormatName(DateFormat format);
/// Parses a format name as above (also accepted: lower case, "D/M/Y", "M/D/Y", "ISO"); never
/// YearWeek, which is not a format of one cell.
std::optional<DateFormat> dateFormatFromName(std::string_view name);
DateShape shapeOfFormat(DateFormat format);

/// Parses `text` in `format`; nullopt when it has another shape or the day does not exist.
std::optional<Date> parseDateAs(std::string_view text, DateFormat format);

/// Four ASCII digits: the year they write; nullopt otherwise.
std::optional<int> yearOfText(std::string_view text);
/// One or two ASCII digits: the number they write (0 to 99, not checked against 1 to 53);
/// nullopt otherwise.
std::optional<int> weekNumberOfText(std::string_view text);

/// What is wrong with a year cell and a week cell, if anything.
enum class YearWeekProblem : std::uint8_t {
    None,
    EmptyYear,
    EmptyWeek,
    NotAYear,     // not four digits
    NotAWeek,     // not one or two digits
    NoSuchWeek,   // week 0, above 53, or 53 in a year of 52 weeks
    OffCalendar,  // a year outside the calendar Date supports
};

struct YearWeekReading {
    std::optional<Date> weekStart;  // the week's first day; nullopt when there is a problem
    YearWeekProblem problem = YearWeekProblem::None;
    int year = 0;  // as read, when the cell is a number
    int week = 0;
    /// True when the week cell is the wrong one (false: the year cell).
    bool weekCellWrong() const {
        return problem == YearWeekProblem::EmptyWeek || problem == YearWeekProblem::NotAWeek ||
               problem == YearWeekProblem::NoSuchWeek;
    }
};

/// Week `week` of year `year` under the convention of `start`. The year cell is checked first:
/// a row with both cells wrong is reported for its year.
YearWeekReading readYearWeek(std::string_view year, std::string_view week, WeekStart start);

}  // namespace siftwave::ingest::detail
