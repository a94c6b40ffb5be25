// libFuzzer target: the spreadsheet reader (.xlsx, .ods) on arbitrary bytes, through the same
// parseDrop as a CSV drop. Bytes that start like a ZIP are read as a workbook as they are (the
// container: libzip on a buffer in memory, zip_source_buffer); other bytes become one part of
// a workbook built here with libzip (the first byte picks which: an .xlsx sheet, its shared
// strings, its workbook part, or an .ods content.xml), so the XML, the cell types, the table
// finding and the ODS repeats are reached without the fuzzer having to find valid deflate
// streams. The reader must return a Drop or an Error, never crash, hang or use unbounded memory.
#include "siftwave/ingest/ingest.h"

#include "support/zip_builder.h"

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace {

const std::string kHeaderRow =
    "<row r=\"1\"><c r=\"A1\" t=\"inlineStr\"><is><t>date</t></is></c><c r=\"B1\" t=\"s\"><v>0</v>"
    "</c><c r=\"C1\" t=\"inlineStr\"><is><t>cases</t></is></c></row>";

std::string workbookAround(std::uint8_t pick, const std::string& xml) {
    using siftwave::testing::makeXlsx;
    using siftwave::testing::makeZip;
    const std::string styles = "<cellXfs><xf numFmtId=\"0\"/><xf numFmtId=\"14\"/></cellXfs>";
    switch (pick % 4) {
        case 0:
            return makeXlsx({{"data", xml}}, "", styles, "<si><t>region</t></si>");
        case 1:
            return makeXlsx({{"data", "<sheetData>" + kHeaderRow + "</sheetData>"}}, "", styles,
                            xml);
        case 2:
            return makeXlsx({{"data", "<sheetData>" + kHeaderRow + "</sheetData>"}}, xml, styles,
                            "<si><t>region</t></si>");
        default:
            return makeZip({{"mimetype", "application/vnd.oasis.opendocument.spreadsheet", true},
                            {"content.xml", xml}});
    }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size == 0)
        return 0;
    const std::string_view bytes(reinterpret_cast<const char*>(data), size);
    if (bytes.starts_with("PK")) {
        (void)siftwave::ingest::parseDrop(bytes, "fuzz.xlsx");
        return 0;
    }
    const std::string book = workbookAround(data[0], std::string(bytes.substr(1)));
    (void)siftwave::ingest::parseDrop(book, "fuzz.xlsx");
    return 0;
}
