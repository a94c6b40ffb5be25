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
#include "ingest/table_bounds.h"
#include "ingest/warning_log.h"
#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"

#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

// A calendar longer than this is a mistyped year (the table bounds are in table_bounds.h).
inline constexpr std::int64_t kMaxSpanDays = 100 * 366;

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

    /// The text is a workbook's sheet written as CSV (its lines are the sheet's rows): every
    /// message names places as the sheet's cells ("data!C14"), through sourcePlace().
    void readAsSheetOf(const Provenance& workbook) {
        m_drop.source.format = workbook.format;
        m_drop.source.sheet = workbook.sheet;
        m_drop.source.firstColumn = workbook.firstColumn;
    }

    Result<Drop> run();

private:
    /// A source position as messages name it (sourcePlace(): "line 14" or "data!C14").
    std::string place(std::uint64_t line, std::uint64_t column = 0) const {
        return sourcePlace(m_drop.source, line, column);
    }
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
    /// True when the one-pass read may be tried; sets the predicted calendar. Its steps: the
    /// date format, the dates of the sample and the tail, the weekly step, the tables' size.
    bool predictCalendar();
    /// The date format the one pass reads by: the one already settled, or the shape of the
    /// first whole sample record's date when it names one format (ISO, compact, ISO week).
    std::optional<DateFormat> predictedDateFormat() const;
    /// The dates of the sample and of the file's last records, read in `format`.
    struct PredictedDates {
        std::int32_t lo = std::numeric_limits<std::int32_t>::max();  // earliest serial
        std::int32_t hi = std::numeric_limits<std::int32_t>::min();  // latest serial
        unsigned weekdays = 0;          // bit w: a date on ISO weekday w was seen
        std::size_t sampleRegions = 0;  // distinct region codes in the sample
    };
    PredictedDates sampleAndTailDates(DateFormat format);
    /// Ok(true) when done, Ok(false) when the prediction failed (nothing kept).
    Result<bool> onePass();
    /// One pass, a date text seen for the first time: parsed, interned as `index` with its day.
    /// Ok(false) when it lies outside the predicted calendar (ending at serial `last`) or off its
    /// weekly grid; an error when it is not a date.
    Result<bool> addPredictedDate(std::string_view text, std::uint32_t line, std::int32_t last,
                                  std::uint32_t& index);
    /// One pass, a region code seen for the first time: interned as `region`, its tables grown;
    /// false when there are more regions than reserved for.
    bool addPredictedRegion(std::string_view code, std::uint32_t line, std::uint32_t& region);
    /// One pass, a measure name seen for the first time: interned as `measure`, with its table
    /// reserved at `reserve` cells; false when the memory is not there.
    bool addMeasureNamed(std::string_view name, std::size_t reserve, std::uint32_t& measure);
    void resetForTwoPasses();
    Status keyPass();
    /// The dates in their steps: the header's date texts (dates-across), the format (when not
    /// named), every date's serial and table column, the columns of a dates-across header.
    Status settleDates();
    /// Dates-across: the header's date columns' names are the date texts (line 1).
    void internHeaderDates();
    /// The format the first date's shape names; a slash date's order by settleSlashOrder.
    Status detectDateFormat();
    /// Day or month first, settled by a number above 12 in the dates, never guessed: a mix of
    /// both orders or neither is an error.
    Status settleSlashOrder();
    /// Every date text parsed to its serial; the first day, the step (7 when every date is on
    /// one weekday), the table columns; a calendar too long for a drop is an error.
    Status laySerialsOut();
    /// Dates-across: the table column of each date column (-1 for the others).
    void mapDateColumns();
    Status checkTableJustified(double cells, std::size_t regions, std::int32_t lo, std::int32_t hi,
                               std::size_t loIndex, std::size_t hiIndex,
                               const std::vector<std::int32_t>& serials) const;
    /// The cells the file justifies: kMaxCellsPerValue for each value its data rows (those
    /// read and those a narrowed read left out) can hold, and never less than the sparse floor.
    double justifiedCells() const;
    /// The refusal of a table too large, in its parts: what was asked, then how to narrow it.
    std::string tableAsked(double cells, std::size_t regions, std::int32_t lo, std::int32_t hi,
                           std::size_t loIndex, std::size_t hiIndex) const;
    /// What to type next: a --from/--to window built from the file's own dates (the one of
    /// at most the periods the file justifies that holds the most rows, the latest on a tie) and
    /// an --only-regions example from its own codes, each with what it keeps.
    std::string narrowingAdvice(const std::vector<std::int32_t>& serials, std::size_t regions,
                                std::size_t measures) const;

    // A narrowed read (IngestOptions::narrowing; drop_narrowing.cpp).
    /// Before the passes: the region codes asked for, and (dates down the file) which date
    /// texts lie outside the window.
    Status settleNarrowing();
    /// Dates-down: only the region columns asked for are value columns; none is an error.
    Status narrowRegionColumns();
    /// Every distinct date text of the file in m_dates (a pass over its date column alone),
    /// sorted into kept and left out by the window; m_dates is emptied again for the key pass.
    Status settleDateWindow();
    /// The cadence the dates in m_dates make (daily, or weekly with its week start), kept as
    /// m_fileCadence; `kept[i]` is true when date i's period overlaps from..to.
    Status windowOfDates(std::vector<bool>& kept);
    /// Dates-across: the header's date columns outside the window are left out.
    Status narrowHeaderDates();
    /// True when a narrowed read leaves the row out (counted when `count`).
    bool leftOutByNarrowing(const std::vector<CsvField>& f, bool count);
    /// After the key pass: no row left is an error; codes asked for but not found a warning.
    Status checkNarrowingLeftRows();
    /// The cadence to read by: the options', else (a narrowed read) the whole file's.
    std::optional<Cadence> cadence() const {
        return m_options.cadence ? m_options.cadence : m_fileCadence;
    }
    Status cellPass();
    /// The calendar the dates make: daily, or weekly (every date 7 days apart on one
    /// weekday, or ISO week labels), with the options' overrides; for weekly, the period
    /// of every day index in use. Dates that fit neither grid are an error with their lines.
    struct CalendarPlan {
        TimeAxis axis;
        std::vector<std::int32_t> periodOfDay;  // weekly: day index -> period (-1: no date)
        std::vector<std::int32_t> usedDays;     // weekly: the day indices that hold a date
    };
    /// In its steps: daily when the options say so (week labels then refused), the weekday
    /// most dates fall on, whether the dates are on a weekly grid, the week convention, and the
    /// week of every date.
    Result<CalendarPlan> planCalendar();
    /// The day of a table column (columns are weeks when every date fell on one weekday).
    Date dateOfColumn(std::int32_t column) const { return Date{m_firstSerial + column * m_step}; }
    struct CommonWeekday {
        int weekday = 1;        // the ISO weekday most distinct dates fall on
        std::size_t count = 0;  // the distinct dates on it
    };
    CommonWeekday commonWeekday() const;
    /// The dates not on `weekday`, as "N dates are not: line L (2026-02-03, a Tuesday); ...",
    /// the first `limit` listed.
    std::string offGridDates(int weekday, std::size_t limit) const;
    /// With no cadence given: true when every date is on the common weekday (weekly), false
    /// when the dates are daily; an error when nearly all but not all are (at least 9 in 10).
    Result<bool> datesOnWeeklyGrid(const CommonWeekday& common) const;
    struct WeekConvention {
        WeekStart start = WeekStart::Monday;
        WeekDate named = WeekDate::Start;  // which day of its week a date names
    };
    /// The week convention from the weekday, the date column's name ("end") and the options;
    /// a warning when the dates are not the day of the week the convention names.
    WeekConvention settleWeekConvention(int weekday, bool labels, bool yearWeek);
    /// The week convention alone (settleWeekConvention without its warning).
    WeekConvention conventionFor(int weekday, bool labels, bool yearWeek) const;
    /// The weekly axis from the first date's week to the last's, and every date's week in
    /// `plan`; two dates in one week are an error.
    Status placeWeeks(CalendarPlan& plan, const WeekConvention& convention, int weekday) const;
    /// In its steps: no rows is an error, the calendar, the names of dates, regions and
    /// measures, the tables per period, the closing warnings.
    Status finish();
    void recordDateFormatAndNames();
    /// The tables as the drop keeps them: per period; filled by day for a weekly axis whose
    /// columns are not its weeks, they are moved to their weeks (and the duplicates with them).
    void arrangeTablesByPeriod(const CalendarPlan& plan);
    /// The counted warnings: empty lines, duplicates, thousands, zero fractions, spaces.
    void noteClosingWarnings();

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
    /// After the key pass: the measures and the regions of the tables.
    std::size_t tableMeasures() const;
    std::size_t tableRegions() const;

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

    // A narrowed read: the codes asked for (and which were found), the date texts left out,
    // the cadence and the first and last day of the whole file's dates.
    bool m_narrowed = false;
    KeyDictionary m_regionsAsked;
    std::vector<bool> m_regionAskedFound;
    KeyDictionary m_datesLeftOut;
    std::optional<Cadence> m_fileCadence;
    std::optional<std::int32_t> m_fileFirst, m_fileLast;
    std::vector<std::uint32_t> m_rowsOfDate;  // key pass: the rows of each date text

    bool m_emptyIsMissing = false;
    std::vector<std::string> m_otherMissing;
    WarningLog m_log;
};

}  // namespace siftwave::ingest::detail
