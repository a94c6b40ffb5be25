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

// A revision finding about the whole release (no region, no measure).
Finding releaseFinding(const ScanInput& in, Severity severity) {
    return makeFinding(in, FindingKind::Revision, severity, std::nullopt, std::nullopt);
}

// Measures that appeared or vanished.
void addMeasureChanges(const ScanInput& in, const Drop& before, std::vector<Finding>& out) {
    const Drop& now = in.drop;
    for (std::size_t m = 0; m < now.measures.size(); ++m) {
        if (before.measureIndex(now.measures[m]))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Info, std::nullopt, m);
        f.evidence = {{"change", "measure_appeared"}};
        out.push_back(std::move(f));
    }
    for (const std::string& name : before.measures) {
        if (now.measureIndex(name))
            continue;
        Finding f = releaseFinding(in, Severity::Warning);
        f.measure = name;
        f.evidence = {{"change", "measure_vanished"}};
        out.push_back(std::move(f));
    }
}

// Whether the two releases count the same periods, so they compare cell by cell.
bool onSameGrid(const TimeAxis& na, const TimeAxis& ba) {
    return na.cadence() == ba.cadence() && (!na.weekly() || na.weekStart() == ba.weekStart()) &&
           (na.first() - ba.first()) % na.periodDays() == 0;
}

// A critical finding when both calendars have periods but not on the same grid.
void addCalendarChange(const ScanInput& in, const TimeAxis& ba, bool sameGrid,
                       std::vector<Finding>& out) {
    const TimeAxis& na = in.drop.axis;
    if (sameGrid || na.periods() == 0 || ba.periods() == 0)
        return;
    Finding f = releaseFinding(in, Severity::Critical);
    f.evidence = {
        {"change", "calendar_changed"}, {"previous", ba.describe()}, {"current", na.describe()}};
    out.push_back(std::move(f));
}

// Periods of the old calendar that are gone, and history added before it.
void addDateSpanChanges(const ScanInput& in, const TimeAxis& ba, std::vector<Finding>& out) {
    const TimeAxis& na = in.drop.axis;
    const int pd = na.periodDays();
    auto addSpan = [&](Severity severity, const char* change, Date first, Date last) {
        Finding f = releaseFinding(in, severity);
        f.first = first;
        f.last = last;
        const int periods = (last - first) / pd + 1;
        f.evidence = {{"change", change}, {"periods", periods}, {"days", periods * pd}};
        out.push_back(std::move(f));
    };
    if (na.first() > ba.first())
        addSpan(Severity::Warning, "dates_vanished", ba.first(),
                std::min(ba.lastStart(), na.first() - pd));
    if (na.lastStart() < ba.lastStart())
        addSpan(Severity::Warning, "dates_vanished", std::max(na.lastStart() + pd, ba.first()),
                ba.lastStart());
    if (na.first() < ba.first())
        addSpan(Severity::Info, "dates_appeared", na.first(),
                std::min(na.lastStart(), ba.first() - pd));
}

// Regions that appeared or vanished.
void addRegionChanges(const ScanInput& in, const Drop& before, std::vector<Finding>& out) {
    const Drop& now = in.drop;
    for (std::size_t r = 0; r < now.regionCodes.size(); ++r) {
        if (before.regionIndex(now.regionCodes[r]))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Warning, r, std::nullopt);
        f.evidence = {{"change", "region_appeared"}};
        out.push_back(std::move(f));
    }
    for (const std::string& code : before.regionCodes) {
        if (now.regionIndex(code))
            continue;
        Finding f = releaseFinding(in, Severity::Warning);
        f.region = code;
        f.evidence = {{"change", "region_vanished"}};
        out.push_back(std::move(f));
    }
}

// What changed in one region and measure over the compared periods.
struct SeriesRevision {
    std::size_t changed = 0, appeared = 0, vanished = 0;
    double net = 0, absolute = 0, oldTotal = 0;
    std::int32_t first = -1, last = -1;  // periods of the first and last revised cell
    nlohmann::json dates = nlohmann::json::array();
};

// Counts one pair of cells into `rev`; true when the cell was revised.
bool tallyCell(const Cell& oldCell, const Cell& newCell, SeriesRevision& rev,
               RevisionSummary& summary) {
    if (oldCell.reported() && newCell.reported()) {
        ++summary.cellsCompared;
        rev.oldTotal += oldCell.value;
        if (oldCell.value == newCell.value)
            return false;
        ++rev.changed;
        const double diff = static_cast<double>(newCell.value) - oldCell.value;
        rev.net += diff;
        rev.absolute += std::fabs(diff);
        return true;
    }
    if (oldCell.reported() == newCell.reported())
        return false;
    if (newCell.reported()) {
        ++rev.appeared;
        rev.absolute += std::fabs(static_cast<double>(newCell.value));
        rev.net += newCell.value;
    } else {
        ++rev.vanished;
        rev.oldTotal += oldCell.value;
        rev.absolute += std::fabs(static_cast<double>(oldCell.value));
        rev.net -= oldCell.value;
    }
    return true;
}

