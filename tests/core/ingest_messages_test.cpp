// Bad input an analyst meets on a release morning: the message names what the file really is
// and what to do, rather than a symptom of reading it as text.
#include "siftwave/ingest/ingest.h"

#include <gtest/gtest.h>

#include <string>

namespace siftwave::ingest {
namespace {

Error errorOf(const std::string& text, const IngestOptions& options = {}) {
    Result<Drop> drop = parseDrop(text, "release.csv", options);
    EXPECT_FALSE(drop.ok());
    if (drop.ok())
        return Error{};
    EXPECT_EQ(drop.error().file, "release.csv");
    return drop.error();
}

bool mentions(const Error& e, const std::string& words) {
    return e.message.find(words) != std::string::npos;
}

TEST(IngestMessages, ABrokenExcelWorkbookIsNamedAsADamagedZipContainer) {
    // An .xlsx workbook is a ZIP archive; its local file header starts "PK\3\4"
    // (PKWARE APPNOTE.TXT, section 4.3.7). Cut after its first bytes, it has no central
    // directory: the workbook reader refuses it as damaged (ingest_spreadsheet_test.cpp reads
    // whole workbooks).
    const Error e = errorOf(std::string("PK\x03\x04\x14\x00\x06\x00", 8) + "[Content_Types].xml");
    EXPECT_EQ(e.code, ErrorCode::Syntax);
    EXPECT_TRUE(mentions(e, "ZIP container")) << e.message;
    EXPECT_TRUE(mentions(e, "truncated or damaged")) << e.message;
}

TEST(IngestMessages, AGzipFileIsNamedAsCompressed) {
    // gzip members start with ID1 = 0x1F, ID2 = 0x8B (RFC 1952, section 2.3.1).
    const Error e = errorOf(std::string("\x1F\x8B\x08\x00\x00\x00\x00\x00", 8));
    EXPECT_TRUE(mentions(e, "gzip-compressed")) << e.message;
    EXPECT_TRUE(mentions(e, "decompress")) << e.message;
}

TEST(IngestMessages, APdfIsNamedAsAPdf) {
    // A PDF file starts with "%PDF-" and its version (ISO 32000-1, section 7.5.2).
    const Error e = errorOf("%PDF-1.7\n%\xE2\xE3\xCF\xD3\n1 0 obj\n");
    EXPECT_TRUE(mentions(e, "PDF document")) << e.message;
}

TEST(IngestMessages, ABinaryFileWithACarriageReturnIsNotCalledOldMacText) {
    // The opening bytes of an ELF executable hold NUL bytes; one CR and no LF further on used
    // to be reported as "lines end in a carriage return alone".
    std::string elf(
        "\x7F"
        "ELF\x02\x01\x01\x00\x00\x00\x00\x00",
        12);
    elf += "\r\x01\x02";
    const Error e = errorOf(elf);
    EXPECT_EQ(e.code, ErrorCode::Encoding);
    EXPECT_TRUE(mentions(e, "NUL byte")) << e.message;
    EXPECT_FALSE(mentions(e, "carriage return")) << e.message;
    // Real old-Mac text is still named as such.
    EXPECT_TRUE(mentions(errorOf("date,region,cases\r2026-01-01,A,1\r"), "carriage return alone"));
}

TEST(IngestMessages, AWrongDelimiterOverrideSaysWhatTheFileUses) {
    IngestOptions options;
    options.delimiter = ';';
    const Error e = errorOf("date,region,cases\n2026-01-01,A,1\n2026-01-02,A,2\n", options);
    EXPECT_EQ(e.code, ErrorCode::Layout);
    EXPECT_TRUE(mentions(e, "';' named by --delimiter")) << e.message;
    EXPECT_TRUE(mentions(e, "the file seems to use ','")) << e.message;
    EXPECT_TRUE(mentions(e, "Leave out --delimiter")) << e.message;
    // Without an override, the message still asks for one.
    const Error detected = errorOf("date region cases\n2026-01-01 A 1\n");
    EXPECT_TRUE(mentions(detected, "Name it with --delimiter")) << detected.message;
}

}  // namespace
}  // namespace siftwave::ingest
