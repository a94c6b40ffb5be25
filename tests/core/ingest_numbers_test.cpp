// Counts from value cells: what is read as a number, and what is kept unparsable.
#include "ingest/number_parsing.h"
#include "ingest/sniffing.h"

#include <gtest/gtest.h>

namespace siftwave::detail {
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
}  // namespace siftwave::detail
