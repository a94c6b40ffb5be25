// Spreadsheet drops (.xlsx, .ods): the same Drop as the CSV, dates as ECMA-376 defines serial
// numbers, sheets and tables as agencies publish them, and the refusals (bombs, damage, macros,
// links, encryption). Fixtures: tests/data/spreadsheets (tools/fixtures/
// make_spreadsheet_fixtures.py, written by openpyxl and odfpy); small archives built here.
#include "ingest/spreadsheet/sheet_rows.h"
#include "ingest/spreadsheet/workbook_open.h"
#include "ingest/spreadsheet/xlsx_parts.h"
#include "siftwave/ingest/ingest.h"

#include "support/zip_builder.h"

#include <gtest/gtest.h>

#include <sys/resource.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace siftwave {
namespace {

using ingest::detail::isDateFormat;
using ingest::detail::isoDateOfSerial;
using testing::makeXlsx;
using testing::makeZip;

const std::string kDir = std::string(SIFTWAVE_TEST_DATA_DIR) + "/spreadsheets/";

std::string slurp(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

Drop readOk(const std::string& path, const ingest::IngestOptions& options = {}) {
    Result<Drop> drop = ingest::readDrop(path, options);
    EXPECT_TRUE(drop.ok()) << (drop.ok() ? "" : drop.error().describe());
    return drop.ok() ? std::move(*drop) : Drop{};
}

Error errorOf(const std::string& bytes, const std::string& name = "book.xlsx",
              const ingest::IngestOptions& options = {}) {
    Result<Drop> drop = ingest::parseDrop(bytes, name, options);
    EXPECT_FALSE(drop.ok());
    return drop.ok() ? Error{} : drop.error();
}

bool mentions(const Error& e, const std::string& words) {
    return e.message.find(words) != std::string::npos;
}

std::string serialDate(double serial, bool date1904) {
    bool fictitious = false;
    return isoDateOfSerial(serial, date1904, fictitious);
}

// ECMA-376 Part 1 (5th ed.), 18.17.4.1 "Date Conversion for Serial Values": in the 1900 date
// base system serial value 1 is 1900-01-01 and 60 is 1900-02-29, a day the system counts for
// compatibility though 1900 was no leap year; 61 is 1900-03-01. In the 1904 base system serial
// value 0 is 1904-01-01. 43831 = 2020-01-01 and its 1904 twin 42369 (1462 days less) are from
// memory, checked by the openpyxl-written fixtures below.
TEST(IngestSpreadsheetDates, SerialNumbersAreTheDaysEcma376Names) {
    EXPECT_EQ(serialDate(1, false), "1900-01-01");
    EXPECT_EQ(serialDate(59, false), "1900-02-28");
    EXPECT_EQ(serialDate(61, false), "1900-03-01");
    EXPECT_EQ(serialDate(43831, false), "2020-01-01");
    EXPECT_EQ(serialDate(43831.75, false), "2020-01-01");  // the time of day is dropped
    EXPECT_EQ(serialDate(0, true), "1904-01-01");
    EXPECT_EQ(serialDate(1, true), "1904-01-02");
    EXPECT_EQ(serialDate(42369, true), "2020-01-01");
    EXPECT_EQ(serialDate(0, false), "");  // no day in the 1900 system
    EXPECT_EQ(serialDate(-1, true), "");
}

TEST(IngestSpreadsheetDates, SerialSixtyOfThe1900SystemIsNoDay) {
    bool fictitious = false;
    EXPECT_EQ(isoDateOfSerial(60, false, fictitious), "");
    EXPECT_TRUE(fictitious);
    EXPECT_EQ(isoDateOfSerial(60, true, fictitious), "1904-03-01");  // 1904 was a leap year
    EXPECT_FALSE(fictitious);
}

TEST(IngestSpreadsheetDates, DateFormatsAreTheBuiltInIdsAndCodesWithDayOrYear) {
    // ECMA-376 Part 1, 18.8.30: built-in formats 14 to 22 are dates (and date-times).
    for (int id = 14; id <= 22; ++id)
        EXPECT_TRUE(isDateFormat(id, "")) << id;
    EXPECT_FALSE(isDateFormat(0, "General"));
    EXPECT_FALSE(isDateFormat(2, ""));  // 0.00
    EXPECT_TRUE(isDateFormat(164, "yyyy-mm-dd"));
    EXPECT_TRUE(isDateFormat(165, "[$-407]dd.mm.yyyy"));
    EXPECT_FALSE(isDateFormat(166, "[h]:mm:ss"));   // elapsed time, not a date
    EXPECT_FALSE(isDateFormat(167, "0\" days\""));  // quoted text is not a token
    EXPECT_FALSE(isDateFormat(168, "#,##0;[Red]-#,##0"));
}

TEST(IngestSpreadsheetDates, OpenpyxlsFilesInBothDateSystemsGiveTheSameDays) {
    // The same seven dates written by openpyxl (a general-purpose library) in the 1900 system
    // (built-in format 14) and in the 1904 system (workbookPr date1904="1").
    const Drop d1900 = readOk(kDir + "dates_1900.xlsx");
    const Drop d1904 = readOk(kDir + "dates_1904.xlsx");
    ASSERT_EQ(d1900.periods(), 7);
    ASSERT_EQ(d1904.periods(), 7);
    EXPECT_EQ(d1900.periodStart(0).iso(), "2026-01-05");
    EXPECT_EQ(d1904.periodStart(0).iso(), "2026-01-05");
    EXPECT_EQ(d1904.periodStart(6).iso(), "2026-01-11");
    EXPECT_EQ(d1900.cell(0, 0, 6).value, 16);
    EXPECT_EQ(d1904.cell(0, 0, 6).value, 16);
}

TEST(IngestSpreadsheetDates, TheFictitiousDayIsAnErrorAtItsCell) {
    const Result<Drop> drop = ingest::readDrop(kDir + "fictitious_day.xlsx");
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().cell, "data!A3");
    EXPECT_TRUE(mentions(drop.error(), "serial number 60")) << drop.error().message;
}

TEST(IngestSpreadsheetDates, A1904WorkbookBuiltByHandReadsSerialsFromItsBase) {
    // Serial 0 is 1904-01-01 (18.17.4.1); style 1 has built-in date format 14.
    const std::string book =
        makeXlsx({{"data",
                   "<sheetData><row r=\"1\"><c r=\"A1\" t=\"inlineStr\"><is><t>date</t></is></c>"
                   "<c r=\"B1\" t=\"inlineStr\"><is><t>region</t></is></c>"
                   "<c r=\"C1\" t=\"inlineStr\"><is><t>cases</t></is></c></row>"
                   "<row r=\"2\"><c r=\"A2\" s=\"1\"><v>0</v></c><c r=\"B2\" t=\"inlineStr\"><is>"
                   "<t>QA</t></is></c><c r=\"C2\"><v>4</v></c></row>"
                   "<row r=\"3\"><c r=\"A3\" s=\"1\"><v>1</v></c><c r=\"B3\" t=\"inlineStr\"><is>"
                   "<t>QA</t></is></c><c r=\"C3\"><v>5</v></c></row></sheetData>"}},
                 "<workbookPr date1904=\"1\"/>",
                 "<cellXfs><xf numFmtId=\"0\"/><xf numFmtId=\"14\"/></cellXfs>");
    const Result<Drop> drop = ingest::parseDrop(book, "book.xlsx");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->periodStart(0).iso(), "1904-01-01");
    EXPECT_EQ(drop->periodStart(1).iso(), "1904-01-02");
}

