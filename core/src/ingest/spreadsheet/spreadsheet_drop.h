#pragma once
// A spreadsheet drop (.xlsx, .ods) read through the CSV path: the sheet is chosen, its table
// found and written as CSV text (sheet_table.h), the DropReader reads that text with the same
// layouts, roles, cadence, overrides and cell states as a CSV file, and the Drop's provenance
// then names the workbook (its bytes, its SHA-256), the format and the sheet; an error names the
// cell (data!C14).

#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"

#include <optional>
#include <string>
#include <string_view>

namespace siftwave::ingest::detail {

/// The bytes read as a spreadsheet drop, or nullopt when they are no workbook (a ZIP package
/// of a workbook, or an OLE compound file: an encrypted workbook or a legacy .xls).
std::optional<Result<Drop>> readSpreadsheetDrop(std::string_view bytes, const std::string& path,
                                                const IngestOptions& options);

}  // namespace siftwave::ingest::detail
