#include "siftwave/scan/propose.h"

#include "siftwave/scan/suggested_decision.h"

#include <algorithm>

namespace siftwave::scan {
namespace {

Error nothingToRedistribute(const ProposalRequest& r, Date start, std::string message) {
    Error e = makeError(ErrorCode::InvalidValue, std::move(message));
    e.region = r.region;
    e.date = start.iso();
    return e;
}

/// Step 2: a backlog_dump of the cell with a suggestion.
const Finding* findingOfCell(const ProposalRequest& r, Date start) {
    for (const Finding& f : r.findings)
        if (f.kind == FindingKind::BacklogDump && f.suggestion && f.region == r.region &&
            f.first == start && (!f.measure || *f.measure == r.measure))
            return &f;
    return nullptr;
}

}  // namespace

Result<Proposal> proposeDecision(const Drop& drop, const ProposalRequest& r) {
    if (Status s = r.options.validate(); !s)
        return s.error();
    const std::optional<std::size_t> m = drop.measureIndex(r.measure);
    if (!m)
        return makeError(ErrorCode::NotFound, "no measure '" + r.measure + "'");
    const std::optional<std::size_t> region = drop.regionIndex(r.region);
    if (!region)
        return makeError(ErrorCode::NotFound, "no region '" + r.region + "'");
    const std::optional<std::int32_t> t = drop.periodOf(r.day);
    if (!t)
        return makeError(ErrorCode::NotFound, r.day.iso() + " is outside the drop's calendar");
    const Date start = drop.periodStart(*t);
    const Cell& cell = drop.cell(*m, *region, *t);
    if (!cell.reported()) {
        return nothingToRedistribute(
            r, start, r.region + " has no reported " + r.measure + " on " + start.iso() + ".");
    }
    if (*t == 0) {
        const std::string unit = drop.axis.unitName();
        return nothingToRedistribute(r, start,
                                     start.iso() + " is the first " + unit +
                                         " of the release: there are no earlier " +
                                         drop.axis.unitPlural() + " to move counts to.");
    }

    Proposal p;
    p.reported = cell.value;
    if (const Finding* f = findingOfCell(r, start)) {
        Result<ledger::Decision> d = suggestedDecision(*f, r.measure);
        if (d) {
            p.decision = std::move(*d);
            p.source = ProposalSource::Finding;
            p.finding = f;
            return p;
        }
    }
    ledger::Decision& d = p.decision;
    d.kind = ledger::DecisionKind::Redistribute;
    d.region = r.region;
    d.measure = r.measure;
    d.date = start;
    d.redistributeMethod = ledger::RedistributeMethod::Proportional;
    Result<BacklogEstimate> estimate = estimateBacklog(drop, r.measure, r.region, r.day, r.options);
    if (estimate) {
        d.excess = estimate->excess;
        d.window = ledger::DayRange{estimate->windowFirst, estimate->windowLast};
        if (estimate->gapFirst)
            d.redistributeMethod = ledger::RedistributeMethod::Level;
        p.source = ProposalSource::BacklogEstimate;
        p.estimate = std::move(*estimate);
        return p;
    }
    const BacklogDumpOptions& o = r.options.backlogDump;
    const int before = drop.axis.weekly() ? o.redistributeWeeks : o.redistributeDays;
    d.window =
        ledger::DayRange{drop.periodStart(std::max(0, *t - before)), drop.periodStart(*t - 1)};
    p.source = ProposalSource::NoEstimate;
    p.noEstimate = estimate.error();
    return p;
}

Result<Proposal> proposeDecision(const Drop& drop, const Finding& finding,
                                 const std::string& measure) {
    if (!drop.measureIndex(measure))
        return makeError(ErrorCode::NotFound, "no measure '" + measure + "'");
    Result<ledger::Decision> d = suggestedDecision(finding, measure);
    if (!d)
        return d.error();
    Proposal p;
    p.decision = std::move(*d);
    p.source = ProposalSource::Finding;
    p.finding = &finding;
    if (finding.region && finding.first) {
        const auto r = drop.regionIndex(*finding.region);
        const auto m = drop.measureIndex(measure);
        const auto t = drop.periodOf(*finding.first);
        if (r && m && t && drop.cell(*m, *r, *t).reported())
            p.reported = drop.cell(*m, *r, *t).value;
    }
    return p;
}

}  // namespace siftwave::scan