// Compares two series period by period from `from` to `to` (both on the grid).
SeriesRevision compareSeries(const ScanInput& in, const TimeAxis& ba, std::span<const Cell> a,
                             std::span<const Cell> b, Date from, Date to,
                             RevisionSummary& summary) {
    const TimeAxis& na = in.drop.axis;
    const auto listed = static_cast<std::size_t>(in.options.revision.maxDatesListed);
    SeriesRevision rev;
    for (Date d = from; d <= to; d = d + na.periodDays()) {
        const Cell& oldCell = a[static_cast<std::size_t>(ba.periodOnGrid(d))];
        const Cell& newCell = b[static_cast<std::size_t>(na.periodOnGrid(d))];
        if (!tallyCell(oldCell, newCell, rev, summary))
            continue;
        const std::int32_t t = na.periodOnGrid(d);
        if (rev.first < 0)
            rev.first = t;
        rev.last = t;
        if (rev.dates.size() < listed) {
            rev.dates.push_back(
                {{"date", d.iso()}, {"old", cellValue(oldCell)}, {"new", cellValue(newCell)}});
        }
    }
    return rev;
}

// Adds one series' counts to the release summary.
void addToSummary(const SeriesRevision& rev, RevisionSummary& summary) {
    summary.cellsChanged += rev.changed;
    summary.cellsAppeared += rev.appeared;
    summary.cellsVanished += rev.vanished;
    summary.netChange += rev.net;
    summary.absoluteChange += rev.absolute;
    summary.previousTotal += rev.oldTotal;
}

// The values_revised finding of one revised series, severity by share of the old total.
Finding valuesRevisedFinding(const ScanInput& in, const SeriesRevision& rev, std::size_t r,
                             std::size_t m) {
    const Drop& now = in.drop;
    const double share = rev.oldTotal > 0 ? rev.absolute / rev.oldTotal : 1.0;
    const Severity severity = share >= in.options.revision.criticalShare ? Severity::Critical
                              : share >= 0.01                            ? Severity::Warning
                                                                         : Severity::Info;
    Finding f = makeFinding(in, FindingKind::Revision, severity, r, m);
    f.first = now.periodStart(rev.first);
    f.last = now.periodStart(rev.last);
    f.impact = rev.absolute;
    f.evidence = {{"change", "values_revised"},
                  {"changed", rev.changed},
                  {"appeared", rev.appeared},
                  {"vanished", rev.vanished},
                  {"net_change", rev.net},
                  {"absolute_change", rev.absolute},
                  {"previous_total", rev.oldTotal},
                  {"share_of_previous", share},
                  {"dates", rev.dates}};
    suggestAccept(f, std::string("revisions of earlier ") + now.axis.unitPlural() +
                         " are normal for late reports; check that the new "
                         "values are the ones to brief on");
    return f;
}

// Cell by cell over the common periods of every region and measure in both releases.
void addValueRevisions(const ScanInput& in, const Drop& before, std::vector<Finding>& out,
                       RevisionSummary& summary) {
    const Drop& now = in.drop;
    const TimeAxis& na = now.axis;
    const TimeAxis& ba = before.axis;
    const Date from = std::max(na.first(), ba.first());
    const Date to = std::min(na.lastStart(), ba.lastStart());
    if (to < from)
        return;
    std::set<std::size_t> revisedRegions;
    for (std::size_t m = 0; m < now.measures.size(); ++m) {
        const std::optional<std::size_t> pm = before.measureIndex(now.measures[m]);
        if (!pm)
            continue;
        for (std::size_t r = 0; r < now.regionCodes.size(); ++r) {
            const std::optional<std::size_t> pr = before.regionIndex(now.regionCodes[r]);
            if (!pr)
                continue;
            const SeriesRevision rev =
                compareSeries(in, ba, before.series(*pm, *pr), now.series(m, r), from, to, summary);
            addToSummary(rev, summary);
            if (rev.first < 0)
                continue;
            revisedRegions.insert(r);
            out.push_back(valuesRevisedFinding(in, rev, r, m));
        }
    }
    summary.regionsRevised = revisedRegions.size();
}

}  // namespace

void findRevisions(const ScanInput& in, std::vector<Finding>& out, RevisionSummary& summary) {
    const Drop* before = in.context.previous;
    if (before == nullptr)
        return;
    summary = RevisionSummary{};
    summary.compared = true;
    const TimeAxis& na = in.drop.axis;
    const TimeAxis& ba = before->axis;
    const bool sameGrid = onSameGrid(na, ba);
    const bool bothHavePeriods = na.periods() > 0 && ba.periods() > 0;
    addMeasureChanges(in, *before, out);
    addCalendarChange(in, ba, sameGrid, out);
    if (sameGrid && bothHavePeriods)
        addDateSpanChanges(in, ba, out);
    addRegionChanges(in, *before, out);
    if (sameGrid && bothHavePeriods)
        addValueRevisions(in, *before, out, summary);
}

}  // namespace siftwave::scan::detail
