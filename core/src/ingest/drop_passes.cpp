// The passes over a drop's records (see drop_reader.h).
#include "ingest/drop_reader.h"

#include <algorithm>
#include <array>
#include <bit>
#include <cassert>
#include <cctype>
#include <cstdio>
#include <limits>
#include <set>

namespace siftwave::ingest::detail {
namespace {

constexpr std::size_t kCheckAhead = std::size_t{256} << 10;
constexpr std::size_t kTailBytes = std::size_t{64} << 10;

// Joins a year cell and a week cell into one date key (dateKeyOf): the ASCII unit separator,
// which no year or week number holds.
constexpr char kYearWeekSeparator = '\x1f';

std::pair<std::string_view, std::string_view> splitYearWeekKey(std::string_view key) {
    const std::size_t at = key.find(kYearWeekSeparator);
    if (at == std::string_view::npos)
        return {key, {}};
    return {key.substr(0, at), key.substr(at + 1)};
}

bool hasEdgeSpace(std::string_view code) {
    return std::isspace(static_cast<unsigned char>(code.front())) ||
           std::isspace(static_cast<unsigned char>(code.back()));
}

}  // namespace

std::size_t DropReader::tableMeasures() const {
    if (m_roles.measureColumn >= 0)
        return m_measureNames.size();
    return m_roles.layout == Layout::Long ? m_roles.valueColumns.size() : 1;
}

std::size_t DropReader::tableRegions() const {
    return m_roles.layout == Layout::DatesDown ? m_roles.valueColumns.size() : m_regions.size();
}

std::size_t DropReader::measureCount() const {
    if (m_roles.layout != Layout::Long)
        return 1;
    return m_roles.measureColumn >= 0 ? m_measureNames.size() : m_roles.valueColumns.size();
}

Status DropReader::advance(std::size_t offset) {
    if (offset < m_nextCheck)
        return Ok{};
    if (Status s = m_checker.checkUpTo(offset + kCheckAhead); !s)
        return s;
    m_nextCheck = offset + kCheckAhead / 2;
    if (m_file)
        m_file->release(offset);
    return Ok{};
}

Status DropReader::admitSlowly(const CsvRecord& record, bool& keep) {
    keep = false;
    if (record.isEmptyLine()) {
        if (m_emptyLines++ == 0)
            m_firstEmptyLine = record.line;
        return Ok{};
    }
    if (Status s = checkFieldCount(record); !s)
        return s;
    if (record.strayQuote && !m_strayReported) {
        m_strayReported = true;
        m_log.add("quote",
                  "a '\"' inside a value that is not quoted is kept as part of the value (RFC "
                  "4180 expects such values in quotes)",
                  record.line, 0);
    }
    ++m_drop.rows;
    const auto line = static_cast<std::uint32_t>(record.line);
    if (m_roles.layout != Layout::DatesAcross) {
        const std::size_t col = static_cast<std::size_t>(m_roles.dateColumn);
        if (record.fields[col].text.empty()) {
            if (m_roles.yearWeek())
                return yearWeekError(dateKeyOf(record.fields, col), line);
            m_log.add("empty date", "the date cell is empty; the row is not read", line, col + 1);
            return Ok{};
        }
    }
    if (m_roles.layout != Layout::DatesDown) {
        const std::size_t col = static_cast<std::size_t>(m_roles.regionColumn);
        if (record.fields[col].text.empty()) {
            m_log.add("empty region", "the region cell is empty; the row is not read", line,
                      col + 1);
            return Ok{};
        }
    }
    if (m_roles.measureColumn >= 0) {
        const std::size_t col = static_cast<std::size_t>(m_roles.measureColumn);
        if (record.fields[col].text.empty()) {
            m_log.add("empty measure", "the measure-name cell is empty; the row is not read", line,
                      col + 1);
            return Ok{};
        }
    }
    keep = true;
    return Ok{};
}

void DropReader::noteNewRegion(std::string_view code, std::uint32_t line) {
    if (hasEdgeSpace(code)) {
        m_log.add("spaces in code",
                  "region code " + quoted(code) +
                      " has spaces at its start or end; it is kept exactly as written",
                  line, static_cast<std::uint64_t>(m_roles.regionColumn) + 1);
    }
}

std::string_view DropReader::yearWeekKey(std::string_view year, std::string_view week) {
    m_yearWeekKey.assign(year);
    m_yearWeekKey += kYearWeekSeparator;
    m_yearWeekKey.append(week);
    return m_yearWeekKey;
}

std::optional<Date> DropReader::parseDateIn(std::string_view text, DateFormat format) const {
    if (format != DateFormat::YearWeek)
        return parseDateAs(text, format);
    const auto [year, week] = splitYearWeekKey(text);
    return readYearWeek(year, week, m_yearWeekStart).weekStart;
}

Error DropReader::yearWeekError(std::string_view key, std::uint64_t line) const {
    const auto [yearText, weekText] = splitYearWeekKey(key);
    const YearWeekReading r = readYearWeek(yearText, weekText, m_yearWeekStart);
    const int cellColumn = r.weekCellWrong() ? m_roles.weekColumn : m_roles.dateColumn;
    const std::string column = " in the " + std::string(r.weekCellWrong() ? "week" : "year") +
                               " column " + quoted(columnName(cellColumn));
    const bool iso = m_yearWeekStart == WeekStart::Monday;
    const char* weeks = iso ? "ISO 8601 weeks" : "epidemiological weeks (Sunday start)";
    std::string why;
    switch (r.problem) {
        case YearWeekProblem::EmptyYear:
        case YearWeekProblem::EmptyWeek:
            why = "the cell" + column + " is empty; every row needs a year and a week number";
            break;
        case YearWeekProblem::NotAYear:
            why = quoted(yearText) + column + " is not a year (four digits, such as 2026)";
            break;
        case YearWeekProblem::NotAWeek:
            why = quoted(weekText) + column + " is not a week number (a whole number, 1 to 53)";
            break;
        case YearWeekProblem::NoSuchWeek:
            if (r.week < 1 || r.week > 53) {
                why = "week " + std::to_string(r.week) + column +
                      " does not exist: weeks are numbered 1 to 52 or 53";
            } else if (r.week > weeksInYear(r.year, m_yearWeekStart)) {
                const WeekStart other = iso ? WeekStart::Sunday : WeekStart::Monday;
                why = "week " + std::to_string(r.week) + column +
                      " does not exist: " + std::to_string(r.year) + " has " +
                      std::to_string(weeksInYear(r.year, m_yearWeekStart)) + " " + weeks;
                if (weeksInYear(r.year, other) >= r.week)
                    why += iso ? " (it has 53 Sunday-start epidemiological weeks: if these are "
                                 "such weeks, pass --week-start sunday)"
                               : " (it has 53 ISO 8601 weeks: if these are ISO weeks, pass "
                                 "--week-start monday)";
            } else {
                why = "week " + std::to_string(r.week) + " of " + std::to_string(r.year) +
                      " is outside the calendar";
            }
            break;
        case YearWeekProblem::OffCalendar:
            why = "year " + std::to_string(r.year) + column + " is outside the calendar";
            break;
        case YearWeekProblem::None:
            break;
    }
    return fail(ErrorCode::InvalidValue, why, line, static_cast<std::uint64_t>(cellColumn) + 1);
}

namespace {

// The years Date accepts (isValidYmd in date.cpp).
constexpr int kFirstSupportedYear = 1400;
constexpr int kLastSupportedYear = 9999;

// True when `text` names a day of the proleptic Gregorian calendar (ISO 8601) whose year lies
// outside the supported range (0001-01-01), as opposed to a day that does not exist (2026-02-30).
bool outsideSupportedYears(std::string_view text, DateShape shape, DateFormat format) {
    int a = 0, b = 0, c = 0;
    if (!splitDate(text, shape, a, b, c))
        return false;
    int y = a, m = b, d = c;
    if (format == DateFormat::DayFirst) {
        y = c;
        m = b;
        d = a;
    } else if (format == DateFormat::MonthFirst) {
        y = c;
        m = a;
        d = b;
    } else if (format != DateFormat::Iso && format != DateFormat::Compact) {
        return false;
    }
    if (y >= kFirstSupportedYear && y <= kLastSupportedYear)
        return false;
    const bool leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    static const int days[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
    return m >= 1 && m <= 12 && d >= 1 && d <= days[m - 1] + (m == 2 && leap ? 1 : 0);
}

}  // namespace

Error DropReader::dateError(const std::string& text, std::uint64_t line,
                            std::uint64_t column) const {
    if (m_roles.yearWeek())
        return yearWeekError(text, line);
    const char* formatName = dateFormatName(m_dateFormat);
    const DateShape shape = dateShapeOf(text);
    std::string why;
    int year = 0, week = 0, unused = 0;
    if (m_dateFormat == DateFormat::IsoWeek &&
        splitDate(text, DateShape::IsoWeek, year, week, unused)) {
        // ISO 8601: a year has 52 or 53 weeks (53 when it starts on a Thursday, or a Wednesday
        // in a leap year).
        const int weeks = isValidYmd(year, 1, 4) ? weeksInYear(year, WeekStart::Monday) : 0;
        why = quoted(text) + " is not an ISO week: " +
              (weeks > 0 ? std::to_string(year) + " has " + std::to_string(weeks) +
                               " ISO weeks (week 1 holds 4 January)"
                         : std::string("the year is outside the supported calendar (1400-9999)"));
    } else if (shape == shapeOfFormat(m_dateFormat) &&
               outsideSupportedYears(text, shape, m_dateFormat)) {
        why = quoted(text) + " is a real day, but outside the years Siftwave reads (" +
              std::to_string(kFirstSupportedYear) + " to " + std::to_string(kLastSupportedYear) +
              "); is the year mistyped?";
    } else if (shape == shapeOfFormat(m_dateFormat)) {
        why = quoted(text) + " is not a real day of the calendar (read as " + formatName + ")";
    } else if (shape == DateShape::None) {
        why = quoted(text) + " in the date column is not a date; the dates in this file are " +
              formatName;
    } else {
        why = quoted(text) + " is written in another date format than the rest of the file (" +
              formatName + ")";
    }
    return fail(ErrorCode::InvalidValue, why, line, column);
}

std::optional<DateFormat> DropReader::predictedDateFormat() const {
    if (m_dateFormat != DateFormat::Unknown)
        return m_dateFormat;
    // The first sample record with every field: a short record has no date to look at.
    const auto whole = std::find_if(m_sample.begin(), m_sample.end(), [&](const SampleRecord& r) {
        return r.fields.size() == m_names.size();
    });
    if (whole == m_sample.end())
        return std::nullopt;
    const DateShape shape =
        dateShapeOf(whole->fields[static_cast<std::size_t>(m_roles.dateColumn)]);
    if (shape == DateShape::Iso)
        return DateFormat::Iso;
    if (shape == DateShape::Compact)
        return DateFormat::Compact;
    if (shape == DateShape::IsoWeek)
        return DateFormat::IsoWeek;
    return std::nullopt;  // a slash order is settled only after every date was seen
}

DropReader::PredictedDates DropReader::sampleAndTailDates(DateFormat format) {
    const std::size_t dateCol = static_cast<std::size_t>(m_roles.dateColumn);
    const std::size_t regionCol = static_cast<std::size_t>(m_roles.regionColumn);
    PredictedDates dates;
    auto see = [&](std::string_view text) {
        if (std::optional<Date> d = parseDateIn(text, format)) {
            dates.lo = std::min(dates.lo, d->serial);
            dates.hi = std::max(dates.hi, d->serial);
            dates.weekdays |= 1u << d->isoWeekday();
        }
    };
    std::set<std::string_view> sampleRegions;
    for (const SampleRecord& r : m_sample) {
        if (r.fields.size() != m_names.size())
            continue;
        see(m_roles.yearWeek() ? yearWeekKey(r.fields[dateCol],
                                             r.fields[static_cast<std::size_t>(m_roles.weekColumn)])
                               : std::string_view(r.fields[dateCol]));
        sampleRegions.insert(r.fields[regionCol]);
    }
    dates.sampleRegions = sampleRegions.size();
    // The last records: a guess only (the tail may start inside a quoted field).
    std::size_t tail = m_bytes.size() > kTailBytes ? m_bytes.size() - kTailBytes : 0;
    if (tail <= m_dataStart) {
        tail = m_dataStart;
    } else {
        const std::size_t nl = m_bytes.find('\n', tail);
        tail = nl == std::string_view::npos ? m_bytes.size() : nl + 1;
    }
    CsvScanner scanner(m_bytes, m_delimiter, tail);
    CsvRecord record;
    while (scanner.next(record)) {
        if (record.fields.size() == m_names.size())
            see(dateKeyOf(record.fields, dateCol));
    }
    return dates;
}

bool DropReader::predictCalendar() {
    // A narrowed read takes the two passes: its calendar is the window's, not the file's ends.
    if (m_narrowed || m_roles.layout != Layout::Long || m_sample.empty())
        return false;
    if (static_cast<std::size_t>(m_roles.dateColumn) >= m_names.size() ||
        static_cast<std::size_t>(m_roles.regionColumn) >= m_names.size())
        return false;
    const std::optional<DateFormat> format = predictedDateFormat();
    if (!format)
        return false;
    const PredictedDates dates = sampleAndTailDates(*format);
    const std::int32_t lo = dates.lo, hi = dates.hi;
    if (lo > hi)
        return false;
    if (hi - lo > kMaxSpanDays)
        return false;
    // Dates on one weekday: predicted weekly, one table column per week (a date off that grid
    // sends the read to two passes).
    const std::int32_t step =
        m_options.cadence != Cadence::Daily && hi > lo && std::popcount(dates.weekdays) == 1 ? 7
                                                                                             : 1;
    if ((hi - lo) % step != 0)
        return false;
    const std::size_t days = static_cast<std::size_t>((hi - lo) / step) + 1;
    // The regions: the rows the file's size suggests (at the sample's bytes per row) over the
    // days, with room to spare.
    const std::size_t sampleRows = std::max<std::size_t>(m_sample.size(), 1);
    const double bytesPerRow =
        std::max(1.0, static_cast<double>(m_sampleBytes) / static_cast<double>(sampleRows));
    const double rows = static_cast<double>(m_bytes.size() - m_dataStart) / bytesPerRow;
    const double regions =
        std::max(static_cast<double>(dates.sampleRegions), rows / static_cast<double>(days));
    const std::size_t capacity = static_cast<std::size_t>(regions * 1.5) + 64;
    const std::size_t measures = m_roles.measureColumn >= 0 ? 4 : m_roles.valueColumns.size();
    // A table far larger than the file's values (sparse rows over a long calendar) is left to
    // the two passes, which refuse it before allocating (checkTableJustified).
    const double cells =
        static_cast<double>(capacity) * static_cast<double>(days) * static_cast<double>(measures);
    const double values = rows * static_cast<double>(std::max<std::size_t>(m_names.size(), 1));
    // The reservation is made before any row is read, so it is held to what the file's values
    // justify, without the sparse floor: a small file with a long calendar (the sample's regions
    // over a century) reserved 160 MB before its regions overflowed and it was refused.
    if (cells > kMaxCells || cells > kMaxCellsPerValue * values)
        return false;
    m_dateFormat = *format;
    m_firstSerial = lo;
    m_days = days;
    m_step = step;
    m_regionCapacity = capacity;
    return true;
}

Result<bool> DropReader::onePass() {
    const std::size_t dateCol = static_cast<std::size_t>(m_roles.dateColumn);
    const std::size_t regionCol = static_cast<std::size_t>(m_roles.regionColumn);
    const int measureCol = m_roles.measureColumn;
    const std::size_t reserve = m_regionCapacity * m_days;
    m_tables.reset(m_days);
    if (measureCol < 0) {
        for (std::size_t m = 0; m < m_roles.valueColumns.size(); ++m) {
            if (!m_tables.addMeasure(reserve))
                return false;
        }
    }
    const std::int32_t last = m_firstSerial + (static_cast<std::int32_t>(m_days) - 1) * m_step;
    std::int32_t lo = last, hi = m_firstSerial;
    CsvScanner scanner(m_bytes, m_delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    // The loop keeps only the lookups of known keys; a key seen for the first time goes to its
    // own step (addPredictedDate, addPredictedRegion, addMeasureNamed).
    while (scanner.next(record)) {
        if (Status s = advance(record.offset); !s)
            return s.error();
        bool keep = false;
        if (Status s = admit(record, keep); !s)
            return s.error();
        if (!keep)
            continue;
        const auto line = static_cast<std::uint32_t>(record.line);
        const std::vector<CsvField>& f = record.fields;

        const std::string_view dateText = dateKeyOf(f, dateCol);
        std::uint32_t di = m_dates.find(dateText);
        if (di == KeyDictionary::kNone) {
            Result<bool> added = addPredictedDate(dateText, line, last, di);
            if (!added || !*added)
                return added;
            const std::int32_t serial = m_firstSerial + m_dayOfDate[di] * m_step;
            lo = std::min(lo, serial);
            hi = std::max(hi, serial);
        }
        const std::int32_t day = m_dayOfDate[di];

        const std::string_view code = f[regionCol].text;
        std::uint32_t region = m_regions.find(code);
        if (region == KeyDictionary::kNone && !addPredictedRegion(code, line, region))
            return false;

        if (measureCol >= 0) {
            const std::string_view name = f[static_cast<std::size_t>(measureCol)].text;
            std::uint32_t measure = m_measureNames.find(name);
            if (measure == KeyDictionary::kNone && !addMeasureNamed(name, reserve, measure))
                return false;
            const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[0]);
            place(measure, region, day, parseCell(f[col].text, line, col + 1));
        } else {
            for (std::size_t m = 0; m < m_roles.valueColumns.size(); ++m) {
                const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[m]);
                place(m, region, day, parseCell(f[col].text, line, col + 1));
            }
        }
    }
    if (scanner.failed())
        return syntaxFailure(scanner.error());
    m_tables.finish();
    if (lo != m_firstSerial || hi != last)
        return false;  // the guessed ends were wrong (e.g. a tail inside a quoted field)
    if (Status s = m_checker.checkAll(); !s)
        return s.error();
    m_drop.source.sha256 = m_checker.sha256();
    if (m_file)
        m_file->release(m_bytes.size());
    return true;
}

Result<bool> DropReader::addPredictedDate(std::string_view text, std::uint32_t line,
                                          std::int32_t last, std::uint32_t& index) {
    const std::size_t dateCol = static_cast<std::size_t>(m_roles.dateColumn);
    const std::optional<Date> d = parseDateIn(text, m_dateFormat);
    if (!d)
        return dateError(std::string(text), line, dateCol + 1);
    if (d->serial < m_firstSerial || d->serial > last)
        return false;  // outside the predicted calendar: read in two passes
    bool added = false;
    index = m_dates.intern(text, added);
    if ((d->serial - m_firstSerial) % m_step != 0)
        return false;  // off the predicted weekly grid: read in two passes
    m_dayOfDate.push_back((d->serial - m_firstSerial) / m_step);
    m_dateLine.push_back(line);
    m_dateColumn.push_back(dateCol + 1);
    return true;
}

bool DropReader::addPredictedRegion(std::string_view code, std::uint32_t line,
                                    std::uint32_t& region) {
    if (m_regions.size() == m_regionCapacity)
        return false;  // more regions than reserved for: read in two passes
    bool added = false;
    region = m_regions.intern(code, added);
    noteNewRegion(code, line);
    return m_tables.growTo(m_regions.size());
}

bool DropReader::addMeasureNamed(std::string_view name, std::size_t reserve,
                                 std::uint32_t& measure) {
    bool added = false;
    measure = m_measureNames.intern(name, added);
    return m_tables.addMeasure(reserve);
}

void DropReader::resetForTwoPasses() {
    m_regions = KeyDictionary();
    m_dates = KeyDictionary();
    m_measureNames = KeyDictionary();
    m_dateLine.clear();
    m_dateColumn.clear();
    m_dayOfDate.clear();
    m_rowsOfDate.clear();
    m_step = 1;
    m_tables.reset(0);
    m_drop.duplicates.clear();
    m_drop.rows = 0;
    m_drop.source.dialect.thousandsSeparator = 0;
    m_log = m_sniffLog;
    m_emptyLines = 0;
    m_firstEmptyLine = 0;
    m_strayReported = false;
    m_nextCheck = 0;
    m_dateFormat = initialDateFormat();
    if (m_file)
        m_file->rewind();
}

Status DropReader::keyPass() {
    CsvScanner scanner(m_bytes, m_delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    const std::size_t dateCol = static_cast<std::size_t>(std::max(m_roles.dateColumn, 0));
    const std::size_t regionCol = static_cast<std::size_t>(std::max(m_roles.regionColumn, 0));
    const bool hasDates = m_roles.layout != Layout::DatesAcross;
    const bool hasRegions = m_roles.layout != Layout::DatesDown;
    while (scanner.next(record)) {
        if (Status s = advance(record.offset); !s)
            return s;
        bool keep = false;
        if (Status s = admit(record, keep); !s)
            return s;
        if (!keep || (m_narrowed && leftOutByNarrowing(record.fields, true)))
            continue;
        const auto line = static_cast<std::uint32_t>(record.line);
        bool added = false;
        if (hasDates) {
            const std::uint32_t date = m_dates.intern(dateKeyOf(record.fields, dateCol), added);
            if (added) {
                m_dateLine.push_back(line);
                m_dateColumn.push_back(dateCol + 1);
                m_rowsOfDate.push_back(0);
            }
            ++m_rowsOfDate[date];
        }
        if (hasRegions) {
            const std::string_view code = record.fields[regionCol].text;
            m_regions.intern(code, added);
            if (added)
                noteNewRegion(code, line);
        }
        if (m_roles.measureColumn >= 0)
            m_measureNames.intern(
                record.fields[static_cast<std::size_t>(m_roles.measureColumn)].text, added);
    }
    if (scanner.failed())
        return syntaxFailure(scanner.error());
    if (Status s = m_checker.checkAll(); !s)
        return s;
    m_drop.source.sha256 = m_checker.sha256();
    if (m_file)
        m_file->release(m_bytes.size());
    if (m_narrowed) {
        if (Status s = checkNarrowingLeftRows(); !s)
            return s;
    }
    if (m_drop.rows == 0)
        return fail(ErrorCode::Layout, "the file has a header but no data rows", 1, 0);
    return Ok{};
}

Status DropReader::settleDates() {
    if (m_roles.layout == Layout::DatesAcross)
        internHeaderDates();
    if (m_dates.size() == 0)
        return fail(ErrorCode::Layout, "no row has a date");
    if (m_dateFormat == DateFormat::Unknown) {
        if (Status s = detectDateFormat(); !s)
            return s;
    }
    if (m_roles.layout == Layout::DatesAcross && m_narrowed) {
        if (Status s = narrowHeaderDates(); !s)
            return s;
    }
    if (Status s = laySerialsOut(); !s)
        return s;
    if (m_roles.layout == Layout::DatesAcross)
        mapDateColumns();
    return Ok{};
}

void DropReader::internHeaderDates() {
    for (int c : m_roles.dateColumns) {
        bool added = false;
        m_dates.intern(m_names[static_cast<std::size_t>(c)], added);
        if (added) {
            m_dateLine.push_back(1);
            m_dateColumn.push_back(static_cast<std::uint64_t>(c) + 1);
        }
    }
}

Status DropReader::detectDateFormat() {
    const std::string& first = m_dates.key(0);
    const DateShape shape = dateShapeOf(first);
    if (shape == DateShape::None) {
        return fail(ErrorCode::InvalidValue,
                    quoted(first) +
                        " in the date column is not a date (YYYY-MM-DD, YYYYMMDD, D/M/Y, M/D/Y or "
                        "an ISO week YYYY-Www)",
                    m_dateLine[0], m_dateColumn[0]);
    }
    if (shape == DateShape::Iso)
        m_dateFormat = DateFormat::Iso;
    if (shape == DateShape::Compact)
        m_dateFormat = DateFormat::Compact;
    if (shape == DateShape::IsoWeek)
        m_dateFormat = DateFormat::IsoWeek;
    if (shape == DateShape::Slash)
        return settleSlashOrder();
    return Ok{};
}

Status DropReader::settleSlashOrder() {
    // Day or month first: settled only by a number above 12, never guessed.
    const std::size_t n = m_dates.size();
    std::size_t firstAbove12 = n, secondAbove12 = n;
    for (std::size_t i = 0; i < n; ++i) {
        int a, b, y;
        if (!splitDate(m_dates.key(static_cast<std::uint32_t>(i)), DateShape::Slash, a, b, y))
            continue;
        if (a > 12 && firstAbove12 == n)
            firstAbove12 = i;
        if (b > 12 && secondAbove12 == n)
            secondAbove12 = i;
    }
    if (firstAbove12 < n && secondAbove12 < n) {
        return fail(ErrorCode::InvalidValue,
                    "dates mix day-first and month-first orders: " +
                        quoted(m_dates.key(static_cast<std::uint32_t>(firstAbove12))) + " (" +
                        place(m_dateLine[firstAbove12]) + ") is day first, " +
                        quoted(m_dates.key(static_cast<std::uint32_t>(secondAbove12))) +
                        " is month first; fix the file",
                    m_dateLine[secondAbove12], m_dateColumn[secondAbove12]);
    }
    if (firstAbove12 < n) {
        m_dateFormat = DateFormat::DayFirst;
    } else if (secondAbove12 < n) {
        m_dateFormat = DateFormat::MonthFirst;
    } else {
        return fail(ErrorCode::Ambiguous,
                    "dates such as " + m_dates.key(0) +
                        " could be day/month or month/day (no day of the month in the file "
                        "is above 12); "
                        "rerun with --date-format DD/MM/YYYY or MM/DD/YYYY",
                    m_dateLine[0], m_dateColumn[0]);
    }
    return Ok{};
}

Status DropReader::laySerialsOut() {
    const std::size_t n = m_dates.size();
    m_dayOfDate.resize(n);
    std::int32_t lo = std::numeric_limits<std::int32_t>::max();
    std::int32_t hi = std::numeric_limits<std::int32_t>::min();
    std::vector<std::int32_t> serials(n);
    std::size_t loIndex = 0, hiIndex = 0;
    for (std::size_t i = 0; i < n; ++i) {
        const std::string& text = m_dates.key(static_cast<std::uint32_t>(i));
        std::optional<Date> d = parseDateIn(text, m_dateFormat);
        if (!d)
            return dateError(text, m_dateLine[i], m_dateColumn[i]);
        serials[i] = d->serial;
        if (d->serial < lo)
            loIndex = i;
        if (d->serial > hi)
            hiIndex = i;
        lo = std::min(lo, d->serial);
        hi = std::max(hi, d->serial);
    }
    const std::int64_t span = static_cast<std::int64_t>(hi) - lo + 1;
    // Every date on one weekday: one table column per week (the calendar plan makes them weeks).
    unsigned weekdays = 0;
    for (std::int32_t serial : serials)
        weekdays |= 1u << Date{serial}.isoWeekday();
    m_step = cadence() != Cadence::Daily && hi > lo && std::popcount(weekdays) == 1 ? 7 : 1;
    const std::int64_t columns = (span - 1) / m_step + 1;
    const std::size_t measures = tableMeasures();
    const std::size_t regions = tableRegions();
    const double cells =
        static_cast<double>(columns) * static_cast<double>(regions) * static_cast<double>(measures);
    if (span > kMaxSpanDays || cells > kMaxCells) {
        return fail(ErrorCode::InvalidValue,
                    "the dates run from " + Date{lo}.iso() + " (" + place(m_dateLine[loIndex]) +
                        ") to " + Date{hi}.iso() + " (" + place(m_dateLine[hiIndex]) + "), " +
                        std::to_string(span) +
                        " days: too long a calendar for a drop. Nothing was read. Is a year "
                        "mistyped?" +
                        narrowingAdvice(serials, regions, measures),
                    m_dateLine[loIndex], m_dateColumn[loIndex]);
    }
    if (Status s = checkTableJustified(cells, regions, lo, hi, loIndex, hiIndex, serials); !s)
        return s;
    for (std::size_t i = 0; i < n; ++i)
        m_dayOfDate[i] = (serials[i] - lo) / m_step;
    m_firstSerial = lo;
    m_days = static_cast<std::size_t>(columns);
    return Ok{};
}

// The table holds every region on every period of the calendar. A few stray dates far from the
// rest (a mistyped year) or a century of sparse rows would make it vastly larger than the file:
// 10,000 regions with rows a century apart asked for 4.3 GB from a 378 KB file. Refuse, before
// allocating, a table of more than kSparseFloorCells cells that holds over kMaxCellsPerValue
// cells for each value the file can hold (its data rows times its columns), and say how to
// narrow the read to a table the file justifies.
double DropReader::justifiedCells() const {
    const std::uint64_t rows = m_drop.rows + m_drop.source.leftOut.rows();
    const double values = static_cast<double>(std::max<std::uint64_t>(rows, 1)) *
                          static_cast<double>(std::max<std::size_t>(m_names.size(), 1));
    return std::max(kSparseFloorCells, kMaxCellsPerValue * values);
}

Status DropReader::checkTableJustified(double cells, std::size_t regions, std::int32_t lo,
                                       std::int32_t hi, std::size_t loIndex, std::size_t hiIndex,
                                       const std::vector<std::int32_t>& serials) const {
    if (cells <= justifiedCells())
        return Ok{};
    return fail(ErrorCode::InvalidValue,
                tableAsked(cells, regions, lo, hi, loIndex, hiIndex) +
                    narrowingAdvice(serials, regions, tableMeasures()),
                m_dateLine[loIndex], m_dateColumn[loIndex]);
}

std::string DropReader::tableAsked(double cells, std::size_t regions, std::int32_t lo,
                                   std::int32_t hi, std::size_t loIndex,
                                   std::size_t hiIndex) const {
    const std::int64_t columns = (static_cast<std::int64_t>(hi) - lo) / m_step + 1;
    char size[32];
    std::snprintf(size, sizeof size, "%.1f GB", cells * static_cast<double>(sizeof(Cell)) / 1e9);
    const std::string narrowed = m_drop.source.narrowing.active()
                                     ? " (narrowed by " + m_drop.source.narrowing.asOptions() + ")"
                                     : std::string();
    return "the read" + narrowed + " asks for a table of " + std::to_string(columns) +
           (m_step == 7 ? " weeks" : " days") + " x " + std::to_string(regions) +
           (regions == 1 ? " region" : " regions") + ": " +
           std::to_string(static_cast<std::uint64_t>(cells)) + " cells, about " + size +
           ". Its dates run from " + Date{lo}.iso() + " (" + place(m_dateLine[loIndex]) + ") to " +
           Date{hi}.iso() + " (" + place(m_dateLine[hiIndex]) + "), and its " +
           std::to_string(m_drop.rows + m_drop.source.leftOut.rows()) +
           " data rows justify at most " +
           std::to_string(static_cast<std::uint64_t>(justifiedCells())) +
           " cells: nearly all of the table would be empty. Nothing was read. Is a year "
           "mistyped?";
}

void DropReader::mapDateColumns() {
    m_dayOfColumn.assign(m_names.size(), -1);
    for (int c : m_roles.dateColumns) {
        m_dayOfColumn[static_cast<std::size_t>(c)] =
            m_dayOfDate[m_dates.find(m_names[static_cast<std::size_t>(c)])];
    }
}

Cell DropReader::parseCellSlowly(std::string_view text, std::uint32_t line, std::uint64_t column) {
    Cell cell;
    cell.line = line;
    bool missing = text.empty() && m_emptyIsMissing;
    for (const std::string& token : m_otherMissing)
        missing = missing || text == token;
    if (missing) {
        cell.state = CellState::Blank;
        return cell;
    }
    if (parsePlainCount(text, cell.value)) {
        cell.state = CellState::Reported;
        return cell;
    }
    const ParsedCount parsed = parseCount(text, m_style);
    if (parsed.ok) {
        cell.state = CellState::Reported;
        cell.value = parsed.value;
        switch (parsed.note) {
            case NumberNote::Thousands:
                if (m_drop.source.dialect.thousandsSeparator == 0)
                    m_drop.source.dialect.thousandsSeparator = parsed.thousandsSeparator;
                m_log.count("thousands", line, column, std::string(text));
                break;
            case NumberNote::ZeroFraction:
                m_log.count("zero fraction", line, column, std::string(text));
                break;
            case NumberNote::Spaces:
                m_log.count("spaces", line, column, std::string(text));
                break;
            default:
                break;
        }
        return cell;
    }
    cell.state = CellState::Unparsable;
    cell.value = 0;
    std::string why;
    if (text.empty())
        why = "the cell is empty and the empty cell is not a missing-value token here";
    else if (parsed.note == NumberNote::NotWhole)
        why = quoted(text) + " is not a whole number";
    else if (parsed.note == NumberNote::OutOfRange)
        why = quoted(text) + " is too large for a count";
    else
        why = quoted(text) + " is not a number";
    if (!text.empty() && parsed.note == NumberNote::NotANumber)
        why += "; the cell is kept as unparsable (if it means 'no value', pass --missing " +
               quoted(text) + ")";
    else
        why += "; the cell is kept as unparsable";
    m_log.add("unparsable", why, line, column);
    return cell;
}

void DropReader::addDuplicate(std::size_t measure, std::uint32_t region, std::int32_t day,
                              const Cell& cell, std::uint32_t firstLine) {
    DuplicateRow dup;
    dup.measure = measure;
    dup.region = region;
    dup.day = day;
    dup.cell = cell;
    dup.firstLine = firstLine;
    m_drop.duplicates.push_back(dup);
}

Status DropReader::cellPass() {
    const std::size_t regions =
        m_roles.layout == Layout::DatesDown ? m_roles.valueColumns.size() : m_regions.size();
    m_tables.reset(m_days);
    for (std::size_t m = 0; m < measureCount(); ++m) {
        if (!m_tables.addMeasure(regions * m_days))
            return fail(ErrorCode::Io, "not enough memory for the cell tables");
    }
    if (!m_tables.growTo(regions))
        return fail(ErrorCode::Io, "not enough memory for the cell tables");
    if (m_file)
        m_file->rewind();
    CsvScanner scanner(m_bytes, m_delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    std::size_t nextRelease = 0;
    const std::size_t dateCol = static_cast<std::size_t>(std::max(m_roles.dateColumn, 0));
    const std::size_t regionCol = static_cast<std::size_t>(std::max(m_roles.regionColumn, 0));
    const int measureCol = m_roles.measureColumn;
    while (scanner.next(record)) {
        if (m_file && record.offset >= nextRelease) {
            m_file->release(record.offset);
            nextRelease = record.offset + kCheckAhead;
        }
        if (record.isEmptyLine())
            continue;
        const auto line = static_cast<std::uint32_t>(record.line);
        const std::vector<CsvField>& f = record.fields;
        // Rows the key pass did not read (an empty key) are skipped the same way here.
        if (m_roles.layout != Layout::DatesAcross && f[dateCol].text.empty())
            continue;
        if (m_roles.layout != Layout::DatesDown && f[regionCol].text.empty())
            continue;
        if (measureCol >= 0 && f[static_cast<std::size_t>(measureCol)].text.empty())
            continue;
        if (m_narrowed && leftOutByNarrowing(f, false))
            continue;
        switch (m_roles.layout) {
            case Layout::Long: {
                const std::int32_t day = m_dayOfDate[m_dates.find(dateKeyOf(f, dateCol))];
                const std::uint32_t region = m_regions.find(f[regionCol].text);
                if (measureCol >= 0) {
                    const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[0]);
                    place(m_measureNames.find(f[static_cast<std::size_t>(measureCol)].text), region,
                          day, parseCell(f[col].text, line, col + 1));
                } else {
                    for (std::size_t m = 0; m < m_roles.valueColumns.size(); ++m) {
                        const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[m]);
                        place(m, region, day, parseCell(f[col].text, line, col + 1));
                    }
                }
                break;
            }
            case Layout::DatesDown: {
                const std::int32_t day = m_dayOfDate[m_dates.find(dateKeyOf(f, dateCol))];
                for (std::size_t r = 0; r < m_roles.valueColumns.size(); ++r) {
                    const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[r]);
                    place(0, static_cast<std::uint32_t>(r), day,
                          parseCell(f[col].text, line, col + 1));
                }
                break;
            }
            case Layout::DatesAcross: {
                const std::uint32_t region = m_regions.find(f[regionCol].text);
                for (int c : m_roles.dateColumns) {
                    const std::size_t col = static_cast<std::size_t>(c);
                    place(0, region, m_dayOfColumn[col], parseCell(f[col].text, line, col + 1));
                }
                break;
            }
            case Layout::CaseList:  // read by case_list_reader.cpp, never by these passes
                break;
        }
    }
    if (scanner.failed())
        return syntaxFailure(scanner.error());
    m_tables.finish();
    if (m_file)
        m_file->release(m_bytes.size());
    return Ok{};
}