/// The Drop parts that must be equal whatever the file format.
void expectSameDrop(const Drop& a, const Drop& b) {
    EXPECT_EQ(a.regionCodes, b.regionCodes);
    EXPECT_EQ(a.measures, b.measures);
    EXPECT_EQ(a.axis.describe(), b.axis.describe());
    EXPECT_EQ(a.rows, b.rows);
    EXPECT_EQ(a.source.layout, b.source.layout);
    EXPECT_EQ(a.source.columns.values, b.source.columns.values);
    ASSERT_EQ(a.tables.size(), b.tables.size());
    for (std::size_t m = 0; m < a.tables.size(); ++m)
        for (std::size_t r = 0; r < a.regionCodes.size(); ++r)
            for (std::int32_t d = 0; d < a.periods(); ++d) {
                const Cell& x = a.cell(m, r, d);
                const Cell& y = b.cell(m, r, d);
                ASSERT_EQ(x.value, y.value) << m << " " << r << " " << d;
                ASSERT_EQ(x.state, y.state);
                ASSERT_EQ(x.line, y.line);  // a CSV line is the sheet's row
            }
}

TEST(IngestSpreadsheetSameDrop, AWeeklyDropReadsAlikeAsCsvXlsxAndOds) {
    const Drop csv = readOk(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/fluBYBW_weekly_wide.csv");
    const Drop xlsx = readOk(kDir + "flu_weekly_wide.xlsx");
    const Drop ods = readOk(kDir + "flu_weekly_wide.ods");
    EXPECT_TRUE(csv.axis.weekly());
    expectSameDrop(csv, xlsx);
    expectSameDrop(csv, ods);
    EXPECT_EQ(xlsx.source.format, "xlsx");
    EXPECT_EQ(ods.source.format, "ods");
    EXPECT_EQ(xlsx.source.sheet, "data");
    EXPECT_EQ(xlsx.source.sha256.size(), 64u);
}

TEST(IngestSpreadsheetSameDrop, CodesWithLeadingZerosStayText) {
    const Drop csv = readOk(kDir + "flu_weekly_ags.csv");
    const Drop xlsx = readOk(kDir + "flu_weekly_ags.xlsx");
    const Drop ods = readOk(kDir + "flu_weekly_ags.ods");
    ASSERT_FALSE(xlsx.regionCodes.empty());
    EXPECT_EQ(xlsx.regionCodes.front(), "08311");
    expectSameDrop(csv, xlsx);
    expectSameDrop(csv, ods);
}

TEST(IngestSpreadsheetSameDrop, ADailyDropWithARegionCodedNaReadsAlike) {
    const Drop csv = readOk(std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv");
    const Drop xlsx = readOk(kDir + "quenmara_current.xlsx");
    const Drop ods = readOk(kDir + "quenmara_current.ods");
    EXPECT_TRUE(xlsx.regionIndex("NA").has_value());
    expectSameDrop(csv, xlsx);
    expectSameDrop(csv, ods);
}

void expectLayoutRead(const Drop& drop) {
    EXPECT_EQ(drop.source.sheet, "data");
    EXPECT_EQ(drop.source.sheets, (std::vector<std::string>{"notes", "data", "empty"}));
    EXPECT_EQ(drop.regionCodes, (std::vector<std::string>{"KV", "NA", "0412"}));
    EXPECT_EQ(drop.source.columns.date, "week");
    EXPECT_EQ(drop.periods(), 6);
    EXPECT_EQ(drop.rows, 6u);
    // C8 holds #N/A: region NA (the table's second value column), week 3; unparsable, no number.
    const Cell& c = drop.cell(0, 1, 2);
    EXPECT_EQ(c.state, CellState::Unparsable);
    EXPECT_EQ(c.line, 8u);
    EXPECT_EQ(drop.cell(0, 0, 2).value, 12);
    std::vector<std::string> places;
    for (const Warning& w : drop.warnings)
        places.push_back(sourcePlace(drop.source, w.line, w.column) + " " + w.message);
    auto has = [&](const std::string& start, const std::string& words) {
        for (const std::string& p : places)
            if (p.starts_with(start) && p.find(words) != std::string::npos)
                return true;
        return false;
    };
    EXPECT_TRUE(has("data!1:1 ", "title or note row")) << ::testing::PrintToString(places);
    EXPECT_TRUE(has("data!2:2 ", "title or note row"));
    EXPECT_TRUE(has("data!C8 ", "error value #N/A"));
    EXPECT_TRUE(has("data!13:13 ", "note row below the table"));
}

TEST(IngestSpreadsheetTables, NotesSheetTitleRowsMergedHeaderAndErrorCellsXlsx) {
    expectLayoutRead(readOk(kDir + "layout.xlsx"));
}

TEST(IngestSpreadsheetTables, NotesSheetTitleRowsMergedHeaderAndErrorCellsOds) {
    expectLayoutRead(readOk(kDir + "layout.ods"));
}

TEST(IngestSpreadsheetTables, SheetIsChosenByNameOrPosition) {
    ingest::IngestOptions byName;
    byName.sheet = "data";
    EXPECT_EQ(readOk(kDir + "layout.xlsx", byName).source.sheet, "data");
    ingest::IngestOptions byIndex;
    byIndex.sheet = "2";
    EXPECT_EQ(readOk(kDir + "layout.ods", byIndex).source.sheet, "data");
}

TEST(IngestSpreadsheetTables, AnEmptySheetAMissingSheetAndSheetOnCsvAreErrors) {
    ingest::IngestOptions empty;
    empty.sheet = "empty";
    Result<Drop> drop = ingest::readDrop(kDir + "layout.xlsx", empty);
    ASSERT_FALSE(drop.ok());
    EXPECT_TRUE(mentions(drop.error(), "sheet 'empty' is empty")) << drop.error().message;
    ingest::IngestOptions missing;
    missing.sheet = "7";
    drop = ingest::readDrop(kDir + "layout.ods", missing);
    ASSERT_FALSE(drop.ok());
    EXPECT_TRUE(mentions(drop.error(), "2 'data'")) << drop.error().message;
    drop = ingest::readDrop(kDir + "flu_weekly_ags.csv", missing);
    ASSERT_FALSE(drop.ok());
    EXPECT_EQ(drop.error().code, ErrorCode::Usage);
}

TEST(IngestSpreadsheetTables, EverySheetWithDatesIsListedAndTheFirstIsReadByDefault) {
    // A notes sheet, then two tables with dates (two districts' releases in one workbook).
    const std::string book = testing::makeTwoTableXlsx();
    Result<Drop> drop = ingest::parseDrop(book, "two.xlsx");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.sheet, "north");
    EXPECT_EQ(drop->source.datedSheets, (std::vector<std::string>{"north", "south"}));
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"N1"}));
    ingest::IngestOptions south;
    south.sheet = "south";
    drop = ingest::parseDrop(book, "two.xlsx", south);
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"S1"}));
    EXPECT_EQ(drop->source.datedSheets, (std::vector<std::string>{"north", "south"}));
    // One sheet: nothing to choose between, nothing listed.
    EXPECT_TRUE(readOk(kDir + "flu_weekly_ags.xlsx").source.datedSheets.empty());
    EXPECT_EQ(readOk(kDir + "layout.ods").source.datedSheets, (std::vector<std::string>{"data"}));
}

