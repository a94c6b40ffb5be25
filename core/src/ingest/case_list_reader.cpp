// Case lists: detection, the columns, the dates' formats and the counts (case_list_reader.h).
#include "ingest/case_list_reader.h"

#include "ingest/csv_scanner.h"
#include "ingest/date_parsing.h"
#include "ingest/header_words.h"
#include "ingest/input_source.h"
#include "ingest/number_parsing.h"
#include "ingest/sniffing.h"
#include "ingest/table_bounds.h"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <optional>
#include <unordered_map>

namespace siftwave::ingest {

bool IngestOptions::forcesCaseList() const {
    return caseList.value_or(false) || (layout && *layout == Layout::CaseList) ||
           !eventColumn.empty() || !reportColumn.empty();
}

Status IngestOptions::validateCaseListOptions() const {
    if (caseList && !*caseList && (!eventColumn.empty() || !reportColumn.empty()))
        return makeError(ErrorCode::Usage,
                         "--event-col and --report-col name a case list's columns; they do not "
                         "apply when the file is not read as a case list");
    if (!eventColumn.empty() && eventColumn == reportColumn)
        return makeError(ErrorCode::Usage,
                         "--event-col and --report-col name the same column '" + eventColumn + "'");
    if (forcesCaseList() &&
        (!valueColumns.empty() || !measureColumn.empty() || !yearColumn.empty() ||
         !weekColumn.empty() || !dateColumn.empty() || (layout && *layout != Layout::CaseList)))
        return makeError(ErrorCode::Usage,
                         "a case list has no value, measure, year or week column and no other "
                         "layout; name its dates with --event-col and --report-col");
    return Ok{};
}

namespace detail {
namespace {

constexpr std::size_t kSampleRecords = 200;
constexpr std::int32_t kMaxSpanDays = 40000;  // about 110 years: a mistyped year, not a list
const char* const kWholeSeries = "all";       // the one region of a list with no region column

std::size_t bomLength(std::string_view bytes) {
    return bytes.starts_with("\xEF\xBB\xBF") ? 3 : 0;
}

std::string lowerAscii(std::string_view text) {
    std::string out(text);
    for (char& c : out)
        c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

/// The name speaks of a report date: report, notification, Meldung, received, arrival
/// (English and German words of the trade; common practice, no source).
bool speaksOfReport(std::string_view name) {
    const std::string n = lowerAscii(name);
    for (const char* w : {"report", "notif", "meld", "receiv", "arriv", "eingang"}) {
        if (n.find(w) != std::string::npos)
            return true;
    }
    return false;
}

bool isDateCell(std::string_view text) {
    const DateShape shape = dateShapeOf(text);
    if (shape == DateShape::None)
        return false;
    if (shape == DateShape::Slash) {
        int a = 0, b = 0, y = 0;
        return splitDate(text, shape, a, b, y) &&
               parseDateAs(text, a > 12 ? DateFormat::DayFirst : DateFormat::MonthFirst)
                   .has_value();
    }
    const DateFormat f = shape == DateShape::Iso       ? DateFormat::Iso
                         : shape == DateShape::Compact ? DateFormat::Compact
                                                       : DateFormat::IsoWeek;
    return parseDateAs(text, f).has_value();
}

bool isMissing(std::string_view text, const IngestOptions& options) {
    return std::find(options.missingTokens.begin(), options.missingTokens.end(), text) !=
           options.missingTokens.end();
}

/// The first records' facts per column: how many are dates, numbers, anything.
struct ColumnFacts {
    std::size_t nonEmpty = 0;
    std::size_t dates = 0;
    std::size_t numbers = 0;
    bool dateColumn() const { return nonEmpty > 0 && dates * 10 >= nonEmpty * 8; }
    bool numberColumn() const { return nonEmpty > 0 && numbers * 2 >= nonEmpty; }
};

struct Sample {
    char delimiter = ',';
    std::vector<std::string> names;
    std::vector<ColumnFacts> facts;
    std::size_t records = 0;
};

std::optional<Sample> sampleOf(std::string_view bytes, const IngestOptions& options) {
    const std::size_t start = bomLength(bytes);
    Sample s;
    s.delimiter = options.delimiter
                      ? *options.delimiter
                      : sniffDelimiter(bytes, start, std::min(bytes.size(), start + (64u << 10)));
    CsvScanner scanner(bytes, s.delimiter, start);
    CsvRecord record;
    while (s.records <= kSampleRecords && scanner.next(record)) {
        if (record.isEmptyLine())
            continue;
        if (s.names.empty()) {
            for (const CsvField& f : record.fields)
                s.names.emplace_back(f.text);
            s.facts.resize(s.names.size());
            continue;
        }
        ++s.records;
        for (std::size_t c = 0; c < std::min(record.fields.size(), s.facts.size()); ++c) {
            const std::string_view t = record.fields[c].text;
            if (t.empty() || isMissing(t, options))
                continue;
            ++s.facts[c].nonEmpty;
            if (dateShapeOf(t) != DateShape::None)  // a date, or a mistyped one (2026-02-30)
                ++s.facts[c].dates;
            else if (const CellShape shape = shapeOf(t, NumberStyle{});
                     shape == CellShape::Integer || shape == CellShape::Decimal)
                ++s.facts[c].numbers;
        }
    }
    if (scanner.failed() || s.names.size() < 1)
        return std::nullopt;
    return s;
}

bool optionsNameAnotherLayout(const IngestOptions& o) {
    return (o.layout && *o.layout != Layout::CaseList) || !o.dateColumn.empty() ||
           !o.valueColumns.empty() || !o.measureColumn.empty() || !o.yearColumn.empty() ||
           !o.weekColumn.empty() || (o.header && !*o.header);
}

}  // namespace

bool isCaseList(std::string_view bytes, const IngestOptions& options) {
    if (options.forcesCaseList())
        return true;
    if ((options.caseList && !*options.caseList) || optionsNameAnotherLayout(options))
        return false;
    if (findInvalidUtf8(bytes.substr(0, std::min<std::size_t>(bytes.size(), 4096))) !=
        std::string_view::npos)
        return false;
    const std::optional<Sample> s = sampleOf(bytes, options);
    if (!s || s->records < 1)
        return false;
    std::size_t dateColumns = 0;
    std::size_t numberColumns = 0;
    for (std::size_t c = 0; c < s->names.size(); ++c) {
        if (isDateCell(s->names[c]) || isDigitName(s->names[c]))
            return false;  // dates across the header, or a region per column: a wide release
        if (s->facts[c].dateColumn())
            ++dateColumns;
        else if (headerWordsOf(s->names[c]).hints(HeaderRole::Count))
            return false;  // a column named as counts, whatever its cells hold
        else if (s->facts[c].numberColumn())
            ++numberColumns;
    }
    return dateColumns >= 2 || (dateColumns == 1 && numberColumns == 0 && s->names.size() >= 1 &&
                                s->names.size() <= 40);
}

namespace {

/// The read of one case list, in its steps (run()).
class CaseListReader {
public:
    CaseListReader(std::string_view bytes, std::string path, const IngestOptions& options)
        : m_bytes(bytes), m_path(std::move(path)), m_options(options), m_checker(bytes, m_path) {}

