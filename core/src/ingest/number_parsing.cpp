#include "ingest/number_parsing.h"

#include "ingest/date_parsing.h"

namespace siftwave::ingest::detail {
namespace {

bool isDigit(char c) {
    return c >= '0' && c <= '9';
}

/// Length of the thousands separator at the start of `t` (0 if none): , . space ' or U+00A0 /
/// U+202F.
std::size_t separatorAt(std::string_view t, char& which) {
    if (t.empty())
        return 0;
    const char c = t[0];
    if (c == ',' || c == '.' || c == ' ' || c == '\'') {
        which = c;
        return 1;
    }
    if (t.substr(0, 2) == "\xC2\xA0") {
        which = ' ';
        return 2;
    }
    if (t.substr(0, 3) == "\xE2\x80\xAF") {
        which = ' ';
        return 3;
    }
    return 0;
}

/// Parses digits with optional groups of three; false if the text is not of that form.
bool parseGroupedDigits(std::string_view t, char decimal, std::int64_t& value, char& separator,
                        bool& overflow) {
    value = 0;
    separator = 0;
    overflow = false;
    std::size_t i = 0;
    std::size_t firstGroup = 0;
    while (i < t.size() && isDigit(t[i])) {
        value = value * 10 + (t[i] - '0');
        if (value > 10'000'000'000LL)
            overflow = true, value = 10'000'000'000LL;
        ++i;
        ++firstGroup;
    }
    if (firstGroup == 0)
        return false;
    if (i == t.size())
        return true;
    std::string_view sepText;
    if (firstGroup > 3)
        return false;
    while (i < t.size()) {
        char which = 0;
        const std::size_t len = separatorAt(t.substr(i), which);
        if (len == 0 || which == decimal)
            return false;
        if (separator == 0) {
            separator = which;
            sepText = t.substr(i, len);
        } else if (t.substr(i, len) != sepText) {
            return false;
        }
        i += len;
        if (i + 3 > t.size())
            return false;
        for (int k = 0; k < 3; ++k, ++i) {
            if (!isDigit(t[i]))
                return false;
            value = value * 10 + (t[i] - '0');
            if (value > 10'000'000'000LL)
                overflow = true, value = 10'000'000'000LL;
        }
    }
    return true;
}

}  // namespace

ParsedCount parseCount(std::string_view text, const NumberStyle& style) {
    ParsedCount out;
    if (parsePlainCount(text, out.value)) {
        out.ok = true;
        return out;
    }
    std::string_view t = text;
    bool spaces = false;
    while (!t.empty() && t.front() == ' ')
        t.remove_prefix(1), spaces = true;
    while (!t.empty() && t.back() == ' ')
        t.remove_suffix(1), spaces = true;
    bool negative = false;
    if (!t.empty() && (t[0] == '-' || t[0] == '+')) {
        negative = t[0] == '-';
        t.remove_prefix(1);
    }
    out.note = NumberNote::NotANumber;
    if (t.empty())
        return out;

    std::string_view integerPart = t;
    std::string_view fraction;
    if (const std::size_t dot = t.rfind(style.decimalSeparator); dot != std::string_view::npos) {
        integerPart = t.substr(0, dot);
        fraction = t.substr(dot + 1);
        if (fraction.empty())
            return out;
        for (char c : fraction) {
            if (!isDigit(c))
                return out;
        }
    }
    std::int64_t value = 0;
    char separator = 0;
    bool overflow = false;
    if (!parseGroupedDigits(integerPart, style.decimalSeparator, value, separator, overflow))
        return out;
    if (!fraction.empty()) {
        for (char c : fraction) {
            if (c != '0') {
                out.note = NumberNote::NotWhole;
                return out;
            }
        }
    }
    if (negative)
        value = -value;
    if (overflow || value > INT32_MAX || value < INT32_MIN) {
        out.note = NumberNote::OutOfRange;
        return out;
    }
    out.ok = true;
    out.value = static_cast<std::int32_t>(value);
    if (separator != 0) {
        out.note = NumberNote::Thousands;
        out.thousandsSeparator = separator;
    } else if (!fraction.empty()) {
        out.note = NumberNote::ZeroFraction;
    } else if (spaces) {
        out.note = NumberNote::Spaces;
    } else {
        out.note = NumberNote::None;
    }
    return out;
}

CellShape shapeOf(std::string_view text, const NumberStyle& style) {
    if (text.empty())
        return CellShape::Empty;
    if (dateShapeOf(text) != DateShape::None && dateShapeOf(text) != DateShape::Compact)
        return CellShape::Date;
    if (text.size() > 1 && text[0] == '0') {
        bool digits = true;
        for (char c : text)
            digits = digits && isDigit(c);
        if (digits)
            return CellShape::LeadingZero;
    }
    const ParsedCount count = parseCount(text, style);
    if (count.ok)
        return CellShape::Integer;
    if (count.note == NumberNote::NotWhole || count.note == NumberNote::OutOfRange)
        return CellShape::Decimal;
    return CellShape::Text;
}

}  // namespace siftwave::ingest::detail