namespace {

const char* weekdayName(int isoWeekday) {
    static const char* const names[] = {"Monday", "Tuesday",  "Wednesday", "Thursday",
                                        "Friday", "Saturday", "Sunday"};
    return names[(isoWeekday + 6) % 7];
}

// The ISO weekday (1 = Monday) of the first or last day of a week.
int namedWeekday(WeekStart start, WeekDate named) {
    if (start == WeekStart::Monday)
        return named == WeekDate::Start ? 1 : 7;
    return named == WeekDate::Start ? 7 : 6;
}

}  // namespace

Result<DropReader::CalendarPlan> DropReader::planCalendar() {
    CalendarPlan plan;
    plan.axis = TimeAxis::daily(Date{m_firstSerial}, static_cast<std::int32_t>(m_days));
    assert(m_step == 1 || cadence() != Cadence::Daily);
    // Week labels and a year with a week number name weeks: weekly by definition.
    const bool yearWeek = m_dateFormat == DateFormat::YearWeek;
    const bool labels = m_dateFormat == DateFormat::IsoWeek || yearWeek;
    if (cadence() == Cadence::Daily) {
        if (labels)
            return fail(ErrorCode::Usage,
                        std::string(yearWeek ? "the dates are a year and a week number"
                                             : "the dates are ISO week labels (like 2026-W05)") +
                            ", which name weeks, not days; leave out --cadence daily",
                        m_dateLine.empty() ? 0 : m_dateLine[0],
                        m_dateColumn.empty() ? 0 : m_dateColumn[0]);
        return plan;
    }
    const CommonWeekday common = commonWeekday();
    if (!labels && cadence() != Cadence::Weekly) {
        Result<bool> weekly = datesOnWeeklyGrid(common);
        if (!weekly)
            return weekly.error();
        if (!*weekly)
            return plan;  // daily
    }
    const WeekConvention convention = settleWeekConvention(common.weekday, labels, yearWeek);
    if (Status s = placeWeeks(plan, convention, common.weekday); !s)
        return s.error();
    return plan;
}

