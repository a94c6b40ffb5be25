#pragma once
// What a workbook reader hands on: a sheet's rows as typed cells, in row order, whatever the
// format (.xlsx or .ods). sheet_table.h turns them into the record stream the CSV path reads.

#include "siftwave/result.h"

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

enum class CellKind : std::uint8_t {
    Text,     // a string cell: kept verbatim ("0412", "NA")
    Number,   // a number, written in plain decimal ("12", "0.5")
    Date,     // a date (a serial number with a date format, or a date value): ISO 8601 text
    Boolean,  // TRUE or FALSE
    Error,    // an error value (#N/A, #VALUE!, Err:502): never a number
};

struct SheetCell {
    std::uint32_t column = 0;  // 0-based sheet column (A = 0)
    CellKind kind = CellKind::Text;
    std::string text;
};

struct SheetRow {
    std::uint32_t row = 0;         // 1-based sheet row
    std::vector<SheetCell> cells;  // non-empty cells, left to right
};

/// A merged range of cells (ECMA-376 mergeCell, ODS number-columns-spanned), 0-based columns,
/// 1-based rows, inclusive.
struct MergedRange {
    std::uint32_t firstRow = 0, lastRow = 0;
    std::uint32_t firstColumn = 0, lastColumn = 0;
};

/// Receives a sheet's rows; returns false to stop reading (not an error).
class RowSink {
public:
    virtual ~RowSink() = default;
    virtual bool row(const SheetRow& row) = 0;
};

/// The largest sheet a workbook may declare (ECMA-376 and the spreadsheet programs' limits:
/// 1,048,576 rows and 16,384 columns); a reference beyond is refused, and repeats are bounded by
/// it.
constexpr std::uint32_t kMaxSheetRows = 1048576;
constexpr std::uint32_t kMaxSheetColumns = 16384;

class Workbook {
public:
    virtual ~Workbook() = default;
    /// Names of the worksheets, in workbook order.
    virtual const std::vector<std::string>& sheetNames() const = 0;
    /// Streams sheet `index`'s rows to `sink`. The merged ranges seen are added to `merges`
    /// (all of them when the read was not stopped early).
    virtual Status readRows(std::size_t index, RowSink& sink, std::vector<MergedRange>& merges) = 0;
    /// Every merged range of sheet `index` (a pass of its own for .xlsx, where they follow the
    /// rows).
    virtual Result<std::vector<MergedRange>> mergesOf(std::size_t index) = 0;
    /// The unpacked size of the part that holds sheet `index`, as declared (a hint for memory).
    virtual std::uint64_t partBytes(std::size_t index) const = 0;
};

/// The date of a spreadsheet serial number (ECMA-376 Part 1, 18.17.4.1): 1900 system, serial 1
/// is 1900-01-01, serial 60 the fictitious 1900-02-29, serial 61 is 1900-03-01; 1904 system,
/// serial 0 is 1904-01-01. The time of day (the fraction) is dropped. Empty when the serial is
/// no date: serial 60 in the 1900 system (then `fictitious` is set), below 1 (1900) or below 0
/// (1904), or after 9999-12-31.
std::string isoDateOfSerial(double serial, bool date1904, bool& fictitious);

/// A number written as the CSV path reads it: digits with '.' for decimals, no exponent.
std::string plainNumberText(std::string_view text);

}  // namespace siftwave::ingest::detail