    Result<Drop> run() {
        if (Status s = checkBytes(); !s)
            return s.error();
        if (Status s = readHeader(); !s)
            return s.error();
        if (Status s = chooseColumns(); !s)
            return s.error();
        if (Status s = settleNarrowing(); !s)
            return s.error();
        if (Status s = settleFormats(); !s)
            return s.error();
        if (Status s = readCases(); !s)
            return s.error();
        if (Status s = countCases(); !s)
            return s.error();
        return std::move(m_drop);
    }

private:
    Error fail(ErrorCode code, std::string message, std::uint64_t line = 0,
               std::uint64_t column = 0) const {
        Error e = makeError(code, std::move(message));
        e.file = m_path;
        e.line = line;
        e.column = column;
        return e;
    }

    /// UTF-8 and the hash, the byte-order mark, the line endings and the delimiter.
    Status checkBytes() {
        if (Status s = m_checker.checkAll(); !s)
            return s;
        m_drop.source.path = m_path;
        m_drop.source.bytes = m_bytes.size();
        m_drop.source.sha256 = m_checker.sha256();
        m_drop.source.layout = Layout::CaseList;
        m_start = bomLength(m_bytes);
        Dialect& d = m_drop.source.dialect;
        d.bom = m_start > 0;
        const std::size_t nl = m_bytes.find('\n', m_start);
        d.crlf = nl != std::string_view::npos && nl > 0 && m_bytes[nl - 1] == '\r';
        d.header = true;
        d.delimiter =
            m_options.delimiter
                ? *m_options.delimiter
                : sniffDelimiter(m_bytes, m_start, std::min(m_bytes.size(), m_start + (64u << 10)));
        if (m_options.header && !*m_options.header)
            return fail(ErrorCode::Usage,
                        "a case list needs a header row that names its date columns");
        return Ok{};
    }