DropReader::CommonWeekday DropReader::commonWeekday() const {
    std::array<std::size_t, 8> byWeekday{};
    for (std::int32_t day : m_dayOfDate)
        ++byWeekday[static_cast<std::size_t>(dateOfColumn(day).isoWeekday())];
    int weekday = 1;
    for (int w = 2; w <= 7; ++w)
        if (byWeekday[static_cast<std::size_t>(w)] > byWeekday[static_cast<std::size_t>(weekday)])
            weekday = w;
    return {weekday, byWeekday[static_cast<std::size_t>(weekday)]};
}

std::string DropReader::offGridDates(int weekday, std::size_t limit) const {
    std::string list;
    std::size_t listed = 0, total = 0;
    for (std::size_t i = 0; i < m_dayOfDate.size(); ++i) {
        const Date d = dateOfColumn(m_dayOfDate[i]);
        if (d.isoWeekday() == weekday)
            continue;
        ++total;
        if (listed++ < limit)
            list += (list.empty() ? "" : "; ") + place(m_dateLine[i]) + " (" + d.iso() + ", a " +
                    weekdayName(d.isoWeekday()) + ")";
    }
    return std::to_string(total) + (total == 1 ? " date is not: " : " dates are not: ") + list +
           (total > limit ? "; ..." : "");
}

