// readDrop / parseDrop: the passes over a drop's bytes.
//
//  1. sniff: BOM, delimiter, header, decimal separator, layout and roles from
//     the first records;
//  2. key pass: every record once, collecting the region codes (first-seen
//     order), the distinct date texts and the measure names; the bytes are
//     hashed (SHA-256) and checked for UTF-8 on the way;
//  3. the date format is settled (refusing an ambiguous day/month order) and
//     every distinct date text parsed once;
//  4. cell pass: every record again, each value cell parsed into the dense
//     region x day table of its measure; repeats go to `duplicates`.
// Two passes let the tables be allocated once at their final size, so the
// peak memory is the tables plus a window of the file (see input_source.h).

#include "ingest/csv_scanner.h"
#include "ingest/date_parsing.h"
#include "ingest/input_source.h"
#include "ingest/key_dictionary.h"
#include "ingest/number_parsing.h"
#include "ingest/role_detection.h"
#include "ingest/sniffing.h"
#include "ingest/warning_log.h"
#include "siftwave/ingest/ingest.h"

#include <algorithm>
#include <cctype>
#include <limits>
#include <map>

namespace siftwave {
namespace {

using namespace detail;

constexpr std::size_t kSampleBytes = std::size_t{256} << 10;
constexpr int kSampleRecords = 400;
constexpr std::size_t kCheckAhead = std::size_t{1} << 20;

std::string quoted(std::string_view text) {
    std::string out = "'";
    if (text.size() > 60) {
        out.append(text.substr(0, 57));
        out += "...";
    } else {
        out.append(text);
    }
    return out + "'";
}

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
               std::uint64_t column = 0) {
        Error e = makeError(code, std::move(message));
        e.file = m_path;
        e.line = line;
        e.column = column;
        return e;
    }
    /// A syntax error, unless an encoding error comes before it.
    Error syntaxFailure(const CsvSyntaxError& s) {
        Status enc = m_checker.checkUpTo(s.offset + 1);
        if (!enc)
            return enc.error();
        return fail(ErrorCode::Syntax, s.message, s.line, s.column);
    }

    Status sniff();
    Status keyPass();
    Status settleDates();
    Status cellPass();
    void storeCell(std::size_t measure, std::uint32_t region, std::int32_t day,
                   std::string_view text, std::uint32_t line, std::uint64_t column);
    Status checkFieldCount(const CsvRecord& record);
    std::string columnName(int c) const { return m_names[static_cast<std::size_t>(c)]; }

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

    KeyDictionary m_regions;
    KeyDictionary m_dates;
    KeyDictionary m_measureNames;
    std::vector<std::uint64_t> m_dateLine,
        m_dateColumn;                       // where each distinct date text was first seen
    std::vector<std::int32_t> m_dayOfDate;  // day index per distinct date text
    DateFormat m_dateFormat = DateFormat::Unknown;
    std::vector<std::int32_t>
        m_dayOfColumn;  // dates-across: day index per column (-1 if not a date column)
    std::vector<std::uint32_t>
        m_keptLine;  // per region/date key: line of the first row (wide layouts)

    bool m_emptyIsMissing = false;
    std::vector<std::string> m_otherMissing;
    WarningLog m_log;
};

