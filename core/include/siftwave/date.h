#pragma once
// Calendar days as plain integers.
//
// A Date is a day number: days since 1970-01-01 in the proleptic Gregorian
// calendar (ISO 8601). Day arithmetic is integer arithmetic; conversion to
// and from year/month/day and ISO 8601 text lives here (backed by
// Boost.Date_Time for validation and weekday rules).

#include <compare>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace siftwave {

struct Date {
    std::int32_t serial = 0;  // days since 1970-01-01

    friend auto operator<=>(const Date&, const Date&) = default;
    Date operator+(int days) const { return Date{serial + days}; }
    Date operator-(int days) const { return Date{serial - days}; }
    int operator-(Date other) const { return serial - other.serial; }

    /// Builds a date from a calendar day; nullopt when it does not exist (2026-02-30).
    static std::optional<Date> fromYmd(int year, int month, int day);
    /// Parses exactly "YYYY-MM-DD"; nullopt otherwise or when the day does not exist.
    static std::optional<Date> fromIso(std::string_view text);

    int year() const;
    int month() const;  // 1..12
    int day() const;    // 1..31
    /// ISO 8601 weekday: 1 = Monday ... 7 = Sunday.
    int isoWeekday() const;
    /// "YYYY-MM-DD".
    std::string iso() const;
};

/// True if the year/month/day triple names a real day of the Gregorian calendar.
bool isValidYmd(int year, int month, int day);

}  // namespace siftwave
