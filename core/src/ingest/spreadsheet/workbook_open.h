#pragma once
// Opening a spreadsheet drop's bytes as a Workbook: .xlsx (ECMA-376) or .ods (ISO/IEC 26300),
// told apart by their packages (a [Content_Types].xml with a workbook, or an OpenDocument
// mimetype part). Refused with a message: macros, links to other files, encryption.

#include "ingest/spreadsheet/sheet_rows.h"
#include "ingest/spreadsheet/zip_archive.h"

#include <memory>
#include <optional>
#include <string>
#include <string_view>

namespace siftwave::ingest::detail {

enum class SpreadsheetFormat { Xlsx, Ods };

/// "xlsx" or "ods".
const char* spreadsheetFormatName(SpreadsheetFormat format);

/// Opens an .xlsx workbook (the package's parts, shared strings, styles and date system).
Result<std::unique_ptr<Workbook>> openXlsx(std::unique_ptr<ZipArchive> archive);
/// Opens an .ods workbook (its content.xml tables).
Result<std::unique_ptr<Workbook>> openOds(std::unique_ptr<ZipArchive> archive);

/// The bytes as a workbook when they are a ZIP package or an OLE compound file (an encrypted
/// workbook, or a legacy .xls); nullopt when they are neither (then they are read as CSV).
std::optional<Result<std::unique_ptr<Workbook>>> openWorkbook(std::string_view bytes,
                                                              const std::string& path,
                                                              SpreadsheetFormat& format,
                                                              const ArchiveLimits& limits = {});

}  // namespace siftwave::ingest::detail
