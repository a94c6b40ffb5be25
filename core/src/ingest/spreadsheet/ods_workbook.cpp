// An .ods workbook (ISO/IEC 26300, OpenDocument 1.2 Part 1, 9.1 tables): content.xml holds
// every sheet as a table:table of table:table-row and table:table-cell elements. A cell's type
// is office:value-type (19.389): float, percentage and currency read office:value, date reads
// office:date-value, boolean office:boolean-value, string (and time) the cell's text paragraphs.
// Repeats (table:number-rows-repeated, table:number-columns-repeated) are expanded only for
// cells that hold something, and never beyond a sheet's 1,048,576 rows and 16,384 columns nor
// kMaxExpandedCells copies in all; a merged cell is table:number-columns-spanned / -rows-spanned.
#include "ingest/spreadsheet/workbook_open.h"
#include "ingest/spreadsheet/xml_stream.h"

#include <algorithm>
#include <cstring>

namespace siftwave::ingest::detail {
namespace {

constexpr const char* kContent = "content.xml";
// Copies made by repeats (beyond the cells written once): 10 million, more than a drop's
// runs of equal counts need, few enough to read in seconds.
constexpr std::uint64_t kMaxExpandedCells = 10'000'000;

std::uint32_t countAttribute(const char** a, std::string_view name) {
    const char* v = attribute(a, name);
    if (!v)
        return 1;
    const long n = std::atol(v);
    return n < 1 ? 1 : static_cast<std::uint32_t>(std::min<long>(n, kMaxSheetRows + 1L));
}

struct TableNames final : XmlHandler {
    std::vector<std::string> names;
    void start(std::string_view name, const char** a) override {
        if (name == "table") {
            const char* n = attribute(a, "name");
            names.emplace_back(n ? n : "Sheet" + std::to_string(names.size() + 1));
        }
    }
    void end(std::string_view) override {}
};

class TableRows final : public XmlHandler {
public:
    TableRows(std::size_t table, std::string name, RowSink& sink, std::vector<MergedRange>& merges)
        : m_table(table), m_name(std::move(name)), m_sink(sink), m_merges(merges) {}
    void start(std::string_view name, const char** a) override {
        if (name == "table") {
            m_inTable = m_tables++ == m_table;
        } else if (!m_inTable) {
            return;
        } else if (name == "table-row") {
            m_rowRepeat = countAttribute(a, "number-rows-repeated");
            m_row.cells.clear();
            m_column = 0;
        } else if (name == "table-cell" || name == "covered-table-cell") {
            startCell(a);
        } else if (name == "annotation") {
            ++m_annotation;
            collecting = false;
        } else if (m_inCell && m_annotation == 0) {
            startInText(name, a);
        }
    }
    void end(std::string_view name) override {
        if (name == "table" && m_inTable) {
            m_inTable = false;
            stop = true;  // the sheet is read
        } else if (!m_inTable) {
            return;
        } else if (name == "table-row") {
            endRow();
        } else if (name == "table-cell" || name == "covered-table-cell") {
            endCell();
        } else if (name == "annotation") {
            --m_annotation;
            collecting = m_inCell && m_annotation == 0;
        } else if (name == "p" && m_inCell) {
            m_paragraphEnded = true;
        }
    }
    void text(std::string_view t) override { m_text.append(t); }

private:
    void startCell(const char** a);
    void startInText(std::string_view name, const char** a);
    void endCell();
    void endRow();

