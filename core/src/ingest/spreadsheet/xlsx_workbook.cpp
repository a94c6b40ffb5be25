// An .xlsx workbook (ECMA-376 Part 1, SpreadsheetML; Part 2, the package): the workbook part
// found through the package relationships, its sheets, the date system (workbookPr date1904),
// the cell formats that are dates, the shared strings, and each sheet's rows streamed.
#include "ingest/spreadsheet/workbook_open.h"
#include "ingest/spreadsheet/xlsx_parts.h"
#include "ingest/spreadsheet/xml_stream.h"

namespace siftwave::ingest::detail {
namespace {

class XlsxWorkbook final : public Workbook {
public:
    XlsxWorkbook(std::unique_ptr<ZipArchive> archive, XlsxBook book)
        : m_archive(std::move(archive)), m_book(std::move(book)) {}
    const std::vector<std::string>& sheetNames() const override { return m_book.sheetNames; }
    Status readRows(std::size_t index, RowSink& sink, std::vector<MergedRange>& merges) override {
        return readXlsxSheet(*m_archive, m_book, index, sink, merges, false);
    }
    std::uint64_t partBytes(std::size_t index) const override {
        return m_archive->declaredSize(m_book.sheetParts[index]);
    }
    Result<std::vector<MergedRange>> mergesOf(std::size_t index) override {
        std::vector<MergedRange> merges;
        struct NoRows final : RowSink {
            bool row(const SheetRow&) override { return true; }
        } none;
        if (Status s = readXlsxSheet(*m_archive, m_book, index, none, merges, true); !s)
            return s.error();
        return merges;
    }

private:
    std::unique_ptr<ZipArchive> m_archive;
    XlsxBook m_book;
};

/// Macros and links to other workbooks are refused before anything else is read: Siftwave
/// runs nothing and fetches nothing, and a linked value may stand for a file it cannot see.
Status refuseActiveContent(ZipArchive& archive) {
    for (const std::string& name : archive.names()) {
        if (name.ends_with("vbaProject.bin"))
            return archive.fail(
                "the workbook holds macros (" + name +
                "); Siftwave reads no macro-enabled workbook and runs nothing in it: save it "
                "as .xlsx (without macros) or the sheet as CSV (UTF-8)");
        if (name.starts_with("xl/externalLinks/"))
            return archive.fail(
                "the workbook links to other files (" + name +
                "), so some of its values may come from files Siftwave will not open: break "
                "the links (keep their values) and save it again, or save the sheet as CSV");
    }
    Result<std::string> types = archive.readWhole("[Content_Types].xml", std::size_t{1} << 20);
    if (!types)
        return types.error();
    if (types->find("macroEnabled") != std::string::npos)
        return archive.fail(
            "the workbook is macro-enabled (its content types say so); Siftwave reads no "
            "macro-enabled workbook and runs nothing in it: save it as .xlsx or the sheet as CSV");
    return Ok{};
}

}  // namespace

Result<std::unique_ptr<Workbook>> openXlsx(std::unique_ptr<ZipArchive> archive) {
    if (Status s = refuseActiveContent(*archive); !s)
        return s.error();
    Result<XlsxBook> book = readXlsxBook(*archive);
    if (!book)
        return book.error();
    return std::unique_ptr<Workbook>(new XlsxWorkbook(std::move(archive), std::move(*book)));
}

}  // namespace siftwave::ingest::detail
