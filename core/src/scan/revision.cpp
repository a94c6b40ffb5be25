// revision: what changed since the previous release (--previous FILE), or between each two
// successive releases of a history (--releases FILE...).
//
// Every comparison is of one ReleasePair (release_history.h), the alignment the reporting
// triangle reads too: the scan's `previous` is the history of two releases {previous, drop}.
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
// A history of more than two releases also gives each successive pair's summary and the
// counts of its findings (ScanReport::releaseRevisions); the findings listed are the newest
// pair's, the ones about the scanned drop.

#include "scan/scan_input.h"
#include "siftwave/release_history.h"

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
void addMeasureChanges(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out) {
    for (std::size_t m = 0; m < in.drop.measures.size(); ++m) {
        if (pair.olderMeasure(m))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Info, std::nullopt, m);
        f.evidence = {{"change", "measure_appeared"}};
        out.push_back(std::move(f));
    }
    for (std::string& name : pair.measuresGone()) {
        Finding f = releaseFinding(in, Severity::Warning);
        f.measure = std::move(name);
        f.evidence = {{"change", "measure_vanished"}};
        out.push_back(std::move(f));
    }
}

// A critical finding when both calendars have periods but not on the same grid.
void addCalendarChange(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out) {
    const TimeAxis& na = pair.newer().axis;
    const TimeAxis& ba = pair.older().axis;
    if (pair.sameGrid() || na.periods() == 0 || ba.periods() == 0)
        return;
    Finding f = releaseFinding(in, Severity::Critical);
    f.evidence = {
        {"change", "calendar_changed"}, {"previous", ba.describe()}, {"current", na.describe()}};
    out.push_back(std::move(f));
}

// Periods of the old calendar that are gone, and history added before it.
void addDateSpanChanges(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out) {
    const TimeAxis& na = pair.newer().axis;
    const TimeAxis& ba = pair.older().axis;
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
void addRegionChanges(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out) {
    for (std::size_t r = 0; r < in.drop.regionCodes.size(); ++r) {
        if (pair.olderRegion(r))
            continue;
        Finding f = makeFinding(in, FindingKind::Revision, Severity::Warning, r, std::nullopt);
        f.evidence = {{"change", "region_appeared"}};
        out.push_back(std::move(f));
    }
    for (std::string& code : pair.regionsGone()) {
        Finding f = releaseFinding(in, Severity::Warning);
        f.region = std::move(code);
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

// Compares the newer release's series (m, r) with the older one's over the common periods.
SeriesRevision compareSeries(const ScanInput& in, const ReleasePair& pair, std::size_t m,
                             std::size_t r, RevisionSummary& summary) {
    const TimeAxis& na = pair.newer().axis;
    const std::span<const Cell> older = pair.olderSeries(m, r);
    const std::span<const Cell> newer = pair.newer().series(m, r);
    const auto listed = static_cast<std::size_t>(in.options.revision.maxDatesListed);
    SeriesRevision rev;
    for (std::int32_t t = pair.firstCommon(); t <= pair.lastCommon(); ++t) {
        const Cell& oldCell = older[static_cast<std::size_t>(*pair.olderPeriod(t))];
        const Cell& newCell = newer[static_cast<std::size_t>(t)];
        if (!tallyCell(oldCell, newCell, rev, summary))
            continue;
        if (rev.first < 0)
            rev.first = t;
        rev.last = t;
        if (rev.dates.size() < listed) {
            rev.dates.push_back({{"date", na.periodStart(t).iso()},
                                 {"old", cellValue(oldCell)},
                                 {"new", cellValue(newCell)}});
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
void addValueRevisions(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out,
                       RevisionSummary& summary) {
    const Drop& now = pair.newer();
    if (pair.lastCommon() < pair.firstCommon())
        return;
    std::set<std::size_t> revisedRegions;
    for (std::size_t m = 0; m < now.measures.size(); ++m) {
        if (!pair.olderMeasure(m))
            continue;
        for (std::size_t r = 0; r < now.regionCodes.size(); ++r) {
            if (!pair.olderRegion(r))
                continue;
            const SeriesRevision rev = compareSeries(in, pair, m, r, summary);
            addToSummary(rev, summary);
            if (rev.first < 0)
                continue;
            revisedRegions.insert(r);
            out.push_back(valuesRevisedFinding(in, rev, r, m));
        }
    }
    summary.regionsRevised = revisedRegions.size();
}

// Every revision finding of one pair of releases (`in` reads the newer one) and its summary.
void comparePair(const ScanInput& in, const ReleasePair& pair, std::vector<Finding>& out,
                 RevisionSummary& summary) {
    summary = RevisionSummary{};
    summary.compared = true;
    addMeasureChanges(in, pair, out);
    addCalendarChange(in, pair, out);
    if (pair.comparable())
        addDateSpanChanges(in, pair, out);
    addRegionChanges(in, pair, out);
    if (pair.comparable())
        addValueRevisions(in, pair, out, summary);
}

// One successive pair of a longer history, as its findings' counts and its summary.
ReleaseRevisions pairRevisions(const ReleaseHistory& history, std::size_t k,
                               std::span<const Finding> findings, const RevisionSummary& summary) {
    ReleaseRevisions rr;
    rr.previousFile = history.release(k - 1).source.path;
    rr.currentFile = history.release(k).source.path;
    rr.previousAsOf = history.asOf(k - 1);
    rr.currentAsOf = history.asOf(k);
    rr.summary = summary;
    for (const Finding& f : findings) {
        ++rr.bySeverity[severityName(f.severity)];
        ++rr.byChange[f.evidence["change"].get<std::string>()];
    }
    return rr;
}

}  // namespace

void findRevisions(const ScanInput& in, ScanReport& report) {
    // `previous` is the history of two releases: it and the scanned drop, in that order.
    std::optional<ReleaseHistory> twoReleases;
    const ReleaseHistory* history = in.context.history;
    if (history == nullptr && in.context.previous != nullptr) {
        twoReleases = ReleaseHistory::borrowing({in.context.previous, &in.drop},
                                                ReleaseHistory::Order::AsGiven)
                          .value();
        history = &*twoReleases;
    }
    if (history == nullptr || history->size() < 2)
        return;
    const std::size_t newest = history->size() - 1;
    const std::size_t before = report.findings.size();
    comparePair(in, history->successive(newest), report.findings, report.revisions);
    if (history->size() == 2)
        return;  // the newest pair alone: what --previous always reported
    // A longer history: every successive pair (the earlier ones read their own newer release).
    for (std::size_t k = 1; k < newest; ++k) {
        const ScanInput pairInput{history->release(k), in.options, {}, 0, {}};
        std::vector<Finding> findings;
        RevisionSummary summary;
        comparePair(pairInput, history->successive(k), findings, summary);
        report.releaseRevisions.push_back(pairRevisions(*history, k, findings, summary));
    }
    report.releaseRevisions.push_back(pairRevisions(
        *history, newest, std::span(report.findings).subspan(before), report.revisions));
}

}  // namespace siftwave::scan::detail