    std::size_t m_table;
    std::string m_name;
    RowSink& m_sink;
    std::vector<MergedRange>& m_merges;
    std::size_t m_tables = 0;
    bool m_inTable = false;
    SheetRow m_row;
    std::uint32_t m_nextRow = 1;
    std::uint32_t m_rowRepeat = 1;
    std::uint32_t m_column = 0;
    std::uint64_t m_expanded = 0;
    bool m_inCell = false;
    int m_annotation = 0;
    bool m_paragraphEnded = false;
    std::uint32_t m_columnRepeat = 1;
    SheetCell m_cell;
    bool m_formula = false;
    std::string m_text;
};

void TableRows::startCell(const char** a) {
    m_inCell = true;
    m_paragraphEnded = false;
    collecting = true;
    m_text.clear();
    m_cell = SheetCell{};
    m_columnRepeat = countAttribute(a, "number-columns-repeated");
    m_formula = attribute(a, "formula") != nullptr;
    const char* type = attribute(a, "value-type");
    const std::string_view t = type ? type : "";
    if (t == "float" || t == "percentage" || t == "currency") {
        const char* v = attribute(a, "value");
        m_cell.kind = CellKind::Number;
        m_cell.text = plainNumberText(v ? v : "");
    } else if (t == "date") {
        const char* v = attribute(a, "date-value");
        m_cell.kind = CellKind::Date;
        m_cell.text = std::string(v ? v : "").substr(0, 10);
    } else if (t == "boolean") {
        const char* v = attribute(a, "boolean-value");
        m_cell.kind = CellKind::Boolean;
        m_cell.text = v && std::strcmp(v, "true") == 0 ? "TRUE" : "FALSE";
    }
    const std::uint32_t columns = countAttribute(a, "number-columns-spanned");
    const std::uint32_t rows = countAttribute(a, "number-rows-spanned");
    if (columns > 1 || rows > 1)
        m_merges.push_back({m_nextRow, m_nextRow + rows - 1, m_column, m_column + columns - 1});
}

void TableRows::startInText(std::string_view name, const char** a) {
    if (name == "p") {
        if (m_paragraphEnded)
            m_text += '\n';  // paragraphs of one cell are its lines
        m_paragraphEnded = false;
    } else if (name == "s") {
        m_text.append(std::min<std::uint32_t>(countAttribute(a, "c"), 1024), ' ');
    } else if (name == "tab") {
        m_text += '\t';
    } else if (name == "line-break") {
        m_text += '\n';
    }
}

void TableRows::endCell() {
    m_inCell = false;
    collecting = false;
    if (m_cell.text.empty() && m_cell.kind == CellKind::Text) {
        m_cell.text = std::move(m_text);
        if (m_formula && (m_cell.text.starts_with('#') || m_cell.text.starts_with("Err:")))
            m_cell.kind = CellKind::Error;  // a formula whose result is an error
    }
    const bool filled = !m_cell.text.empty();
    const std::uint32_t end = static_cast<std::uint32_t>(
        std::min<std::uint64_t>(std::uint64_t{m_column} + m_columnRepeat, kMaxSheetColumns));
    if (filled) {
        const std::uint64_t copies = std::uint64_t{end - std::min(end, m_column)} * m_rowRepeat;
        m_expanded += copies > 0 ? copies - 1 : 0;
        if (m_expanded > kMaxExpandedCells) {
            failure = "sheet " + m_name +
                      " repeats its cells into more than 10 million copies; it is not read";
            return;
        }
        for (std::uint32_t c = m_column; c < end; ++c) {
            m_cell.column = c;
            m_row.cells.push_back(m_cell);
        }
    }
    m_column = end;
}

void TableRows::endRow() {
    if (m_row.cells.empty()) {
        m_nextRow = std::min<std::uint32_t>(m_nextRow + m_rowRepeat, kMaxSheetRows + 1);
        return;
    }
    for (std::uint32_t k = 0; k < m_rowRepeat; ++k) {
        if (m_nextRow > kMaxSheetRows) {
            failure = "sheet " + m_name + " has rows beyond the 1,048,576 a sheet may hold";
            return;
        }
        m_row.row = m_nextRow++;
        if (!m_sink.row(m_row)) {
            stop = true;
            return;
        }
    }
}

class OdsWorkbook final : public Workbook {
public:
    OdsWorkbook(std::unique_ptr<ZipArchive> archive, std::vector<std::string> names)
        : m_archive(std::move(archive)), m_names(std::move(names)) {}
    const std::vector<std::string>& sheetNames() const override { return m_names; }
    Status readRows(std::size_t index, RowSink& sink, std::vector<MergedRange>& merges) override {
        TableRows rows(index, m_names[index], sink, merges);
        return parseXmlPart(*m_archive, kContent, rows);
    }
    std::uint64_t partBytes(std::size_t) const override {
        return m_archive->declaredSize(kContent);
    }
    Result<std::vector<MergedRange>> mergesOf(std::size_t index) override {
        std::vector<MergedRange> merges;
        struct AllRows final : RowSink {
            bool row(const SheetRow&) override { return true; }
        } all;
        if (Status s = readRows(index, all, merges); !s)
            return s.error();
        return merges;
    }

private:
    std::unique_ptr<ZipArchive> m_archive;
    std::vector<std::string> m_names;
};

}  // namespace

Result<std::unique_ptr<Workbook>> openOds(std::unique_ptr<ZipArchive> archive) {
    for (const std::string& name : archive->names()) {
        if (name.starts_with("Basic/") || name.starts_with("Scripts/"))
            return archive->fail("the workbook holds macros or scripts (" + name +
                                 "); Siftwave reads no workbook with macros and runs nothing "
                                 "in it: save a copy without them, or the sheet as CSV (UTF-8)");
    }
    TableNames names;
    if (Status s = parseXmlPart(*archive, kContent, names); !s)
        return s.error();
    return std::unique_ptr<Workbook>(new OdsWorkbook(std::move(archive), std::move(names.names)));
}

}  // namespace siftwave::ingest::detail