    Status readHeader() {
        CsvScanner scanner(m_bytes, m_drop.source.dialect.delimiter, m_start);
        CsvRecord record;
        while (scanner.next(record)) {
            if (record.isEmptyLine())
                continue;
            for (const CsvField& f : record.fields)
                m_names.emplace_back(f.text);
            m_dataStart = scanner.position();
            m_dataLine = scanner.line();
            return Ok{};
        }
        if (scanner.failed())
            return fail(ErrorCode::Syntax, scanner.error().message, scanner.error().line,
                        scanner.error().column);
        return fail(ErrorCode::Layout, "the file is empty: no header, no cases");
    }

    std::optional<std::size_t> columnNamed(const std::string& name) const {
        for (std::size_t c = 0; c < m_names.size(); ++c) {
            if (m_names[c] == name)
                return c;
        }
        return std::nullopt;
    }

    std::string columnList() const {
        std::string out;
        for (std::size_t c = 0; c < m_names.size(); ++c)
            out += (c ? ", '" : "'") + m_names[c] + "'";
        return out;
    }

    Result<std::optional<std::size_t>> namedColumn(const std::string& name, const char* flag) {
        if (name.empty())
            return std::optional<std::size_t>{};
        if (std::optional<std::size_t> c = columnNamed(name))
            return c;
        return fail(ErrorCode::Layout,
                    std::string(flag) + " names '" + name + "', which is not a column of the " +
                        "header; the columns are " + columnList(),
                    m_dataLine > 1 ? m_dataLine - 1 : 1);
    }

    /// The event, report and region columns: named, or chosen as the header says.
    Status chooseColumns();
    /// The format of each date column, from the options or from every cell of the column.
    Status settleFormats();
    Result<DateFormat> formatOfColumn(std::size_t column);
    /// Every row: its region, its dates, a CaseRecord or a CaseProblem.
    Status readCases();
    void readCase(const CsvRecord& record);
    std::optional<Date> readDate(const CsvRecord& record, std::size_t column, DateFormat format,
                                 CaseProblemKind missing, CaseProblemKind unreadable,
                                 std::uint32_t region);
    Status checkFieldCount(const CsvRecord& record) const;
    /// A narrowed read (IngestOptions::narrowing): the codes asked for, sorted; --only-regions
    /// for a list without a region column is a usage error.
    Status settleNarrowing();
    /// True (and counted) when a narrowed read leaves the case out: its event date outside
    /// from..to (weekly: its week), or its region not asked for. An unreadable event is kept, to
    /// be reported as a problem.
    bool leftOutByNarrowing(const CsvRecord& record);
    /// The table of regions x periods is refused before it is allocated when the file does not
    /// justify it (table_bounds.h), with the --from/--to and --only-regions that would fit.
    Status checkTableJustified(const TimeAxis& axis) const;
    /// The calendar from the first event to the last, and the counts per region and period.
    Status countCases();
    Result<TimeAxis> axisOfEvents() const;

