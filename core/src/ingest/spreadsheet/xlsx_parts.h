#pragma once
// The parts of an .xlsx workbook a drop needs (ECMA-376 Part 1, chapter 18): the workbook
// (sheets, date system), styles (which cell formats are dates), shared strings, and the sheets.

#include "ingest/spreadsheet/sheet_rows.h"
#include "ingest/spreadsheet/zip_archive.h"

#include <string>
#include <vector>

namespace siftwave::ingest::detail {

struct XlsxBook {
    std::vector<std::string> sheetNames;
    std::vector<std::string> sheetParts;  // the worksheet part of each sheet
    bool date1904 = false;                // workbookPr date1904 (18.2.28)
    std::vector<bool> dateStyle;          // per cellXfs index: its number format is a date
    std::vector<std::string> sharedStrings;
};

/// The shared strings may hold at most this many bytes of text in all.
constexpr std::size_t kMaxSharedStringBytes = std::size_t{512} << 20;

Result<XlsxBook> readXlsxBook(ZipArchive& archive);

/// Streams sheet `index`'s rows; `mergesOnly` skips the cells (a pass for mergeCells alone).
Status readXlsxSheet(ZipArchive& archive, const XlsxBook& book, std::size_t index, RowSink& sink,
                     std::vector<MergedRange>& merges, bool mergesOnly);

/// True when a number format code shows a date: a built-in date format (ids 14 to 22,
/// 18.8.30) or a custom code whose first section holds a day or year token (d, y) outside
/// quoted text, escapes and [brackets].
bool isDateFormat(int numFmtId, std::string_view formatCode);

/// "C14" as a 0-based column and a 1-based row; false when it is not a cell reference.
bool parseCellReference(std::string_view reference, std::uint32_t& column, std::uint32_t& row);

}  // namespace siftwave::ingest::detail