Status DropReader::sniff() {
    const auto* u = reinterpret_cast<const unsigned char*>(m_bytes.data());
    if (m_bytes.size() >= 2 && ((u[0] == 0xFF && u[1] == 0xFE) || (u[0] == 0xFE && u[1] == 0xFF))) {
        return fail(
            ErrorCode::Encoding,
            "the file is UTF-16 (it starts with a UTF-16 byte-order mark); save it as UTF-8", 1, 1);
    }
    if (m_bytes.size() >= 3 && u[0] == 0xEF && u[1] == 0xBB && u[2] == 0xBF) {
        m_start = 3;
        m_drop.source.dialect.bom = true;
    }
    std::size_t firstContent = m_start;
    while (firstContent < m_bytes.size() &&
           (m_bytes[firstContent] == '\n' || m_bytes[firstContent] == '\r' ||
            m_bytes[firstContent] == ' ' || m_bytes[firstContent] == '\t')) {
        ++firstContent;
    }
    if (firstContent >= m_bytes.size())
        return fail(ErrorCode::Syntax, "the file is empty; there is nothing to read");

    const std::size_t sampleEnd = std::min(m_bytes.size(), m_start + kSampleBytes);
    if (Status s = m_checker.checkUpTo(sampleEnd); !s)
        return s;

    m_delimiter =
        m_options.delimiter ? *m_options.delimiter : sniffDelimiter(m_bytes, m_start, sampleEnd);
    m_drop.source.dialect.delimiter = m_delimiter;
    if (const std::size_t nl = m_bytes.find('\n', m_start);
        nl != std::string_view::npos && nl > 0) {
        m_drop.source.dialect.crlf = m_bytes[nl - 1] == '\r';
    }

    // The first records, owned (the sniffers and role detection look at them).
    std::vector<SampleRecord> records;
    {
        CsvScanner scanner(m_bytes, m_delimiter, m_start);
        CsvRecord record;
        while (static_cast<int>(records.size()) < kSampleRecords && scanner.next(record)) {
            if (record.isEmptyLine())
                continue;
            SampleRecord s;
            s.line = record.line;
            for (const CsvField& f : record.fields)
                s.fields.emplace_back(f.text);
            records.push_back(std::move(s));
            if (records.size() == 1) {
                m_dataStart = scanner.position();
                m_dataLine = scanner.line();
            }
            if (scanner.position() >= sampleEnd && records.size() >= 3)
                break;
        }
        if (scanner.failed())
            return syntaxFailure(scanner.error());
        if (Status s = m_checker.checkUpTo(scanner.position()); !s)
            return s;
    }
    if (records.empty())
        return fail(ErrorCode::Syntax, "the file is empty; there is nothing to read");

    NumberStyle provisional = sniffNumberStyle(records, false);
    m_header = m_options.header ? *m_options.header : sniffHeader(records, provisional);
    m_style = sniffNumberStyle(records, m_header);
    m_drop.source.dialect.header = m_header;
    m_drop.source.dialect.decimalSeparator = m_style.decimalSeparator;
    if (m_style.decimalSeparator == ',') {
        m_log.add("dialect",
                  "numbers use a decimal comma (',' separates decimals, '.' groups thousands)");
    }

    if (m_header) {
        m_names = records.front().fields;
        records.erase(records.begin());
    } else {
        m_dataStart = m_start;
        m_dataLine = 1;
        for (std::size_t i = 0; i < records.front().fields.size(); ++i)
            m_names.push_back("column " + std::to_string(i + 1));
    }
    if (records.empty()) {
        return fail(ErrorCode::Layout, "the file has a header but no data rows", 1, 0);
    }
    if (m_names.size() < 2) {
        return fail(ErrorCode::Layout,
                    "every line holds a single column: the delimiter was not found. Is it another "
                    "character? Name it "
                    "with --delimiter (',' ';' 'tab' '|')",
                    1, 0);
    }

    Result<RoleMapping> roles = detectRoles(m_names, m_header, records, m_style, m_options);
    if (!roles) {
        Error e = roles.error();
        e.file = m_path;
        return e;
    }
    m_roles = std::move(*roles);
    if (m_roles.layout == Layout::DatesDown) {
        std::map<std::string_view, int> seen;
        for (int c : m_roles.valueColumns) {
            auto [it, added] = seen.emplace(m_names[static_cast<std::size_t>(c)], c);
            if (!added) {
                return fail(ErrorCode::Layout,
                            "the header names region " + quoted(it->first) + " twice (columns " +
                                std::to_string(it->second + 1) + " and " + std::to_string(c + 1) +
                                ")",
                            1, static_cast<std::uint64_t>(c) + 1);
            }
            if (it->first.empty()) {
                return fail(ErrorCode::Layout, "a region column has an empty name in the header", 1,
                            static_cast<std::uint64_t>(c) + 1);
            }
        }
    }
    m_drop.source.layout = m_roles.layout;
    ColumnMapping& cols = m_drop.source.columns;
    if (m_roles.dateColumn >= 0)
        cols.date = columnName(m_roles.dateColumn);
    if (m_roles.regionColumn >= 0)
        cols.region = columnName(m_roles.regionColumn);
    if (m_roles.measureColumn >= 0)
        cols.measure = columnName(m_roles.measureColumn);
    for (int c : m_roles.valueColumns)
        cols.values.push_back(columnName(c));
    for (int c : m_roles.dateColumns)
        cols.values.push_back(columnName(c));
    for (int c : m_roles.unusedColumns) {
        m_log.add("unused column",
                  "column " + quoted(columnName(c)) +
                      " is not used (it is not the date, region, measure "
                      "or a value column)",
                  1, static_cast<std::uint64_t>(c) + 1);
    }

    for (const std::string& token : m_options.missingTokens) {
        if (token.empty())
            m_emptyIsMissing = true;
        else
            m_otherMissing.push_back(token);
    }
    if (!m_options.dateFormat.empty())
        m_dateFormat = *dateFormatFromName(m_options.dateFormat);
    return Ok{};
}