Result<bool> DropReader::datesOnWeeklyGrid(const CommonWeekday& common) const {
    const std::size_t n = m_dayOfDate.size();
    if (n >= 2 && common.count == n)
        return true;  // weekly by the dates themselves
    if (n >= 4 && common.count * 10 >= n * 9) {
        std::size_t i = 0;
        while (i < n && dateOfColumn(m_dayOfDate[i]).isoWeekday() == common.weekday)
            ++i;
        return fail(
            ErrorCode::InvalidValue,
            "the dates fit neither a daily nor a weekly grid: " + std::to_string(common.count) +
                " of " + std::to_string(n) + " are " + weekdayName(common.weekday) +
                "s, as weekly data would be, but " + offGridDates(common.weekday, 5) +
                ". Correct those dates, or pass --cadence daily to read every date "
                "as a day",
            i < n ? m_dateLine[i] : 0, i < n ? m_dateColumn[i] : 0);
    }
    return false;
}

DropReader::WeekConvention DropReader::conventionFor(int weekday, bool labels,
                                                     bool yearWeek) const {
    WeekStart start = WeekStart::Monday;
    WeekDate named = WeekDate::Start;
    if (!labels) {
        const std::string dateName =
            m_roles.dateColumn >= 0
                ? lowerTrimmed(m_names[static_cast<std::size_t>(m_roles.dateColumn)])
                : std::string();
        const bool saysEnd = dateName.find("end") != std::string::npos;
        if (weekday == 7 && !saysEnd)
            start = WeekStart::Sunday;
        if (weekday == 7 && saysEnd)
            named = WeekDate::End;
        if (weekday == 6) {
            start = WeekStart::Sunday;
            named = WeekDate::End;
        }
    }
    if (m_options.weekStart) {
        start = *m_options.weekStart;
        named = weekday == namedWeekday(start, WeekDate::End) ? WeekDate::End : WeekDate::Start;
    }
    if (yearWeek) {
        start = m_yearWeekStart;  // the dates are the weeks' first days under this convention
        named = WeekDate::Start;
    }
    if (m_options.weekDate)
        named = *m_options.weekDate;
    return {start, named};
}