    std::string_view m_bytes;
    std::string m_path;
    const IngestOptions& m_options;
    InputChecker m_checker;
    Drop m_drop;
    CaseList m_list;
    std::size_t m_start = 0;
    std::size_t m_dataStart = 0;
    std::uint64_t m_dataLine = 1;
    std::vector<std::string> m_names;
    std::size_t m_event = 0;
    std::optional<std::size_t> m_report;
    std::optional<std::size_t> m_region;
    DateFormat m_eventFormat = DateFormat::Iso;
    DateFormat m_reportFormat = DateFormat::Iso;
    std::unordered_map<std::string, std::uint32_t> m_regionIndex;
};

Status CaseListReader::chooseColumns() {
    Result<std::optional<std::size_t>> event = namedColumn(m_options.eventColumn, "--event-col");
    Result<std::optional<std::size_t>> report = namedColumn(m_options.reportColumn, "--report-col");
    Result<std::optional<std::size_t>> region = namedColumn(m_options.regionColumn, "--region-col");
    if (!event)
        return event.error();
    if (!report)
        return report.error();
    if (!region)
        return region.error();
    const std::optional<Sample> sample = sampleOf(m_bytes, m_options);
    std::vector<std::size_t> dateColumns;
    for (std::size_t c = 0; sample && c < sample->facts.size(); ++c) {
        if (sample->facts[c].dateColumn())
            dateColumns.push_back(c);
    }
    auto isDateColumn = [&](std::size_t c) {
        return std::find(dateColumns.begin(), dateColumns.end(), c) != dateColumns.end();
    };
    if (*event) {
        m_event = **event;
    } else {
        auto it = std::find_if(dateColumns.begin(), dateColumns.end(), [&](std::size_t c) {
            return !speaksOfReport(m_names[c]) && (!*report || c != **report);
        });
        if (it == dateColumns.end())
            return fail(ErrorCode::Layout,
                        "no column of event dates was found in the first rows; name it with "
                        "--event-col (the columns are " +
                            columnList() + ")",
                        m_dataLine > 1 ? m_dataLine - 1 : 1);
        m_event = *it;
    }
    if (*report) {
        m_report = **report;
    } else {
        for (std::size_t c : dateColumns) {
            if (c != m_event && (speaksOfReport(m_names[c]) || !m_report))
                m_report = c;
            if (m_report && speaksOfReport(m_names[*m_report]))
                break;
        }
    }
    if (*region) {
        m_region = **region;
    } else {
        for (std::size_t c = 0; c < m_names.size(); ++c) {
            if (!isDateColumn(c) && headerWordsOf(m_names[c]).hints(HeaderRole::Region)) {
                m_region = c;
                break;
            }
        }
    }
    if (m_region && (*m_region == m_event || (m_report && *m_region == *m_report)))
        return fail(ErrorCode::Usage, "the region column cannot also be a date column");
    m_list.eventColumn = m_names[m_event];
    m_list.reportColumn = m_report ? m_names[*m_report] : std::string();
    m_list.regionColumn = m_region ? m_names[*m_region] : std::string();
    ColumnMapping& map = m_drop.source.columns;
    map.date = m_list.eventColumn;
    map.region = m_list.regionColumn;
    return Ok{};
}

Result<DateFormat> CaseListReader::formatOfColumn(std::size_t column) {
    if (!m_options.dateFormat.empty())
        return *dateFormatFromName(m_options.dateFormat);
    CsvScanner scanner(m_bytes, m_drop.source.dialect.delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    std::optional<DateShape> shape;
    bool dayFirst = false;
    bool monthFirst = false;
    while (scanner.next(record)) {
        if (column >= record.fields.size())
            continue;
        const std::string_view t = record.fields[column].text;
        const DateShape s = dateShapeOf(t);
        if (s == DateShape::None)
            continue;
        if (!shape)
            shape = s;
        int a = 0, b = 0, y = 0;
        if (s == DateShape::Slash && splitDate(t, s, a, b, y)) {
            dayFirst = dayFirst || a > 12;
            monthFirst = monthFirst || b > 12;
        }
    }
    if (!shape)
        return fail(ErrorCode::Layout, "column '" + m_names[column] + "' holds no date in any row",
                    m_dataLine, column + 1);
    switch (*shape) {
        case DateShape::Iso:
            return DateFormat::Iso;
        case DateShape::Compact:
            return DateFormat::Compact;
        case DateShape::IsoWeek:
            return DateFormat::IsoWeek;
        default:
            break;
    }
    if (dayFirst == monthFirst)
        return fail(ErrorCode::Ambiguous,
                    "the dates in column '" + m_names[column] + "' read both day first and " +
                        "month first" + (dayFirst ? " (both orders occur)" : "") +
                        "; name the order with --date-format DD/MM/YYYY or MM/DD/YYYY",
                    m_dataLine, column + 1);
    return dayFirst ? DateFormat::DayFirst : DateFormat::MonthFirst;
}

Status CaseListReader::settleFormats() {
    Result<DateFormat> event = formatOfColumn(m_event);
    Result<DateFormat> report = m_report ? formatOfColumn(*m_report) : event;
    // A file writes its dates one way: a slash order one column settles holds for the other.
    auto ambiguous = [](const Result<DateFormat>& r) {
        return !r && r.error().code == ErrorCode::Ambiguous;
    };
    auto slash = [](const Result<DateFormat>& r) {
        return r && (*r == DateFormat::DayFirst || *r == DateFormat::MonthFirst);
    };
    if (ambiguous(event) && slash(report))
        event = *report;
    if (ambiguous(report) && slash(event))
        report = *event;
    if (!event)
        return event.error();
    if (!report)
        return report.error();
    m_eventFormat = *event;
    m_reportFormat = *report;
    m_drop.source.dateFormat = dateFormatName(m_eventFormat);
    return Ok{};
}

Status CaseListReader::checkFieldCount(const CsvRecord& record) const {
    if (record.fields.size() == m_names.size())
        return Ok{};
    const std::size_t got = record.fields.size();
    return fail(ErrorCode::Syntax,
                "this row has " + std::to_string(got) + (got == 1 ? " field" : " fields") +
                    " but the header has " + std::to_string(m_names.size()),
                record.line, std::min(got, m_names.size()) + 1);
}

std::optional<Date> CaseListReader::readDate(const CsvRecord& record, std::size_t column,
                                             DateFormat format, CaseProblemKind missing,
                                             CaseProblemKind unreadable, std::uint32_t region) {
    const std::string_view t = record.fields[column].text;
    CaseProblem p;
    p.line = static_cast<std::uint32_t>(record.line);
    p.column = static_cast<std::uint32_t>(column + 1);
    p.region = region;
    if (t.empty() || isMissing(t, m_options)) {
        p.kind = missing;
    } else if (std::optional<Date> d = parseDateAs(t, format)) {
        return d;
    } else {
        p.kind = unreadable;
        p.text = std::string(t);
    }
    m_list.problems.push_back(std::move(p));
    return std::nullopt;
}

void CaseListReader::readCase(const CsvRecord& record) {
    std::string code = m_region ? std::string(record.fields[*m_region].text) : kWholeSeries;
    auto [it, added] =
        m_regionIndex.emplace(std::move(code), static_cast<std::uint32_t>(m_regionIndex.size()));
    if (added)
        m_drop.regionCodes.push_back(it->first);
    const std::uint32_t region = it->second;
    const std::optional<Date> event =
        readDate(record, m_event, m_eventFormat, CaseProblemKind::MissingEvent,
                 CaseProblemKind::UnreadableEvent, region);
    if (!event)
        return;
    CaseRecord c;
    c.event = *event;
    c.region = region;
    c.line = static_cast<std::uint32_t>(record.line);
    if (m_report) {
        const std::size_t before = m_list.problems.size();
        if (std::optional<Date> report =
                readDate(record, *m_report, m_reportFormat, CaseProblemKind::MissingReport,
                         CaseProblemKind::UnreadableReport, region)) {
            c.report = *report;
            c.hasReport = true;
            c.reportBeforeEvent = *report < *event;
            if (c.reportBeforeEvent) {
                CaseProblem p{CaseProblemKind::ReportBeforeEvent,
                              c.line,
                              static_cast<std::uint32_t>(*m_report + 1),
                              region,
                              std::string(record.fields[*m_report].text),
                              *event,
                              *report};
                m_list.problems.push_back(std::move(p));
            }
        } else if (m_list.problems.size() > before) {
            m_list.problems.back().event = *event;
        }
    }
    m_list.cases.push_back(c);
}

Status CaseListReader::readCases() {
    CsvScanner scanner(m_bytes, m_drop.source.dialect.delimiter, m_dataStart, m_dataLine);
    CsvRecord record;
    while (scanner.next(record)) {
        if (record.isEmptyLine())
            continue;
        if (Status s = checkFieldCount(record); !s)
            return s;
        ++m_drop.rows;
        if (m_drop.source.narrowing.active() && leftOutByNarrowing(record))
            continue;
        readCase(record);
    }
    if (scanner.failed())
        return fail(ErrorCode::Syntax, scanner.error().message, scanner.error().line,
                    scanner.error().column);
    if (m_list.cases.empty() && m_drop.source.leftOut.rows() > 0)
        return fail(ErrorCode::InvalidValue,
                    "no case is left by " + m_drop.source.narrowing.asOptions() + ": " +
                        m_drop.source.leftOut.describe(m_drop.source.narrowing));
    if (m_list.cases.empty())
        return fail(ErrorCode::Layout,
                    m_drop.rows == 0
                        ? std::string("the case list has a header but no cases")
                        : "no row has a readable event date in column '" + m_names[m_event] + "'",
                    m_dataLine);
    return Ok{};
}

Result<TimeAxis> CaseListReader::axisOfEvents() const {
    const auto [lo, hi] = std::minmax_element(
        m_list.cases.begin(), m_list.cases.end(),
        [](const CaseRecord& a, const CaseRecord& b) { return a.event < b.event; });
    if (hi->event - lo->event > kMaxSpanDays)
        return fail(ErrorCode::InvalidValue,
                    "the event dates run from " + lo->event.iso() + " (line " +
                        std::to_string(lo->line) + ") to " + hi->event.iso() + " (line " +
                        std::to_string(hi->line) + "), too long a calendar; is a year mistyped?",
                    lo->event == m_list.cases.front().event ? hi->line : lo->line, m_event + 1);
    if (m_options.cadence == Cadence::Weekly) {
        const WeekStart start = m_options.weekStart.value_or(WeekStart::Monday);
        const Date first = weekStartOf(lo->event, start);
        const Date last = weekStartOf(hi->event, start);
        return TimeAxis::weekly(first, (last - first) / 7 + 1, start,
                                m_options.weekDate.value_or(WeekDate::Start));
    }
    return TimeAxis::daily(lo->event, hi->event - lo->event + 1);
}

Status CaseListReader::settleNarrowing() {
    ReadNarrowing asked = m_options.narrowing;
    std::sort(asked.regions.begin(), asked.regions.end());
    asked.regions.erase(std::unique(asked.regions.begin(), asked.regions.end()),
                        asked.regions.end());
    if (!asked.regions.empty() && !m_region)
        return fail(ErrorCode::Usage,
                    "the case list has no region column, so --only-regions does not apply; leave "
                    "it out, or name the region column with --region-col");
    m_drop.source.narrowing = std::move(asked);
    return Ok{};
}

bool CaseListReader::leftOutByNarrowing(const CsvRecord& record) {
    const ReadNarrowing& asked = m_drop.source.narrowing;
    LeftOut& out = m_drop.source.leftOut;
    if (asked.from || asked.to) {
        if (std::optional<Date> event = parseDateAs(record.fields[m_event].text, m_eventFormat)) {
            Date first = *event, last = *event;
            if (m_options.cadence == Cadence::Weekly) {
                first = weekStartOf(*event, m_options.weekStart.value_or(WeekStart::Monday));
                last = first + 6;
            }
            if ((asked.from && last < *asked.from) || (asked.to && first > *asked.to)) {
                ++out.rowsOutsideDates;
                --m_drop.rows;  // m_drop.rows counts the rows read
                return true;
            }
        }
    }
    if (!asked.regions.empty() &&
        !std::binary_search(asked.regions.begin(), asked.regions.end(),
                            std::string_view(record.fields[*m_region].text))) {
        ++out.rowsOfOtherRegions;
        --m_drop.rows;
        return true;
    }
    return false;
}

Status CaseListReader::checkTableJustified(const TimeAxis& axis) const {
    const double regions = static_cast<double>(m_drop.regionCodes.size());
    const double periods = static_cast<double>(axis.periods());
    const double cells = regions * periods;
    const double rows = static_cast<double>(m_drop.rows + m_drop.source.leftOut.rows());
    const double justified =
        std::min(kMaxCells, std::max(kSparseFloorCells, kMaxCellsPerValue * std::max(rows, 1.0) *
                                                            static_cast<double>(m_names.size())));
    if (cells <= justified)
        return Ok{};
    const bool weekly = axis.weekly();
    const auto fitPeriods = static_cast<std::int32_t>(std::floor(justified / regions));
    const auto fitRegions = static_cast<std::size_t>(std::floor(justified / periods));
    ReadNarrowing window = m_drop.source.narrowing;
    window.from = axis.periodStart(axis.periods() - std::max(fitPeriods, 1));
    window.to = axis.lastStart() + (weekly ? 6 : 0);
    std::string advice = " To read a part of it, narrow the dates: " + window.asOptions() +
                         " (the latest " + std::to_string(fitPeriods) +
                         (weekly ? " weeks" : " days") + " the file justifies for " +
                         std::to_string(m_drop.regionCodes.size()) + " regions)";
    if (fitRegions >= 1) {
        ReadNarrowing some = m_drop.source.narrowing;
        for (std::size_t i = 0;
             i < m_drop.regionCodes.size() && i < std::min<std::size_t>(fitRegions, 3); ++i)
            some.regions.push_back(m_drop.regionCodes[i]);
        std::sort(some.regions.begin(), some.regions.end());
        advice += "; or narrow the regions: " + some.asOptions() + " (at most " +
                  std::to_string(fitRegions) +
                  " regions over the whole span; --only-regions @FILE reads a file of codes, one "
                  "per line)";
    }
    return fail(ErrorCode::InvalidValue,
                "the case list asks for a table of " + std::to_string(axis.periods()) +
                    (weekly ? " weeks" : " days") + " x " +
                    std::to_string(m_drop.regionCodes.size()) + " regions (" + axis.first().iso() +
                    " to " + axis.lastStart().iso() +
                    "): " + std::to_string(static_cast<std::uint64_t>(cells)) + " cells, and its " +
                    std::to_string(static_cast<std::uint64_t>(rows)) + " rows justify at most " +
                    std::to_string(static_cast<std::uint64_t>(justified)) +
                    " cells: nearly all of the table would be empty. Nothing was read. Is a year "
                    "mistyped?" +
                    advice + ".");
}

Status CaseListReader::countCases() {
    Result<TimeAxis> axis = axisOfEvents();
    if (!axis)
        return axis.error();
    m_drop.axis = *axis;
    m_drop.measures = {m_options.measureName.empty() ? std::string("cases")
                                                     : m_options.measureName};
    if (Status s = checkTableJustified(*axis); !s)
        return s;
    CellTable table(m_drop.regionCodes.size(), static_cast<std::size_t>(axis->periods()));
    for (std::size_t r = 0; r < table.regions(); ++r) {
        for (Cell& c : table.series(r))
            c.state = CellState::Reported;
    }
    for (const CaseRecord& c : m_list.cases) {
        Cell& cell = table.at(c.region, static_cast<std::size_t>(axis->periodOnGrid(c.event)));
        if (cell.value++ == 0)
            cell.line = c.line;
    }
    m_drop.tables.push_back(std::move(table));
    m_drop.indexRegions();
    m_drop.caseList = std::move(m_list);
    return Ok{};
}

}  // namespace

Result<Drop> readCaseList(std::string_view bytes, const std::string& path,
                          const IngestOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    return CaseListReader(bytes, path, options).run();
}

}  // namespace detail
}  // namespace siftwave::ingest
