// case_dates: rows of a case list whose dates cannot be used as they stand.
//
// A case list (Drop::caseList, case_list.h) keeps the rows the reader could not place: a
// missing or unreadable event date (the case is not in the counts), a missing or unreadable
// report date, or a report date before the event date (the case is counted by its event
// date, but gives no reporting delay and stays out of the nowcast's reporting triangle). One
// finding per region and kind of problem, listing the lines. Critical when the rows are at
// least `critical_share` of the region's rows (the counts or the delays rest on fewer cases
// than the list holds); a missing report date alone is info.
//
// Evidence: problem (caseProblemName), rows, lines (the first `max_lines_listed`), example
// (the first cell as written, for unreadable dates), region_rows (the region's rows with a
// case or a problem), share.

#include "scan/scan_input.h"

#include <algorithm>
#include <map>
#include <nlohmann/json.hpp>

namespace siftwave::scan::detail {
namespace {

struct ProblemGroup {
    std::vector<const CaseProblem*> rows;
    std::optional<Date> first;
    std::optional<Date> last;
};

bool hasEventDate(CaseProblemKind kind) {
    return kind != CaseProblemKind::MissingEvent && kind != CaseProblemKind::UnreadableEvent;
}

std::string noteFor(CaseProblemKind kind) {
    if (!hasEventDate(kind))
        return "these cases are not in the counts: correct the event dates at the source and "
               "read the list again";
    if (kind == CaseProblemKind::ReportBeforeEvent)
        return "counted by their event date, but left out of the reporting delays and the "
               "nowcast: check both dates at the source";
    return "counted by their event date, but without a reporting delay";
}

Severity severityOf(CaseProblemKind kind, double share, double criticalShare) {
    if (share >= criticalShare)
        return Severity::Critical;
    return kind == CaseProblemKind::MissingReport ? Severity::Info : Severity::Warning;
}

}  // namespace

void findCaseDateProblems(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    if (!drop.caseList || drop.caseList->problems.empty())
        return;
    const CaseList& list = *drop.caseList;
    std::vector<std::size_t> regionRows(drop.regionCodes.size(), 0);
    for (const CaseRecord& c : list.cases)
        ++regionRows[c.region];
    std::map<std::pair<std::uint32_t, CaseProblemKind>, ProblemGroup> groups;
    for (const CaseProblem& p : list.problems) {
        if (!hasEventDate(p.kind))
            ++regionRows[p.region];
        ProblemGroup& g = groups[{p.region, p.kind}];
        g.rows.push_back(&p);
        if (hasEventDate(p.kind)) {
            g.first = std::min(g.first.value_or(p.event), p.event);
            g.last = std::max(g.last.value_or(p.event), p.event);
        }
    }
    const CaseDatesOptions& o = in.options.caseDates;
    for (const auto& [key, g] : groups) {
        const auto [region, kind] = key;
        const double rows = static_cast<double>(g.rows.size());
        const double share =
            rows / static_cast<double>(std::max<std::size_t>(regionRows[region], 1));
        Finding f = makeFinding(in, FindingKind::CaseDates,
                                severityOf(kind, share, o.criticalShare), region, 0);
        if (g.first) {
            f.first = drop.periodStart(drop.axis.periodOnGrid(*g.first));
            f.last = drop.periodStart(drop.axis.periodOnGrid(*g.last));
        }
        f.impact = rows;
        nlohmann::json lines = nlohmann::json::array();
        for (std::size_t i = 0; i < g.rows.size() && i < static_cast<std::size_t>(o.maxLinesListed);
             ++i)
            lines.push_back(g.rows[i]->line);
        f.evidence = {{"problem", caseProblemName(kind)},
                      {"rows", g.rows.size()},
                      {"lines", lines},
                      {"column", g.rows.front()->column},
                      {"example", g.rows.front()->text},
                      {"region_rows", regionRows[region]},
                      {"share", share}};
        suggestAccept(f, noteFor(kind));
        out.push_back(std::move(f));
    }
}

}  // namespace siftwave::scan::detail