TEST(IngestSpreadsheetTables, ADelimiterForAWorkbookIsAUsageErrorNotIgnored) {
    ingest::IngestOptions semicolon;
    semicolon.delimiter = ';';
    for (const char* book : {"layout.xlsx", "layout.ods"}) {
        Result<Drop> drop = ingest::readDrop(kDir + book, semicolon);
        ASSERT_FALSE(drop.ok()) << book;
        EXPECT_EQ(drop.error().code, ErrorCode::Usage) << book;
        EXPECT_TRUE(mentions(drop.error(), "--delimiter applies to a CSV file"))
            << drop.error().message;
    }
}

TEST(IngestSpreadsheetCells, CellTypesReadAsTheStandardDefinesThem) {
    // 18.18.11 ST_CellType: s, inlineStr, str, b, e, d, n. Shared string 0 is "0412".
    const std::string book = makeXlsx(
        {{"data",
          "<sheetData><row r=\"2\"><c r=\"B2\" t=\"s\"><v>1</v></c><c r=\"C2\" t=\"s\"><v>2</v></c>"
          "<c r=\"D2\" t=\"inlineStr\"><is><t>cases</t></is></c><c r=\"E2\" t=\"str\"><f>\"x\"</f>"
          "<v>flag</v></c></row>"
          "<row r=\"3\"><c r=\"B3\" t=\"d\"><v>2026-03-02T00:00:00</v></c><c r=\"C3\" t=\"s\">"
          "<v>0</v></c><c r=\"D3\"><v>1.2E1</v></c><c r=\"E3\" t=\"b\"><v>1</v></c></row>"
          "<row r=\"4\"><c r=\"B4\" t=\"d\"><v>2026-03-03</v></c><c r=\"C4\" t=\"s\"><v>0</v></c>"
          "<c r=\"D4\" t=\"e\"><v>#VALUE!</v></c><c r=\"E4\" t=\"b\"><v>0</v></c></row>"
          "</sheetData>"}},
        "", "",
        "<si><t>0412</t></si><si><t>date</t></si><si><r><t>reg</t></r><r><t>ion</t></r>"
        "<rPh><t>x</t></rPh></si>");
    const Result<Drop> drop = ingest::parseDrop(book, "book.xlsx");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->source.firstColumn, 1u);  // the table starts in column B
    EXPECT_EQ(drop->source.columns.region, "region");
    EXPECT_EQ(drop->regionCodes, (std::vector<std::string>{"0412"}));
    EXPECT_EQ(drop->periodStart(0).iso(), "2026-03-02");
    EXPECT_EQ(drop->cell(0, 0, 0).value, 12);
    EXPECT_EQ(drop->cell(0, 0, 1).state, CellState::Unparsable);
    bool named = false;
    for (const Warning& w : drop->warnings)
        named = named || (sourcePlace(drop->source, w.line, w.column) == "data!D4" &&
                          w.message.find("#VALUE!") != std::string::npos);
    EXPECT_TRUE(named);
}