DropReader::WeekConvention DropReader::settleWeekConvention(int weekday, bool labels,
                                                            bool yearWeek) {
    const auto [start, named] = conventionFor(weekday, labels, yearWeek);
    const char* convention = start == WeekStart::Monday
                                 ? "an ISO 8601 week (Monday to Sunday)"
                                 : "an epidemiological week (Sunday to Saturday)";
    if (!yearWeek && weekday != namedWeekday(start, named)) {
        m_log.add("week date",
                  std::string("the dates are ") + weekdayName(weekday) + "s, not the " +
                      (named == WeekDate::Start ? "first" : "last") + " day of " + convention +
                      "; each date is counted in the week that holds it (--week-start and "
                      "--week-date set the convention)",
                  0, 0);
    }
    return {start, named};
}

Status DropReader::placeWeeks(CalendarPlan& plan, const WeekConvention& convention,
                              int weekday) const {
    // The weeks from the first date's to the last date's.
    const std::size_t n = m_dayOfDate.size();
    plan.periodOfDay.assign(m_days, -1);
    if (n == 0) {  // no row kept a date (every region cell empty, say): an empty calendar
        plan.axis = TimeAxis::weekly(weekStartOf(Date{m_firstSerial}, convention.start), 0,
                                     convention.start, convention.named);
        return Ok{};
    }
    std::int32_t lo = std::numeric_limits<std::int32_t>::max(), hi = -1;
    for (std::int32_t day : m_dayOfDate) {
        lo = std::min(lo, day);
        hi = std::max(hi, day);
    }
    const Date firstWeek = weekStartOf(dateOfColumn(lo), convention.start);
    const Date lastWeek = weekStartOf(dateOfColumn(hi), convention.start);
    plan.axis = TimeAxis::weekly(firstWeek, (lastWeek - firstWeek) / 7 + 1, convention.start,
                                 convention.named);
    std::vector<std::size_t> dateOfPeriod(static_cast<std::size_t>(plan.axis.periods()), n);
    for (std::size_t i = 0; i < n; ++i) {
        const std::int32_t day = m_dayOfDate[i];
        const std::int32_t p = plan.axis.periodOnGrid(dateOfColumn(day));
        std::size_t& other = dateOfPeriod[static_cast<std::size_t>(p)];
        if (other != n && m_dayOfDate[other] == day)
            continue;  // two texts of one day ("2026,5" and "2026,05"): one date
        if (other != n) {
            return fail(ErrorCode::InvalidValue,
                        "two dates fall in one week (" + plan.axis.periodDescription(p) +
                            "): " + dateOfColumn(m_dayOfDate[other]).iso() + " (" +
                            place(m_dateLine[other]) + ") and " + dateOfColumn(day).iso() +
                            "; weekly data has one date per week (" + offGridDates(weekday, 5) +
                            " " + weekdayName(weekday) +
                            "s). Pass --cadence daily to read every date "
                            "as a day",
                        m_dateLine[i], m_dateColumn[i]);
        }
        other = i;
        plan.periodOfDay[static_cast<std::size_t>(day)] = p;
        plan.usedDays.push_back(day);
    }
    std::sort(plan.usedDays.begin(), plan.usedDays.end());
    return Ok{};
}

