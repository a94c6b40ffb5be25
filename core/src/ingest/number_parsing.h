#pragma once
// Reading a count from a value cell.
//
// A count is a whole number that fits in 32 bits, optionally signed (negative
// corrections exist). Accepted spellings besides plain digits, each reported
// to the analyst as a warning by the reader:
//   - thousands separators in groups of three ("1,234", "1.234", "1 234",
//     "1'234"), when the separator is not the file's decimal separator;
//   - a zero decimal part ("12.0", or "12,0" with a decimal comma);
//   - spaces around the number.
// Everything else ("12.5", "1e3", "n/a", "<5") is unparsable; the reader keeps
// the cell as Unparsable with its line and column, it never guesses a value.

#include <cstdint>
#include <string_view>

namespace siftwave::detail {

enum class NumberNote : std::uint8_t {
    None,
    Thousands,     // read with a thousands separator
    ZeroFraction,  // read from "12.0"
    Spaces,        // spaces around the number
    NotANumber,    // unparsable: not a number at all
    NotWhole,      // unparsable: has a non-zero fractional part
    OutOfRange,    // unparsable: does not fit in 32 bits
};

struct NumberStyle {
    char decimalSeparator = '.';
};

struct ParsedCount {
    bool ok = false;
    std::int32_t value = 0;
    NumberNote note = NumberNote::None;
    char thousandsSeparator =
        0;  // the separator used when note == Thousands (' ' also for U+00A0/U+202F)
};

/// Fast path: optional sign and digits only.
inline bool parsePlainCount(std::string_view t, std::int32_t& out) {
    std::size_t i = 0;
    const std::size_t n = t.size();
    if (n == 0 || n > 11)
        return false;
    bool negative = false;
    if (t[0] == '-' || t[0] == '+') {
        negative = t[0] == '-';
        i = 1;
        if (n == 1)
            return false;
    }
    std::int64_t v = 0;
    for (; i < n; ++i) {
        const unsigned d = static_cast<unsigned char>(t[i]) - static_cast<unsigned>('0');
        if (d > 9)
            return false;
        v = v * 10 + d;
    }
    if (negative)
        v = -v;
    if (v > INT32_MAX || v < INT32_MIN)
        return false;
    out = static_cast<std::int32_t>(v);
    return true;
}

/// Full parse with the notes above.
ParsedCount parseCount(std::string_view text, const NumberStyle& style);

/// What a cell looks like, for sniffing the layout and the roles of columns.
enum class CellShape : std::uint8_t {
    Empty,
    Integer,      // a count as parseCount reads it
    Decimal,      // a number with a fractional part
    LeadingZero,  // digits with a leading zero ("004"): a code rather than a count
    Date,         // one of the date shapes (see date_parsing.h)
    Text,
};
CellShape shapeOf(std::string_view text, const NumberStyle& style);

}  // namespace siftwave::detail