TEST(IngestSpreadsheetCells, ASharedStringThatIsNotThereIsAnErrorAtItsCell) {
    const std::string book = makeXlsx(
        {{"data", "<sheetData><row r=\"1\"><c r=\"A1\" t=\"s\"><v>5</v></c></row></sheetData>"}},
        "", "", "<si><t>date</t></si>");
    const Error e = errorOf(book);
    EXPECT_TRUE(mentions(e, "data!A1")) << e.message;
    EXPECT_TRUE(mentions(e, "shared string")) << e.message;
}

TEST(IngestSpreadsheetCells, AnErrorInTheDataNamesTheSheetAndCell) {
    // The date column's row 3 holds text that is no date: the CSV path's message, at data!B3.
    const std::string book =
        makeXlsx({{"data",
                   "<sheetData><row r=\"1\"><c r=\"B1\" t=\"inlineStr\"><is><t>date</t></is></c>"
                   "<c r=\"C1\" t=\"inlineStr\"><is><t>region</t></is></c><c r=\"D1\" "
                   "t=\"inlineStr\"><is><t>cases</t></is></c></row><row r=\"2\"><c r=\"B2\" "
                   "t=\"inlineStr\"><is><t>2026-01-05</t></is></c><c r=\"C2\" t=\"inlineStr\"><is>"
                   "<t>QA</t></is></c><c r=\"D2\"><v>1</v></c></row><row r=\"3\"><c r=\"B3\" "
                   "t=\"inlineStr\"><is><t>2026-13-45</t></is></c><c r=\"C3\" t=\"inlineStr\"><is>"
                   "<t>QA</t></is></c><c r=\"D3\"><v>1</v></c></row></sheetData>"}});
    const Error e = errorOf(book);
    EXPECT_EQ(e.cell, "data!B3");
    EXPECT_EQ(e.describe().rfind("book.xlsx: data!B3: ", 0), 0u) << e.describe();
}

