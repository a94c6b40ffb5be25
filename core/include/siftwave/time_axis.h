#pragma once
// The calendar of a Drop: which periods its counts are for.
//
// A period is a day (daily cadence) or a calendar week of seven consecutive
// days (weekly cadence). Weekly releases use one of two week conventions:
//   - ISO 8601 weeks (ISO 8601-1:2019, 3.2.2 and 4.3.2.2): weeks start on
//     Monday; week 1 of a year is the week that holds the year's first
//     Thursday (equivalently 4 January), so a year has 52 or 53 weeks and the
//     days of 29-31 December or 1-3 January may belong to the other year's week.
//   - Sunday-start epidemiological weeks (the US CDC's MMWR weeks, used by
//     several national systems): weeks start on Sunday; week 1 of a year is
//     the first Sunday-start week with at least four days in that year.
// Either way a week is named by its year and number, and shown to people as
// "2026-W05" (ISO) or "2026 epi week 5", with its first and last day.
//
// Files name a week by one of its dates: its first day or its last day
// (`WeekDate`). The axis stores the first day of every period; the named date
// is only how a date in a file is mapped to its week.
//
// Everything else in Siftwave takes periods from this type: no code outside it
// assumes that a period is one day. Period i covers the days
// periodStart(i) .. periodEnd(i); durations in days are periodDays() per period.

#include "siftwave/date.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace siftwave {

enum class Cadence : std::uint8_t { Daily, Weekly };
enum class WeekStart : std::uint8_t { Monday, Sunday };
/// Which day of its week a date in the file names.
enum class WeekDate : std::uint8_t { Start, End };

/// "daily", "weekly".
const char* cadenceName(Cadence cadence);
std::optional<Cadence> cadenceFromName(std::string_view name);
/// "monday", "sunday".
const char* weekStartName(WeekStart start);
std::optional<WeekStart> weekStartFromName(std::string_view name);
/// "start", "end".
const char* weekDateName(WeekDate date);
std::optional<WeekDate> weekDateFromName(std::string_view name);

/// A week by its year and number: ISO 8601 weeks (Monday start) or epidemiological
/// weeks (Sunday start). `year` is the week's own year, which may differ from the
/// calendar year of some of its days.
struct WeekNumber {
    int year = 0;
    int week = 0;  // 1..53
    friend bool operator==(const WeekNumber&, const WeekNumber&) = default;
};

/// The first day (Monday or Sunday) of the week that holds `day`.
Date weekStartOf(Date day, WeekStart start);
/// The week that holds `day` under the convention of `start` (Monday: ISO 8601;
/// Sunday: epidemiological weeks).
WeekNumber weekNumberOf(Date day, WeekStart start);
/// The first day of week `week` of `year`; nullopt when the year has no such week
/// or the day is outside the supported calendar.
std::optional<Date> weekStartDate(WeekNumber week, WeekStart start);
/// 52 or 53.
int weeksInYear(int year, WeekStart start);

class TimeAxis {
public:
    TimeAxis() = default;
    /// `periods` days from `first`.
    static TimeAxis daily(Date first, std::int32_t periods);
    /// `periods` weeks from the week that starts on `firstWeekStart` (which must be a
    /// Monday for WeekStart::Monday and a Sunday for WeekStart::Sunday).
    static TimeAxis weekly(Date firstWeekStart, std::int32_t periods, WeekStart start,
                           WeekDate named = WeekDate::Start);

    Cadence cadence() const { return m_cadence; }
    bool weekly() const { return m_cadence == Cadence::Weekly; }
    WeekStart weekStart() const { return m_weekStart; }
    WeekDate weekDate() const { return m_weekDate; }
    std::int32_t periods() const { return m_periods; }
    bool empty() const { return m_periods <= 0; }
    /// Days in one period: 1 or 7.
    int periodDays() const { return m_cadence == Cadence::Weekly ? 7 : 1; }

    /// First day of period i (i may lie outside 0..periods-1: the grid goes on).
    Date periodStart(std::int32_t i) const { return m_first + i * periodDays(); }
    /// Last day of period i.
    Date periodEnd(std::int32_t i) const { return periodStart(i) + (periodDays() - 1); }
    /// The date a file writes for period i (its first or its last day).
    Date namedDate(std::int32_t i) const {
        return m_weekDate == WeekDate::End ? periodEnd(i) : periodStart(i);
    }
    Date first() const { return m_first; }
    /// First day of the last period (first() when empty).
    Date lastStart() const { return periodStart(m_periods > 0 ? m_periods - 1 : 0); }
    /// Last day of the last period.
    Date lastEnd() const { return periodEnd(m_periods > 0 ? m_periods - 1 : 0); }
    /// Days covered: periods() * periodDays().
    std::int64_t spanDays() const { return static_cast<std::int64_t>(m_periods) * periodDays(); }

    /// The period that holds `day` on the unbounded grid (negative before the first).
    std::int32_t periodOnGrid(Date day) const;
    /// The period that holds `day`; nullopt outside the axis.
    std::optional<std::int32_t> periodOf(Date day) const;
    /// The period a date written in a file names: for weekly data the date must be the
    /// named day (start or end) of a week on this grid; nullopt otherwise or outside.
    std::optional<std::int32_t> periodNamedBy(Date named) const;
    /// Position on the continuous day line of a day within period i: i * periodDays() + offset.
    double dayOffset(Date day) const { return static_cast<double>(day - m_first); }

    /// The week number of period i (weekly axes only).
    WeekNumber weekOf(std::int32_t i) const;
    /// How people name period i: "2026-03-01" for a day; "2026-W05" (ISO) or
    /// "2026 epi week 5" (Sunday start) for a week.
    std::string periodName(std::int32_t i) const;
    /// The name with the days spelled out: "2026-03-01"; "2026-W05, 2026-01-26 to 2026-02-01".
    std::string periodDescription(std::int32_t i) const;
    /// "day" or "week".
    const char* unitName() const { return m_cadence == Cadence::Weekly ? "week" : "day"; }
    /// "days" or "weeks".
    const char* unitPlural() const { return m_cadence == Cadence::Weekly ? "weeks" : "days"; }
    /// "Daily" or "Weekly".
    const char* adjective() const { return m_cadence == Cadence::Weekly ? "Weekly" : "Daily"; }
    /// One line: "daily, 2026-01-01 to 2026-03-31 (90 days)" or "weekly (ISO 8601 weeks,
    /// dates name the first day), 2026-W01 to 2026-W10 (10 weeks)".
    std::string describe() const;

    friend bool operator==(const TimeAxis&, const TimeAxis&) = default;

private:
    Cadence m_cadence = Cadence::Daily;
    WeekStart m_weekStart = WeekStart::Monday;
    WeekDate m_weekDate = WeekDate::Start;
    Date m_first;
    std::int32_t m_periods = 0;
};

}  // namespace siftwave
