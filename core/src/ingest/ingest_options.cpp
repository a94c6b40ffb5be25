#include "ingest/date_parsing.h"
#include "siftwave/ingest/ingest.h"

namespace siftwave::ingest {

Status IngestOptions::validate() const {
    if (!dateFormat.empty() && !detail::dateFormatFromName(dateFormat)) {
        return makeError(ErrorCode::Usage,
                         "unknown date format '" + dateFormat +
                             "'; use YYYY-MM-DD, YYYYMMDD, DD/MM/YYYY, MM/DD/YYYY or YYYY-Www");
    }
    if (cadence == Cadence::Daily && (weekStart || weekDate))
        return makeError(
            ErrorCode::Usage,
            "--week-start and --week-date apply to weekly data, not with --cadence daily");
    const bool yearWeek = !yearColumn.empty() || !weekColumn.empty();
    if (yearWeek) {
        if (!dateColumn.empty())
            return makeError(ErrorCode::Usage,
                             "--date-col and --year-col/--week-col name two different dates; "
                             "use --date-col for a column of dates, --year-col and --week-col "
                             "for a year and a week number");
        if (!dateFormat.empty())
            return makeError(ErrorCode::Usage,
                             "--date-format applies to a column of dates, not to a year and a "
                             "week column");
        if (layout && *layout == Layout::DatesAcross)
            return makeError(ErrorCode::Usage,
                             "--year-col and --week-col do not apply to the dates-across layout "
                             "(the dates are the header)");
        if (cadence == Cadence::Daily)
            return makeError(ErrorCode::Usage,
                             "a year and a week number name weeks, not days; --cadence daily "
                             "does not apply with --year-col or --week-col");
        if (yearColumn == weekColumn)
            return makeError(ErrorCode::Usage,
                             "--year-col and --week-col name the same column '" + yearColumn + "'");
    }
    if (delimiter) {
        const char d = *delimiter;
        if (d == '"' || d == '\n' || d == '\r' || d == '\0') {
            return makeError(ErrorCode::Usage,
                             "the delimiter cannot be a quote, a line break or NUL");
        }
    }
    if (layout && *layout == Layout::DatesAcross && !dateColumn.empty()) {
        return makeError(
            ErrorCode::Usage,
            "--date-col does not apply to the dates-across layout (the dates are the header)");
    }
    if (narrowing.from && narrowing.to && *narrowing.to < *narrowing.from)
        return makeError(ErrorCode::Usage, "--to " + narrowing.to->iso() + " comes before --from " +
                                               narrowing.from->iso());
    for (const std::string& code : narrowing.regions)
        if (code.empty())
            return makeError(ErrorCode::Usage, "--only-regions names an empty region code");
    if (Status s = validateCaseListOptions(); !s)
        return s;
    for (std::size_t i = 0; i < valueColumns.size(); ++i) {
        if (valueColumns[i].empty())
            return makeError(ErrorCode::Usage, "a value column name is empty");
        for (std::size_t j = 0; j < i; ++j) {
            if (valueColumns[i] == valueColumns[j]) {
                return makeError(ErrorCode::Usage,
                                 "value column '" + valueColumns[i] + "' is named twice");
            }
        }
    }
    return Ok{};
}

}  // namespace siftwave::ingest
