#pragma once
// Drop: one data release exactly as read. Never modified after ingest.
//
// A Drop holds the provenance of the file, the region codes exactly as written
// (text, never coerced, in first-seen order), the measures, the time axis
// (daily or weekly periods, time_axis.h) and, per measure, a dense
// region x period table of cells. Rows that repeat a (region, date, measure) are kept aside in
// `duplicates`; the table holds the first occurrence.

#include "siftwave/case_list.h"
#include "siftwave/date.h"
#include "siftwave/time_axis.h"

#include <cstddef>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <unordered_map>
#include <utility>
#include <vector>

namespace siftwave {

enum class CellState : std::uint8_t {
    Absent,      // no row for this region and period
    Reported,    // a number was read
    Blank,       // the cell matched a missing-value token (default: the empty cell)
    Unparsable,  // something that is neither a number nor a missing token
};

/// "absent", "reported", "blank", "unparsable".
const char* cellStateName(CellState state);

struct Cell {
    std::int32_t value = 0;  // the count when Reported (may be negative); 0 otherwise
    std::uint32_t line = 0;  // 1-based physical line of the source row; 0 when Absent
    CellState state = CellState::Absent;

    bool reported() const { return state == CellState::Reported; }
};

/// A dense region x period table for one measure; a region's periods are contiguous.
/// (The table knows nothing of the calendar: "days" here counts its columns, the periods.)
class CellTable {
public:
    CellTable() = default;
    CellTable(std::size_t regions, std::size_t days) : m_days(days), m_cells(regions * days) {}
    /// Adopts cells already laid out region by region; `cells.size()` must be a multiple of `days`.
    CellTable(std::size_t days, std::vector<Cell> cells)
        : m_days(days), m_cells(std::move(cells)) {}

    std::size_t regions() const { return m_days == 0 ? 0 : m_cells.size() / m_days; }
    std::size_t days() const { return m_days; }
    Cell& at(std::size_t region, std::size_t day) { return m_cells[region * m_days + day]; }
    const Cell& at(std::size_t region, std::size_t day) const {
        return m_cells[region * m_days + day];
    }
    std::span<const Cell> series(std::size_t region) const {
        return {m_cells.data() + region * m_days, m_days};
    }
    std::span<Cell> series(std::size_t region) {
        return {m_cells.data() + region * m_days, m_days};
    }

private:
    std::size_t m_days = 0;
    std::vector<Cell> m_cells;
};

enum class Layout {
    Long,         // one row per date x region (x measure): date, region, value column(s)
    DatesDown,    // wide: one row per date, one column per region
    DatesAcross,  // wide: one row per region, one column per date
    CaseList,     // one row per case, with its dates (case_list.h); counted by event date
};

/// "long", "dates-down", "dates-across", "case-list".
const char* layoutName(Layout layout);
std::optional<Layout> layoutFromName(std::string_view name);

/// What the reader found (or was told) about the text format.
struct Dialect {
    char delimiter = ',';
    bool header = true;
    bool bom = false;             // a UTF-8 byte-order mark was present
    bool crlf = false;            // lines end in CR LF
    char decimalSeparator = '.';  // ',' when a decimal comma was detected
    char thousandsSeparator = 0;  // 0 when none was seen; else '.', ',', ' ' or '\''
};

/// Which source columns play which role (names as in the header, or "column N").
struct ColumnMapping {
    std::string date;  // with a year and a week column: "YEAR+WEEK" (both names), for display
    std::string year;  // a date written as a year and a week number: the two columns;
    std::string week;  // empty otherwise
    std::string region;
    // One per measure column (long), or the region/date columns (wide).
    std::vector<std::string> values;
    std::string measure;  // long layout with a measure-name column; empty otherwise
};

/// A narrowed read: the dates and regions a read was limited to (IngestOptions::narrowing,
/// the CLI's --from, --to and --only-regions). Rows outside are counted, never put in the
/// tables. Empty (no bound, no region) means the whole file. A ledger entry records the
/// narrowing of the read it was made on (ledger/entry.h), so that replay refuses another one.
struct ReadNarrowing {
    std::optional<Date> from;          // first day kept; a week is kept when it overlaps
    std::optional<Date> to;            // last day kept (inclusive)
    std::vector<std::string> regions;  // codes kept, verbatim, sorted, each once; empty: all

    bool active() const { return from || to || !regions.empty(); }
    /// The options that ask for it, as typed: "--from 2026-01-01 --to 2026-03-31
    /// --only-regions A,B" (a list of more than 8 codes is shown by its count); "" when whole.
    std::string asOptions() const;
    friend bool operator==(const ReadNarrowing&, const ReadNarrowing&) = default;
};

/// What a narrowed read left out, for the audit trail (inspect, figures, reports).
struct LeftOut {
    std::uint64_t rowsOutsideDates = 0;        // data rows whose period lies outside from..to
    std::uint64_t rowsOfOtherRegions = 0;      // data rows (in the dates) of regions not asked for
    std::uint64_t dateColumns = 0;             // dates-across: date columns outside from..to
    std::uint64_t regionColumns = 0;           // dates-down: region columns not asked for
    std::vector<std::string> regionsNotFound;  // asked for, but in no row of the file

