// Counts from value cells: what is read as a number, and what is kept unparsable.
#include "ingest/number_parsing.h"
#include "ingest/sniffing.h"
#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <string>

namespace siftwave::ingest::detail {
namespace {

ParsedCount parse(std::string_view text, char decimal = '.') {
    NumberStyle style;
    style.decimalSeparator = decimal;
    return parseCount(text, style);
}

TEST(IngestNumbers, ReadsPlainSignedCounts) {
    EXPECT_EQ(parse("0").value, 0);
    EXPECT_EQ(parse("17").value, 17);
    EXPECT_EQ(parse("-3").value, -3);
    EXPECT_EQ(parse("+3").value, 3);
    EXPECT_EQ(parse("007").value, 7);
    EXPECT_EQ(parse("2147483647").value, 2147483647);
    EXPECT_EQ(parse("-2147483648").value, -2147483647 - 1);
    EXPECT_FALSE(parse("2147483648").ok);
    EXPECT_EQ(parse("2147483648").note, NumberNote::OutOfRange);
    EXPECT_FALSE(parse("99999999999999999999").ok);
}

TEST(IngestNumbers, TheDigitWindowAgreesWithTheDigitLoop) {
    // parsePlainCountIn reads up to eight digits as one word (the SWAR step, see
    // number_parsing.h); the byte-by-byte loop of parsePlainCount is the reference.
    // Each text is placed after other bytes of a buffer, as a cell in a file is.
    ::siftwave::testing::Xorshift64 random(0x9E3779B97F4A7C15ull);
    auto next = [&] { return random.next(); };
    const std::string bytesAround = "0123456789,;-+ .\"/:aZ\x7F\x80\xFF";
    auto check = [&](const std::string& text) {
        for (std::size_t lead = 0; lead <= 9; ++lead) {
            std::string buffer(lead, bytesAround[next() % bytesAround.size()]);
            buffer += text;
            buffer += ",";
            const std::string_view cell = std::string_view(buffer).substr(lead, text.size());
            std::int32_t fast = -1, slow = -2;
            const bool fastOk = parsePlainCountIn(cell, buffer, fast);
            const bool slowOk = parsePlainCount(cell, slow);
            ASSERT_EQ(fastOk, slowOk) << "'" << text << "' after " << lead << " bytes";
            if (slowOk) {
                ASSERT_EQ(fast, slow) << "'" << text << "' after " << lead << " bytes";
            }
        }
    };
    for (int v = 0; v <= 1000; ++v)
        check(std::to_string(v));
    for (const char* text : {"99999999",
                             "10000000",
                             "00000000",
                             "01234567",
                             "12345678",
                             "123456789",
                             "2147483647",
                             "2147483648",
                             "-5",
                             "+5",
                             "-",
                             "",
                             "1a",
                             "a1",
                             "1 2",
                             "1.0",
                             "1/2",
                             "12345678a",
                             "1234567:",
                             "/1234567",
                             "\x80"
                             "1",
                             "1"
                             "\xB0"}) {
        check(std::string(text));
    }
    check(
        std::string("12\0"
                    "39",
                    5));  // a NUL byte among the digits
    for (int k = 0; k < 20000; ++k) {
        std::string text = std::to_string(next() % 100000000);
        if (k % 3 == 0)  // one byte replaced by any byte: still a digit or not
            text[next() % text.size()] = static_cast<char>(next() % 256);
        check(text);
    }
}

TEST(IngestNumbers, ReadsThousandsGroupsOfThree) {
    // Digit grouping by threes is common practice (no published source beyond locale conventions).
    EXPECT_EQ(parse("1,234").value, 1234);
    EXPECT_EQ(parse("1,234").note, NumberNote::Thousands);
    EXPECT_EQ(parse("1,234").thousandsSeparator, ',');
    EXPECT_EQ(parse("12 345 678").value, 12345678);
    EXPECT_EQ(parse("1'234").value, 1234);
    EXPECT_EQ(parse("1\xC2\xA0"
                    "234")
                  .value,
              1234);  // U+00A0 no-break space
    EXPECT_EQ(parse("1.234", ',').value, 1234);
    EXPECT_EQ(parse("1.234", ',').thousandsSeparator, '.');
    EXPECT_FALSE(parse("1,23").ok);      // not a group of three
    EXPECT_FALSE(parse("1234,567").ok);  // first group longer than three
    EXPECT_FALSE(parse("1,234.567.890").ok);
    EXPECT_FALSE(parse("1,234 567").ok);  // mixed separators
}

TEST(IngestNumbers, DecimalsAreWholeOnlyWithAZeroFraction) {
    EXPECT_EQ(parse("12.0").value, 12);
    EXPECT_EQ(parse("12.0").note, NumberNote::ZeroFraction);
    EXPECT_EQ(parse("12,00", ',').value, 12);
    EXPECT_FALSE(parse("12.5").ok);
    EXPECT_EQ(parse("12.5").note, NumberNote::NotWhole);
    EXPECT_FALSE(parse("1.234").ok);  // with a decimal point this is 1.234, not a count
    EXPECT_EQ(parse("1,234.0").value, 1234);
}

TEST(IngestNumbers, EverythingElseIsNotANumber) {
    for (const char* text :
         {"", "-", "NA", "n/a", "<5", "1e3", "0x10", "five", "12a", ".5", "5.", "--1", "1 2"})
        EXPECT_FALSE(parse(text).ok) << text;
    EXPECT_EQ(parse(" 12 ").value, 12);
    EXPECT_EQ(parse(" 12 ").note, NumberNote::Spaces);
}

TEST(IngestNumbers, SniffsTheDecimalSeparator) {
    auto styleOf = [](std::vector<std::string> cells) {
        std::vector<SampleRecord> rows;
        for (const std::string& c : cells)
            rows.push_back({{"2026-01-01", "A", c}, 0});
        return sniffNumberStyle(rows, false).decimalSeparator;
    };
    EXPECT_EQ(styleOf({"1", "2"}), '.');
    EXPECT_EQ(styleOf({"1,5", "2"}), ',');
    EXPECT_EQ(styleOf({"1.234", "2"}), ',');  // dot groups of three and no other dot
    EXPECT_EQ(styleOf({"1.234", "0.5"}), '.');
    EXPECT_EQ(styleOf({"1,234", "2"}), '.');
    EXPECT_EQ(styleOf({"1.234,5"}), ',');
}

TEST(IngestNumbers, SniffsTheDelimiter) {
    auto sniff = [](std::string_view text) { return sniffDelimiter(text, 0, text.size()); };
    EXPECT_EQ(sniff("a,b,c\n1,2,3\n"), ',');
    EXPECT_EQ(sniff("a;b;c\n1;2,5;3\n"), ';');
    EXPECT_EQ(sniff("a\tb\n1\t2\n"), '\t');
    EXPECT_EQ(sniff("a|b\n1|2\n"), '|');
    EXPECT_EQ(sniff("\"a;b\",c\n\"1;2\",3\n"), ',');  // delimiters inside quotes do not count
}

}  // namespace
}  // namespace siftwave::ingest::detail
