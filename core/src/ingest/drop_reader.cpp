// readDrop / parseDrop: sniffing and the overall sequence (see drop_reader.h).
#include "ingest/drop_reader.h"

#include "ingest/case_list_reader.h"

#include "ingest/header_words.h"
#include "ingest/spreadsheet/spreadsheet_drop.h"

#include <algorithm>
#include <cctype>
#include <map>
#include <optional>
#include <string>

namespace siftwave::ingest {
namespace detail {
namespace {

constexpr std::size_t kSampleBytes = std::size_t{256} << 10;
constexpr int kSampleRecords = 400;

/// A file that is not text but a packed container an analyst may pick by mistake, named by its
/// magic number (the ZIP local file header "PK\3\4", PKWARE APPNOTE 4.3.7; gzip 1F 8B, RFC 1952
/// section 2.3.1; "%PDF-", ISO 32000-1 section 7.5.2), with what to do instead.
std::optional<std::string> packedFormatOf(std::string_view bytes) {
    if (bytes.starts_with(std::string_view("PK\x03\x04", 4))) {
        return "the file is a ZIP archive that is neither a CSV text file nor a workbook "
               "(.xlsx, .ods): unzip it first";
    }
    if (bytes.size() >= 2 && static_cast<unsigned char>(bytes[0]) == 0x1F &&
        static_cast<unsigned char>(bytes[1]) == 0x8B) {
        return std::string(
            "the file is gzip-compressed, not a CSV text file: decompress it first "
            "(gunzip)");
    }
    if (bytes.starts_with("%PDF-")) {
        return std::string(
            "the file is a PDF document, not a CSV text file: ask for the data as "
            "CSV");
    }
    return std::nullopt;
}

/// How a delimiter is written in --delimiter's help: ',' ';' '|' or tab.
std::string delimiterAsTyped(char delimiter) {
    if (delimiter == '\t')
        return "tab";
    return std::string("'") + delimiter + "'";
}

}  // namespace

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

Error DropReader::fail(ErrorCode code, std::string message, std::uint64_t line,
                       std::uint64_t column) const {
    Error e = makeError(code, std::move(message));
    e.file = m_path;
    e.line = line;
    e.column = column;
    return e;
}

Error DropReader::syntaxFailure(const CsvSyntaxError& s) {
    Status enc = m_checker.checkUpTo(s.offset + 1);
    if (!enc)
        return enc.error();
    return fail(ErrorCode::Syntax, s.message, s.line, s.column);
}

Status DropReader::sniff() {
    if (Status s = rejectUnreadableStart(); !s)
        return s;
    // The first block: its encoding, line endings and delimiter, then its first records.
    const std::size_t sampleEnd = std::min(m_bytes.size(), m_start + kSampleBytes);
    if (Status s = checkSampleBlock(sampleEnd); !s)
        return s;
    settleDelimiter(sampleEnd);
    std::size_t sampledUpTo = m_start;
    Result<std::vector<SampleRecord>> records = readSampleRecords(sampleEnd, sampledUpTo);
    if (!records)
        return records.error();
    settleHeaderAndNumberStyle(*records);
    if (Status s = takeColumnNames(*records, sampleEnd); !s)
        return s;
    if (Status s = settleRoles(*records); !s)
        return s;
    if (Status s = settleNarrowing(); !s)
        return s;
    if (Status s = recordColumnMapping(); !s)
        return s;

    for (const std::string& token : m_options.missingTokens) {
        if (token.empty())
            m_emptyIsMissing = true;
        else
            m_otherMissing.push_back(token);
    }
    m_dateFormat = initialDateFormat();
    m_sampleBytes = sampledUpTo > m_dataStart ? sampledUpTo - m_dataStart : 0;
    m_sample = std::move(*records);
    m_sniffLog = m_log;
    return Ok{};
}

Status DropReader::rejectUnreadableStart() {
    const auto* u = reinterpret_cast<const unsigned char*>(m_bytes.data());
    if (m_bytes.size() >= 2 && ((u[0] == 0xFF && u[1] == 0xFE) || (u[0] == 0xFE && u[1] == 0xFF))) {
        return fail(
            ErrorCode::Encoding,
            "the file is UTF-16 (it starts with a UTF-16 byte-order mark); save it as UTF-8", 1, 1);
    }
    if (std::optional<std::string> kind = packedFormatOf(m_bytes)) {
        return fail(ErrorCode::Encoding, *kind, 1, 1);
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
    return Ok{};
}

Status DropReader::checkSampleBlock(std::size_t sampleEnd) {
    // The encoding of the first block is checked before the line endings: a binary file often
    // holds a CR byte and no LF, and is better named as binary than as old Mac text.
    if (Status s = m_checker.checkUpTo(sampleEnd); !s)
        return s;
    if (m_bytes.find('\n', m_start) == std::string_view::npos &&
        m_bytes.find('\r', m_start) != std::string_view::npos) {
        return fail(ErrorCode::Syntax,
                    "the lines end in a carriage return alone (an old Mac format); save the file "
                    "with LF or CR LF line endings",
                    1, 0);
    }
    return Ok{};
}

void DropReader::settleDelimiter(std::size_t sampleEnd) {
    m_delimiter =
        m_options.delimiter ? *m_options.delimiter : sniffDelimiter(m_bytes, m_start, sampleEnd);
    m_drop.source.dialect.delimiter = m_delimiter;
    if (const std::size_t nl = m_bytes.find('\n', m_start);
        nl != std::string_view::npos && nl > 0) {
        m_drop.source.dialect.crlf = m_bytes[nl - 1] == '\r';
    }
}

Result<std::vector<SampleRecord>> DropReader::readSampleRecords(std::size_t sampleEnd,
                                                                std::size_t& sampledUpTo) {
    std::vector<SampleRecord> records;
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
    sampledUpTo = scanner.position();
    if (Status s = m_checker.checkUpTo(scanner.position()); !s)
        return s.error();
    if (records.empty())
        return fail(ErrorCode::Syntax, "the file is empty; there is nothing to read");
    return records;
}

void DropReader::settleHeaderAndNumberStyle(const std::vector<SampleRecord>& records) {
    NumberStyle provisional = sniffNumberStyle(records, false);
    m_header = m_options.header ? *m_options.header : sniffHeader(records, provisional);
    m_style = sniffNumberStyle(records, m_header);
    m_drop.source.dialect.header = m_header;
    m_drop.source.dialect.decimalSeparator = m_style.decimalSeparator;
    if (m_style.decimalSeparator == ',') {
        m_log.add("dialect",
                  "numbers use a decimal comma (',' separates decimals, '.' groups thousands)");
    }
}

Status DropReader::takeColumnNames(std::vector<SampleRecord>& records, std::size_t sampleEnd) {
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
    if (m_names.size() < 2 && m_options.delimiter) {
        const char found = sniffDelimiter(m_bytes, m_start, sampleEnd);
        std::string message = "every line holds a single column with the delimiter " +
                              delimiterAsTyped(*m_options.delimiter) + " named by --delimiter";
        if (found != *m_options.delimiter)
            message += "; the file seems to use " + delimiterAsTyped(found);
        message += ". Leave out --delimiter to detect it, or name the right one";
        return fail(ErrorCode::Layout, std::move(message), 1, 0);
    }
    if (m_names.size() < 2) {
        return fail(ErrorCode::Layout,
                    "every line holds a single column: the delimiter was not found. Is it another "
                    "character? Name it "
                    "with --delimiter (',' ';' 'tab' '|')",
                    1, 0);
    }
    return Ok{};
}

Status DropReader::settleRoles(const std::vector<SampleRecord>& records) {
    Result<RoleMapping> roles = detectRoles(m_names, m_header, records, m_style, m_options);
    if (!roles) {
        Error e = roles.error();
        e.file = m_path;
        return e;
    }
    m_roles = std::move(*roles);
    if (m_roles.layout == Layout::DatesDown ||
        (m_roles.layout == Layout::Long && m_roles.measureColumn < 0))
        return checkValueColumnNamesDistinct();
    return Ok{};
}

Status DropReader::checkValueColumnNamesDistinct() const {
    const bool regions = m_roles.layout == Layout::DatesDown;
    std::map<std::string_view, int> seen;
    for (int c : m_roles.valueColumns) {
        auto [it, added] = seen.emplace(m_names[static_cast<std::size_t>(c)], c);
        const std::uint64_t column = static_cast<std::uint64_t>(c) + 1;
        if (!added && regions) {
            return fail(ErrorCode::Layout,
                        "the header names region " + quoted(it->first) + " twice (columns " +
                            std::to_string(it->second + 1) + " and " + std::to_string(c + 1) + ")",
                        1, column);
        }
        if (!added) {
            return fail(ErrorCode::Layout,
                        "columns " + std::to_string(it->second + 1) + " and " +
                            std::to_string(c + 1) + " are both named " + quoted(it->first) +
                            ", so their measures cannot be told apart; rename one or pick "
                            "the value columns with --value-col",
                        1, column);
        }
        if (regions && it->first.empty())
            return fail(ErrorCode::Layout, "a region column has an empty name in the header", 1,
                        column);
    }
    return Ok{};
}

Status DropReader::recordColumnMapping() {
    m_drop.source.layout = m_roles.layout;
    ColumnMapping& cols = m_drop.source.columns;
    if (m_roles.dateColumn >= 0)
        cols.date = columnName(m_roles.dateColumn);
    if (m_roles.yearWeek()) {
        if (Status s = settleYearWeekConvention(); !s)
            return s;
        cols.year = columnName(m_roles.dateColumn);
        cols.week = columnName(m_roles.weekColumn);
        cols.date = cols.year + "+" + cols.week;
    }
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
    return Ok{};
}

Status DropReader::settleYearWeekConvention() {
    const HeaderWords year = headerWordsOf(columnName(m_roles.dateColumn));
    const HeaderWords week = headerWordsOf(columnName(m_roles.weekColumn));
    if (!m_options.dateFormat.empty()) {
        return fail(ErrorCode::Usage,
                    "the dates are a year and a week column (" +
                        quoted(columnName(m_roles.dateColumn)) + " and " +
                        quoted(columnName(m_roles.weekColumn)) +
                        "); --date-format applies to a column of dates, leave it out",
                    1, static_cast<std::uint64_t>(m_roles.dateColumn) + 1);
    }
    if (m_options.weekStart) {
        m_yearWeekStart = *m_options.weekStart;
    } else if (year.weekWords == WeekWords::Mmwr || week.weekWords == WeekWords::Mmwr) {
        m_yearWeekStart = WeekStart::Sunday;  // MMWR weeks start on Sunday by definition
    } else {
        m_yearWeekStart = WeekStart::Monday;
        int epi = -1;  // the column whose name says "epi"
        if (year.weekWords == WeekWords::Epidemiological)
            epi = m_roles.dateColumn;
        else if (week.weekWords == WeekWords::Epidemiological)
            epi = m_roles.weekColumn;
        if (epi >= 0) {
            m_log.add("week convention",
                      "column " + quoted(columnName(epi)) +
                          " names epidemiological weeks, which start on Sunday in some "
                          "countries (the CDC's MMWR weeks) and on Monday in others; they were "
                          "read as ISO 8601 weeks (Monday start). Pass --week-start sunday for "
                          "Sunday-start weeks, or --week-start monday to confirm",
                      1, static_cast<std::uint64_t>(epi) + 1);
        }
    }
    return Ok{};
}

DateFormat DropReader::initialDateFormat() const {
    if (m_roles.yearWeek())
        return DateFormat::YearWeek;
    if (!m_options.dateFormat.empty())
        return *dateFormatFromName(m_options.dateFormat);
    return DateFormat::Unknown;
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

Result<Drop> DropReader::run() {
    if (Status s = m_options.validate(); !s)
        return s.error();
    m_drop.source.path = m_path;
    m_drop.source.bytes = m_bytes.size();
    if (Status s = sniff(); !s)
        return s.error();
    const ReadNarrowing& asked = m_drop.source.narrowing;
    if ((asked.from || asked.to) && m_roles.layout != Layout::DatesAcross) {
        if (Status s = settleDateWindow(); !s)
            return s.error();
    }
    bool done = false;
    if (predictCalendar()) {
        Result<bool> one = onePass();
        if (!one)
            return one.error();
        done = *one;
        if (!done)
            resetForTwoPasses();
    }
    if (!done) {
        if (Status s = keyPass(); !s)
            return s.error();
        if (Status s = settleDates(); !s)
            return s.error();
        if (Status s = cellPass(); !s)
            return s.error();
    }
    if (Status s = finish(); !s)
        return s.error();
    return std::move(m_drop);
}

}  // namespace detail

namespace {

/// A spreadsheet drop, read through the CSV path (spreadsheet/spreadsheet_drop.h); nullopt for
/// text. --sheet is refused for a CSV file.
std::optional<Result<Drop>> readAsSpreadsheet(std::string_view bytes, const std::string& path,
                                              const IngestOptions& options) {
    std::optional<Result<Drop>> drop = detail::readSpreadsheetDrop(bytes, path, options);
    if (!drop && !options.sheet.empty()) {
        Error e = makeError(ErrorCode::Usage,
                            "--sheet applies to a spreadsheet (.xlsx, .ods), and this file is "
                            "not one; leave it out");
        e.file = path;
        return Result<Drop>(std::move(e));
    }
    return drop;
}

}  // namespace

Result<Drop> parseDrop(std::string_view bytes, const std::string& displayPath,
                       const IngestOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    if (std::optional<Result<Drop>> sheet = readAsSpreadsheet(bytes, displayPath, options))
        return std::move(*sheet);
    if (detail::isCaseList(bytes, options))
        return detail::readCaseList(bytes, displayPath, options);
    detail::DropReader reader(bytes, displayPath, options, nullptr);
    return reader.run();
}

Result<Drop> readDrop(const std::string& path, const IngestOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    detail::InputFile file;
    if (Status s = file.open(path); !s)
        return s.error();
    if (std::optional<Result<Drop>> sheet = readAsSpreadsheet(file.bytes(), path, options))
        return std::move(*sheet);
    if (detail::isCaseList(file.bytes(), options))
        return detail::readCaseList(file.bytes(), path, options);
    detail::DropReader reader(file.bytes(), path, options, &file);
    return reader.run();
}

}  // namespace siftwave::ingest