Status DropReader::checkFieldCount(const CsvRecord& record) {
    if (record.fields.size() == m_names.size())
        return Ok{};
    if (Status s = m_checker.checkUpTo(record.offset + 1); !s)
        return s;
    const std::size_t got = record.fields.size();
    return fail(
        ErrorCode::Syntax,
        "this row has " + std::to_string(got) + (got == 1 ? " field" : " fields") + " but " +
            (m_header ? "the header has " : "the first row has ") + std::to_string(m_names.size()) +
            (got > m_names.size()
                 ? " (a " + delimiterName(m_delimiter) + " inside a value that is not quoted?)"
                 : ""),
        record.line, got > m_names.size() ? m_names.size() + 1 : got + 1);
}

Status DropReader::keyPass() {
    CsvScanner scanner(m_bytes, m_delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    std::size_t nextCheck = 0;
    std::size_t emptyLines = 0;
    std::uint64_t firstEmptyLine = 0;
    bool strayReported = false;
    const std::size_t dateCol = static_cast<std::size_t>(std::max(m_roles.dateColumn, 0));
    const std::size_t regionCol = static_cast<std::size_t>(std::max(m_roles.regionColumn, 0));
    const bool hasDates = m_roles.layout != Layout::DatesAcross;
    const bool hasRegions = m_roles.layout != Layout::DatesDown;
    while (scanner.next(record)) {
        if (record.offset >= nextCheck) {
            if (Status s = m_checker.checkUpTo(record.offset + kCheckAhead); !s)
                return s;
            nextCheck = record.offset + kCheckAhead / 2;
            if (m_file)
                m_file->release(record.offset);
        }
        if (record.isEmptyLine()) {
            if (emptyLines++ == 0)
                firstEmptyLine = record.line;
            continue;
        }
        if (Status s = checkFieldCount(record); !s)
            return s;
        if (record.strayQuote && !strayReported) {
            strayReported = true;
            m_log.add(
                "quote",
                "a '\"' inside a value that is not quoted is kept as part of the value (RFC 4180 "
                "expects such values in quotes)",
                record.line, 0);
        }
        ++m_drop.rows;
        const auto line = static_cast<std::uint32_t>(record.line);
        if (hasDates) {
            const std::string_view text = record.fields[dateCol].text;
            if (text.empty()) {
                m_log.add("empty date", "the date cell is empty; the row is not read", line,
                          dateCol + 1);
                continue;
            }
            bool added = false;
            m_dates.intern(text, added);
            if (added) {
                m_dateLine.push_back(line);
                m_dateColumn.push_back(dateCol + 1);
            }
        }
        if (hasRegions) {
            const std::string_view code = record.fields[regionCol].text;
            if (code.empty()) {
                m_log.add("empty region", "the region cell is empty; the row is not read", line,
                          regionCol + 1);
                continue;
            }
            bool added = false;
            m_regions.intern(code, added);
            if (added && (std::isspace(static_cast<unsigned char>(code.front())) ||
                          std::isspace(static_cast<unsigned char>(code.back())))) {
                m_log.add("spaces in code",
                          "region code " + quoted(code) +
                              " has spaces at its start or end; it is kept exactly as written",
                          line, regionCol + 1);
            }
        }
        if (m_roles.measureColumn >= 0) {
            const std::string_view name =
                record.fields[static_cast<std::size_t>(m_roles.measureColumn)].text;
            if (name.empty()) {
                m_log.add("empty measure", "the measure-name cell is empty; the row is not read",
                          line, static_cast<std::uint64_t>(m_roles.measureColumn) + 1);
                continue;
            }
            bool added = false;
            m_measureNames.intern(name, added);
        }
    }
    if (scanner.failed())
        return syntaxFailure(scanner.error());
    if (Status s = m_checker.checkAll(); !s)
        return s;
    if (m_file)
        m_file->release(m_bytes.size());
    if (emptyLines > 0) {
        m_log.add("empty line",
                  std::to_string(emptyLines) +
                      (emptyLines == 1 ? " empty line was" : " empty lines were") + " skipped",
                  firstEmptyLine, 0);
    }
    if (m_drop.rows == 0)
        return fail(ErrorCode::Layout, "the file has a header but no data rows", 1, 0);
    m_drop.source.sha256 = m_checker.sha256();
    return Ok{};
}

Status DropReader::settleDates() {
    // The date texts: from the rows, or (dates-across) from the header.
    if (m_roles.layout == Layout::DatesAcross) {
        for (int c : m_roles.dateColumns) {
            bool added = false;
            m_dates.intern(m_names[static_cast<std::size_t>(c)], added);
            if (added) {
                m_dateLine.push_back(1);
                m_dateColumn.push_back(static_cast<std::uint64_t>(c) + 1);
            }
        }
    }
    const std::size_t n = m_dates.size();
    if (n == 0)
        return fail(ErrorCode::Layout, "no row has a date");

    if (m_dateFormat == DateFormat::Unknown) {
        const std::string& first = m_dates.key(0);
        const DateShape shape = dateShapeOf(first);
        if (shape == DateShape::None) {
            return fail(
                ErrorCode::InvalidValue,
                quoted(first) +
                    " in the date column is not a date (YYYY-MM-DD, YYYYMMDD, D/M/Y or M/D/Y)",
                m_dateLine[0], m_dateColumn[0]);
        }
        if (shape == DateShape::Iso)
            m_dateFormat = DateFormat::Iso;
        if (shape == DateShape::Compact)
            m_dateFormat = DateFormat::Compact;
        if (shape == DateShape::Slash) {
            // Day or month first: settled only by a number above 12, never guessed.
            std::size_t firstAbove12 = n, secondAbove12 = n;
            for (std::size_t i = 0; i < n; ++i) {
                int a, b, y;
                if (!splitDate(m_dates.key(static_cast<std::uint32_t>(i)), DateShape::Slash, a, b,
                               y))
                    continue;
                if (a > 12 && firstAbove12 == n)
                    firstAbove12 = i;
                if (b > 12 && secondAbove12 == n)
                    secondAbove12 = i;
            }
            if (firstAbove12 < n && secondAbove12 < n) {
                return fail(ErrorCode::InvalidValue,
                            "dates mix day-first and month-first orders: " +
                                quoted(m_dates.key(static_cast<std::uint32_t>(firstAbove12))) +
                                " (line " + std::to_string(m_dateLine[firstAbove12]) +
                                ") is day first, " +
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
                            "dates such as " + first +
                                " could be day/month or month/day (no day of the month in the file "
                                "is above 12); "
                                "rerun with --date-format DD/MM/YYYY or MM/DD/YYYY",
                            m_dateLine[0], m_dateColumn[0]);
            }
        }
    }

    m_dayOfDate.resize(n);
    std::int32_t lo = std::numeric_limits<std::int32_t>::max();
    std::int32_t hi = std::numeric_limits<std::int32_t>::min();
    std::vector<std::int32_t> serials(n);
    const char* formatName = dateFormatName(m_dateFormat);
    for (std::size_t i = 0; i < n; ++i) {
        const std::string& text = m_dates.key(static_cast<std::uint32_t>(i));
        std::optional<Date> d = parseDateAs(text, m_dateFormat);
        if (!d) {
            const DateShape expected = shapeOfFormat(m_dateFormat);
            std::string why;
            if (dateShapeOf(text) == expected) {
                why = quoted(text) + " is not a real day of the calendar (read as " + formatName +
                      ")";
            } else if (dateShapeOf(text) == DateShape::None) {
                why = quoted(text) +
                      " in the date column is not a date; the dates in this file are " + formatName;
            } else {
                why = quoted(text) +
                      " is written in another date format than the rest of the file (" +
                      formatName + ")";
            }
            return fail(ErrorCode::InvalidValue, why, m_dateLine[i], m_dateColumn[i]);
        }
        serials[i] = d->serial;
        lo = std::min(lo, d->serial);
        hi = std::max(hi, d->serial);
    }
    const std::int64_t span = static_cast<std::int64_t>(hi) - lo + 1;
    const std::size_t measures =
        m_roles.measureColumn >= 0
            ? m_measureNames.size()
            : (m_roles.layout == Layout::Long ? m_roles.valueColumns.size() : 1);
    const std::size_t regions =
        m_roles.layout == Layout::DatesDown ? m_roles.valueColumns.size() : m_regions.size();
    const double cells =
        static_cast<double>(span) * static_cast<double>(regions) * static_cast<double>(measures);
    if (span > 100 * 366 || cells > 1.5e9) {
        return fail(ErrorCode::InvalidValue,
                    "the dates run from " + Date{lo}.iso() + " to " + Date{hi}.iso() + " (" +
                        std::to_string(span) +
                        " days), too long a calendar for a drop; is a year mistyped?");
    }
    for (std::size_t i = 0; i < n; ++i)
        m_dayOfDate[i] = serials[i] - lo;
    m_drop.firstDay = Date{lo};
    m_drop.days = static_cast<std::int32_t>(span);
    m_drop.source.dateFormat = formatName;
    if (m_roles.layout == Layout::DatesAcross) {
        m_dayOfColumn.assign(m_names.size(), -1);
        for (int c : m_roles.dateColumns) {
            m_dayOfColumn[static_cast<std::size_t>(c)] =
                m_dayOfDate[m_dates.find(m_names[static_cast<std::size_t>(c)])];
        }
    }
    return Ok{};
}

void DropReader::storeCell(std::size_t measure, std::uint32_t region, std::int32_t day,
                           std::string_view text, std::uint32_t line, std::uint64_t column) {
    Cell cell;
    cell.line = line;
    bool missing = text.empty() ? m_emptyIsMissing : false;
    for (const std::string& token : m_otherMissing)
        missing = missing || text == token;
    if (missing) {
        cell.state = CellState::Blank;
    } else if (parsePlainCount(text, cell.value)) {
        cell.state = CellState::Reported;
    } else {
        const ParsedCount parsed = parseCount(text, m_style);
        if (parsed.ok) {
            cell.state = CellState::Reported;
            cell.value = parsed.value;
            switch (parsed.note) {
                case NumberNote::Thousands:
                    if (m_drop.source.dialect.thousandsSeparator == 0) {
                        m_drop.source.dialect.thousandsSeparator = parsed.thousandsSeparator;
                    }
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
        } else {
            cell.state = CellState::Unparsable;
            std::string why;
            if (text.empty())
                why = "the cell is empty and the empty cell is not a missing-value token here";
            else if (parsed.note == NumberNote::NotWhole)
                why = quoted(text) + " is not a whole number";
            else if (parsed.note == NumberNote::OutOfRange)
                why = quoted(text) + " is too large for a count";
            else
                why = quoted(text) + " is not a number";
            m_log.add("unparsable",
                      why + "; the cell is kept as unparsable" +
                          (text.empty() || parsed.note != NumberNote::NotANumber
                               ? std::string()
                               : " (if it means 'no value', pass --missing " + quoted(text) + ")"),
                      line, column);
        }
    }
    Cell& target = m_drop.tables[measure].at(region, static_cast<std::size_t>(day));
    if (target.state != CellState::Absent) {
        DuplicateRow dup;
        dup.measure = measure;
        dup.region = region;
        dup.day = day;
        dup.cell = cell;
        dup.firstLine = target.line;
        m_drop.duplicates.push_back(dup);
        return;
    }
    target = cell;
}

Status DropReader::cellPass() {
    const std::size_t regions =
        m_roles.layout == Layout::DatesDown ? m_roles.valueColumns.size() : m_regions.size();
    std::size_t measures = 1;
    if (m_roles.layout == Layout::Long) {
        measures = m_roles.measureColumn >= 0 ? m_measureNames.size() : m_roles.valueColumns.size();
    }
    m_drop.tables.reserve(measures);
    for (std::size_t m = 0; m < measures; ++m)
        m_drop.tables.emplace_back(regions, static_cast<std::size_t>(m_drop.days));

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
        switch (m_roles.layout) {
            case Layout::Long: {
                const std::string_view dateText = f[dateCol].text;
                const std::string_view code = f[regionCol].text;
                if (dateText.empty() || code.empty())
                    continue;
                const std::int32_t day = m_dayOfDate[m_dates.find(dateText)];
                const std::uint32_t region = m_regions.find(code);
                if (measureCol >= 0) {
                    const std::string_view name = f[static_cast<std::size_t>(measureCol)].text;
                    if (name.empty())
                        continue;
                    const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[0]);
                    storeCell(m_measureNames.find(name), region, day, f[col].text, line, col + 1);
                } else {
                    for (std::size_t m = 0; m < m_roles.valueColumns.size(); ++m) {
                        const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[m]);
                        storeCell(m, region, day, f[col].text, line, col + 1);
                    }
                }
                break;
            }
            case Layout::DatesDown: {
                const std::string_view dateText = f[dateCol].text;
                if (dateText.empty())
                    continue;
                const std::int32_t day = m_dayOfDate[m_dates.find(dateText)];
                for (std::size_t r = 0; r < m_roles.valueColumns.size(); ++r) {
                    const std::size_t col = static_cast<std::size_t>(m_roles.valueColumns[r]);
                    storeCell(0, static_cast<std::uint32_t>(r), day, f[col].text, line, col + 1);
                }
                break;
            }
            case Layout::DatesAcross: {
                const std::string_view code = f[regionCol].text;
                if (code.empty())
                    continue;
                const std::uint32_t region = m_regions.find(code);
                for (int c : m_roles.dateColumns) {
                    const std::size_t col = static_cast<std::size_t>(c);
                    storeCell(0, region, m_dayOfColumn[col], f[col].text, line, col + 1);
                }
                break;
            }
        }
    }
    if (scanner.failed())
        return syntaxFailure(scanner.error());  // cannot happen after the key pass
    if (m_file)
        m_file->release(m_bytes.size());
    return Ok{};
}

