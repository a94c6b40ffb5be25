#pragma once
// Dates as drops write them.
//
// Accepted formats (ISO 8601-1:2019 calendar dates and the two slash orders):
//   YYYY-MM-DD   ISO 8601 extended format, e.g. 2026-03-04
//   YYYYMMDD     ISO 8601 basic format, e.g. 20260304
//   DD/MM/YYYY   day first (1 or 2 digits for day and month), e.g. 4/3/2026
//   MM/DD/YYYY   month first, e.g. 3/4/2026
//   YYYY-Www     an ISO 8601 week (ISO 8601-1:2019, 5.2.3.3 reduced precision week
//                date: extended 2026-W05 or basic 2026W05); read as the week's Monday.
//                A file of week labels is weekly by definition.
// A slash date whose two first numbers are both 12 or less reads either way.
// The reader never guesses: if no date in the file has a first number above
// 12 (then it must be month first) or a second number above 12 (day first),
// the order is ambiguous and the analyst has to name it.

#include "siftwave/date.h"

#include <optional>
#include <string_view>

namespace siftwave::detail {

enum class DateShape { None, Iso, Compact, Slash, IsoWeek };
enum class DateFormat { Unknown, Iso, Compact, DayFirst, MonthFirst, IsoWeek };

/// The syntactic shape of a text (no calendar check). Compact means 8 digits.
DateShape dateShapeOf(std::string_view text);

/// The three numbers of a date text of the given shape, in written order
/// (year, month, day for Iso/Compact; first, second, year for Slash).
bool splitDate(std::string_view text, DateShape shape, int& n1, int& n2, int& n3);

/// "YYYY-MM-DD", "YYYYMMDD", "DD/MM/YYYY", "MM/DD/YYYY", "YYYY-Www" ("" for Unknown).
const char* dateFormatName(DateFormat format);
/// Parses a format name as above (also accepted: lower case, "D/M/Y", "M/D/Y", "ISO").
std::optional<DateFormat> dateFormatFromName(std::string_view name);
DateShape shapeOfFormat(DateFormat format);

/// Parses `text` in `format`; nullopt when it has another shape or the day does not exist.
std::optional<Date> parseDateAs(std::string_view text, DateFormat format);

}  // namespace siftwave::detail
