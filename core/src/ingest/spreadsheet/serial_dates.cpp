// Serial numbers as dates (ECMA-376 Part 1, 18.17.4 "Dates and Times").
#include "ingest/spreadsheet/sheet_rows.h"

#include "siftwave/date.h"

#include <charconv>
#include <cmath>

namespace siftwave::ingest::detail {

std::string isoDateOfSerial(double serial, bool date1904, bool& fictitious) {
    fictitious = false;
    if (!std::isfinite(serial) || serial > 2958465.0)  // 2958465 is 9999-12-31 in 1900
        return {};
    const auto day = static_cast<std::int32_t>(std::floor(serial));
    if (date1904) {
        // 18.17.4.1: the 1904 date base, serial 0 is 1904-01-01.
        if (day < 0)
            return {};
        return (Date::fromYmd(1904, 1, 1).value() + day).iso();
    }
    // 18.17.4.1: the 1900 date base, serial 1 is 1900-01-01; the system counts a 29 February
    // 1900 that never was (serial 60), so from serial 61 (1900-03-01) on a day is one less.
    if (day < 1)
        return {};
    if (day == 60) {
        fictitious = true;
        return {};
    }
    const Date base = Date::fromYmd(1899, 12, 31).value();
    return (base + (day < 60 ? day : day - 1)).iso();
}

std::string plainNumberText(std::string_view text) {
    bool plain = !text.empty();
    for (char c : text)
        plain = plain && ((c >= '0' && c <= '9') || c == '-' || c == '.');
    if (plain)
        return std::string(text);
    double value = 0;
    const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
    if (ec != std::errc() || end != text.data() + text.size())
        return std::string(text);
    char buffer[400];
    const auto [out, ec2] =
        std::to_chars(buffer, buffer + sizeof buffer, value, std::chars_format::fixed);
    if (ec2 != std::errc())
        return std::string(text);
    return std::string(buffer, out);
}

}  // namespace siftwave::ingest::detail
