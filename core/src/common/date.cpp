#include "siftwave/date.h"

#include <boost/date_time/gregorian/gregorian_types.hpp>

#include <cstdio>

namespace siftwave {
namespace {

// Day numbers from civil dates: H. Hinnant, "chrono-Compatible Low-Level Date
// Algorithms" (days_from_civil / civil_from_days), public domain.
std::int32_t daysFromCivil(int y, unsigned m, unsigned d) {
    y -= m <= 2;
    const int era = (y >= 0 ? y : y - 399) / 400;
    const unsigned yoe = static_cast<unsigned>(y - era * 400);
    const unsigned doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
    const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    return era * 146097 + static_cast<int>(doe) - 719468;
}

struct Ymd {
    int y;
    unsigned m;
    unsigned d;
};

Ymd civilFromDays(std::int32_t z) {
    z += 719468;
    const int era = (z >= 0 ? z : z - 146096) / 146097;
    const unsigned doe = static_cast<unsigned>(z - era * 146097);
    const unsigned yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
    const int y = static_cast<int>(yoe) + era * 400;
    const unsigned doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    const unsigned mp = (5 * doy + 2) / 153;
    const unsigned d = doy - (153 * mp + 2) / 5 + 1;
    const unsigned m = mp < 10 ? mp + 3 : mp - 9;
    return {y + (m <= 2), m, d};
}

}  // namespace

bool isValidYmd(int year, int month, int day) {
    if (year < 1400 || year > 9999 || month < 1 || month > 12 || day < 1)
        return false;
    return day <= boost::gregorian::gregorian_calendar::end_of_month_day(
                      static_cast<unsigned short>(year), static_cast<unsigned short>(month));
}

std::optional<Date> Date::fromYmd(int year, int month, int day) {
    if (!isValidYmd(year, month, day))
        return std::nullopt;
    return Date{daysFromCivil(year, static_cast<unsigned>(month), static_cast<unsigned>(day))};
}

std::optional<Date> Date::fromIso(std::string_view t) {
    if (t.size() != 10 || t[4] != '-' || t[7] != '-')
        return std::nullopt;
    int v[3] = {0, 0, 0};
    const int starts[3] = {0, 5, 8};
    const int lens[3] = {4, 2, 2};
    for (int k = 0; k < 3; ++k) {
        for (int i = 0; i < lens[k]; ++i) {
            const char c = t[static_cast<size_t>(starts[k] + i)];
            if (c < '0' || c > '9')
                return std::nullopt;
            v[k] = v[k] * 10 + (c - '0');
        }
    }
    return fromYmd(v[0], v[1], v[2]);
}

int Date::year() const {
    return civilFromDays(serial).y;
}
int Date::month() const {
    return static_cast<int>(civilFromDays(serial).m);
}
int Date::day() const {
    return static_cast<int>(civilFromDays(serial).d);
}

int Date::isoWeekday() const {
    // 1970-01-01 was a Thursday (ISO weekday 4).
    const int w = ((serial % 7) + 7 + 3) % 7;  // 0 = Monday
    return w + 1;
}

std::string Date::iso() const {
    const Ymd c = civilFromDays(serial);
    char buf[32];  // room for any int year, so -Wformat-truncation has nothing to warn about
    std::snprintf(buf, sizeof buf, "%04d-%02u-%02u", c.y, c.m, c.d);
    return buf;
}

}  // namespace siftwave
