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
#include <cstring>
#include <string_view>

namespace siftwave::ingest::detail {

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

/// Fast path for 1 to 8 plain digits: the 8 bytes ending at the text's last digit
/// are read as one word (the caller guarantees they are readable), the bytes in
/// front of the digits are replaced by '0', every byte is checked to be a digit
/// and the eight are combined in three multiplications. This is the SWAR
/// ("SIMD within a register") eight-digit step of simdjson (Langdale and Lemire,
/// "Parsing gigabytes of JSON per second", VLDB Journal 2019; the constants are
/// quoted from memory and checked against the digit loop in ingest_numbers_test).
inline bool parseDigitWindow(const char* windowStart, std::size_t digits, std::int32_t& out) {
    if (digits == 0 || digits > 8)
        return false;
    std::uint64_t v;
    std::memcpy(&v, windowStart, 8);  // little-endian: the first byte is the lowest
    constexpr std::uint64_t kZeros = 0x3030303030303030ull;
    const unsigned before = 8 * static_cast<unsigned>(8 - digits);  // bits in front of the digits
    const std::uint64_t keep = before == 0 ? ~std::uint64_t{0} : ~std::uint64_t{0} << before;
    v = (v & keep) | (kZeros & ~keep);
    // Every byte 0x30..0x39: its high nibble is 3, and so is that of the byte plus 6.
    if (((v & 0xF0F0F0F0F0F0F0F0ull) |
         (((v + 0x0606060606060606ull) & 0xF0F0F0F0F0F0F0F0ull) >> 4)) != 0x3333333333333333ull)
        return false;
    v -= kZeros;
    v = v * 10 + (v >> 8);  // pairs of digits
    v = (((v & 0x000000FF000000FFull) * 0x000F424000000064ull) +
         (((v >> 16) & 0x000000FF000000FFull) * 0x0000271000000001ull)) >>
        32;
    out = static_cast<std::int32_t>(v);  // at most 99,999,999
    return true;
}

/// parsePlainCount for a text that lies inside `buffer`: the digit window when the
/// 8 bytes before the text's end are inside `buffer` too, else the loop.
inline bool parsePlainCountIn(std::string_view t, std::string_view buffer, std::int32_t& out) {
    const auto begin = reinterpret_cast<std::uintptr_t>(buffer.data());
    const auto end = reinterpret_cast<std::uintptr_t>(t.data()) + t.size();
    if (t.size() <= 8 && end >= begin + 8 && end <= begin + buffer.size() &&
        reinterpret_cast<std::uintptr_t>(t.data()) >= begin)
        return parseDigitWindow(t.data() + t.size() - 8, t.size(), out) || parsePlainCount(t, out);
    return parsePlainCount(t, out);
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
    Text,         // the last (role_detection.cpp counts the shapes in an array up to it)
};
CellShape shapeOf(std::string_view text, const NumberStyle& style);

}  // namespace siftwave::ingest::detail