// --- Safety -------------------------------------------------------------------------------

long peakKib() {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return usage.ru_maxrss;
}

TEST(IngestSpreadsheetSafety, AZipBombIsRefusedWithinTheMemoryBound) {
    // 8 MiB of one repeated row deflate about 1000:1, far beyond the 250:1 a sheet reaches.
    std::string row = "<row><c t=\"inlineStr\"><is><t>x</t></is></c></row>";
    std::string huge;
    huge.reserve(std::size_t{8} << 20);
    huge += "<sheetData>";
    while (huge.size() < (std::size_t{8} << 20))
        huge += row;
    huge += "</sheetData>";
    const std::string book = makeXlsx({{"data", huge}});
    huge = std::string();
    const long before = peakKib();
    const Error e = errorOf(book);
    EXPECT_TRUE(mentions(e, "ZIP bomb")) << e.message;
    EXPECT_LT(peakKib() - before, 32 * 1024);  // refused before any of it is held
}

TEST(IngestSpreadsheetSafety, APartUnpackingBeyondItsDeclaredSizeStopsWhileStreaming) {
    // The declared sizes of the sheet are rewritten smaller than the data (in the local header
    // and the central directory, PKWARE APPNOTE 4.3.7 and 4.3.12): the count of bytes inflated
    // stops it. libzip may notice first (a size or CRC mismatch): either way it is refused.
    std::string filler(std::size_t{8} << 20, ' ');
    std::string book = makeXlsx({{"data", "<sheetData>" + filler + "</sheetData>"}});
    const std::string name = "xl/worksheets/sheet1.xml";
    for (std::size_t at = book.find(name); at != std::string::npos; at = book.find(name, at + 1)) {
        const bool central = book.compare(at - 46, 4, "PK\x01\x02") == 0;
        const std::size_t sizeAt = central ? at - 46 + 24 : at - 30 + 22;
        book[sizeAt] = 16, book[sizeAt + 1] = 0, book[sizeAt + 2] = 0, book[sizeAt + 3] = 0;
    }
    const long before = peakKib();
    const Error e = errorOf(book);
    EXPECT_TRUE(mentions(e, "more than its declared") || mentions(e, "damaged")) << e.message;
    EXPECT_LT(peakKib() - before, 32 * 1024);
}

