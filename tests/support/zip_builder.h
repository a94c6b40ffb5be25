#pragma once
// Small ZIP archives built in memory with libzip, for the spreadsheet reader's tests: a
// hand-made workbook part by part, a ZIP bomb, a damaged archive. Tests that include this link
// libzip (tests/CMakeLists.txt).

#include <zip.h>

#include <cstdint>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

namespace siftwave::testing {

struct ZipPart {
    std::string name;
    std::string bytes;
    bool stored = false;  // no compression (an OpenDocument mimetype part)
};

/// The archive of `parts`, in order, deflated unless stored.
inline std::string makeZip(const std::vector<ZipPart>& parts) {
    zip_error_t error;
    zip_error_init(&error);
    zip_source_t* buffer = zip_source_buffer_create(nullptr, 0, 0, &error);
    zip_source_keep(buffer);
    zip_t* archive = zip_open_from_source(buffer, ZIP_TRUNCATE, &error);
    if (!archive)
        throw std::runtime_error("zip_open_from_source failed");
    for (const ZipPart& part : parts) {
        zip_source_t* data = zip_source_buffer(archive, part.bytes.data(), part.bytes.size(), 0);
        const zip_int64_t index = zip_file_add(archive, part.name.c_str(), data, ZIP_FL_ENC_UTF_8);
        if (index < 0)
            throw std::runtime_error("zip_file_add failed");
        zip_set_file_compression(archive, static_cast<zip_uint64_t>(index),
                                 part.stored ? ZIP_CM_STORE : ZIP_CM_DEFLATE, 0);
        zip_file_set_mtime(archive, static_cast<zip_uint64_t>(index), 315532800, 0);
    }
    if (zip_close(archive) != 0)
        throw std::runtime_error("zip_close failed");
    std::string out;
    zip_source_open(buffer);
    zip_source_seek(buffer, 0, SEEK_END);
    out.resize(static_cast<std::size_t>(zip_source_tell(buffer)));
    zip_source_seek(buffer, 0, SEEK_SET);
    zip_source_read(buffer, out.data(), out.size());
    zip_source_close(buffer);
    zip_source_free(buffer);
    return out;
}

/// A minimal .xlsx package (ECMA-376 Part 2) around the given sheets' XML (sheetData and what
/// follows it); `workbookPr` is put in the workbook part as is, `styles` is the styles part.
inline std::string makeXlsx(const std::vector<std::pair<std::string, std::string>>& sheets,
                            const std::string& workbookPr = "", const std::string& styles = "",
                            const std::string& sharedStrings = "",
                            std::vector<ZipPart> extra = {}) {
    const std::string ns = "http://schemas.openxmlformats.org/";
    const std::string rel = ns + "officeDocument/2006/relationships/";
    std::string types = "<?xml version=\"1.0\"?><Types xmlns=\"" + ns +
                        "package/2006/content-types\">"
                        "<Default Extension=\"xml\" ContentType=\"application/xml\"/></Types>";
    std::string workbook = "<?xml version=\"1.0\"?><workbook xmlns=\"" + ns +
                           "spreadsheetml/2006/main\" xmlns:r=\"" + ns +
                           "officeDocument/2006/relationships\">" + workbookPr + "<sheets>";
    std::string rels =
        "<?xml version=\"1.0\"?><Relationships xmlns=\"" + ns + "package/2006/relationships\">";
    std::vector<ZipPart> parts{
        {"[Content_Types].xml", types},
        {"_rels/.rels", "<?xml version=\"1.0\"?><Relationships xmlns=\"" + ns +
                            "package/2006/relationships\"><Relationship Id=\"rId1\" "
                            "Type=\"" +
                            rel +
                            "officeDocument\" "
                            "Target=\"xl/workbook.xml\"/></Relationships>"}};
    for (std::size_t i = 0; i < sheets.size(); ++i) {
        const std::string n = std::to_string(i + 1);
        workbook +=
            "<sheet name=\"" + sheets[i].first + "\" sheetId=\"" + n + "\" r:id=\"rId" + n + "\"/>";
        rels += "<Relationship Id=\"rId" + n + "\" Type=\"" + rel +
                "worksheet\" Target=\"worksheets/sheet" + n + ".xml\"/>";
        parts.push_back({"xl/worksheets/sheet" + n + ".xml",
                         "<?xml version=\"1.0\"?><worksheet xmlns=\"" + ns +
                             "spreadsheetml/2006/main\">" + sheets[i].second + "</worksheet>"});
    }
    if (!styles.empty()) {
        rels += "<Relationship Id=\"rS\" Type=\"" + rel + "styles\" Target=\"styles.xml\"/>";
        parts.push_back({"xl/styles.xml", "<?xml version=\"1.0\"?><styleSheet xmlns=\"" + ns +
                                              "spreadsheetml/2006/main\">" + styles +
                                              "</styleSheet>"});
    }
    if (!sharedStrings.empty()) {
        rels += "<Relationship Id=\"rT\" Type=\"" + rel +
                "sharedStrings\" Target=\"sharedStrings.xml\"/>";
        parts.push_back({"xl/sharedStrings.xml", "<?xml version=\"1.0\"?><sst xmlns=\"" + ns +
                                                     "spreadsheetml/2006/main\">" + sharedStrings +
                                                     "</sst>"});
    }
    workbook += "</sheets></workbook>";
    rels += "</Relationships>";
    parts.push_back({"xl/workbook.xml", workbook});
    parts.push_back({"xl/_rels/workbook.xml.rels", rels});
    for (ZipPart& p : extra)
        parts.push_back(std::move(p));
    return makeZip(parts);
}

/// A workbook of three sheets: "notes" (one line of text), then "north" and "south", each a
/// long table (date, region, cases) of `days` days of March 2026 (at most 31) with inline
/// strings and ISO dates (t="d"): two tables with dates to choose between.
inline std::string makeTwoTableXlsx(int days = 3) {
    auto text = [](const std::string& ref, const std::string& value) {
        return "<c r=\"" + ref + "\" t=\"inlineStr\"><is><t>" + value + "</t></is></c>";
    };
    auto table = [&](const std::string& region, int base) {
        std::string rows = "<sheetData><row r=\"1\">" + text("A1", "date") + text("B1", "region") +
                           text("C1", "cases") + "</row>";
        for (int day = 1; day <= days; ++day) {
            const std::string r = std::to_string(day + 1);
            const std::string dd = (day < 10 ? "0" : "") + std::to_string(day);
            rows += "<row r=\"" + r + "\"><c r=\"A" + r + "\" t=\"d\"><v>2026-03-" + dd +
                    "</v></c>" + text("B" + r, region) + "<c r=\"C" + r + "\"><v>" +
                    std::to_string(base + day % 7 * 3) + "</v></c></row>";
        }
        return rows + "</sheetData>";
    };
    return makeXlsx({{"notes", "<sheetData><row r=\"1\">" + text("A1", "Invented releases") +
                                   "</row></sheetData>"},
                     {"north", table("N1", 10)},
                     {"south", table("S1", 20)}});
}

}  // namespace siftwave::testing
