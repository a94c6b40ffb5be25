#pragma once
// Which layout a drop has and which column plays which role.
//
// Layouts (see siftwave/drop.h): long (a date column, a region column, value
// columns, optionally a measure-name column), dates-down (a date column, one
// column per region) and dates-across (a region column, one column per date,
// dates in the header). Detection looks at the header names and at the cells
// of the sample (the first records, at most a few hundred: never the whole
// file); every choice can be forced with IngestOptions.
//   - dates-across: two or more header names are dates;
//   - the date column: the one whose cells are all dates (a name with a date
//     word, "date", "week", "Meldewoche", "semaine", ..., wins among several);
//   - a year and a week column, when no column holds dates: the date is then
//     week W of year Y (date_parsing.h). A year column is named with a year word
//     ("year", "Jahr", "année", "año", "anno"; header_words.h) and most of its
//     sample cells are four-digit years from 1900 to 2100; a week column is
//     named with a week word ("week", "Woche", "semaine", "semana", "KW",
//     "epiweek", ...) and most of its cells are whole numbers 1 to 53 (a stray
//     cell is then reported where it is). A name with both words ("yearweek")
//     or a count word ("cases_week") is neither. Among several, a trade name
//     wins, then the first. Without a header they must be named (--year-col,
//     --week-col). Columns like these never become region or value columns,
//     even when a date column wins over them: they are reported as unused;
//   - long or dates-down: from the content, in three steps.
//     1. Either reading may be impossible. Dates-down is impossible without a
//        header, or when a column it would take as a region holds text or
//        codes with a leading zero, or is named with words of the trade
//        ("region", "cases", "district", "new_cases", "Fälle"; header_words.h):
//        a column name never becomes a region code. Long is impossible when no
//        column can hold the region codes (no column has positive region
//        evidence, see the region column below) or there is no column left
//        for the counts.
//     2. When both are possible, each is scored from the sample:
//          long        + 4 x min(1, 2 x share of date cells that repeat a date
//                        above them) (a date-sorted long file);
//                      + 4 x min(1, longest run / 50 rows) when a column of
//                        positive integers holds each of its values in one
//                        block of at least 8 consecutive rows (region codes
//                        in a file sorted by region, where the sample may show
//                        one region only) and a column of counts follows it;
//          dates-down  + 1 when each date is once (under 5 % repeat), and then
//                        + 2 more when no column holds codes in runs as above;
//                      + 3 x share of its region columns named by a number
//                        ("8336": a header of numbers is a header of codes).
//     3. Scores closer than 2 are refused (ErrorCode::Ambiguous) with both
//        readings and --layout in the message; otherwise the higher wins.
//   - the region column of a long file: the column with the most evidence
//     (first on ties): + 3 for text or codes with a leading zero ("004"), or
//     for positive integers in runs as above, or (when a quarter of the date
//     cells or more repeat a date) for a few positive integers, each once per
//     date; + 2 for a region word in its
//     name; - 3 for a count or date word, - 1 for a measure word. Its sample
//     cells must not be column names (a header read as data is refused);
//   - a column of text named with a measure word (measure, indicator, ...)
//     holds measure names; numeric columns and columns named with a count
//     word hold the values.
// The weights are judgement (common practice, no source); the tests in
// tests/core/ingest_layout_test.cpp pin the files they were tuned on.
// Unused columns are reported as warnings by the reader.

#include "ingest/number_parsing.h"
#include "ingest/sniffing.h"
#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/result.h"

#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

struct RoleMapping {
    Layout layout = Layout::Long;
    int dateColumn = -1;            // long, dates-down; with a year and a week column: the year
    int weekColumn = -1;            // a date written as a year and a week number: the week
    int regionColumn = -1;          // long, dates-across
    int measureColumn = -1;         // long with a measure-name column
    std::vector<int> valueColumns;  // long: one per measure; dates-down: one per region
    std::vector<int> dateColumns;   // dates-across: columns whose header is a date
    std::vector<int> unusedColumns;

    /// The date is a year column (dateColumn) and a week-number column (weekColumn).
    bool yearWeek() const { return weekColumn >= 0; }
};

/// `names`: the header (or "column N"); `rows`: sample data records (header excluded).
Result<RoleMapping> detectRoles(const std::vector<std::string>& names, bool header,
                                const std::vector<SampleRecord>& rows, const NumberStyle& style,
                                const IngestOptions& options);

/// `s` without surrounding spaces, in lower case (ASCII): how header names are
/// compared when they are looked up by name.
std::string lowerTrimmed(std::string_view s);

/// Index of the column called `wanted`: exact match first, then ignoring case and
/// surrounding spaces; a Usage error listing the columns when there is none.
Result<int> findColumn(const std::vector<std::string>& names, const std::string& wanted,
                       const char* flag);

}  // namespace siftwave::ingest::detail