TEST(IngestSpreadsheetSafety, LimitsAreCheckedOnDeclaredAndOnActualSizes) {
    std::string part(std::size_t{3} << 20, 'x');
    for (std::size_t i = 0; i < part.size(); ++i)
        part[i] = static_cast<char>('a' + (i * 7919 + i / 13) % 26);  // compresses poorly
    const std::string book =
        makeXlsx({{"data", "<sheetData/>"}}, "", "", "", {{"xl/extra.xml", "<x>" + part + "</x>"}});
    ingest::detail::ArchiveLimits limits;
    limits.maxPartBytes = std::size_t{1} << 20;
    Result<std::unique_ptr<ingest::detail::ZipArchive>> archive =
        ingest::detail::ZipArchive::open(book, "book.xlsx", limits);
    ASSERT_TRUE(archive.ok());
    const Status s = (*archive)->stream("xl/extra.xml", [](std::string_view) { return true; });
    ASSERT_FALSE(s.ok());
    EXPECT_TRUE(mentions(s.error(), "MiB")) << s.error().message;
}

TEST(IngestSpreadsheetSafety, AZipThatIsNoWorkbookIsNamedAsAZipArchive) {
    const Error e = errorOf(makeZip({{"cases.csv", "date,region,cases\n"}}), "cases.zip");
    EXPECT_TRUE(mentions(e, "ZIP archive that is neither")) << e.message;
    EXPECT_TRUE(mentions(e, "unzip")) << e.message;
}

TEST(IngestSpreadsheetSafety, TruncatedArchivesAreRefusedAsDamaged) {
    const std::string whole = slurp(kDir + "flu_weekly_wide.xlsx");
    for (std::size_t keep : {whole.size() / 2, whole.size() - 30, std::size_t{40}}) {
        const Error e = errorOf(whole.substr(0, keep));
        EXPECT_TRUE(mentions(e, "truncated") || mentions(e, "damaged")) << e.message;
    }
}

