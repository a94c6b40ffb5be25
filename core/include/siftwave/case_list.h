#pragma once
// CaseList: the cases of a case list (one row per case) as a Drop keeps them beside its counts.
//
// A case list is read into a Drop like any other release: its cases are counted per region
// and period by their event date (onset, sample or hospitalisation), so the scan, the ledger
// and the fit see counts. The cases themselves stay here, each with its event date, its
// report date and the physical line it came from, because the reporting delay (report date
// minus event date) and the nowcast need them. Rows the reader could not place are kept as
// problems with their lines; the scan turns them into `case_dates` findings.

#include "siftwave/date.h"

#include <cstdint>
#include <string>
#include <vector>

namespace siftwave {

/// One case as read. `region` indexes the Drop's regionCodes.
struct CaseRecord {
    Date event;                      // the event date (always present: a case without one is a
                                     // CaseProblem, not a record)
    Date report;                     // meaningful only when hasReport
    bool hasReport = false;          // false: no (readable) report date
    bool reportBeforeEvent = false;  // the report date precedes the event date (a data error)
    std::uint32_t region = 0;
    std::uint32_t line = 0;  // 1-based physical line of the row
};

enum class CaseProblemKind : std::uint8_t {
    MissingEvent,       // the event date cell is empty (or a missing-value token)
    UnreadableEvent,    // the event date cell is not a date in the file's format
    MissingReport,      // the report date cell is empty: counted, but no delay
    UnreadableReport,   // the report date cell is not a date: counted, but no delay
    ReportBeforeEvent,  // reported before it happened: counted, but no delay
};

/// "missing_event_date", "unreadable_event_date", "missing_report_date",
/// "unreadable_report_date", "report_before_event".
const char* caseProblemName(CaseProblemKind kind);

struct CaseProblem {
    CaseProblemKind kind = CaseProblemKind::MissingEvent;
    std::uint32_t line = 0;    // 1-based physical line
    std::uint32_t column = 0;  // 1-based column of the cell at fault
    std::uint32_t region = 0;  // index into the Drop's regionCodes (the row's region)
    std::string text;          // the cell as written (empty for a missing date)
    Date event;                // for ReportBeforeEvent, MissingReport, UnreadableReport
    Date report;               // for ReportBeforeEvent
};

struct CaseList {
    std::string eventColumn;            // header names as written
    std::string reportColumn;           // empty when the list has no report date
    std::string regionColumn;           // empty: the cases are one series, region "all"
    std::vector<CaseRecord> cases;      // in file order
    std::vector<CaseProblem> problems;  // in file order
};

}  // namespace siftwave
