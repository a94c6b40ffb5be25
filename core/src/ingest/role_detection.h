#pragma once
// Which layout a drop has and which column plays which role.
//
// Layouts (see siftwave/drop.h): long (a date column, a region column, value
// columns, optionally a measure-name column), dates-down (a date column, one
// column per region) and dates-across (a region column, one column per date,
// dates in the header). Detection looks at the header names and at the shape
// of the first records' cells; every choice can be forced with IngestOptions.
//   - dates-across: two or more header names are dates;
//   - the date column: the one whose cells are all dates (a name with "date"
//     or "day" wins among several);
//   - long: some other column holds text or codes with a leading zero ("004"),
//     or dates repeat; the region column is the one named like a region
//     (region, code, area, ...) or the first such column; a column named
//     measure/indicator/variable/metric holds measure names;
//   - dates-down otherwise (all other columns numeric, each date once).
// Unused columns are reported as warnings by the reader.

#include "ingest/number_parsing.h"
#include "ingest/sniffing.h"
#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/result.h"

#include <string>
#include <string_view>
#include <vector>

namespace siftwave::detail {

struct RoleMapping {
    Layout layout = Layout::Long;
    int dateColumn = -1;            // long, dates-down
    int regionColumn = -1;          // long, dates-across
    int measureColumn = -1;         // long with a measure-name column
    std::vector<int> valueColumns;  // long: one per measure; dates-down: one per region
    std::vector<int> dateColumns;   // dates-across: columns whose header is a date
    std::vector<int> unusedColumns;
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

}  // namespace siftwave::detail
