#pragma once
// Reading a data drop (CSV per RFC 4180) into a Drop, exactly as written.
//
// The reader sniffs the dialect (delimiter among , ; TAB |, header or not,
// decimal comma, thousands separators), the layout (long, dates-down,
// dates-across) and the roles of the columns; every guess can be overridden
// through IngestOptions. Region codes are kept verbatim. A value cell is
// missing only if it matches one of `missingTokens`; anything else that is
// not a number is `unparsable` and reported with line and column. It never
// guesses the day/month order: when every day-of-month is 12 or less it asks
// for `dateFormat`.

#include "siftwave/drop.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest {

struct IngestOptions {
    std::optional<Layout> layout;  // default: detected
    std::string dateColumn;        // default: detected (header name)
    /// A date written as a year column and a week-number column (year 2026, week 5), when no
    /// column holds dates. Default: detected, both by a header word (year, Jahr, année, año,
    /// anno; week, Woche, semaine, semana, settimana, KW, epiweek, isoweek) and by the cells
    /// (four-digit years 1900 to 2100; weeks 1 to 53). Naming one detects the other.
    /// Such a file is weekly: ISO 8601 weeks unless weekStart says Sunday (or the names say
    /// MMWR). Not with dateColumn, dateFormat, the dates-across layout or cadence daily.
    std::string yearColumn;
    std::string weekColumn;
    std::string regionColumn;  // default: detected (header name)
    // Default: detected; each becomes a measure (long layout).
    std::vector<std::string> valueColumns;
    std::string measureColumn;  // long layout with a measure-name column; default: detected
    std::string measureName;    // wide layouts: name of the one measure (default "cases")
    std::string dateFormat;     // "" = detect; "YYYY-MM-DD", "YYYYMMDD", "DD/MM/YYYY", "MM/DD/YYYY"
    std::optional<char> delimiter;  // default: sniffed among , ; TAB |
    std::optional<bool> header;     // default: sniffed
    // Cells that mean "no value" (default: the empty cell).
    std::vector<std::string> missingTokens{""};
    /// The calendar (time_axis.h). Default: detected. Weekly when every date lies 7 days
    /// apart on one weekday, or the dates are ISO week labels (2026-W05) or a year and a
    /// week column; daily otherwise.
    std::optional<Cadence> cadence;
    /// Weekly: the first day of a week. Default: from the dates' weekday (Monday dates:
    /// ISO weeks; Sunday dates: epidemiological weeks named by their first day, or ISO
    /// weeks named by their last day when the date column's name says "end"; Saturday
    /// dates: epidemiological weeks named by their last day). A year and a week column:
    /// ISO weeks (Monday), or Sunday-start epidemiological weeks when a column's name says
    /// MMWR (the CDC's weeks); "epiweek" alone leaves ISO weeks and a warning, since
    /// epidemiological weeks start on Sunday in the Americas and on Monday in Europe.
    std::optional<WeekStart> weekStart;
    /// Weekly: whether a date names the first or the last day of its week (default: as above).
    std::optional<WeekDate> weekDate;
    /// A spreadsheet drop (.xlsx, .ods): the sheet to read, by name or by 1-based position
    /// (a name wins when a sheet is named with digits). Default: the first sheet whose first
    /// rows hold dates. Refused for a CSV file.
    std::string sheet;

    /// A case list: one row per case with its dates (case_list.h), counted per region and period
    /// by the event date. Default: detected (case_list_reader.h: a header, one or more columns
    /// of dates, and no column of counts); true forces it (`--case-list`, or layout CaseList),
    /// false refuses it.
    std::optional<bool> caseList;
    /// The case list's event date (onset, sample, hospitalisation). Default: the first date
    /// column whose name does not speak of a report. Naming it (or reportColumn) forces a case
    /// list.
    std::string eventColumn;
    /// The case list's report date. Default: the date column whose name speaks of a report
    /// (report, notification, Meldung, ...), else the next date column after the event's; none
    /// when the list has one date column.
    std::string reportColumn;

    /// A narrowed read (the CLI's --from, --to, --only-regions): only the rows whose period
    /// overlaps from..to (a day inside it; for weekly data a week that overlaps it) and whose
    /// region is listed are put in the tables; the others are counted in
    /// Provenance::leftOut. Wide layouts leave out whole columns (dates-across: date columns;
    /// dates-down: region columns). The read's narrowing is kept in Provenance::narrowing and
    /// recorded by every ledger entry made on it. Default: the whole file.
    ReadNarrowing narrowing;

    /// Usage errors (unknown date format, a delimiter that is a quote, ...).
    Status validate() const;
    /// The case-list options' part of validate() (case_list_reader.cpp).
    Status validateCaseListOptions() const;
    /// True when the options ask for a case list (caseList, layout CaseList, event/report column).
    bool forcesCaseList() const;
};

/// Reads and parses a file. The file is never written.
Result<Drop> readDrop(const std::string& path, const IngestOptions& options = {});

/// Parses bytes already in memory; `displayPath` is used in provenance and messages.
Result<Drop> parseDrop(std::string_view bytes, const std::string& displayPath,
                       const IngestOptions& options = {});

/// Reads a region register: CSV with columns code, name, parent, population
/// (header required; parent and population may be empty). Codes verbatim.
Result<RegionRegister> readRegister(const std::string& path);

/// The region register that goes with a drop, looked for in the drop's folder: for
/// "<name>_<release>.csv" the file "<name>_regions.csv", else "regions.csv", else the one CSV
/// file whose name holds "regions" or "register" (letter case aside; hidden files and the drop
/// itself never count). Empty when there is none. The workbench opens it with the drop, and
/// the CLI's commands that take --regions read it when the flag is not given.
std::string registerBeside(const std::string& dropPath);

}  // namespace siftwave::ingest
