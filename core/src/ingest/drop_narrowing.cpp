// A narrowed read (IngestOptions::narrowing: --from, --to, --only-regions) and the advice that
// names one when a table would be too large (see drop_reader.h).
//
// The rows outside are left out while reading, never put in the tables: the key pass and the
// cell pass skip them (leftOutByNarrowing), so the calendar and the regions are those of the rows
// kept, and the table-size guard judges the narrowed table. Which date texts lie outside is
// settled before the key pass, by one pass over the date column alone (settleDateWindow): a week
// is kept when it overlaps from..to, and whether the dates are weeks (and which day starts them)
// is decided by every date of the file, so that the window does not change the file's cadence.
#include "ingest/drop_reader.h"

#include <algorithm>
#include <cmath>

namespace siftwave::ingest::detail {
namespace {

constexpr std::size_t kCodesListed = 5;  // codes named in a message

std::string listed(const std::vector<std::string>& codes) {
    std::string out;
    for (std::size_t i = 0; i < codes.size() && i < kCodesListed; ++i)
        out += (i == 0 ? "" : ", ") + quoted(codes[i]);
    if (codes.size() > kCodesListed)
        out += ", ...";
    return out;
}

std::string datesOf(const ReadNarrowing& n) {
    if (n.from && n.to)
        return n.from->iso() + " to " + n.to->iso();
    return n.from ? "from " + n.from->iso() : "up to " + n.to->iso();
}

}  // namespace

Status DropReader::settleNarrowing() {
    ReadNarrowing asked = m_options.narrowing;
    std::sort(asked.regions.begin(), asked.regions.end());
    asked.regions.erase(std::unique(asked.regions.begin(), asked.regions.end()),
                        asked.regions.end());
    m_narrowed = asked.active();
    if (!m_narrowed)
        return Ok{};
    for (const std::string& code : asked.regions) {
        bool added = false;
        m_regionsAsked.intern(code, added);
    }
    m_regionAskedFound.assign(asked.regions.size(), false);
    m_drop.source.narrowing = std::move(asked);
    if (m_roles.layout == Layout::DatesDown && !m_drop.source.narrowing.regions.empty())
        return narrowRegionColumns();
    return Ok{};
}

Status DropReader::narrowRegionColumns() {
    std::vector<int> kept;
    std::vector<std::string> columns;
    for (int c : m_roles.valueColumns) {
        const std::string& code = m_names[static_cast<std::size_t>(c)];
        columns.push_back(code);
        const std::uint32_t asked = m_regionsAsked.find(code);
        if (asked == KeyDictionary::kNone) {
            ++m_drop.source.leftOut.regionColumns;
            continue;
        }
        kept.push_back(c);
        m_regionAskedFound[asked] = true;
    }
    if (kept.empty())
        return fail(ErrorCode::InvalidValue,
                    "none of the regions --only-regions asks for (" +
                        listed(m_drop.source.narrowing.regions) +
                        ") is a region column of the file; its region columns are " +
                        listed(columns) + " (codes are compared exactly as written)",
                    1, 0);
    m_roles.valueColumns = std::move(kept);
    return Ok{};
}

Status DropReader::settleDateWindow() {
    const std::size_t dateCol = static_cast<std::size_t>(m_roles.dateColumn);
    CsvScanner scanner(m_bytes, m_delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    std::size_t nextRelease = 0;
    // A record of the wrong shape or a syntax error is left to the key pass, which says so.
    while (scanner.next(record)) {
        if (m_file && record.offset >= nextRelease) {
            m_file->release(record.offset);
            nextRelease = record.offset + (std::size_t{256} << 10);
        }
        if (record.fields.size() != m_names.size() || record.fields[dateCol].text.empty())
            continue;
        bool added = false;
        m_dates.intern(dateKeyOf(record.fields, dateCol), added);
        if (added) {
            m_dateLine.push_back(record.line);
            m_dateColumn.push_back(dateCol + 1);
        }
    }
    if (m_file)
        m_file->rewind();
    if (m_dates.size() > 0) {
        if (m_dateFormat == DateFormat::Unknown) {
            if (Status s = detectDateFormat(); !s)
                return s;
        }
        std::vector<bool> kept;
        if (Status s = windowOfDates(kept); !s)
            return s;
        for (std::uint32_t i = 0; i < kept.size(); ++i) {
            bool added = false;
            if (!kept[i])
                m_datesLeftOut.intern(m_dates.key(i), added);
        }
    }
    m_dates = KeyDictionary();
    m_dateLine.clear();
    m_dateColumn.clear();
    m_dayOfDate.clear();
    m_firstSerial = 0;
    return Ok{};
}

Status DropReader::windowOfDates(std::vector<bool>& kept) {
    const std::size_t n = m_dates.size();
    std::vector<std::int32_t> serials(n);
    std::int32_t lo = std::numeric_limits<std::int32_t>::max();
    std::int32_t hi = std::numeric_limits<std::int32_t>::min();
    for (std::uint32_t i = 0; i < n; ++i) {
        const std::optional<Date> d = parseDateIn(m_dates.key(i), m_dateFormat);
        if (!d)
            return dateError(m_dates.key(i), m_dateLine[i], m_dateColumn[i]);
        serials[i] = d->serial;
        lo = std::min(lo, d->serial);
        hi = std::max(hi, d->serial);
    }
    m_fileFirst = lo;
    m_fileLast = hi;
    // The whole file's calendar, as planCalendar would settle it (daily steps of one day).
    m_firstSerial = lo;
    m_step = 1;
    m_dayOfDate.resize(n);
    for (std::size_t i = 0; i < n; ++i)
        m_dayOfDate[i] = serials[i] - lo;
    const bool yearWeek = m_dateFormat == DateFormat::YearWeek;
    const bool labels = yearWeek || m_dateFormat == DateFormat::IsoWeek;
    const CommonWeekday common = commonWeekday();
    bool weekly =
        m_options.cadence != Cadence::Daily && (labels || m_options.cadence == Cadence::Weekly);
    if (!weekly && !m_options.cadence) {
        Result<bool> grid = datesOnWeeklyGrid(common);
        if (!grid)
            return grid.error();
        weekly = *grid;
    }
    m_fileCadence = weekly ? Cadence::Weekly : Cadence::Daily;
    const WeekStart start = conventionFor(common.weekday, labels, yearWeek).start;
    const ReadNarrowing& asked = m_drop.source.narrowing;
    kept.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
        const std::int32_t first =
            weekly ? weekStartOf(Date{serials[i]}, start).serial : serials[i];
        const std::int32_t last = weekly ? first + 6 : first;
        kept[i] =
            (!asked.from || last >= asked.from->serial) && (!asked.to || first <= asked.to->serial);
    }
    return Ok{};
}

Status DropReader::narrowHeaderDates() {
    if (!m_drop.source.narrowing.from && !m_drop.source.narrowing.to)
        return Ok{};
    std::vector<bool> kept;
    if (Status s = windowOfDates(kept); !s)
        return s;
    KeyDictionary keptDates;
    std::vector<std::uint64_t> lines, columns;
    for (std::uint32_t i = 0; i < kept.size(); ++i) {
        bool added = false;
        if (!kept[i])
            continue;
        keptDates.intern(m_dates.key(i), added);
        lines.push_back(m_dateLine[i]);
        columns.push_back(m_dateColumn[i]);
    }
    std::vector<int> dateColumns;
    for (int c : m_roles.dateColumns) {
        if (kept[m_dates.find(m_names[static_cast<std::size_t>(c)])])
            dateColumns.push_back(c);
        else
            ++m_drop.source.leftOut.dateColumns;
    }
    m_roles.dateColumns = std::move(dateColumns);
    m_dates = std::move(keptDates);
    m_dateLine = std::move(lines);
    m_dateColumn = std::move(columns);
    m_dayOfDate.clear();
    if (m_dates.size() == 0)
        return fail(ErrorCode::InvalidValue,
                    "no date column of the header falls within " +
                        datesOf(m_drop.source.narrowing) +
                        " (--from, --to); the header's dates run from " + Date{*m_fileFirst}.iso() +
                        " to " + Date{*m_fileLast}.iso(),
                    1, 0);
    return Ok{};
}

bool DropReader::leftOutByNarrowing(const std::vector<CsvField>& f, bool count) {
    const ReadNarrowing& asked = m_drop.source.narrowing;
    LeftOut& out = m_drop.source.leftOut;
    if ((asked.from || asked.to) && m_roles.layout != Layout::DatesAcross &&
        m_datesLeftOut.find(dateKeyOf(f, static_cast<std::size_t>(m_roles.dateColumn))) !=
            KeyDictionary::kNone) {
        if (count) {
            ++out.rowsOutsideDates;
            --m_drop.rows;  // admit() counted it; m_drop.rows counts the rows read
        }
        return true;
    }
    if (asked.regions.empty() || m_roles.layout == Layout::DatesDown)
        return false;
    const std::uint32_t region =
        m_regionsAsked.find(f[static_cast<std::size_t>(m_roles.regionColumn)].text);
    if (region == KeyDictionary::kNone) {
        if (count) {
            ++out.rowsOfOtherRegions;
            --m_drop.rows;
        }
        return true;
    }
    m_regionAskedFound[region] = true;
    return false;
}

Status DropReader::checkNarrowingLeftRows() {
    const ReadNarrowing& asked = m_drop.source.narrowing;
    LeftOut& out = m_drop.source.leftOut;
    for (std::size_t i = 0; i < asked.regions.size(); ++i)
        if (!m_regionAskedFound[i])
            out.regionsNotFound.push_back(asked.regions[i]);
    if (!out.regionsNotFound.empty()) {
        const std::size_t n = out.regionsNotFound.size();
        m_log.add("regions not found",
                  "--only-regions names " + std::to_string(n) +
                      (n == 1 ? " code that no row of the file holds: "
                              : " codes that no row of the file holds: ") +
                      listed(out.regionsNotFound) +
                      " (codes are compared exactly as written, letter case and spaces included)",
                  0, 0);
    }
    if (m_drop.rows > 0)
        return Ok{};
    std::string span;
    if (m_fileFirst)
        span = "; the file's dates run from " + Date{*m_fileFirst}.iso() + " to " +
               Date{*m_fileLast}.iso();
    return fail(ErrorCode::InvalidValue,
                "no data row is left by " + asked.asOptions() + ": " + out.describe(asked) + span,
                0, 0);
}

std::string DropReader::narrowingAdvice(const std::vector<std::int32_t>& serials,
                                        std::size_t regions, std::size_t measures) const {
    const double budget = std::min(justifiedCells(), kMaxCells);
    const double perPeriod = static_cast<double>(std::max<std::size_t>(regions * measures, 1));
    const std::int64_t periods =
        std::min(static_cast<std::int64_t>(std::floor(budget / perPeriod)), kMaxSpanDays / m_step);
    const char* unit = m_step == 7 ? " weeks" : " days";
    std::string advice;
    if (periods >= 1 && !serials.empty()) {
        // The window of at most `periods` periods that holds the most rows (the latest on a tie).
        std::vector<std::pair<std::int32_t, std::uint64_t>> days(serials.size());
        for (std::size_t i = 0; i < serials.size(); ++i)
            days[i] = {serials[i], i < m_rowsOfDate.size() ? m_rowsOfDate[i] : 1};
        std::sort(days.begin(), days.end());
        const std::int64_t length = periods * m_step;
        std::uint64_t rows = 0, best = 0;
        std::size_t first = 0, bestFirst = 0, bestLast = 0;
        for (std::size_t last = 0; last < days.size(); ++last) {
            rows += days[last].second;
            while (std::int64_t{days[last].first} - days[first].first >= length)
                rows -= days[first++].second;
            if (rows >= best) {
                best = rows;
                bestFirst = first;
                bestLast = last;
            }
        }
        ReadNarrowing window = m_drop.source.narrowing;
        window.from = Date{days[bestFirst].first};
        window.to = Date{days[bestLast].first};
        advice += " To read a part of it, narrow the dates: " + window.asOptions() + " (at most " +
                  std::to_string(periods) + unit + " x " + std::to_string(regions) +
                  " regions: the window that holds the most rows, " + std::to_string(best) +
                  " of " + std::to_string(m_drop.rows) + ")";
    }
    const std::int64_t span =
        serials.empty() ? 0
                        : (std::int64_t{*std::max_element(serials.begin(), serials.end())} -
                           *std::min_element(serials.begin(), serials.end())) /
                                  m_step +
                              1;
    const double perRegion = static_cast<double>(span) * static_cast<double>(measures);
    const auto fewer = span > 0 && span * m_step <= kMaxSpanDays
                           ? static_cast<std::size_t>(std::floor(budget / perRegion))
                           : std::size_t{0};
    if (fewer >= 1 && fewer < regions) {
        ReadNarrowing some = m_drop.source.narrowing;
        some.regions.clear();
        for (std::size_t i = 0;
             i < regions && some.regions.size() < std::min<std::size_t>(fewer, 3); ++i)
            some.regions.push_back(m_roles.layout == Layout::DatesDown
                                       ? columnName(m_roles.valueColumns[i])
                                       : m_regions.key(static_cast<std::uint32_t>(i)));
        advice += std::string(advice.empty() ? " To read a part of it," : "; or") +
                  " narrow the regions: " + some.asOptions() + " (at most " +
                  std::to_string(fewer) + " of the " + std::to_string(regions) +
                  " regions over the whole span; --only-regions @FILE reads a file of codes, one "
                  "per line)";
    }
    if (advice.empty())
        advice =
            " Split the file into shorter periods, or narrow the read with --from, --to and "
            "--only-regions";
    return advice + ".";
}

}  // namespace siftwave::ingest::detail
