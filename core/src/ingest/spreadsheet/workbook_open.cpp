#include "ingest/spreadsheet/workbook_open.h"

namespace siftwave::ingest::detail {
namespace {

/// An OLE compound file (MS-CFB 2.2: the header signature D0 CF 11 E0 A1 B1 1A E1).
bool isCompoundFile(std::string_view bytes) {
    return bytes.starts_with(std::string_view("\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1", 8));
}

/// An encrypted Office Open XML workbook is a compound file holding an "EncryptionInfo"
/// stream (MS-OFFCRYPTO 2.3.4); its directory names the streams in UTF-16LE.
bool holdsEncryptionInfo(std::string_view bytes) {
    static const std::string name = [] {
        std::string n;
        for (char c : std::string_view("EncryptionInfo")) {
            n += c;
            n += '\0';
        }
        return n;
    }();
    return bytes.find(name) != std::string_view::npos;
}

Error refusal(const std::string& path, std::string message) {
    Error e = makeError(ErrorCode::Encoding, std::move(message));
    e.file = path;
    return e;
}

}  // namespace

const char* spreadsheetFormatName(SpreadsheetFormat format) {
    return format == SpreadsheetFormat::Ods ? "ods" : "xlsx";
}

std::optional<Result<std::unique_ptr<Workbook>>> openWorkbook(std::string_view bytes,
                                                              const std::string& path,
                                                              SpreadsheetFormat& format,
                                                              const ArchiveLimits& limits) {
    if (isCompoundFile(bytes)) {
        if (holdsEncryptionInfo(bytes))
            return refusal(path,
                           "the workbook is encrypted (password-protected); Siftwave does not "
                           "decrypt files: open it, remove the password and save a copy, or save "
                           "the sheet as CSV (UTF-8)");
        return refusal(path,
                       "the file is a legacy Excel 97-2003 workbook (.xls, BIFF), which Siftwave "
                       "does not read: save it as .xlsx, .ods or CSV (UTF-8)");
    }
    if (!bytes.starts_with(std::string_view("PK\x03\x04", 4)))
        return std::nullopt;
    Result<std::unique_ptr<ZipArchive>> archive = ZipArchive::open(bytes, path, limits);
    if (!archive)
        return Result<std::unique_ptr<Workbook>>(archive.error());
    ZipArchive& zip = **archive;
    if (zip.has("mimetype")) {
        Result<std::string> mimetype = zip.readWhole("mimetype", 256);
        if (mimetype && mimetype->starts_with("application/vnd.oasis.opendocument.spreadsheet")) {
            format = SpreadsheetFormat::Ods;
            return openOds(std::move(*archive));
        }
        return std::nullopt;
    }
    if (zip.has("[Content_Types].xml") && (zip.has("xl/workbook.xml") || zip.has("_rels/.rels"))) {
        format = SpreadsheetFormat::Xlsx;
        return openXlsx(std::move(*archive));
    }
    return std::nullopt;
}

}  // namespace siftwave::ingest::detail
