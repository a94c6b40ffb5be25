#include "siftwave/case_list.h"

namespace siftwave {

const char* caseProblemName(CaseProblemKind kind) {
    switch (kind) {
        case CaseProblemKind::MissingEvent:
            return "missing_event_date";
        case CaseProblemKind::UnreadableEvent:
            return "unreadable_event_date";
        case CaseProblemKind::MissingReport:
            return "missing_report_date";
        case CaseProblemKind::UnreadableReport:
            return "unreadable_report_date";
        case CaseProblemKind::ReportBeforeEvent:
            return "report_before_event";
    }
    return "missing_event_date";
}

}  // namespace siftwave
