#include "scan/code_text.h"

#include <algorithm>
#include <array>
#include <cctype>
#include <cstdio>
#include <cstdlib>

namespace siftwave::scan::detail {
namespace {

bool isSpace(char c) {
    return c == ' ' || c == '\t' || c == '\r' || c == '\n' || c == '\v' || c == '\f';
}

std::string_view trim(std::string_view s) {
    while (!s.empty() && isSpace(s.front()))
        s.remove_prefix(1);
    while (!s.empty() && isSpace(s.back()))
        s.remove_suffix(1);
    return s;
}

std::string upper(std::string_view s) {
    std::string out(s);
    for (char& c : out)
        c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    return out;
}

bool allDigits(std::string_view s) {
    return !s.empty() &&
           std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; });
}

constexpr std::array<const char*, 12> kMonths = {"JAN", "FEB", "MAR", "APR", "MAY", "JUN",
                                                 "JUL", "AUG", "SEP", "OCT", "NOV", "DEC"};
constexpr std::array<const char*, 12> kMonthNames = {
    "January", "February", "March",     "April",   "May",      "June",
    "July",    "August",   "September", "October", "November", "December"};

// Month from a 3-letter abbreviation or a full English name (upper case), 0 if none.
int monthOf(std::string_view word) {
    for (std::size_t i = 0; i < kMonths.size(); ++i) {
        if (word == kMonths[i] || word == upper(kMonthNames[i]))
            return static_cast<int>(i) + 1;
    }
    if (word == "SEPT")
        return 9;
    return 0;
}

// "MAR1", "MAR-1", "1-MAR", "1 MAR", "3/4", "1-2": day-month shapes spreadsheets turn into dates.
std::optional<std::string> dateLike(const std::string& u) {
    std::size_t i = 0;
    while (i < u.size() && std::isalpha(static_cast<unsigned char>(u[i])))
        ++i;
    if (i > 0) {  // letters first
        const int month = monthOf(std::string_view(u).substr(0, i));
        std::size_t j = i;
        if (j < u.size() && (u[j] == '-' || u[j] == ' ' || u[j] == '/' || u[j] == '.'))
            ++j;
        const std::string_view rest = std::string_view(u).substr(j);
        if (month > 0 && allDigits(rest) && rest.size() <= 2) {
            const int day = std::atoi(std::string(rest).c_str());
            if (day >= 1 && day <= 31) {
                return std::to_string(day) + " " + kMonthNames[static_cast<std::size_t>(month - 1)];
            }
        }
        return std::nullopt;
    }
    std::size_t d = 0;
    while (d < u.size() && std::isdigit(static_cast<unsigned char>(u[d])))
        ++d;
    if (d == 0 || d > 2 || d >= u.size())
        return std::nullopt;
    const char sep = u[d];
    if (sep != '-' && sep != '/' && sep != ' ' && sep != '.')
        return std::nullopt;
    const int first = std::atoi(u.substr(0, d).c_str());
    const std::string_view rest = std::string_view(u).substr(d + 1);
    const int month = monthOf(rest);
    if (month > 0 && first >= 1 && first <= 31) {
        return std::to_string(first) + " " + kMonthNames[static_cast<std::size_t>(month - 1)];
    }
    if (sep != '.' && allDigits(rest) && rest.size() <= 2) {
        const int second = std::atoi(std::string(rest).c_str());
        if (first >= 1 && first <= 31 && second >= 1 && second <= 12) {
            return "a date (" + std::string(u) + ")";
        }
        if (first >= 1 && first <= 12 && second >= 1 && second <= 31) {
            return "a date (" + std::string(u) + ")";
        }
    }
    return std::nullopt;
}

}  // namespace

std::string foldCode(std::string_view code) {
    std::string u = upper(trim(code));
    std::size_t zeros = 0;
    while (zeros + 1 < u.size() && u[zeros] == '0')
        ++zeros;
    return u.substr(zeros);
}

std::optional<CodeCollision> codeCollision(std::string_view code) {
    const std::string_view t = trim(code);
    const std::string u = upper(t);
    static const char* const kMissing[] = {"", "NA", "N/A", "NULL", "NONE", "NAN", "#N/A", "-"};
    for (const char* token : kMissing) {
        if (u == token)
            return CodeCollision{"missing_token", "missing"};
    }
    static const char* const kBoolean[] = {"TRUE", "FALSE", "YES", "NO", "ON", "OFF"};
    for (const char* token : kBoolean) {
        if (u == token) {
            const bool yes = u == "TRUE" || u == "YES" || u == "ON";
            return CodeCollision{"boolean", yes ? "TRUE" : "FALSE"};
        }
    }
    if (t.size() != code.size())
        return CodeCollision{"whitespace", std::string(t)};
    if (allDigits(t) && t.size() > 1 && t.front() == '0') {
        return CodeCollision{"leading_zero", foldCode(t)};
    }
    if (allDigits(t) && t.size() > 15) {
        return CodeCollision{"long_number", "a number rounded to 15 significant digits"};
    }
    // Scientific notation: digits, E, optional sign, digits ("1E5").
    const std::size_t e = u.find('E');
    if (e != std::string::npos && e > 0) {
        std::string_view mantissa = std::string_view(u).substr(0, e);
        std::string_view exponent = std::string_view(u).substr(e + 1);
        if (!exponent.empty() && (exponent.front() == '+' || exponent.front() == '-')) {
            exponent.remove_prefix(1);
        }
        const std::size_t dot = mantissa.find('.');
        const bool mantissaOk =
            dot == std::string_view::npos
                ? allDigits(mantissa)
                : (allDigits(mantissa.substr(0, dot)) && allDigits(mantissa.substr(dot + 1)));
        if (mantissaOk && allDigits(exponent) && exponent.size() <= 3) {
            const double value = std::strtod(std::string(u).c_str(), nullptr);
            char text[64];
            std::snprintf(text, sizeof text, "%.15g", value);
            return CodeCollision{"scientific", text};
        }
    }
    if (auto date = dateLike(u))
        return CodeCollision{"date_like", *date};
    return std::nullopt;
}

}  // namespace siftwave::scan::detail