Status DropReader::finish() {
    if (m_drop.rows == 0)
        return fail(ErrorCode::Layout, "the file has a header but no data rows", 1, 0);
    Result<CalendarPlan> plan = planCalendar();
    if (!plan)
        return plan.error();
    m_drop.axis = plan->axis;
    recordDateFormatAndNames();
    arrangeTablesByPeriod(*plan);
    m_drop.indexRegions();
    noteClosingWarnings();
    return Ok{};
}

void DropReader::recordDateFormatAndNames() {
    m_drop.source.dateFormat = dateFormatName(m_dateFormat);
    if (m_dateFormat == DateFormat::YearWeek)
        m_drop.source.dateFormat =
            m_yearWeekStart == WeekStart::Monday ? "year+ISO week" : "year+epi week";
    if (m_roles.layout == Layout::DatesDown) {
        for (int c : m_roles.valueColumns)
            m_drop.regionCodes.push_back(m_names[static_cast<std::size_t>(c)]);
    } else {
        m_drop.regionCodes = m_regions.takeKeys();
    }
    if (m_roles.layout == Layout::Long) {
        if (m_roles.measureColumn >= 0) {
            m_drop.measures = m_measureNames.keys();
        } else {
            for (int c : m_roles.valueColumns)
                m_drop.measures.push_back(m_names[static_cast<std::size_t>(c)]);
        }
    } else {
        m_drop.measures.push_back(m_options.measureName.empty() ? std::string("cases")
                                                                : m_options.measureName);
    }
}

