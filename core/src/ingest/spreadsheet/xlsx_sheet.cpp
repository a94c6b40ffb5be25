// An .xlsx worksheet's rows, streamed (ECMA-376 Part 1, 18.3: sheetData, row, c, v, is,
// mergeCells). A cell's type (18.18.11 ST_CellType): s shared string, inlineStr, str (a
// formula's text), b boolean, e error, d ISO 8601 date, n (or none) a number, which is a date
// when its style's number format is one.
#include "ingest/spreadsheet/xlsx_parts.h"
#include "ingest/spreadsheet/xml_stream.h"

#include "siftwave/drop.h"

#include <charconv>
#include <cstring>

namespace siftwave::ingest::detail {
namespace {

class SheetPart final : public XmlHandler {
public:
    SheetPart(const XlsxBook& book, std::string sheet, RowSink& sink,
              std::vector<MergedRange>& merges, bool mergesOnly)
        : m_book(book),
          m_sheet(std::move(sheet)),
          m_sink(sink),
          m_merges(merges),
          m_mergesOnly(mergesOnly) {}

    void start(std::string_view name, const char** a) override {
        if (name == "c") {
            startCell(a);
        } else if (name == "v" || (name == "t" && m_inCell && m_phonetic == 0)) {
            collecting = m_inCell;
        } else if (name == "row") {
            startRow(a);
        } else if (name == "rPh") {
            ++m_phonetic;
        } else if (name == "mergeCell") {
            addMerge(attribute(a, "ref"));
        } else if (name == "sheetData" && m_mergesOnly) {
            m_skipping = true;
        }
    }
    void end(std::string_view name) override {
        if (name == "c") {
            if (m_inCell)
                endCell();
        } else if (name == "v" || name == "t") {
            collecting = false;
        } else if (name == "row") {
            endRow();
        } else if (name == "rPh") {
            --m_phonetic;
        }
    }
    void text(std::string_view t) override { m_text.append(t); }

private:
    std::string place() const {
        return m_sheet + "!" + columnLetters(m_column) + std::to_string(m_row.row);
    }
    void startRow(const char** a) {
        if (m_skipping)
            return;
        const char* r = attribute(a, "r");
        std::uint32_t row = m_row.row + 1;
        if (r) {
            std::uint64_t value = 0;
            std::from_chars(r, r + std::strlen(r), value);
            row = static_cast<std::uint32_t>(value);
        }
        if (row <= m_row.row || row > kMaxSheetRows) {
            failure = "sheet " + m_sheet + ": row " + std::string(r ? r : "?") +
                      " is out of order or beyond the 1,048,576 rows a sheet may hold";
            return;
        }
        m_row.row = row;
        m_row.cells.clear();
        m_nextColumn = 0;
    }
    void endRow() {
        if (m_skipping || m_row.cells.empty())
            return;
        if (!m_sink.row(m_row))
            stop = true;
    }
    void startCell(const char** a) {
        if (m_skipping)
            return;
        m_inCell = true;
        m_text.clear();
        m_type = 'n';
        m_style = 0;
        m_column = m_nextColumn;
        for (const char** p = a; *p; p += 2) {
            const std::string_view key = localName(p[0]);
            if (key == "r") {
                std::uint32_t row = 0;
                if (!parseCellReference(p[1], m_column, row) || row != m_row.row) {
                    failure = "sheet " + m_sheet + ": cell reference '" + std::string(p[1]) +
                              "' is not a cell of row " + std::to_string(m_row.row);
                }
            } else if (key == "t") {
                const std::string_view t(p[1]);
                m_type = t == "s"           ? 's'
                         : t == "str"       ? 'f'
                         : t == "inlineStr" ? 'i'
                         : t == "b"         ? 'b'
                         : t == "e"         ? 'e'
                         : t == "d"         ? 'd'
                                            : 'n';
            } else if (key == "s") {
                m_style = static_cast<std::size_t>(std::atol(p[1]));
            }
        }
        m_nextColumn = m_column + 1;
    }
    void endCell();
    void addMerge(const char* ref);

    const XlsxBook& m_book;
    std::string m_sheet;
    RowSink& m_sink;
    std::vector<MergedRange>& m_merges;
    bool m_mergesOnly;
    bool m_skipping = false;
    SheetRow m_row;
    std::uint32_t m_nextColumn = 0;
    std::uint32_t m_column = 0;
    bool m_inCell = false;
    char m_type = 'n';
    std::size_t m_style = 0;
    int m_phonetic = 0;
    std::string m_text;
};

void SheetPart::endCell() {
    m_inCell = false;
    collecting = false;
    if (m_text.empty())
        return;  // a styled empty cell
    SheetCell cell;
    cell.column = m_column;
    switch (m_type) {
        case 's': {
            std::size_t index = 0;
            const auto [end, ec] =
                std::from_chars(m_text.data(), m_text.data() + m_text.size(), index);
            if (ec != std::errc() || index >= m_book.sharedStrings.size()) {
                failure = place() + " refers to shared string '" + m_text +
                          "', which the workbook does not hold";
                return;
            }
            cell.text = m_book.sharedStrings[index];
            break;
        }
        case 'i':
        case 'f':
            cell.text = m_text;  // inlineStr (is/t), and str: a formula's text result
            break;
        case 'b':
            cell.kind = CellKind::Boolean;
            cell.text = m_text == "1" ? "TRUE" : "FALSE";
            break;
        case 'e':
            cell.kind = CellKind::Error;
            cell.text = m_text;
            break;
        case 'd':
            cell.kind = CellKind::Date;
            cell.text = m_text.substr(0, 10);
            break;
        default:
            if (m_style < m_book.dateStyle.size() && m_book.dateStyle[m_style]) {
                double serial = 0;
                std::from_chars(m_text.data(), m_text.data() + m_text.size(), serial);
                bool fictitious = false;
                std::string iso = isoDateOfSerial(serial, m_book.date1904, fictitious);
                if (fictitious) {
                    cell.kind = CellKind::Error;
                    cell.text = "1900-02-29";  // serial 60 of the 1900 system: no real day
                    break;
                }
                if (!iso.empty()) {
                    cell.kind = CellKind::Date;
                    cell.text = std::move(iso);
                    break;
                }
            }
            cell.kind = CellKind::Number;
            cell.text = plainNumberText(m_text);
    }
    if (cell.kind == CellKind::Text && cell.text.empty())
        return;
    m_row.cells.push_back(std::move(cell));
}

void SheetPart::addMerge(const char* ref) {
    if (!ref)
        return;
    const std::string_view range(ref);
    const std::size_t colon = range.find(':');
    MergedRange m;
    if (colon == std::string_view::npos ||
        !parseCellReference(range.substr(0, colon), m.firstColumn, m.firstRow) ||
        !parseCellReference(range.substr(colon + 1), m.lastColumn, m.lastRow) ||
        m.lastRow < m.firstRow || m.lastColumn < m.firstColumn)
        return;  // a malformed range merges nothing
    m_merges.push_back(m);
}

}  // namespace

Status readXlsxSheet(ZipArchive& archive, const XlsxBook& book, std::size_t index, RowSink& sink,
                     std::vector<MergedRange>& merges, bool mergesOnly) {
    SheetPart handler(book, book.sheetNames[index], sink, merges, mergesOnly);
    return parseXmlPart(archive, book.sheetParts[index], handler);
}

}  // namespace siftwave::ingest::detail
