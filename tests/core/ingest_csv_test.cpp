// The RFC 4180 record scanner. The examples are those of RFC 4180 ("Common
// Format and MIME Type for Comma-Separated Values (CSV) Files", Y. Shafranovich,
// October 2005), section 2, quoted from the RFC's text.
#include "ingest/csv_scanner.h"
#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace siftwave::ingest::detail {
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

// A plain reading of RFC 4180, section 2, written for this test only and byte by byte,
// with the scanner's documented extensions (LF alone ends a line; a quote inside an
// unquoted field and a CR not followed by LF are data; a CR at the very end ends the
// line). The scanner reads most records from 64-byte bit masks instead; both must agree.
struct ReferenceRecord {
    std::vector<std::string> fields;
    std::vector<bool> quoted;
    std::uint64_t line = 0;
    std::size_t offset = 0;
    bool strayQuote = false;
};

std::vector<ReferenceRecord> referenceScan(const std::string& s, char delimiter) {
    std::vector<ReferenceRecord> records;
    std::size_t i = 0;
    std::uint64_t line = 1;
    const std::size_t n = s.size();
    auto lineEndsAt = [&](std::size_t k) {
        return s[k] == '\n' || (s[k] == '\r' && (k + 1 == n || s[k + 1] == '\n'));
    };
    while (i < n) {
        ReferenceRecord r;
        r.line = line;
        r.offset = i;
        for (;;) {
            std::string field;
            bool quoted = false;
            if (i < n && s[i] == '"') {
                quoted = true;
                ++i;
                for (;;) {
                    if (s[i] == '"' && i + 1 < n && s[i + 1] == '"') {
                        field += '"';
                        i += 2;
                    } else if (s[i] == '"') {
                        ++i;
                        break;
                    } else {
                        line += s[i] == '\n';
                        field += s[i++];
                    }
                }
            } else {
                while (i < n && s[i] != delimiter && !lineEndsAt(i)) {
                    r.strayQuote = r.strayQuote || s[i] == '"';
                    field += s[i++];
                }
            }
            r.fields.push_back(field);
            r.quoted.push_back(quoted);
            if (i < n && s[i] == delimiter) {
                ++i;
                if (i == n) {
                    r.fields.emplace_back();
                    r.quoted.push_back(false);
                    break;
                }
                continue;
            }
            if (i < n && s[i] == '\r')
                ++i;
            if (i < n && s[i] == '\n')
                ++i;
            ++line;
            break;
        }
        records.push_back(r);
    }
    return records;
}

TEST(CsvScanner, BitMaskReadingAgreesWithAPlainReading) {
    ::siftwave::testing::Xorshift64 random(0xD1B54A32D192ED03ull);
    auto next = [&](std::uint64_t bound) { return random.below(bound); };
    for (int file = 0; file < 60; ++file) {
        const char delimiter = ",;\t|"[file % 4];
        // Mostly plain records, as in real drops; now and then a quoted field (with
        // delimiters, line breaks and doubled quotes), a stray quote, a lone CR, an
        // empty line, a long field over several 64-byte blocks, or CR LF line ends.
        const bool crlf = file % 3 == 1;
        std::string text;
        const int records = 50 + static_cast<int>(next(400));
        for (int r = 0; r < records; ++r) {
            const int fields = 1 + static_cast<int>(next(6));
            for (int f = 0; f < fields; ++f) {
                if (f > 0)
                    text += delimiter;
                const std::uint64_t kind = next(100);
                if (kind < 80) {
                    for (std::uint64_t k = next(12); k > 0; --k)
                        text += "0123456789-DAZ "[next(15)];
                } else if (kind < 86) {
                    text += '"';
                    for (std::uint64_t k = next(10); k > 0; --k) {
                        const std::uint64_t c = next(8);
                        text += c == 0   ? std::string("\"\"")
                                : c == 1 ? std::string(1, delimiter)
                                : c == 2 ? std::string("\n")
                                : c == 3 ? std::string("\r\n")
                                         : std::string(1, "xyz7"[c % 4]);
                    }
                    text += '"';
                } else if (kind < 89) {
                    text += "a\"b";
                } else if (kind < 91) {
                    text += "c\rd";
                } else if (kind < 95) {
                    text += std::string(40 + next(150), 'w');
                }  // else an empty field
            }
            if (next(40) == 0)
                text += crlf ? "\r\n" : "\n";  // an empty line
            text += crlf ? "\r\n" : "\n";
        }
        if (file % 5 == 0)
            text.pop_back();  // no line break after the last record
        SCOPED_TRACE("file " + std::to_string(file));
        const std::vector<ReferenceRecord> expected = referenceScan(text, delimiter);
        CsvScanner scanner(text, delimiter);
        CsvRecord record;
        std::size_t k = 0;
        while (scanner.next(record)) {
            ASSERT_LT(k, expected.size());
            const ReferenceRecord& e = expected[k];
            ASSERT_EQ(record.fields.size(), e.fields.size()) << "record " << k;
            for (std::size_t f = 0; f < e.fields.size(); ++f) {
                ASSERT_EQ(record.fields[f].text, e.fields[f]) << "record " << k << " field " << f;
                ASSERT_EQ(record.fields[f].quoted, e.quoted[f]) << "record " << k;
            }
            ASSERT_EQ(record.line, e.line) << "record " << k;
            ASSERT_EQ(record.offset, e.offset) << "record " << k;
            ASSERT_EQ(record.strayQuote, e.strayQuote) << "record " << k;
            ++k;
        }
        EXPECT_FALSE(scanner.failed()) << scanner.error().message;
        EXPECT_EQ(k, expected.size());
        EXPECT_EQ(scanner.position(), text.size());
    }
}

}  // namespace
}  // namespace siftwave::ingest::detail
