// Bad input: each class gives a clear error with file, line and column where there
// is one, and nothing crashes or hangs.
#include "siftwave/ingest/ingest.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>
#include <sys/stat.h>

#include <filesystem>
#include <fstream>
#include <random>
#include <string>

namespace siftwave::ingest {
namespace {

Error errorOf(const std::string& text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "bad.csv", options);
    EXPECT_FALSE(drop.ok());
    if (drop.ok())
        return Error{};
    EXPECT_EQ(drop.error().file, "bad.csv");
    return drop.error();
}

bool mentions(const Error& e, const std::string& words) {
    return e.message.find(words) != std::string::npos;
}

TEST(IngestBadInput, InvalidUtf8IsAnErrorWithItsByteOffset) {
    // 0xE9 alone is Latin-1 "é", not UTF-8 (RFC 3629, section 3: a lead byte needs its
    // continuation).
    const Error e = errorOf("date,region,cases\n2026-01-01,Bogot\xE9,1\n");
    EXPECT_EQ(e.code, ErrorCode::Encoding);
    EXPECT_EQ(e.line, 2u);
    EXPECT_EQ(e.column, 17u);
    EXPECT_TRUE(mentions(e, "byte offset 34 (0xE9) is not valid UTF-8")) << e.message;
}

TEST(IngestBadInput, OverlongAndSurrogateSequencesAreInvalidUtf8) {
    // RFC 3629, section 3: overlong forms (C0 80) and surrogates (ED A0 80) are not UTF-8.
    EXPECT_EQ(errorOf("date,region,cases\n2026-01-01,A\xC0\x80,1\n").code, ErrorCode::Encoding);
    EXPECT_EQ(errorOf("date,region,cases\n2026-01-01,A\xED\xA0\x80,1\n").code, ErrorCode::Encoding);
    EXPECT_EQ(errorOf("date,region,cases\n2026-01-01,A\xF4\x90\x80\x80,1\n").code,
              ErrorCode::Encoding);
    Result<Drop> ok = parseDrop(
        "date,region,cases\n2026-01-01,\xC3\x85land \xE2\x82\xAC\xF0\x9F\x98\x80,1\n", "ok.csv");
    ASSERT_TRUE(ok.ok()) << ok.error().describe();
    EXPECT_EQ(ok->regionCodes[0], "\xC3\x85land \xE2\x82\xAC\xF0\x9F\x98\x80");
}

TEST(IngestBadInput, InvalidUtf8FarIntoTheFileIsFound) {
    std::string text = "date,region,cases\n";
    for (int i = 0; i < 200000; ++i)
        text += "2026-01-01,R" + std::to_string(i % 1000) + ",1\n";
    const std::size_t offset = text.size() + 11;
    text += "2026-01-02,\xFF,1\n";
    const Error e = errorOf(text);
    EXPECT_EQ(e.code, ErrorCode::Encoding);
    EXPECT_EQ(e.line, 200002u);
    EXPECT_EQ(e.column, 12u);
    EXPECT_TRUE(mentions(e, "byte offset " + std::to_string(offset))) << e.message;
}

TEST(IngestBadInput, Utf16AndNulBytesAreRefused) {
    EXPECT_TRUE(mentions(errorOf(std::string("\xFF\xFE"
                                             "d\0a\0",
                                             6)),
                         "UTF-16"));
    const Error nul = errorOf(std::string("date,region,cases\n2026-01-01,A\0,1\n", 34));
    EXPECT_EQ(nul.code, ErrorCode::Encoding);
    EXPECT_EQ(nul.line, 2u);
    EXPECT_TRUE(mentions(nul, "NUL byte"));
}

TEST(IngestBadInput, AnUnclosedQuoteNamesWhereItOpened) {
    const Error e =
        errorOf("date,region,cases\n2026-01-01,A,1\n2026-01-02,\"B,2\n2026-01-03,C,3\n");
    EXPECT_EQ(e.code, ErrorCode::Syntax);
    EXPECT_EQ(e.line, 3u);
    EXPECT_EQ(e.column, 2u);
    EXPECT_TRUE(mentions(e, "never closed"));
}

TEST(IngestBadInput, TextAfterAClosingQuoteIsASyntaxError) {
    const Error e = errorOf("date,region,cases\n2026-01-01,\"A\"x,1\n");
    EXPECT_EQ(e.code, ErrorCode::Syntax);
    EXPECT_EQ(e.line, 2u);
    EXPECT_EQ(e.column, 2u);
    EXPECT_TRUE(mentions(e, "after the closing quote"));
}

TEST(IngestBadInput, ARowWithTheWrongNumberOfFieldsIsAnError) {
    // RFC 4180, section 2, rule 4: each line should contain the same number of fields.
    const Error more = errorOf("date,region,cases\n2026-01-01,A,1\n2026-01-02,A,1,5\n");
    EXPECT_EQ(more.code, ErrorCode::Syntax);
    EXPECT_EQ(more.line, 3u);
    EXPECT_EQ(more.column, 4u);
    EXPECT_EQ(
        more.message,
        "this row has 4 fields but the header has 3 (a comma inside a value that is not quoted?)");
    const Error fewer = errorOf("date,region,cases\n2026-01-01,A,1\n2026-01-02,A\n");
    EXPECT_EQ(fewer.line, 3u);
    EXPECT_EQ(fewer.column, 3u);
    EXPECT_EQ(fewer.message, "this row has 2 fields but the header has 3");
}

TEST(IngestBadInput, EmptyAndHeaderOnlyFilesAreErrors) {
    EXPECT_TRUE(mentions(errorOf(""), "the file is empty"));
    EXPECT_TRUE(mentions(errorOf("\n\r\n  \n"), "the file is empty"));
    const Error headerOnly = errorOf("date,region,cases\n");
    EXPECT_EQ(headerOnly.code, ErrorCode::Layout);
    EXPECT_TRUE(mentions(headerOnly, "no data rows"));
}

TEST(IngestBadInput, ASingleColumnFileAsksForTheDelimiter) {
    const Error e = errorOf("date region cases\n2026-01-01 A 1\n");
    EXPECT_EQ(e.code, ErrorCode::Layout);
    EXPECT_TRUE(mentions(e, "--delimiter"));
}

TEST(IngestBadInput, CarriageReturnOnlyLineEndingsAreNamed) {
    const Error e = errorOf("date,region,cases\r2026-01-01,A,1\r");
    EXPECT_EQ(e.code, ErrorCode::Syntax);
    EXPECT_TRUE(mentions(e, "carriage return alone"));
}

TEST(IngestBadInput, TwoValueColumnsWithOneNameAreAnError) {
    const Error e = errorOf("date,region,cases,cases\n2026-01-01,A,1,2\n");
    EXPECT_EQ(e.code, ErrorCode::Layout);
    EXPECT_EQ(e.line, 1u);
    EXPECT_EQ(e.column, 4u);
    EXPECT_TRUE(mentions(e, "columns 3 and 4 are both named 'cases'"));
}

TEST(IngestBadInput, AFileWithoutDatesAsksForTheDateColumn) {
    const Error e = errorOf("region,cases\nA,1\nB,2\n");
    EXPECT_EQ(e.code, ErrorCode::Layout);
    EXPECT_TRUE(mentions(e, "--date-col"));
}

TEST(IngestBadInput, NamingAColumnThatDoesNotExistListsTheColumns) {
    IngestOptions options;
    options.valueColumns = {"hospitalised"};
    const Error e = errorOf("date,region,cases\n2026-01-01,A,1\n", options);
    EXPECT_EQ(e.code, ErrorCode::Usage);
    EXPECT_EQ(
        e.message,
        "--value-col names 'hospitalised', but there is no such column; the columns are 'date', "
        "'region', 'cases'");
}

TEST(IngestBadInput, WrongOptionsAreUsageErrors) {
    IngestOptions badFormat;
    badFormat.dateFormat = "DD.MM.YY";
    EXPECT_EQ(badFormat.validate().error().code, ErrorCode::Usage);
    Result<Drop> refused = parseDrop("date,region,cases\n2026-01-01,A,1\n", "x.csv", badFormat);
    ASSERT_FALSE(refused.ok());
    EXPECT_EQ(refused.error().code, ErrorCode::Usage);
    EXPECT_TRUE(
        mentions(refused.error(), "use YYYY-MM-DD, YYYYMMDD, DD/MM/YYYY, MM/DD/YYYY or YYYY-Www"));
    IngestOptions quote;
    quote.delimiter = '"';
    EXPECT_FALSE(quote.validate().ok());
    IngestOptions twice;
    twice.valueColumns = {"cases", "cases"};
    EXPECT_FALSE(twice.validate().ok());
    EXPECT_TRUE(IngestOptions{}.validate().ok());
}

TEST(IngestBadInput, MissingFilesAndFoldersAreIoErrors) {
    Result<Drop> missing = readDrop("/nonexistent/siftwave/drop.csv");
    ASSERT_FALSE(missing.ok());
    EXPECT_EQ(missing.error().code, ErrorCode::Io);
    EXPECT_EQ(missing.error().file, "/nonexistent/siftwave/drop.csv");
    EXPECT_TRUE(mentions(missing.error(), "cannot open the file"));
    Result<Drop> folder = readDrop(std::filesystem::temp_directory_path().string());
    ASSERT_FALSE(folder.ok());
    EXPECT_EQ(folder.error().code, ErrorCode::Io);
}

TEST(IngestBadInput, EmptyKeyCellsSkipTheRowWithAWarning) {
    Result<Drop> drop =
        parseDrop("date,region,cases\n2026-01-01,A,1\n2026-01-01,,2\n,A,3\n", "k.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->rows, 3u);
    EXPECT_EQ(drop->countCells().reported, 1u);
    int warned = 0;
    for (const Warning& w : drop->warnings) {
        if (w.line == 3 && w.column == 2 &&
            w.message.find("region cell is empty") != std::string::npos)
            ++warned;
        if (w.line == 4 && w.column == 1 &&
            w.message.find("date cell is empty") != std::string::npos)
            ++warned;
    }
    EXPECT_EQ(warned, 2);
}

TEST(IngestBadInput, ReadingNeverWritesTheInput) {
    const std::filesystem::path path = siftwave::testing::testTempPath("siftwave_bad_input.csv");
    const std::string text = "date,region,cases\n2026-02-30,A,1\n";
    {
        std::ofstream out(path, std::ios::binary);
        out << text;
    }
    Result<Drop> drop = readDrop(path.string());
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().describe(),
              path.string() +
                  ":2:1: '2026-02-30' is not a real day of the calendar (read as YYYY-MM-DD)");
    std::ifstream in(path, std::ios::binary);
    const std::string after((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    EXPECT_EQ(after, text);
    std::filesystem::remove(path);
}

TEST(IngestBadInput, MangledFilesNeverCrash) {
    // Deterministic mutations of a valid drop: every result is either a drop or an error
    // with a message; none may crash or hang (common practice, no source).
    const std::string base =
        "date,region,cases,deaths\n2026-01-01,NA,5,0\n2026-01-02,\"0 4\",3,1\n2026-01-03,NA,,x\n";
    const char alphabet[] = {',', ';', '"', '\n', '\r',   '\t',   '|', '0',
                             '9', '/', '-', 'A',  '\xFF', '\xC3', ' '};
    std::mt19937 rng(20261201);
    int errors = 0, drops = 0;
    for (int round = 0; round < 3000; ++round) {
        std::string text = base;
        const int edits = 1 + static_cast<int>(rng() % 6);
        for (int k = 0; k < edits; ++k) {
            const std::size_t at = rng() % (text.size() + 1);
            const char c = alphabet[rng() % sizeof alphabet];
            switch (rng() % 3) {
                case 0:
                    text.insert(text.begin() + static_cast<std::ptrdiff_t>(at), c);
                    break;
                case 1:
                    if (at < text.size())
                        text.erase(at, 1);
                    break;
                default:
                    if (at < text.size())
                        text[at] = c;
                    break;
            }
        }
        Result<Drop> drop = parseDrop(text, "fuzz.csv");
        if (drop.ok()) {
            ++drops;
            EXPECT_EQ(drop->tables.size(), drop->measures.size());
            for (const CellTable& t : drop->tables) {
                EXPECT_EQ(t.regions(), drop->regionCodes.size());
                EXPECT_EQ(t.days(), static_cast<std::size_t>(drop->periods()));
            }
        } else {
            ++errors;
            EXPECT_FALSE(drop.error().message.empty());
        }
    }
    EXPECT_GT(drops, 0);
    EXPECT_GT(errors, 0);
}

// Regression (found by a long libFuzzer run of fuzz_drop_reader): a long file dated by year and
// week whose only row has no region kept no date, and the weekly calendar was planned from
// "no date" (a signed overflow under UBSan, and a calendar of 306 million weeks from the year
// -5877610 in `inspect`). Now it is an empty weekly calendar, with the row's warning.
TEST(IngestBadInput, AWeeklyFileWhoseRowsAllLackARegionHasAnEmptyCalendar) {
    IngestOptions options;
    options.layout = Layout::Long;
    Result<Drop> drop = parseDrop("year,week,{date,reases\n2001,1,81,", "weeks.csv", options);
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->periods(), 0);
    EXPECT_TRUE(drop->regionCodes.empty());
    ASSERT_FALSE(drop->warnings.empty());
}

// Regression (found by libFuzzer, reliability issue item 2): a short record before the first
// whole one made the calendar prediction read a date field past the record's end. Under
// AddressSanitizer this was a heap-buffer-overflow; now the short record is an error with its
// line, and records after it are never indexed past their fields.
TEST(IngestBadInput, AShortRecordBeforeTheFirstWholeOneIsReportedNotRead) {
    Result<Drop> drop = parseDrop("x,y,z\na\n,2026-01-01,5\n", "short.csv");
    if (drop.ok()) {
        // Read as some layout: the short record must then be a warning on line 2.
        bool warned = false;
        for (const Warning& w : drop->warnings)
            warned = warned || w.line == 2;
        EXPECT_TRUE(warned);
    } else {
        EXPECT_EQ(drop.error().file, "short.csv");
        EXPECT_GT(drop.error().line, 0u) << drop.error().describe();
    }
    // Every short-record position in the first rows of a long file.
    for (int at = 0; at < 5; ++at) {
        std::string text = "date,region,cases\n";
        for (int i = 0; i < 5; ++i)
            text += i == at ? std::string("A\n") : "2026-01-0" + std::to_string(i + 1) + ",R,1\n";
        Result<Drop> d = parseDrop(text, "short.csv");
        if (!d.ok()) {
            EXPECT_EQ(d.error().line, static_cast<std::uint64_t>(at + 2)) << d.error().describe();
        }
    }
}

// Reliability issue, item 7: 0001-01-01 is a real day of the proleptic Gregorian calendar (ISO
// 8601); what stops it is the supported range, and the message says so. 2026-02-30 is no day.
TEST(IngestBadInput, AYearOutsideTheSupportedRangeIsNamedAsSuch) {
    const Error early = errorOf("date,region,cases\n0001-01-01,A,1\n2026-01-02,A,1\n");
    EXPECT_EQ(early.line, 2u);
    EXPECT_TRUE(
        mentions(early, "is a real day, but outside the years Siftwave reads (1400 to 9999)"))
        << early.message;
    const Error missing = errorOf("date,region,cases\n2026-01-01,A,1\n2026-02-30,A,1\n");
    EXPECT_TRUE(mentions(missing, "is not a real day of the calendar")) << missing.message;
}

// Reliability issue, item 6: a FIFO with no writer used to block the reader forever; now it
// reads as empty at once (the open does not wait for a writer). Bounded by the test's own
// timeout (ctest), not by a clock here.
TEST(IngestBadInput, AFifoWithNoWriterIsReadAsEmptyWithoutBlocking) {
    const std::filesystem::path fifo = testing::testTempPath("no-writer.fifo");
    std::filesystem::remove(fifo);
    ASSERT_EQ(::mkfifo(fifo.c_str(), 0600), 0);
    Result<Drop> drop = readDrop(fifo.string());
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().file, fifo.string());
    std::filesystem::remove(fifo);
}

// Item 6: /dev/zero never ends. It used to end in an uncaught std::bad_alloc (SIGABRT); now the
// stream is read up to InputFile::kMaxStreamBytes and refused with a message that says what to
// do.
TEST(IngestBadInput, AnEndlessStreamIsRefusedAtItsLimit) {
    if (!std::filesystem::exists("/dev/zero"))
        GTEST_SKIP() << "no /dev/zero on this system";
    Result<Drop> drop = readDrop("/dev/zero");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::Io);
    EXPECT_TRUE(mentions(drop.error(), "not a regular file")) << drop.error().message;
    EXPECT_TRUE(mentions(drop.error(), "save the data to a file")) << drop.error().message;
}

}  // namespace
}  // namespace siftwave::ingest
