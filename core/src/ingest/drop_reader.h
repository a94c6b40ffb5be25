#pragma once
// DropReader: the passes of readDrop / parseDrop over a drop's bytes.
//
//  1. sniff (drop_reader.cpp): BOM, delimiter, header, decimal separator,
//     layout and roles from the first records;
//  2a. one pass (drop_passes.cpp), for a long file whose dates are ISO 8601
//     (or ISO week labels, or a year and a week column):
//     the calendar is predicted from the first and the last records, the cell
//     tables are reserved at that size and filled (cell_table_builder.h) while
//     the region codes are collected. Any date outside the prediction (an unsorted file) abandons
//     the pass and falls back to 2b; the result is the same either way;
//  2b. two passes: a key pass collects region codes, dates and measure names,
//     the date format is settled (refusing an ambiguous day/month order), then
//     a cell pass fills the tables allocated at their final size.
// A date written as a year and a week column is read as one key, the two cells
// joined (dateKeyOf), so both paths treat it as a date text like any other.
// Along the first pass the bytes are hashed (SHA-256) and checked for UTF-8.
// Peak memory is the cell tables plus a window of the file (input_source.h).

#include "ingest/cell_table_builder.h"
#include "ingest/csv_scanner.h"
#include "ingest/date_parsing.h"
#include "ingest/input_source.h"
#include "ingest/key_dictionary.h"
#include "ingest/number_parsing.h"
#include "ingest/role_detection.h"
#include "ingest/sniffing.h"
#include "ingest/warning_log.h"
#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"

#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

/// 'text' in quotes, shortened when long (for messages).
std::string quoted(std::string_view text);

class DropReader {
public:
    DropReader(std::string_view bytes, std::string path, const IngestOptions& options,
               InputFile* file)
        : m_bytes(bytes),
          m_path(std::move(path)),
          m_options(options),
          m_file(file),
          m_checker(bytes, m_path) {}

    Result<Drop> run();

private:
    Error fail(ErrorCode code, std::string message, std::uint64_t line = 0,
               std::uint64_t column = 0) const;
    /// A syntax error, unless an encoding error comes before it.
    Error syntaxFailure(const CsvSyntaxError& s);

    /// Pass 1, in its steps: the bytes can be read as text, the first block's encoding and line
    /// endings, the delimiter, the first records (the sample), header and decimal separator,
    /// the column names, the roles, and the column mapping recorded in the provenance.
    Status sniff();
    /// A UTF-16 byte-order mark, a packed file (ZIP, gzip, PDF) or nothing but blank space is
    /// refused; a UTF-8 byte-order mark is skipped.
    Status rejectUnreadableStart();
    /// The first block is UTF-8, and its lines do not end in a carriage return alone.
    Status checkSampleBlock(std::size_t sampleEnd);
    void settleDelimiter(std::size_t sampleEnd);
    /// The first records up to `sampleEnd` (at least 3), owned; `sampledUpTo` is where they end.
    Result<std::vector<SampleRecord>> readSampleRecords(std::size_t sampleEnd,
                                                        std::size_t& sampledUpTo);
    void settleHeaderAndNumberStyle(const std::vector<SampleRecord>& records);
    /// The header's names (taken out of `records`) or "column N"; a file of one column is refused.
    Status takeColumnNames(std::vector<SampleRecord>& records, std::size_t sampleEnd);
    /// detectRoles, then the names that must differ: regions (dates-down), measures (long).
    Status settleRoles(const std::vector<SampleRecord>& records);
    /// The value columns' names differ: they name regions (dates-down) or measures (long).
    Status checkValueColumnNamesDistinct() const;
    /// The layout and column names in the provenance; the unused columns as warnings.
    Status recordColumnMapping();
    /// A year and a week column: ISO 8601 weeks, or Sunday-start weeks when --week-start or
    /// the columns' names (MMWR) say so; "epi" in a name is noted as a warning.
    Status settleYearWeekConvention();
    /// The date format before any date is read: named, YearWeek, or Unknown (to detect).
    DateFormat initialDateFormat() const;
    /// True when the one-pass read may be tried; sets the predicted calendar.
    bool predictCalendar();
    /// Ok(true) when done, Ok(false) when the prediction failed (nothing kept).
    Result<bool> onePass();
    void resetForTwoPasses();
    Status keyPass();
    Status settleDates();
    Status cellPass();
    /// The calendar the dates make: daily, or weekly (every date 7 days apart on one
    /// weekday, or ISO week labels), with the options' overrides; for weekly, the period
    /// of every day index in use. Dates that fit neither grid are an error with their lines.
    struct CalendarPlan {
        TimeAxis axis;
        std::vector<std::int32_t> periodOfDay;  // weekly: day index -> period (-1: no date)
        std::vector<std::int32_t> usedDays;     // weekly: the day indices that hold a date
    };
    Result<CalendarPlan> planCalendar();
    Status finish();