void DropReader::arrangeTablesByPeriod(const CalendarPlan& plan) {
    std::vector<std::vector<Cell>> tables = m_tables.takeTables();
    m_drop.tables.reserve(tables.size());
    const auto periods = static_cast<std::size_t>(m_drop.axis.periods());
    // Filled week by week already (one column per week, in order): the tables are the weeks.
    bool columnsAreWeeks = m_drop.axis.weekly() && periods == m_days;
    for (std::int32_t column : plan.usedDays)
        columnsAreWeeks =
            columnsAreWeeks && plan.periodOfDay[static_cast<std::size_t>(column)] == column;
    for (std::vector<Cell>& cells : tables) {
        if (!m_drop.axis.weekly() || columnsAreWeeks) {
            m_drop.tables.emplace_back(m_days, std::move(cells));
            continue;
        }
        // Otherwise the tables were filled by day; each date's column becomes its week's.
        const std::size_t regions = m_days == 0 ? 0 : cells.size() / m_days;
        std::vector<Cell> weeks(regions * periods);
        for (std::size_t r = 0; r < regions; ++r)
            for (std::int32_t day : plan.usedDays)
                weeks[r * periods +
                      static_cast<std::size_t>(plan.periodOfDay[static_cast<std::size_t>(day)])] =
                    cells[r * m_days + static_cast<std::size_t>(day)];
        cells = {};
        m_drop.tables.emplace_back(periods, std::move(weeks));
    }
    if (m_drop.axis.weekly())
        for (DuplicateRow& d : m_drop.duplicates)
            d.day = plan.periodOfDay[static_cast<std::size_t>(d.day)];
}

