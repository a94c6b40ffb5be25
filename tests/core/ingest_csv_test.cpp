// The RFC 4180 record scanner. The examples are those of RFC 4180 ("Common
// Format and MIME Type for Comma-Separated Values (CSV) Files", Y. Shafranovich,
// October 2005), section 2, quoted from the RFC's text.
#include "ingest/csv_scanner.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace siftwave::detail {
namespace {

using Rows = std::vector<std::vector<std::string>>;

Rows scanAll(std::string_view text, char delimiter = ',',
             std::vector<std::uint64_t>* lines = nullptr) {
    CsvScanner scanner(text, delimiter);
    CsvRecord record;
    Rows rows;
    while (scanner.next(record)) {
        std::vector<std::string> fields;
        for (const CsvField& f : record.fields)
            fields.emplace_back(f.text);
        rows.push_back(fields);
        if (lines)
            lines->push_back(record.line);
    }
    EXPECT_FALSE(scanner.failed()) << scanner.error().message;
    return rows;
}

TEST(CsvScanner, RecordsEndInCrlf) {
    // RFC 4180, section 2, rule 1: "aaa,bbb,ccc CRLF zzz,yyy,xxx CRLF"
    EXPECT_EQ(scanAll("aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n"),
              (Rows{{"aaa", "bbb", "ccc"}, {"zzz", "yyy", "xxx"}}));
}

TEST(CsvScanner, LastRecordNeedNotEndInALineBreak) {
    // RFC 4180, section 2, rule 2: "aaa,bbb,ccc CRLF zzz,yyy,xxx"
    EXPECT_EQ(scanAll("aaa,bbb,ccc\r\nzzz,yyy,xxx"),
              (Rows{{"aaa", "bbb", "ccc"}, {"zzz", "yyy", "xxx"}}));
}

TEST(CsvScanner, AnOptionalHeaderIsARecordLikeTheOthers) {
    // RFC 4180, section 2, rule 3: "field_name,field_name,field_name CRLF aaa,bbb,ccc CRLF
    // zzz,yyy,xxx CRLF"
    EXPECT_EQ(scanAll("field_name,field_name,field_name\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n"),
              (Rows{{"field_name", "field_name", "field_name"},
                    {"aaa", "bbb", "ccc"},
                    {"zzz", "yyy", "xxx"}}));
}

TEST(CsvScanner, SpacesArePartOfAField) {
    // RFC 4180, section 2, rule 4: "Spaces are considered part of a field and should not be
    // ignored."
    EXPECT_EQ(scanAll("aaa, bbb ,ccc"), (Rows{{"aaa", " bbb ", "ccc"}}));
}

TEST(CsvScanner, FieldsMayBeQuoted) {
    // RFC 4180, section 2, rule 5: "\"aaa\",\"bbb\",\"ccc\" CRLF zzz,yyy,xxx"
    EXPECT_EQ(scanAll("\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx"),
              (Rows{{"aaa", "bbb", "ccc"}, {"zzz", "yyy", "xxx"}}));
}

TEST(CsvScanner, QuotedFieldsHoldLineBreaksAndCommas) {
    // RFC 4180, section 2, rule 6: "\"aaa\",\"b CRLF bb\",\"ccc\" CRLF zzz,yyy,xxx"
    std::vector<std::uint64_t> lines;
    EXPECT_EQ(scanAll("\"aaa\",\"b\r\nbb\",\"ccc\"\r\nzzz,yyy,xxx", ',', &lines),
              (Rows{{"aaa", "b\r\nbb", "ccc"}, {"zzz", "yyy", "xxx"}}));
    EXPECT_EQ(lines,
              (std::vector<std::uint64_t>{1, 3}));  // the second record starts on physical line 3
    EXPECT_EQ(scanAll("\"a,b\",c\n"), (Rows{{"a,b", "c"}}));
}

TEST(CsvScanner, DoubledQuoteInsideQuotesIsOneQuote) {
    // RFC 4180, section 2, rule 7: "\"aaa\",\"b\"\"bb\",\"ccc\""
    EXPECT_EQ(scanAll("\"aaa\",\"b\"\"bb\",\"ccc\""), (Rows{{"aaa", "b\"bb", "ccc"}}));
    EXPECT_EQ(scanAll("\"\"\"\",\"\"\n"), (Rows{{"\"", ""}}));
}

TEST(CsvScanner, AcceptsLfLineEndingsAndOtherDelimiters) {
    EXPECT_EQ(scanAll("a;b\nc;d\n", ';'), (Rows{{"a", "b"}, {"c", "d"}}));
    EXPECT_EQ(scanAll("a\tb\nc\t\"d\te\"\n", '\t'), (Rows{{"a", "b"}, {"c", "d\te"}}));
    EXPECT_EQ(scanAll("a|b|\n", '|'), (Rows{{"a", "b", ""}}));
}

TEST(CsvScanner, AnUnclosedQuoteIsAnErrorWhereItOpens) {
    CsvScanner scanner("a,b\nc,\"d\ne\n", ',');
    CsvRecord record;
    ASSERT_TRUE(scanner.next(record));
    EXPECT_FALSE(scanner.next(record));
    ASSERT_TRUE(scanner.failed());
    EXPECT_EQ(scanner.error().line, 2u);
    EXPECT_EQ(scanner.error().column, 2u);
    EXPECT_NE(scanner.error().message.find("never closed"), std::string::npos);
}

TEST(CsvScanner, TextAfterAClosingQuoteIsAnError) {
    CsvScanner scanner("x\n\"ab\"c,d\n", ',');
    CsvRecord record;
    ASSERT_TRUE(scanner.next(record));
    EXPECT_FALSE(scanner.next(record));
    ASSERT_TRUE(scanner.failed());
    EXPECT_EQ(scanner.error().line, 2u);
    EXPECT_EQ(scanner.error().column, 1u);
}

}  // namespace
}  // namespace siftwave::detail
