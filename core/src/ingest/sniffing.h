#pragma once
// Sniffing the dialect of a drop from its first records: the delimiter, whether
// the first record is a header, and the decimal separator of its numbers.
//
// Delimiter: for each candidate (, ; TAB |) the first records are split with
// it; the candidate that splits them into the same number (> 1) of fields most
// consistently wins, ties going to more fields (common practice, no source).
// Header: the first record is a header when, in some column, it is text while
// the records below it hold numbers or dates, or it holds dates above numbers
// (the dates-across layout). Decimal separator: a comma followed by other than
// three digits ("12,5") means a decimal comma; "1.234" alone (dot groups of
// three and no other dot) also means the dot groups thousands.

#include "ingest/csv_scanner.h"
#include "ingest/number_parsing.h"

#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

/// Owned copy of a few records (the sample the sniffers look at).
struct SampleRecord {
    std::vector<std::string> fields;
    std::uint64_t line = 0;
};

char sniffDelimiter(std::string_view data, std::size_t start, std::size_t sampleEnd);

/// True when the first record looks like a header (see above). `records` holds the
/// first records of the file, the candidate header first.
bool sniffHeader(const std::vector<SampleRecord>& records, const NumberStyle& style);

/// The decimal separator the numbers in `records` suggest ('.' when nothing says otherwise).
NumberStyle sniffNumberStyle(const std::vector<SampleRecord>& records, bool header);

}  // namespace siftwave::ingest::detail