    /// Housekeeping every record gets once: encoding checks ahead, page release.
    Status advance(std::size_t offset);
    /// The checks every data record gets once; `keep` false when the row is not read.
    /// Inline for the common record: the right number of fields, no stray quote, and
    /// its date, region and measure cells not empty.
    Status admit(const CsvRecord& record, bool& keep) {
        const std::vector<CsvField>& f = record.fields;
        if (f.size() == m_names.size() && !record.strayQuote &&
            (m_roles.layout == Layout::DatesAcross ||
             !f[static_cast<std::size_t>(m_roles.dateColumn)].text.empty()) &&
            (m_roles.layout == Layout::DatesDown ||
             !f[static_cast<std::size_t>(m_roles.regionColumn)].text.empty()) &&
            (m_roles.measureColumn < 0 ||
             !f[static_cast<std::size_t>(m_roles.measureColumn)].text.empty())) {
            ++m_drop.rows;
            keep = true;
            return Ok{};
        }
        return admitSlowly(record, keep);
    }
    Status admitSlowly(const CsvRecord& record, bool& keep);
    void noteNewRegion(std::string_view code, std::uint32_t line);
    /// `text` as a date: a date text in `format`, or (YearWeek) a key of dateKeyOf.
    std::optional<Date> parseDateIn(std::string_view text, DateFormat format) const;
    /// Why `text` is not a date (for a year and a week, which cell and why; `column` is then
    /// the cell's own).
    Error dateError(const std::string& text, std::uint64_t line, std::uint64_t column) const;
    Error yearWeekError(std::string_view key, std::uint64_t line) const;

    /// The text that names a record's date: its date cell, or for a year and a week column
    /// both cells joined by a unit separator (in m_yearWeekKey, valid until the next call).
    std::string_view dateKeyOf(const std::vector<CsvField>& f, std::size_t dateCol) {
        if (m_roles.weekColumn < 0)
            return f[dateCol].text;
        return yearWeekKey(f[dateCol].text, f[static_cast<std::size_t>(m_roles.weekColumn)].text);
    }
    std::string_view yearWeekKey(std::string_view year, std::string_view week);
    Status checkFieldCount(const CsvRecord& record);

    Cell parseCell(std::string_view text, std::uint32_t line, std::uint64_t column) {
        // The common case inline: plain digits and no missing-value token to compare with.
        Cell cell;
        if (m_otherMissing.empty() && parsePlainCountIn(text, m_bytes, cell.value)) {
            cell.line = line;
            cell.state = CellState::Reported;
            return cell;
        }
        return parseCellSlowly(text, line, column);
    }
    Cell parseCellSlowly(std::string_view text, std::uint32_t line, std::uint64_t column);
    void place(std::size_t measure, std::uint32_t region, std::int32_t day, const Cell& cell) {
        std::uint32_t firstLine = 0;
        if (!m_tables.put(measure, region, day, cell, firstLine))
            addDuplicate(measure, region, day, cell, firstLine);
    }
    void addDuplicate(std::size_t measure, std::uint32_t region, std::int32_t day, const Cell& cell,
                      std::uint32_t firstLine);
    std::string columnName(int c) const { return m_names[static_cast<std::size_t>(c)]; }
    std::size_t measureCount() const;

    std::string_view m_bytes;
    std::string m_path;
    const IngestOptions& m_options;
    InputFile* m_file;
    InputChecker m_checker;

    Drop m_drop;
    std::size_t m_start = 0;       // first byte after the BOM
    std::size_t m_dataStart = 0;   // first byte after the header
    std::uint64_t m_dataLine = 1;  // line number at m_dataStart
    char m_delimiter = ',';
    bool m_header = true;
    NumberStyle m_style;
    std::vector<std::string> m_names;
    RoleMapping m_roles;
    std::vector<SampleRecord> m_sample;  // the first data records
    std::size_t m_sampleBytes = 0;       // bytes of the data records in m_sample
    WarningLog m_sniffLog;               // warnings of the sniff, kept for a restart

    KeyDictionary m_regions;
    KeyDictionary m_dates;
    KeyDictionary m_measureNames;
    std::vector<std::uint64_t> m_dateLine, m_dateColumn;  // where each date text was first seen
    std::vector<std::int32_t> m_dayOfDate;                // day index per distinct date text
    DateFormat m_dateFormat = DateFormat::Unknown;
    WeekStart m_yearWeekStart = WeekStart::Monday;  // a year and a week column: the convention
    std::string m_yearWeekKey;                      // dateKeyOf's buffer
    std::vector<std::int32_t> m_dayOfColumn;        // dates-across: day index per column (-1: none)

    std::int32_t m_firstSerial = 0;  // the calendar: first day and length
    std::size_t m_days = 0;          // table columns (days, or weeks when m_step is 7)
    // Days per table column: 7 when every date falls on one weekday (a weekly file: its tables are
    // filled week by week, never 7 times wider), 1 otherwise.
    std::int32_t m_step = 1;
    std::size_t m_regionCapacity = 0;  // one pass: regions the tables are reserved for
    CellTableBuilder m_tables;         // per measure, region-major, m_days per region

    std::size_t m_nextCheck = 0;
    std::size_t m_emptyLines = 0;
    std::uint64_t m_firstEmptyLine = 0;
    bool m_strayReported = false;

    bool m_emptyIsMissing = false;
    std::vector<std::string> m_otherMissing;
    WarningLog m_log;
};

}  // namespace siftwave::ingest::detail
