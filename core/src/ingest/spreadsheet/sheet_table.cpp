#include "ingest/spreadsheet/sheet_table.h"

#include "ingest/date_parsing.h"
#include "ingest/number_parsing.h"

#include <algorithm>

namespace siftwave::ingest::detail {
namespace {

/// A cell that looks like data: a number, a date, a boolean or an error, or a text shaped as a
/// number or a date (a region code "0412" too).
bool dataLike(const SheetCell& cell) {
    if (cell.kind != CellKind::Text)
        return true;
    const CellShape shape = shapeOf(cell.text, NumberStyle{});
    return shape != CellShape::Text && shape != CellShape::Empty;
}

bool allText(const SheetRow& row) {
    return std::none_of(row.cells.begin(), row.cells.end(), dataLike);
}

std::string rowText(const SheetRow& row) {
    std::string text;
    for (const SheetCell& c : row.cells)
        text += (text.empty() ? "" : " | ") + c.text;
    if (text.size() > 80)
        text = text.substr(0, 77) + "...";
    return text;
}

/// The first row wide enough to belong to the table: at least half as many cells as the widest
/// of the first rows, and two.
std::size_t firstTableRow(const std::vector<SheetRow>& head) {
    std::size_t widest = 0;
    for (const SheetRow& r : head)
        widest = std::max(widest, r.cells.size());
    const std::size_t threshold = std::max<std::size_t>(2, (widest + 1) / 2);
    for (std::size_t i = 0; i < head.size(); ++i) {
        if (head[i].cells.size() >= threshold)
            return i;
    }
    return 0;  // a sheet of one column: no title rows told apart
}

/// The text a merged range shows at (row, column): its top-left cell's, when that is in `rows`.
std::string textAt(const std::vector<SheetRow>& rows, const std::vector<MergedRange>& merges,
                   std::uint32_t row, std::uint32_t column) {
    auto cellText = [&](std::uint32_t r, std::uint32_t c) -> std::string {
        for (const SheetRow& sr : rows) {
            if (sr.row != r)
                continue;
            for (const SheetCell& cell : sr.cells)
                if (cell.column == c)
                    return cell.text;
        }
        return {};
    };
    std::string own = cellText(row, column);
    if (!own.empty())
        return own;
    for (const MergedRange& m : merges) {
        if (row >= m.firstRow && row <= m.lastRow && column >= m.firstColumn &&
            column <= m.lastColumn)
            return cellText(m.firstRow, m.firstColumn);
    }
    return {};
}

bool startsHorizontalMerge(const SheetRow& row, const std::vector<MergedRange>& merges) {
    return std::any_of(merges.begin(), merges.end(), [&](const MergedRange& m) {
        return m.firstRow == row.row && m.lastColumn > m.firstColumn;
    });
}

bool isDateCell(const SheetCell& c) {
    return c.kind == CellKind::Date ||
           (c.kind == CellKind::Text && dateShapeOf(c.text) != DateShape::None);
}

std::size_t dateCells(const SheetRow& row) {
    return static_cast<std::size_t>(std::count_if(row.cells.begin(), row.cells.end(), isDateCell));
}

/// The header row's index: the row above the first row of two or more cells that holds a date
/// (the first data row of a long or dates-down table), or that row itself when it holds dates
/// in several cells and the next row fewer (the header of a dates-across table). Without
/// dates, the first row wide enough to belong to the table. -1 when the table starts with data.
int headerIndex(const std::vector<SheetRow>& head) {
    for (std::size_t d = 0; d < head.size(); ++d) {
        if (head[d].cells.size() < 2 || dateCells(head[d]) == 0)
            continue;
        if (dateCells(head[d]) >= 2 && (d + 1 == head.size() || dateCells(head[d + 1]) < 2))
            return static_cast<int>(d);
        return static_cast<int>(d) - 1;
    }
    return static_cast<int>(firstTableRow(head));
}

bool coversFromAbove(const SheetRow& upper, const std::vector<MergedRange>& merges) {
    return std::any_of(merges.begin(), merges.end(), [&](const MergedRange& m) {
        return m.firstRow == upper.row && m.lastRow > m.firstRow;
    });
}

/// A header over two rows: the upper row's index, or -1. The row right above the header row,
/// all text, that is more than a title: two or more cells, a cell merged down into the header
/// row, or a cell merged across that does not start at the table's first column.
int upperHeaderIndex(const std::vector<SheetRow>& head, int h,
                     const std::vector<MergedRange>& merges) {
    if (h < 1)
        return -1;
    const SheetRow& upper = head[static_cast<std::size_t>(h) - 1];
    const SheetRow& header = head[static_cast<std::size_t>(h)];
    if (upper.row + 1 != header.row || !allText(upper))
        return -1;
    std::uint32_t first = header.cells.front().column;
    for (const SheetRow& r : head)
        if (r.row >= header.row && !r.cells.empty())
            first = std::min(first, r.cells.front().column);
    const bool across = startsHorizontalMerge(upper, merges) && upper.cells.front().column > first;
    if (upper.cells.size() >= 2 || coversFromAbove(upper, merges) || across)
        return h - 1;
    return -1;
}

void nameColumns(const std::vector<SheetRow>& head, const std::vector<MergedRange>& merges,
                 TablePlan& plan) {
    std::vector<std::string> upper, lower;
    for (std::uint32_t c = plan.firstColumn; c <= plan.lastColumn; ++c) {
        upper.push_back(textAt(head, merges, plan.upperHeaderRow, c));
        lower.push_back(textAt(head, merges, plan.headerRow, c));
    }
    // One text over every named lower cell is a caption over the table, not part of each name
    // (a "Cases" over the region columns of a dates-down table).
    std::vector<std::string> over;
    for (std::size_t i = 0; i < upper.size(); ++i)
        if (!upper[i].empty() && !lower[i].empty() && upper[i] != lower[i] &&
            std::find(over.begin(), over.end(), upper[i]) == over.end())
            over.push_back(upper[i]);
    const bool caption = over.size() == 1;
    if (caption)
        plan.notes.push_back({"the header's upper row '" + over.front() +
                                  "' is read as a caption over the columns below it",
                              plan.upperHeaderRow, 0});
    for (std::size_t i = 0; i < upper.size(); ++i) {
        if (lower[i].empty() || upper[i] == lower[i])
            plan.names.push_back(upper[i]);
        else if (upper[i].empty() || (caption && upper[i] == over.front()))
            plan.names.push_back(lower[i]);
        else
            plan.names.push_back(upper[i] + " " + lower[i]);
    }
}

}  // namespace

bool holdsDates(const std::vector<SheetRow>& rows) {
    for (const SheetRow& r : rows)
        for (const SheetCell& c : r.cells)
            if (c.kind == CellKind::Date ||
                (c.kind == CellKind::Text && dateShapeOf(c.text) != DateShape::None))
                return true;
    return false;
}

bool mayHaveTwoRowHeader(const std::vector<SheetRow>& head) {
    const int h = headerIndex(head);
    return h >= 1 && allText(head[static_cast<std::size_t>(h) - 1]);
}

TablePlan planTable(const std::vector<SheetRow>& head, const std::vector<MergedRange>& merges) {
    TablePlan plan;
    if (head.empty())
        return plan;
    const int h = std::max(headerIndex(head), 0);
    const int upper = upperHeaderIndex(head, h, merges);
    const std::size_t headerAt = static_cast<std::size_t>(h);
    const std::size_t tableStart = upper >= 0 ? static_cast<std::size_t>(upper) : headerAt;
    plan.headerRow = head[headerAt].row;
    plan.upperHeaderRow = upper >= 0 ? head[tableStart].row : 0;
    for (std::size_t i = 0; i < tableStart; ++i)
        plan.notes.push_back(
            {"a title or note row above the table was skipped: '" + rowText(head[i]) + "'",
             head[i].row, 0});
    plan.firstColumn = kMaxSheetColumns;
    for (std::size_t i = tableStart; i < head.size(); ++i) {
        for (const SheetCell& c : head[i].cells) {
            plan.firstColumn = std::min(plan.firstColumn, c.column);
            plan.lastColumn = std::max(plan.lastColumn, c.column);
        }
    }
    if (upper >= 0)
        nameColumns(head, merges, plan);
    return plan;
}

bool CsvTextWriter::row(const SheetRow& row) {
    if (row.row < m_plan.headerRow || m_tooLarge)
        return !m_tooLarge;
    if (row.row == m_plan.headerRow && !m_plan.names.empty()) {
        writeLine(row.row, m_plan.names);
        return true;
    }
    // A row of one cell after the table's rows may be a note below it ("Source: ..."): held
    // back until a fuller row shows it was part of the table.
    if (row.row > m_plan.headerRow && row.cells.size() == 1 &&
        m_plan.lastColumn > m_plan.firstColumn + 1) {
        m_heldBack.push_back(row);
        return true;
    }
    for (const SheetRow& held : m_heldBack)
        writeRow(held);
    m_heldBack.clear();
    writeRow(row);
    if (m_out.size() > kMaxBytes)
        m_tooLarge = true;
    return !m_tooLarge;
}

void CsvTextWriter::finish() {
    for (const SheetRow& held : m_heldBack)
        notes.push_back(
            {"a note row below the table was not read: '" + rowText(held) + "'", held.row, 0});
    m_heldBack.clear();
    if (m_errorCells > 5)
        notes.push_back({std::to_string(m_errorCells) +
                             " cells hold an error value in all (the first 5 are listed)",
                         0, 0});
    if (m_outsideCells > 0)
        notes.push_back({std::to_string(m_outsideCells) + " cells outside the table's columns (" +
                             columnLetters(m_plan.firstColumn) + " to " +
                             columnLetters(m_plan.lastColumn) + ") were not read",
                         0, 0});
}

void CsvTextWriter::writeRow(const SheetRow& row) {
    const std::uint32_t width = m_plan.lastColumn - m_plan.firstColumn + 1;
    if (row.row > m_line + 1)
        m_out.append(row.row - m_line - 1, '\n');
    std::uint32_t next = 0;  // the next field to write
    for (const SheetCell& cell : row.cells) {
        if (cell.column < m_plan.firstColumn || cell.column > m_plan.lastColumn) {
            noteOutside(row, cell);
            continue;
        }
        const std::uint32_t field = cell.column - m_plan.firstColumn;
        for (; next < field; ++next)
            m_out += ',';
        if (cell.kind == CellKind::Error)
            noteErrorCell(row, cell);
        writeField(cell.text);
    }
    for (; next + 1 < width; ++next)
        m_out += ',';
    m_out += '\n';
    m_line = row.row;
}

void CsvTextWriter::writeLine(std::uint32_t row, const std::vector<std::string>& fields) {
    if (row > m_line + 1)
        m_out.append(row - m_line - 1, '\n');
    for (std::size_t i = 0; i < fields.size(); ++i) {
        if (i)
            m_out += ',';
        writeField(fields[i]);
    }
    m_out += '\n';
    m_line = row;
}

void CsvTextWriter::writeField(std::string_view text) {
    if (text.find_first_of(",\"\n\r") == std::string_view::npos) {
        m_out.append(text);
        return;
    }
    m_out += '"';
    for (char c : text) {
        if (c == '"')
            m_out += "\"\"";
        else
            m_out += (c == '\n' || c == '\r') ? ' ' : c;
    }
    m_out += '"';
}

void CsvTextWriter::noteErrorCell(const SheetRow& row, const SheetCell& cell) {
    if (++m_errorCells > 5)
        return;
    const std::uint64_t field = cell.column - m_plan.firstColumn + 1;
    std::string message =
        cell.text == "1900-02-29"
            ? "the cell holds serial number 60, the 1900 date system's 29 February 1900, a day "
              "that never was (ECMA-376 Part 1, 18.17.4.1); it is not read as a date"
            : "the cell holds the error value " + cell.text +
                  ", not a value; it is not read "
                  "as a number";
    notes.push_back({std::move(message), row.row, field});
}

void CsvTextWriter::noteOutside(const SheetRow&, const SheetCell&) {
    ++m_outsideCells;
}

}  // namespace siftwave::ingest::detail
