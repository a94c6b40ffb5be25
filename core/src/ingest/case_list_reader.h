#pragma once
// Reading a case list (one row per case, with its dates) into a Drop.
//
// Detection (when IngestOptions::caseList is not set and no option names a layout, a date,
// value, measure, year or week column): the file has a header whose names are not dates, and
// in its first records
//   - at least one column holds dates (8 in 10 of its non-empty cells or more have a
//     date's shape), and
//   - no other column is named as a count (cases, Fälle, ...: header_words.h), and
//   - with a single date column, no column holds mostly numbers (a date, a region and a
//     number is a long release, not a case list).
// (Common practice, no source: a count column is what makes a release aggregated.)
//
// Columns: the event date (--event-col; default the first date column whose name does not
// speak of a report), the report date (--report-col; default the date column whose name does,
// else the next date column), the region (--region-col; default a column whose name speaks of
// a region; none: one series named "all"). Dates are read in one format per column, named or
// detected as the CSV reader does (a slash date's order settled by a number above 12, never
// guessed).
//
// Counting: every case with an event date counts once in its region's period (daily, or the
// week that holds the day with --cadence weekly), every period from the first event to the
// last is reported (0 when no case fell in it), and a cell's line is the line of its first
// case. Each case is kept in Drop::caseList with its line; rows with a missing or unreadable
// date, or reported before their event, are kept as CaseProblems (the scan's case_dates).

#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/result.h"

#include <string>
#include <string_view>

namespace siftwave::ingest::detail {

/// True when the bytes look like a case list (above), or the options force one.
bool isCaseList(std::string_view bytes, const IngestOptions& options);

/// Reads the bytes as a case list; `path` names the file in provenance and messages.
Result<Drop> readCaseList(std::string_view bytes, const std::string& path,
                          const IngestOptions& options);

}  // namespace siftwave::ingest::detail