TEST(IngestSpreadsheetSafety, MalformedXmlIsRefusedWithItsPartLineAndColumn) {
    const std::string book =
        makeXlsx({{"data", "<sheetData><row r=\"1\"><c r=\"A1\"><v>1</c></row></sheetData>"}});
    const Error e = errorOf(book);
    EXPECT_TRUE(
        mentions(e, "malformed XML in the workbook part xl/worksheets/sheet1.xml at line 1"))
        << e.message;
}

TEST(IngestSpreadsheetSafety, ADtdIsRefusedSoNoEntityIsExpanded) {
    std::string book = makeZip(
        {{"[Content_Types].xml", "<Types/>"},
         {"xl/workbook.xml",
          "<!DOCTYPE w [<!ENTITY a \"aaaaaaaaaa\"><!ENTITY b \"&a;&a;&a;&a;&a;\">]><workbook/>"}});
    const Error e = errorOf(book);
    EXPECT_TRUE(mentions(e, "DTD")) << e.message;
}

TEST(IngestSpreadsheetSafety, MacrosAndExternalLinksAreRefusedUnopened) {
    Error e = errorOf(
        makeXlsx({{"data", "<sheetData/>"}}, "", "", "", {{"xl/vbaProject.bin", "not run"}}));
    EXPECT_TRUE(mentions(e, "macros")) << e.message;
    e = errorOf(makeXlsx({{"data", "<sheetData/>"}}, "", "", "",
                         {{"xl/externalLinks/externalLink1.xml", "<externalLink/>"}}));
    EXPECT_TRUE(mentions(e, "links to other files")) << e.message;
    e = errorOf(makeZip({{"[Content_Types].xml",
                          "<Types><Override ContentType=\"application/"
                          "vnd.ms-excel.sheet.macroEnabled.main+xml\"/></Types>"},
                         {"xl/workbook.xml", "<workbook/>"}}));
    EXPECT_TRUE(mentions(e, "macro-enabled")) << e.message;
    e = errorOf(makeZip({{"mimetype", "application/vnd.oasis.opendocument.spreadsheet", true},
                         {"content.xml", "<document-content/>"},
                         {"Basic/Standard/Module1.xml", "<module/>"}}),
                "book.ods");
    EXPECT_TRUE(mentions(e, "macros")) << e.message;
}

TEST(IngestSpreadsheetSafety, EncryptedWorkbooksAndLegacyXlsAreRefusedWithAMessage) {
    // MS-CFB 2.2: a compound file starts D0 CF 11 E0 A1 B1 1A E1; an encrypted OOXML workbook
    // is one holding an "EncryptionInfo" stream (MS-OFFCRYPTO 2.3.4), named in UTF-16LE.
    std::string cfb("\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1", 8);
    cfb.resize(1024, '\0');
    std::string encrypted = cfb;
    for (char c : std::string("EncryptionInfo")) {
        encrypted += c;
        encrypted += '\0';
    }
    Error e = errorOf(encrypted);
    EXPECT_TRUE(mentions(e, "encrypted")) << e.message;
    e = errorOf(cfb, "old.xls");
    EXPECT_TRUE(mentions(e, ".xls")) << e.message;
}

TEST(IngestSpreadsheetSafety, OdsRepeatsAreBoundedNotExpanded) {
    // A cell repeated across every column of a row repeated down a million rows: refused
    // quickly, never expanded into 17 billion cells.
    const std::string content =
        "<office:document-content xmlns:office=\"o\" xmlns:table=\"t\" xmlns:text=\"x\">"
        "<office:body><office:spreadsheet><table:table table:name=\"data\">"
        "<table:table-row table:number-rows-repeated=\"1048576\"><table:table-cell "
        "office:value-type=\"float\" office:value=\"1\" table:number-columns-repeated=\"16384\"/>"
        "</table:table-row></table:table></office:spreadsheet></office:body>"
        "</office:document-content>";
    const Error e =
        errorOf(makeZip({{"mimetype", "application/vnd.oasis.opendocument.spreadsheet", true},
                         {"content.xml", content}}),
                "book.ods");
    EXPECT_TRUE(mentions(e, "10 million copies")) << e.message;
}

}  // namespace
}  // namespace siftwave
