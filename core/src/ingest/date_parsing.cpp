#include "ingest/date_parsing.h"

#include "siftwave/time_axis.h"

#include <cctype>
#include <string>

namespace siftwave::ingest::detail {
namespace {

bool digitsAt(std::string_view t, std::size_t from, std::size_t count, int& value) {
    value = 0;
    for (std::size_t i = from; i < from + count; ++i) {
        const unsigned d = static_cast<unsigned char>(t[i]) - static_cast<unsigned>('0');
        if (d > 9)
            return false;
        value = value * 10 + static_cast<int>(d);
    }
    return true;
}

}  // namespace

DateShape dateShapeOf(std::string_view t) {
    int a, b, c;
    if (t.size() == 10 && t[4] == '-' && t[7] == '-') {
        return splitDate(t, DateShape::Iso, a, b, c) ? DateShape::Iso : DateShape::None;
    }
    if (t.size() == 8 && splitDate(t, DateShape::Compact, a, b, c))
        return DateShape::Compact;
    if ((t.size() == 8 || t.size() == 7) && splitDate(t, DateShape::IsoWeek, a, b, c))
        return DateShape::IsoWeek;
    if (t.size() >= 8 && t.size() <= 10) {
        return splitDate(t, DateShape::Slash, a, b, c) ? DateShape::Slash : DateShape::None;
    }
    return DateShape::None;
}

bool splitDate(std::string_view t, DateShape shape, int& n1, int& n2, int& n3) {
    switch (shape) {
        case DateShape::Iso:
            return t.size() == 10 && t[4] == '-' && t[7] == '-' && digitsAt(t, 0, 4, n1) &&
                   digitsAt(t, 5, 2, n2) && digitsAt(t, 8, 2, n3);
        case DateShape::Compact:
            return t.size() == 8 && digitsAt(t, 0, 4, n1) && digitsAt(t, 4, 2, n2) &&
                   digitsAt(t, 6, 2, n3);
        case DateShape::Slash: {
            const std::size_t s1 = t.find('/');
            if (s1 == std::string_view::npos || s1 < 1 || s1 > 2)
                return false;
            const std::size_t s2 = t.find('/', s1 + 1);
            if (s2 == std::string_view::npos || s2 - s1 - 1 < 1 || s2 - s1 - 1 > 2)
                return false;
            if (t.size() - s2 - 1 != 4)
                return false;
            return digitsAt(t, 0, s1, n1) && digitsAt(t, s1 + 1, s2 - s1 - 1, n2) &&
                   digitsAt(t, s2 + 1, 4, n3);
        }
        case DateShape::IsoWeek: {
            // YYYY-Www or YYYYWww (the W in either case).
            const std::size_t w = t.size() == 8 ? 5 : 4;
            if ((t.size() != 8 && t.size() != 7) || (t.size() == 8 && t[4] != '-') ||
                (t[w] != 'W' && t[w] != 'w'))
                return false;
            n3 = 1;
            return digitsAt(t, 0, 4, n1) && digitsAt(t, w + 1, 2, n2);
        }
        case DateShape::None:
            break;
    }
    return false;
}

const char* dateFormatName(DateFormat format) {
    switch (format) {
        case DateFormat::Iso:
            return "YYYY-MM-DD";
        case DateFormat::Compact:
            return "YYYYMMDD";
        case DateFormat::DayFirst:
            return "DD/MM/YYYY";
        case DateFormat::MonthFirst:
            return "MM/DD/YYYY";
        case DateFormat::IsoWeek:
            return "YYYY-Www";
        case DateFormat::YearWeek:
            return "year+week";
        case DateFormat::Unknown:
            break;
    }
    return "";
}

std::optional<DateFormat> dateFormatFromName(std::string_view name) {
    std::string upper;
    for (char c : name)
        upper += static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    if (upper == "YYYY-MM-DD" || upper == "ISO" || upper == "ISO8601")
        return DateFormat::Iso;
    if (upper == "YYYYMMDD")
        return DateFormat::Compact;
    if (upper == "DD/MM/YYYY" || upper == "D/M/Y" || upper == "D/M/YYYY")
        return DateFormat::DayFirst;
    if (upper == "MM/DD/YYYY" || upper == "M/D/Y" || upper == "M/D/YYYY")
        return DateFormat::MonthFirst;
    if (upper == "YYYY-WWW" || upper == "YYYYWWW" || upper == "ISO-WEEK")
        return DateFormat::IsoWeek;
    return std::nullopt;
}

DateShape shapeOfFormat(DateFormat format) {
    switch (format) {
        case DateFormat::Iso:
            return DateShape::Iso;
        case DateFormat::Compact:
            return DateShape::Compact;
        case DateFormat::DayFirst:
        case DateFormat::MonthFirst:
            return DateShape::Slash;
        case DateFormat::IsoWeek:
            return DateShape::IsoWeek;
        case DateFormat::YearWeek:
        case DateFormat::Unknown:
            break;
    }
    return DateShape::None;
}

std::optional<Date> parseDateAs(std::string_view text, DateFormat format) {
    int n1, n2, n3;
    if (!splitDate(text, shapeOfFormat(format), n1, n2, n3))
        return std::nullopt;
    switch (format) {
        case DateFormat::Iso:
        case DateFormat::Compact:
            return Date::fromYmd(n1, n2, n3);
        case DateFormat::DayFirst:
            return Date::fromYmd(n3, n2, n1);
        case DateFormat::MonthFirst:
            return Date::fromYmd(n3, n1, n2);
        case DateFormat::IsoWeek:
            if (!isValidYmd(n1, 1, 4))
                return std::nullopt;
            return weekStartDate(WeekNumber{n1, n2}, WeekStart::Monday);
        case DateFormat::YearWeek:
        case DateFormat::Unknown:
            break;
    }
    return std::nullopt;
}

std::optional<int> yearOfText(std::string_view text) {
    int year = 0;
    if (text.size() != 4 || !digitsAt(text, 0, 4, year))
        return std::nullopt;
    return year;
}

std::optional<int> weekNumberOfText(std::string_view text) {
    int week = 0;
    if (text.empty() || text.size() > 2 || !digitsAt(text, 0, text.size(), week))
        return std::nullopt;
    return week;
}

YearWeekReading readYearWeek(std::string_view year, std::string_view week, WeekStart start) {
    YearWeekReading r;
    const std::optional<int> y = yearOfText(year);
    const std::optional<int> w = weekNumberOfText(week);
    if (year.empty())
        r.problem = YearWeekProblem::EmptyYear;
    else if (!y)
        r.problem = YearWeekProblem::NotAYear;
    else if (week.empty())
        r.problem = YearWeekProblem::EmptyWeek;
    else if (!w)
        r.problem = YearWeekProblem::NotAWeek;
    r.year = y.value_or(0);
    r.week = w.value_or(0);
    if (r.problem != YearWeekProblem::None)
        return r;
    if (!isValidYmd(r.year, 1, 4)) {
        r.problem = YearWeekProblem::OffCalendar;
        return r;
    }
    r.weekStart = weekStartDate(WeekNumber{r.year, r.week}, start);
    if (!r.weekStart)
        r.problem = YearWeekProblem::NoSuchWeek;
    return r;
}

}  // namespace siftwave::ingest::detail
