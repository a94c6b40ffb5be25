#include "siftwave/report/briefing.h"
#include "common/text_escape.h"

#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/ledger/replay.h"

#include <cmath>
#include <cstdio>
#include <set>

namespace siftwave::report {
namespace {

std::string fixed(double v, int decimals) {
    if (!std::isfinite(v))
        return "n/a";
    char text[64];
    std::snprintf(text, sizeof text, "%.*f", decimals, v);
    return text;
}

std::string intervalText(double lower, double upper, int decimals) {
    if (!std::isfinite(lower) || !std::isfinite(upper))
        return "";
    return fixed(lower, decimals) + " to " + fixed(upper, decimals);
}

std::string dateOr(const fit::FitResult& f, double day) {
    return std::isfinite(day) ? f.dateOf(day).iso() : "n/a";
}

std::string dateInterval(const fit::FitResult& f, const fit::Estimate& e) {
    if (!std::isfinite(e.lower) || !std::isfinite(e.upper))
        return "";
    return f.dateOf(e.lower).iso() + " to " + f.dateOf(e.upper).iso();
}

void estimateRow(std::vector<FitTableRow>& rows, const std::string& name, const fit::Estimate& e,
                 int decimals) {
    rows.push_back({name, fixed(e.value, decimals), intervalText(e.lower, e.upper, decimals)});
}

std::vector<std::string> regionsTouched(const Drop& drop, const ledger::Ledger& ledger,
                                        const ledger::Cleaned& cleaned) {
    std::set<std::string> touched;
    for (const ledger::LedgerEntry& e : ledger.entries) {
        if (!cleaned.inEffect(e.sequence) || e.decision.kind == ledger::DecisionKind::Withdraw)
            continue;
        for (const ledger::CellChange& c : e.effect.cells)
            touched.insert(c.region);
        if (!e.decision.region.empty())
            touched.insert(e.decision.region);
        if (!e.decision.into.empty())
            touched.insert(e.decision.into);
    }
    std::vector<std::string> ordered;
    for (const std::string& code : drop.regionCodes)
        if (touched.count(code))
            ordered.push_back(code);
    return ordered;
}

const char* kStyle =
    "body{font-family:'DejaVu Sans',sans-serif;font-size:10pt;color:#222;max-width:60em;"
    "margin:1.5em auto;}"
    "h1{font-size:16pt;margin-bottom:0.2em;}h2{font-size:13pt;margin-top:1.4em;"
    "border-bottom:1px solid #999;}h3{font-size:11pt;}"
    "table{border-collapse:collapse;margin:0.4em 0 1em 0;}"
    "th,td{border:1px solid #999;padding:2px 6px;text-align:left;vertical-align:top;"
    "font-size:9pt;}"
    "td.n{text-align:right;}p.caution{border-left:4px solid #D55E00;padding-left:0.6em;}"
    ".caption{font-size:8.5pt;color:#444;}";

}  // namespace

std::string htmlEscaped(const std::string& text) {
    return detail::htmlEscaped(text);
}

std::vector<FitTableRow> fitTable(const fit::FitResult& f) {
    std::vector<FitTableRow> rows;
    rows.push_back({"Model, method",
                    std::string(fit::modelName(f.model)) + ", " + fit::methodName(f.method), ""});
    rows.push_back({"Window", f.windowFirst().iso() + " to " + f.windowLast().iso(), ""});
    for (const fit::NamedEstimate& p : f.parameters)
        estimateRow(rows, "Parameter " + p.name, p.estimate, 3);
    const fit::DerivedQuantities& d = f.derived;
    rows.push_back({"Peak date", dateOr(f, d.peakDay.value), dateInterval(f, d.peakDay)});
    estimateRow(rows, std::string("Peak incidence (per ") + f.incidenceUnit() + ")",
                d.peakIncidence, 1);
    estimateRow(rows, "Wave size", d.waveSize, 0);
    estimateRow(rows, "Fraction observed", d.fractionObserved, 3);
    rows.push_back({"Start date", dateOr(f, d.startDay.value), dateInterval(f, d.startDay)});
    rows.push_back({"End date", dateOr(f, d.endDay.value), dateInterval(f, d.endDay)});
    estimateRow(rows, "Doubling time on the observed rise (days)", d.observedDoublingTimeDays, 1);
    estimateRow(rows, "Model's instantaneous doubling time at its fastest growth (days)",
                d.doublingTimeDays, 1);
    rows.push_back({"R squared", fixed(f.goodness.r2, 4), ""});
    rows.push_back({"AICc", fixed(f.goodness.aicc, 1), ""});
    rows.push_back({"Solver", f.summary.brief(), ""});
    return rows;
}

Status BriefingRequest::validate() const {
    if (fitRegions)
        if (Status s = fit.validate(); !s)
            return s;
    return Ok{};
}

Result<BriefingReport> buildBriefing(const Drop& drop, const ledger::Ledger& ledger,
                                     const ledger::Cleaned& cleaned,
                                     const BriefingRequest& request) {
    if (Status s = request.validate(); !s)
        return s.error();
    BriefingReport report;
    report.caption = captionFacts(drop, ledger, nullptr, request.exportDate);
    report.title = request.title.empty() ? "Briefing: " + report.caption.sourceFile : request.title;
    report.chainVerified = static_cast<bool>(ledger::verifyChain(ledger));
    if (request.transmission)
        report.caption.caution += std::string(" ") + transmission::caution;

    std::vector<std::string> regions = request.regions;
    if (regions.empty())
        regions = regionsTouched(drop, ledger, cleaned);
    if (regions.empty())
        regions = drop.regionCodes;
    for (const std::string& code : regions) {
        FigureRequest fr;
        fr.region = code;
        fr.measure = request.measure;
        if (request.fitRegions)
            fr.fit = request.fit;
        fr.exportDate = report.caption.exportDate;
        fr.regions = request.regionRegister;
        fr.previous = request.previous;
        fr.countRange = request.countRange;
        fr.transmission = request.transmission;
        fr.transmissionGrowthRate = request.transmissionGrowthRate;
        auto spec = buildFigureSpec(drop, ledger, cleaned, fr);
        if (!spec)
            return spec.error();
        report.figures.push_back(std::move(spec.value()));
    }

    scan::ScanContext context;
    context.previous = request.previous;
    context.regions = request.regionRegister;
    auto scanned = scan::scanDrop(drop, {}, context);
    if (!scanned)
        return scanned.error();
    FindingsSummary& fs = report.findings;
    fs.total = scanned->findings.size();
    fs.bySeverity = scanned->bySeverity;
    for (const auto& [kind, count] : scanned->byKind)
        if (count > 0)
            fs.byKind[kind] = count;
    fs.revisions = scanned->revisions;
    if (request.previous)
        fs.previousFile = fileNameOf(request.previous->source.path);
    for (const scan::Finding& f : scanned->findings) {
        if (fs.top.size() >= request.topFindings)
            break;
        fs.top.push_back({f.id, scan::findingKindName(f.kind), scan::severityName(f.severity),
                          f.region.value_or(""), f.measure.value_or(""),
                          f.first ? f.first->iso() : "", f.last ? f.last->iso() : ""});
    }

    for (const ledger::LedgerEntry& e : ledger.entries)
        report.ledger.push_back({e.sequence, e.timestamp, e.author,
                                 ledger::decisionKindName(e.decision.kind),
                                 ledger::decisionWhere(e.decision, ledger::WhereStyle::Prose),
                                 e.reason, e.effect.netChange(), cleaned.inEffect(e.sequence),
                                 e.hash.substr(0, kHashPrefixLength)});

    const std::set<std::string> shown(regions.begin(), regions.end());
    for (ledger::ReconciliationRow& row : ledger::reconcile(drop, cleaned, ledger))
        if (shown.count(row.region) || !row.entries.empty())
            report.reconciliation.push_back(std::move(row));
    return report;
}

namespace {

std::string td(const std::string& text, bool number = false) {
    return std::string(number ? "<td class=\"n\">" : "<td>") + htmlEscaped(text) + "</td>";
}

// The page head, the title, the source and ledger paragraph and the caution.
std::string headHtml(const BriefingReport& r) {
    std::string h;
    h += "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>" +
         htmlEscaped(r.title) + "</title><style>" + kStyle + "</style></head><body>\n";
    h += "<h1>" + htmlEscaped(r.title) + "</h1>\n";
    const CaptionFacts& c = r.caption;
    h += "<p>Source <b>" + htmlEscaped(c.sourceFile) + "</b>" +
         (c.sourceSheet.empty() ? std::string()
                                : ", sheet <b>" + htmlEscaped(c.sourceSheet) + "</b>") +
         ", " + htmlEscaped(c.firstDate) + " to " + htmlEscaped(c.lastDate) + ", SHA-256 " +
         htmlEscaped(c.dropSha256Prefix) +
         (c.narrowedRead.empty() ? std::string() : " (" + htmlEscaped(c.narrowedRead) + ")") +
         ". Ledger: " + std::to_string(c.ledgerEntries) + " entries" +
         (c.ledgerEntries ? ", head " + htmlEscaped(c.ledgerHeadPrefix) : std::string()) +
         ", chain " + (r.chainVerified ? "verified" : "NOT verified") + ". Exported " +
         htmlEscaped(c.exportDate) + " by Siftwave " + siftwaveVersion() + ".</p>\n";
    h += "<p class=\"caution\">" + htmlEscaped(c.caution) + "</p>\n";
    return h;
}

// The findings: counts by severity and kind, the first in review order, the revisions.
std::string findingsHtml(const FindingsSummary& f) {
    std::string h = "<h2>Findings</h2>\n<p>The scan found " + std::to_string(f.total) + " findings";
    std::string severities;
    for (const char* s : {"critical", "warning", "info"}) {
        const auto it = f.bySeverity.find(s);
        const std::size_t n = it == f.bySeverity.end() ? 0 : it->second;
        severities += (severities.empty() ? ": " : ", ") + std::to_string(n) + " " + s;
    }
    h += htmlEscaped(severities) + ".</p>\n";
    if (!f.byKind.empty()) {
        h += "<table><tr><th>Kind</th><th>Findings</th></tr>\n";
        for (const auto& [kind, n] : f.byKind)
            h += "<tr>" + td(kind) + td(std::to_string(n), true) + "</tr>\n";
        h += "</table>\n";
    }
    if (!f.top.empty()) {
        h += "<h3>First in review order</h3>\n<table><tr><th>Severity</th><th>Kind</th>"
             "<th>Region, measure</th><th>Days</th><th>Id</th></tr>\n";
        for (const FindingLine& l : f.top)
            h += "<tr>" + td(l.severity) + td(l.kind) +
                 td(l.region + (l.measure.empty() ? std::string() : ", " + l.measure)) +
                 td(l.first.empty()     ? std::string()
                    : l.first == l.last ? l.first
                                        : l.first + " to " + l.last) +
                 td(l.id) + "</tr>\n";
        h += "</table>\n";
    }
    if (f.revisions.compared) {
        const scan::RevisionSummary& rv = f.revisions;
        h += "<p>Compared with the previous release <b>" + htmlEscaped(f.previousFile) +
             "</b>: " + std::to_string(rv.cellsChanged) + " of " +
             std::to_string(rv.cellsCompared) + " cells changed, " +
             std::to_string(rv.cellsAppeared) + " appeared, " + std::to_string(rv.cellsVanished) +
             " vanished, in " + std::to_string(rv.regionsRevised) + " regions; net change " +
             htmlEscaped(fixed(rv.netChange, 0)) + ".</p>\n";
    }
    return h;
}

// The latest growth rate (with the doubling or halving time) and the latest R_t, each for the
// last period that has one, or why the last period has none.
std::string transmissionHtml(const transmission::TransmissionResult& t) {
    const transmission::TransmissionRow* growth = nullptr;
    const transmission::TransmissionRow* reproduction = nullptr;
    for (const auto& row : t.rows) {
        if (row.growth.ok())
            growth = &row;
        if (row.reproduction.ok())
            reproduction = &row;
    }
    const std::string why =
        t.rows.empty() ? std::string("no counts") : t.rows.back().reproduction.reason;
    std::string h =
        "<h3>Transmission</h3>\n<table><tr><th>Measure</th><th>Period</th>"
        "<th>Estimate</th><th>95% interval</th></tr>\n";
    if (reproduction) {
        const auto& c = reproduction->reproduction;
        h += "<tr>" + td("R_t (Cori et al. 2013)") + td(t.axis.periodName(reproduction->period)) +
             td(fixed(c.mean, 2), true) + td(intervalText(c.lower, c.upper, 2)) + "</tr>\n";
    } else {
        h += "<tr>" + td("R_t (Cori et al. 2013)") + "<td colspan=\"3\">none: " + htmlEscaped(why) +
             "</td></tr>\n";
    }
    if (growth) {
        const auto& g = growth->growth;
        h += "<tr>" + td("growth rate r per day") + td(t.axis.periodName(growth->period)) +
             td(fixed(g.r.value, 4), true) + td(intervalText(g.r.lower, g.r.upper, 4)) + "</tr>\n";
        const bool halving = g.r.value < 0;
        const transmission::Interval& d = halving ? g.halvingDays : g.doublingDays;
        h += "<tr>" + td(halving ? "halving time, days" : "doubling time, days") +
             td(t.axis.periodName(growth->period)) + td(fixed(d.value, 1), true) +
             td(fixed(d.lower, 1) + " to " +
                (std::isinf(d.upper) ? std::string("open (no growth not excluded)")
                                     : fixed(d.upper, 1))) +
             "</tr>\n";
    }
    h += "</table>\n<p>" + htmlEscaped(t.settingsBrief()) + ".</p>\n";
    return h;
}

// A region's section: its figure (or title and caption), what the figure marks, its fit.
std::string regionHtml(const FigureSpec& fig, const std::string& markup) {
    std::string h;
    if (!markup.empty()) {
        // The figure carries its own title, subtitle and caption block (source, ledger,
        // fit, caution): the section is headed by the region alone.
        h += "<h2>" +
             htmlEscaped(fig.regionName.empty() ? "Region " + fig.regionCode
                                                : fig.regionName + " (" + fig.regionCode + ")") +
             "</h2>\n<div class=\"figure\">" + markup + "</div>\n";
    } else {
        h += "<h2>" + htmlEscaped(fig.title) + "</h2>\n<p>" + htmlEscaped(fig.subtitle) + "</p>\n";
        h += "<p class=\"caption\">";
        for (std::size_t k = 0; k < fig.captionLines.size(); ++k)
            h += (k ? "<br>" : "") + htmlEscaped(fig.captionLines[k]);
        h += "</p>\n";
    }
    if (!fig.decisions.empty() || !fig.excluded.empty()) {
        h += "<p>On this figure:</p><ul>\n";
        for (const DecisionMark& m : fig.decisions)
            h += "<li>" + htmlEscaped(m.label) + " (" + m.first.iso() +
                 (m.last != m.first ? " to " + m.last.iso() : std::string()) + ")</li>\n";
        for (const ExcludedRange& x : fig.excluded)
            h += "<li>" + htmlEscaped(x.label) + " (" + x.first.iso() + " to " + x.last.iso() +
                 ")</li>\n";
        h += "</ul>\n";
    }
    if (fig.fit) {
        h += "<h3>Fit</h3>\n<table><tr><th>Quantity</th><th>Estimate</th><th>95% interval</th>"
             "</tr>\n";
        for (const FitTableRow& row : fitTable(fig.fit->result))
            h += "<tr>" + td(row.quantity) + td(row.value, true) + td(row.interval) + "</tr>\n";
        h += "</table>\n";
    } else if (!fig.fitError.empty()) {
        h += "<p>No fit: " + htmlEscaped(fig.fitError) + "</p>\n";
    }
    if (fig.transmission)
        h += transmissionHtml(*fig.transmission);
    return h;
}

std::string ledgerHtml(const std::vector<LedgerLine>& ledger) {
    std::string h = "<h2>Ledger</h2>\n";
    if (ledger.empty())
        return h + "<p>No ledger entries: every number above is as reported.</p>\n";
    // The reason gets a row of its own under its entry: it is the longest text and
    // must read in one piece.
    h += "<table><tr><th>#</th><th>Time (UTC)</th><th>Author</th><th>Decision</th>"
         "<th>Where</th><th>Net change</th><th>In effect</th><th>Hash</th></tr>\n";
    for (const LedgerLine& l : ledger)
        h += "<tr>" + td(std::to_string(l.sequence), true) + td(l.timestamp) + td(l.author) +
             td(l.kind) + td(l.where) + td(groupedCount(l.netChange), true) +
             td(l.inEffect ? "yes" : "withdrawn") + td(l.hashPrefix) +
             "</tr>\n<tr><td></td><td colspan=\"7\">Reason: " + htmlEscaped(l.reason) +
             "</td></tr>\n";
    h += "</table>\n";
    return h;
}

std::string reconciliationHtml(const std::vector<ledger::ReconciliationRow>& rows) {
    std::string h =
        "<h2>Reconciliation</h2>\n<table><tr><th>Region</th><th>Measure</th><th>Raw total</th>"
        "<th>Cleaned total</th><th>Difference</th><th>Entries explaining it</th></tr>\n";
    for (const ledger::ReconciliationRow& row : rows) {
        std::string entries;
        for (std::uint64_t e : row.entries)
            entries += (entries.empty() ? "#" : ", #") + std::to_string(e);
        h += "<tr>" + td(row.region) + td(row.measure) + td(groupedCount(row.rawTotal), true) +
             td(groupedCount(row.cleanedTotal), true) + td(groupedCount(row.difference()), true) +
             td(entries.empty() ? std::string("none") : entries) + "</tr>\n";
    }
    h += "</table>\n";
    return h;
}

}  // namespace

std::string briefingHtml(const BriefingReport& r, const std::vector<std::string>& figureMarkup) {
    std::string h = headHtml(r);
    h += findingsHtml(r.findings);
    static const std::string noMarkup;
    for (std::size_t i = 0; i < r.figures.size(); ++i)
        h += regionHtml(r.figures[i], i < figureMarkup.size() ? figureMarkup[i] : noMarkup);
    h += ledgerHtml(r.ledger);
    h += reconciliationHtml(r.reconciliation);
    h += "</body></html>\n";
    return h;
}

}  // namespace siftwave::report