    std::uint64_t rows() const { return rowsOutsideDates + rowsOfOtherRegions; }
    /// "1204 data rows left out (1200 outside 2026-01-01 to 2026-03-31, 4 of other
    /// regions)"; "" when nothing was.
    std::string describe(const ReadNarrowing& narrowing) const;
};

struct Provenance {
    std::string path;
    std::uint64_t bytes = 0;
    std::string sha256;  // lower-case hex of the file's bytes
    Dialect dialect;
    Layout layout = Layout::Long;
    ColumnMapping columns;
    /// The format used: "YYYY-MM-DD", "YYYYMMDD", "DD/MM/YYYY", "MM/DD/YYYY", "YYYY-Www", or
    /// "year+ISO week" / "year+epi week" (a year and a week column).
    std::string dateFormat;
    /// A spreadsheet drop (.xlsx, .ods): its format ("xlsx", "ods"; empty for CSV), every
    /// sheet's name in workbook order, the sheet read, and the sheet column (0-based) of the
    /// table's first column. Its line numbers are the sheet's row numbers and its columns the
    /// table's columns counted from `firstColumn`, so sourcePlace() names a cell ("data!C14").
    std::string format;
    std::vector<std::string> sheets;
    /// The sheets whose first rows hold dates, in workbook order: the tables worth choosing
    /// between (the default is the first of them). Listed when the workbook has several sheets.
    std::vector<std::string> datedSheets;
    std::string sheet;
    std::uint32_t firstColumn = 0;
    /// The read was narrowed to these dates and regions (empty: the whole file was read), and
    /// what that left out.
    ReadNarrowing narrowing;
    LeftOut leftOut;
};

/// The narrowing of a read for people and the audit trail: "narrowed read (--from 2026-01-01):
/// 120 data rows left out (120 before 2026-01-01)"; "" for a read of the whole file.
/// Captions, reports and inspect print it.
std::string narrowingNote(const Provenance& source);

/// Where a source position is, as a person finds it: "line 14" or "line 14, column 3" for a
/// CSV drop; "data!C14" (a cell, ECMA-376's sheet!cell reference) or "data!14:14" (a row) for a
/// spreadsheet drop. Empty when `line` is 0.
std::string sourcePlace(const Provenance& source, std::uint64_t line, std::uint64_t column = 0);

/// The column letters of a 0-based sheet column: 0 "A", 25 "Z", 26 "AA" (ECMA-376 Part 1,
/// 18.3.1.4 cell references).
std::string columnLetters(std::uint64_t column);

/// Something the reader noticed but did not treat as fatal.
struct Warning {
    std::string message;
    std::uint64_t line = 0;    // 1-based; 0 when not about one line
    std::uint64_t column = 0;  // 1-based; 0 when not about one column
};

/// A row whose region, date and measure were already seen.
struct DuplicateRow {
    std::size_t measure = 0;
    std::size_t region = 0;
    std::int32_t day = 0;         // period index into the time axis
    Cell cell;                    // the repeating row's cell (the table keeps the first one)
    std::uint32_t firstLine = 0;  // line of the occurrence kept in the table
};

struct CellCounts {
    std::size_t reported = 0;
    std::size_t absent = 0;
    std::size_t blank = 0;
    std::size_t unparsable = 0;
};

struct Drop {
    Provenance source;
    std::vector<std::string> regionCodes;  // verbatim, first-seen order
    std::vector<std::string> measures;     // e.g. "cases", "deaths"
    TimeAxis axis;                         // the periods: daily or weekly (time_axis.h)
    std::size_t rows = 0;                  // data rows read (excluding the header)
    std::vector<CellTable> tables;         // one per measure, each regions x periods
    std::vector<DuplicateRow> duplicates;
    std::vector<Warning> warnings;
    /// A case list (layout CaseList): the cases behind the counts, with their lines.
    std::optional<CaseList> caseList;

    /// Number of periods (days or weeks).
    std::int32_t periods() const { return axis.periods(); }
    /// First day of period i.
    Date periodStart(std::int32_t index) const { return axis.periodStart(index); }
    /// The period that holds a day (any day of a week), nullopt outside the axis.
    std::optional<std::int32_t> periodOf(Date day) const { return axis.periodOf(day); }
    std::optional<std::size_t> regionIndex(std::string_view code) const;
    std::optional<std::size_t> measureIndex(std::string_view name) const;

    const Cell& cell(std::size_t measure, std::size_t region, std::int32_t day) const {
        return tables[measure].at(region, static_cast<std::size_t>(day));
    }
    std::span<const Cell> series(std::size_t measure, std::size_t region) const {
        return tables[measure].series(region);
    }
    CellCounts countCells() const;

    /// Rebuilds the code -> index lookup; call after filling regionCodes.
    void indexRegions();

private:
    std::unordered_map<std::string, std::size_t> m_regionLookup;
};

}  // namespace siftwave