void DropReader::noteClosingWarnings() {
    if (m_emptyLines > 0) {
        m_log.add("empty line",
                  std::to_string(m_emptyLines) +
                      (m_emptyLines == 1 ? " empty line was" : " empty lines were") + " skipped",
                  m_firstEmptyLine, 0);
    }
    if (!m_drop.duplicates.empty()) {
        const DuplicateRow& d = m_drop.duplicates.front();
        m_log.add("duplicates",
                  std::to_string(m_drop.duplicates.size()) +
                      " cells repeat a region, date and measure already read; the first "
                      "occurrence is kept, the repeats are listed as duplicates (first repeat: "
                      "region " +
                      quoted(m_drop.regionCodes[d.region]) + ", " +
                      m_drop.periodStart(d.day).iso() + ", first seen on " + place(d.firstLine) +
                      ")",
                  d.cell.line, 0);
    }
    const char sep = m_drop.source.dialect.thousandsSeparator;
    const std::string sepName = sep == ' ' ? "a space" : std::string("'") + sep + "'";
    m_log.moveTo(m_drop.warnings, m_drop.source,
                 {
                     {"thousands", "cells are written with " + sepName +
                                       " as thousands separator; they were read as whole numbers"},
                     {"zero fraction",
                      "cells are written with a zero decimal part (like 12.0); they were read as "
                      "whole numbers"},
                     {"spaces", "cells have spaces around the number; they were read as numbers"},
                 });
}

}  // namespace siftwave::ingest::detail
