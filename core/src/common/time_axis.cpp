#include "siftwave/time_axis.h"

#include <cassert>
#include <cstdio>

namespace siftwave {
namespace {

// floor(a / b) for b > 0.
std::int32_t floorDiv(std::int32_t a, std::int32_t b) {
    return a >= 0 ? a / b : -((-a + b - 1) / b);
}

// Both conventions are the same rule on a shifted week: a week belongs to the year that
// holds its fourth day (ISO 8601: the Thursday of a Monday week; epidemiological weeks:
// the Wednesday of a Sunday week, i.e. at least four of its days lie in that year).
Date fourthDayOf(Date weekStart) {
    return weekStart + 3;
}

}  // namespace

const char* cadenceName(Cadence cadence) {
    return cadence == Cadence::Weekly ? "weekly" : "daily";
}
std::optional<Cadence> cadenceFromName(std::string_view name) {
    if (name == "daily")
        return Cadence::Daily;
    if (name == "weekly")
        return Cadence::Weekly;
    return std::nullopt;
}
const char* weekStartName(WeekStart start) {
    return start == WeekStart::Sunday ? "sunday" : "monday";
}
std::optional<WeekStart> weekStartFromName(std::string_view name) {
    if (name == "monday")
        return WeekStart::Monday;
    if (name == "sunday")
        return WeekStart::Sunday;
    return std::nullopt;
}
const char* weekDateName(WeekDate date) {
    return date == WeekDate::End ? "end" : "start";
}
std::optional<WeekDate> weekDateFromName(std::string_view name) {
    if (name == "start")
        return WeekDate::Start;
    if (name == "end")
        return WeekDate::End;
    return std::nullopt;
}

Date weekStartOf(Date day, WeekStart start) {
    // isoWeekday: 1 = Monday .. 7 = Sunday. Days since the week's first day:
    const int since = start == WeekStart::Monday ? day.isoWeekday() - 1 : day.isoWeekday() % 7;
    return day - since;
}

WeekNumber weekNumberOf(Date day, WeekStart start) {
    const Date weekFirst = weekStartOf(day, start);
    const int year = fourthDayOf(weekFirst).year();
    // Week 1 starts at the week of 4 January of that year (ISO 8601; for Sunday weeks the
    // same: 4 January always lies in a week with at least four days of January).
    const Date week1 = weekStartOf(Date::fromYmd(year, 1, 4).value_or(weekFirst), start);
    return WeekNumber{year, (weekFirst - week1) / 7 + 1};
}

std::optional<Date> weekStartDate(WeekNumber week, WeekStart start) {
    const std::optional<Date> jan4 = Date::fromYmd(week.year, 1, 4);
    if (!jan4 || week.week < 1 || week.week > weeksInYear(week.year, start))
        return std::nullopt;
    return weekStartOf(*jan4, start) + (week.week - 1) * 7;
}

int weeksInYear(int year, WeekStart start) {
    // The last week of a year is the one that holds 28 December (four days before the end).
    const std::optional<Date> dec28 = Date::fromYmd(year, 12, 28);
    if (!dec28)
        return 0;
    return weekNumberOf(*dec28, start).week;
}

TimeAxis TimeAxis::daily(Date first, std::int32_t periods) {
    TimeAxis a;
    a.m_cadence = Cadence::Daily;
    a.m_first = first;
    a.m_periods = periods;
    return a;
}

TimeAxis TimeAxis::weekly(Date firstWeekStart, std::int32_t periods, WeekStart start,
                          WeekDate named) {
    assert(weekStartOf(firstWeekStart, start) == firstWeekStart);
    TimeAxis a;
    a.m_cadence = Cadence::Weekly;
    a.m_weekStart = start;
    a.m_weekDate = named;
    a.m_first = firstWeekStart;
    a.m_periods = periods;
    return a;
}

std::int32_t TimeAxis::periodOnGrid(Date day) const {
    return floorDiv(day - m_first, periodDays());
}

std::optional<std::int32_t> TimeAxis::periodOf(Date day) const {
    const std::int32_t i = periodOnGrid(day);
    if (i < 0 || i >= m_periods)
        return std::nullopt;
    return i;
}

std::optional<std::int32_t> TimeAxis::periodNamedBy(Date named) const {
    const std::optional<std::int32_t> i = periodOf(named);
    if (!i || namedDate(*i) != named)
        return std::nullopt;
    return i;
}

WeekNumber TimeAxis::weekOf(std::int32_t i) const {
    return weekNumberOf(periodStart(i), m_weekStart);
}

std::string TimeAxis::periodName(std::int32_t i) const {
    if (!weekly())
        return periodStart(i).iso();
    const WeekNumber w = weekOf(i);
    char text[32];
    if (m_weekStart == WeekStart::Monday)
        std::snprintf(text, sizeof text, "%04d-W%02d", w.year, w.week);
    else
        std::snprintf(text, sizeof text, "%04d epi week %d", w.year, w.week);
    return text;
}

std::string TimeAxis::periodDescription(std::int32_t i) const {
    if (!weekly())
        return periodStart(i).iso();
    return periodName(i) + ", " + periodStart(i).iso() + " to " + periodEnd(i).iso();
}

std::string TimeAxis::describe() const {
    if (empty())
        return std::string(cadenceName(m_cadence)) + ", no periods";
    const std::string count =
        std::to_string(m_periods) + " " + (m_periods == 1 ? unitName() : unitPlural());
    if (!weekly())
        return "daily, " + periodStart(0).iso() + " to " + lastStart().iso() + " (" + count + ")";
    const std::string convention = m_weekStart == WeekStart::Monday
                                       ? "ISO 8601 weeks from Monday"
                                       : "epidemiological weeks from Sunday";
    const std::string named = m_weekDate == WeekDate::End ? "the last day" : "the first day";
    return "weekly (" + convention + ", dates name " + named + "), " + periodName(0) + " to " +
           periodName(m_periods - 1) + " (" + count + ")";
}

}  // namespace siftwave
