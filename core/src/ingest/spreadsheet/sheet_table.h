#pragma once
// From a sheet's rows to the records the CSV path reads (one ingest path): the table is found
// below its title and note rows, a header over two rows (or in merged cells) becomes one row
// of names, and every row of the table becomes one CSV record written on the line numbered as
// its sheet row (a row the table skips becomes an empty line), so the CSV reader's line numbers
// are sheet rows and its field numbers the table's columns. The table's columns are those its
// header and first rows use: empty leading and trailing columns and rows are not read.

#include "ingest/spreadsheet/sheet_rows.h"
#include "siftwave/drop.h"

#include <string>
#include <vector>

namespace siftwave::ingest::detail {

/// The first rows of a sheet, enough to find its table (kHeadRows non-empty rows).
constexpr std::size_t kHeadRows = 64;

class HeadRows final : public RowSink {
public:
    bool row(const SheetRow& row) override {
        rows.push_back(row);
        return rows.size() < kHeadRows;
    }
    std::vector<SheetRow> rows;
};

/// True when the rows hold a date: a date cell, or a text cell shaped as a date.
bool holdsDates(const std::vector<SheetRow>& rows);

struct TablePlan {
    std::uint32_t headerRow = 0;       // the header's (lower) row; 0 when the sheet is empty
    std::uint32_t upperHeaderRow = 0;  // a two-row header's upper row, 0 for one row
    std::uint32_t firstColumn = 0, lastColumn = 0;
    std::vector<std::string> names;  // a two-row header: the names made of both rows
    std::vector<Warning> notes;      // title and note rows skipped, a caption read
};

/// True when the first rows may hold a header over two rows, whose merged cells matter.
bool mayHaveTwoRowHeader(const std::vector<SheetRow>& head);

TablePlan planTable(const std::vector<SheetRow>& head, const std::vector<MergedRange>& merges);

/// Writes a sheet's rows as CSV text (comma, LF, RFC 4180 quoting; a line break inside a cell
/// becomes a space, so that lines stay rows) from the table's header row on. The notes: error
/// cells, cells outside the table, note rows below it.
class CsvTextWriter final : public RowSink {
public:
    /// At most this much CSV text (the CSV path itself maps any size, but this is memory).
    static constexpr std::size_t kMaxBytes = std::size_t{1} << 30;

    CsvTextWriter(const TablePlan& plan, std::string& out) : m_plan(plan), m_out(out) {}
    bool row(const SheetRow& row) override;
    /// Ends the text; the rows held back as possible notes below the table are reported.
    void finish();
    bool tooLarge() const { return m_tooLarge; }
    std::vector<Warning> notes;

private:
    void writeRow(const SheetRow& row);
    void writeLine(std::uint32_t row, const std::vector<std::string>& fields);
    void writeField(std::string_view text);
    void noteErrorCell(const SheetRow& row, const SheetCell& cell);
    void noteOutside(const SheetRow& row, const SheetCell& cell);

    const TablePlan& m_plan;
    std::string& m_out;
    std::uint32_t m_line = 0;          // the last line written
    std::vector<SheetRow> m_heldBack;  // rows of one cell after the table's last full row
    std::size_t m_errorCells = 0, m_outsideCells = 0;
    bool m_tooLarge = false;
};

}  // namespace siftwave::ingest::detail
