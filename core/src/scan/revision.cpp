// revision: what changed since the previous release (--previous FILE).
//
// Regions are matched by verbatim code, measures by name, days by date. For
// every region and measure in both releases, each date in both calendars is
// compared: a value that changed (old and new), a cell reported now but not
// before (appeared) or before but not now (vanished). One finding per region
// and measure lists the revised dates (at most max_dates_listed, all counted).
// Severity by the revised amount sum |new - old| against the region's previous
// total over the compared days: info below 1 %, critical from critical_share,
// warning between. Regions or measures that appeared or vanished, and dates of
// the old calendar that are gone or history added before it, are findings of
// their own (new days after the old calendar are the new data, not revisions).

#include "scan/scan_input.h"

#include <cmath>
#include <set>

namespace siftwave::scan::detail {
namespace {

nlohmann::json cellValue(const Cell& c) {
    return c.reported() ? nlohmann::json(c.value) : nlohmann::json(cellStateName(c.state));
}

}  // namespace

void findRevisions(const ScanInput& in, std::vector<Finding>& out, RevisionSummary& summary) {
    const Drop& now = in.drop;
    const Drop* before = in.context.previous;
    if (before == nullptr)
        return;
    summary = RevisionSummary{};
    summary.compared = true;
    const auto listed = static_cast<std::size_t>(in.options.revision.maxDatesListed);
    std::set<std::size_t> revisedRegions;

    // Measures that appeared or vanished.
    for (std::size_t m = 0; m < now.measures.size(); ++m) {
        if (before->measureIndex(now.measures[m]))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Info, std::nullopt, m);
        f.evidence = {{"change", "measure_appeared"}};
        out.push_back(std::move(f));
    }
    for (const std::string& name : before->measures) {
        if (now.measureIndex(name))
            continue;
        Finding f =
            makeFinding(in, FindingKind::Revision, Severity::Warning, std::nullopt, std::nullopt);
        f.measure = name;
        f.evidence = {{"change", "measure_vanished"}};
        out.push_back(std::move(f));
    }
    // The two releases must count the same periods to be compared cell by cell.
    const TimeAxis& na = now.axis;
    const TimeAxis& ba = before->axis;
    const bool sameGrid = na.cadence() == ba.cadence() &&
                          (!na.weekly() || na.weekStart() == ba.weekStart()) &&
                          (na.first() - ba.first()) % na.periodDays() == 0;
    if (!sameGrid && na.periods() > 0 && ba.periods() > 0) {
        Finding f =
            makeFinding(in, FindingKind::Revision, Severity::Critical, std::nullopt, std::nullopt);
        f.evidence = {{"change", "calendar_changed"},
                      {"previous", ba.describe()},
                      {"current", na.describe()}};
        out.push_back(std::move(f));
    }
    // Periods of the old calendar that are gone, and history added before it.
    const int pd = na.periodDays();
    auto spanEvidence = [&](const char* change, Date first, Date last) {
        const int periods = (last - first) / pd + 1;
        return nlohmann::json{{"change", change}, {"periods", periods}, {"days", periods * pd}};
    };
    if (sameGrid && ba.periods() > 0 && na.periods() > 0) {
        if (na.first() > ba.first()) {
            Finding f = makeFinding(in, FindingKind::Revision, Severity::Warning, std::nullopt,
                                    std::nullopt);
            f.first = ba.first();
            f.last = std::min(ba.lastStart(), na.first() - pd);
            f.evidence = spanEvidence("dates_vanished", *f.first, *f.last);
            out.push_back(std::move(f));
        }
        if (na.lastStart() < ba.lastStart()) {
            Finding f = makeFinding(in, FindingKind::Revision, Severity::Warning, std::nullopt,
                                    std::nullopt);
            f.first = std::max(na.lastStart() + pd, ba.first());
            f.last = ba.lastStart();
            f.evidence = spanEvidence("dates_vanished", *f.first, *f.last);
            out.push_back(std::move(f));
        }
        if (na.first() < ba.first()) {
            Finding f =
                makeFinding(in, FindingKind::Revision, Severity::Info, std::nullopt, std::nullopt);
            f.first = na.first();
            f.last = std::min(na.lastStart(), ba.first() - pd);
            f.evidence = spanEvidence("dates_appeared", *f.first, *f.last);
            out.push_back(std::move(f));
        }
    }
    // Regions that appeared or vanished.
    for (std::size_t r = 0; r < now.regionCodes.size(); ++r) {
        if (before->regionIndex(now.regionCodes[r]))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Warning, r, std::nullopt);
        f.evidence = {{"change", "region_appeared"}};
        out.push_back(std::move(f));
    }
    for (const std::string& code : before->regionCodes) {
        if (now.regionIndex(code))
            continue;
        Finding f =
            makeFinding(in, FindingKind::Revision, Severity::Warning, std::nullopt, std::nullopt);
        f.region = code;
        f.evidence = {{"change", "region_vanished"}};
        out.push_back(std::move(f));
    }

    // Cell by cell over the common periods.
    const Date from = std::max(na.first(), ba.first());
    const Date to = std::min(na.lastStart(), ba.lastStart());
    if (!sameGrid || na.periods() == 0 || ba.periods() == 0 || to < from)
        return;
    for (std::size_t m = 0; m < now.measures.size(); ++m) {
        const std::optional<std::size_t> pm = before->measureIndex(now.measures[m]);
        if (!pm)
            continue;
        for (std::size_t r = 0; r < now.regionCodes.size(); ++r) {
            const std::optional<std::size_t> pr = before->regionIndex(now.regionCodes[r]);
            if (!pr)
                continue;
            const std::span<const Cell> a = before->series(*pm, *pr);
            const std::span<const Cell> b = now.series(m, r);
            std::size_t changed = 0, appeared = 0, vanished = 0;
            double net = 0, absolute = 0, oldTotal = 0;
            std::int32_t first = -1, last = -1;
            nlohmann::json dates = nlohmann::json::array();
            for (Date d = from; d <= to; d = d + pd) {
                const Cell& oldCell = a[static_cast<std::size_t>(ba.periodOnGrid(d))];
                const Cell& newCell = b[static_cast<std::size_t>(na.periodOnGrid(d))];
                bool revised = false;
                if (oldCell.reported() && newCell.reported()) {
                    ++summary.cellsCompared;
                    oldTotal += oldCell.value;
                    if (oldCell.value != newCell.value) {
                        ++changed;
                        const double diff = static_cast<double>(newCell.value) - oldCell.value;
                        net += diff;
                        absolute += std::fabs(diff);
                        revised = true;
                    }
                } else if (oldCell.reported() != newCell.reported()) {
                    if (newCell.reported()) {
                        ++appeared;
                        absolute += std::fabs(static_cast<double>(newCell.value));
                        net += newCell.value;
                    } else {
                        ++vanished;
                        oldTotal += oldCell.value;
                        absolute += std::fabs(static_cast<double>(oldCell.value));
                        net -= oldCell.value;
                    }
                    revised = true;
                }
                if (!revised)
                    continue;
                const std::int32_t t = na.periodOnGrid(d);
                if (first < 0)
                    first = t;
                last = t;
                if (dates.size() < listed) {
                    dates.push_back({{"date", d.iso()},
                                     {"old", cellValue(oldCell)},
                                     {"new", cellValue(newCell)}});
                }
            }
            summary.cellsChanged += changed;
            summary.cellsAppeared += appeared;
            summary.cellsVanished += vanished;
            summary.netChange += net;
            summary.absoluteChange += absolute;
            summary.previousTotal += oldTotal;
            if (first < 0)
                continue;
            revisedRegions.insert(r);
            const double share = oldTotal > 0 ? absolute / oldTotal : 1.0;
            const Severity severity = share >= in.options.revision.criticalShare
                                          ? Severity::Critical
                                      : share >= 0.01 ? Severity::Warning
                                                      : Severity::Info;
            Finding f = makeFinding(in, FindingKind::Revision, severity, r, m);
            f.first = now.periodStart(first);
            f.last = now.periodStart(last);
            f.impact = absolute;
            f.evidence = {{"change", "values_revised"},
                          {"changed", changed},
                          {"appeared", appeared},
                          {"vanished", vanished},
                          {"net_change", net},
                          {"absolute_change", absolute},
                          {"previous_total", oldTotal},
                          {"share_of_previous", share},
                          {"dates", dates}};
            suggestAccept(f, std::string("revisions of earlier ") + now.axis.unitPlural() +
                                 " are normal for late reports; check that the new "
                                 "values are the ones to brief on");
            out.push_back(std::move(f));
        }
    }
    summary.regionsRevised = revisedRegions.size();
}

}  // namespace siftwave::scan::detail