Result<Drop> DropReader::run() {
    if (Status s = m_options.validate(); !s) {
        Error e = s.error();
        return e;
    }
    m_drop.source.path = m_path;
    m_drop.source.bytes = m_bytes.size();
    if (Status s = sniff(); !s)
        return s.error();
    if (Status s = keyPass(); !s)
        return s.error();
    if (Status s = settleDates(); !s)
        return s.error();
    if (Status s = cellPass(); !s)
        return s.error();

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
    m_drop.indexRegions();
    if (!m_drop.duplicates.empty()) {
        const DuplicateRow& d = m_drop.duplicates.front();
        m_log.add(
            "duplicates",
            std::to_string(m_drop.duplicates.size()) +
                " cells repeat a region, date and measure already read; the first occurrence is "
                "kept, the repeats are listed as duplicates (first repeat: region " +
                quoted(m_drop.regionCodes[d.region]) + ", " + m_drop.dayAt(d.day).iso() +
                ", first seen on line " + std::to_string(d.firstLine) + ")",
            d.cell.line, 0);
    }
    const char sep = m_drop.source.dialect.thousandsSeparator;
    const std::string sepName = sep == ' ' ? "a space" : std::string("'") + sep + "'";
    m_log.moveTo(m_drop.warnings,
                 {
                     {"thousands", "cells are written with " + sepName +
                                       " as thousands separator; they were read as whole numbers"},
                     {"zero fraction",
                      "cells are written with a zero decimal part (like 12.0); they "
                      "were read as whole numbers"},
                     {"spaces", "cells have spaces around the number; they were read as numbers"},
                 });
    return std::move(m_drop);
}

}  // namespace

Result<Drop> parseDrop(std::string_view bytes, const std::string& displayPath,
                       const IngestOptions& options) {
    DropReader reader(bytes, displayPath, options, nullptr);
    return reader.run();
}

Result<Drop> readDrop(const std::string& path, const IngestOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    InputFile file;
    if (Status s = file.open(path); !s)
        return s.error();
    DropReader reader(file.bytes(), path, options, &file);
    return reader.run();
}

std::string sha256Hex(std::string_view bytes) {
    Sha256 sha;
    sha.update(bytes.data(), bytes.size());
    return sha.hexDigest();
}

}  // namespace siftwave
