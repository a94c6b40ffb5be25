#include "siftwave/ledger/export.h"
#include "common/text_escape.h"
#include "siftwave/csv_field.h"

#include "ledger/entry_json.h"
#include "ledger/file_io.h"
#include "siftwave/ledger/replay.h"

#include <map>
#include <set>

namespace siftwave::ledger {

namespace {

std::string joinIds(std::span<const std::uint64_t> ids, const char* separator) {
    std::string out;
    for (std::size_t i = 0; i < ids.size(); ++i) {
        if (i)
            out += separator;
        out += std::to_string(ids[i]);
    }
    return out;
}

}  // namespace

std::string cleanedCsv(const Drop& drop, const Cleaned& cleaned) {
    std::string out = "date,region,measure,value,raw_value,entries\r\n";
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        const std::string region = csvField(drop.regionCodes[r], true);
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            const std::string measure = csvField(drop.measures[m], true);
            for (std::int32_t d = 0; d < drop.periods(); ++d) {
                const Cell& raw = drop.cell(m, r, d);
                const CleanedCell& c = cleaned.cell(m, r, d);
                const auto touched = cleaned.touchedBy(m, r, d);
                if (raw.state == CellState::Absent && c.state == CleanedState::Absent &&
                    touched.empty())
                    continue;
                out += drop.periodStart(d).iso();
                out += ',';
                out += region;
                out += ',';
                out += measure;
                out += ',';
                if (c.hasValue())
                    out += std::to_string(c.value);
                out += ',';
                if (raw.reported())
                    out += std::to_string(raw.value);
                out += ',';
                out += joinIds(touched, ";");
                out += "\r\n";
            }
        }
    }
    return out;
}

Status writeCleanedCsv(const std::string& path, const Drop& drop, const Cleaned& cleaned) {
    return detail::writeFileAtomically(path, cleanedCsv(drop, cleaned));
}

std::vector<bool> entriesInEffect(const Ledger& ledger) {
    std::vector<bool> inEffect(ledger.entries.size(), true);
    auto kindOf = [&](std::uint64_t seq) { return ledger.entries[seq - 1].decision.kind; };
    for (const LedgerEntry& e : ledger.entries) {
        if (e.decision.kind != DecisionKind::Withdraw)
            continue;
        std::uint64_t cur = e.decision.target;
        bool state = false;
        while (cur >= 1 && cur < e.sequence) {
            inEffect[cur - 1] = state;
            if (kindOf(cur) != DecisionKind::Withdraw)
                break;
            cur = ledger.entries[cur - 1].decision.target;
            state = !state;
        }
    }
    return inEffect;
}

CountsAdded countsAddedByDecisions(const Ledger& ledger) {
    const std::vector<bool> inEffect = entriesInEffect(ledger);
    CountsAdded out;
    for (const LedgerEntry& e : ledger.entries) {
        if (!inEffect[e.sequence - 1] || e.decision.kind == DecisionKind::Withdraw)
            continue;
        std::int64_t change = 0;
        for (const TotalChange& t : e.effect.totals)
            change += t.change();
        if (change > 0) {
            out.total += change;
            out.entries.push_back(e.sequence);
        }
    }
    return out;
}

std::string CountsAdded::describe() const {
    if (!any())
        return {};
    // The words of the issue "Real releases", also for a single entry.
    std::string out =
        "totals changed by decisions that add counts: +" + std::to_string(total) + " (entries ";
    for (std::size_t i = 0; i < entries.size(); ++i) {
        if (i)
            out += ", ";
        out += '#';
        out += std::to_string(entries[i]);
    }
    return out + ")";
}

namespace {

/// Entries in effect, not withdrawals, whose recorded total change for (measure, region) is not 0.
std::map<std::pair<std::string, std::string>, std::vector<std::uint64_t>> explainingEntries(
    const Ledger& ledger) {
    const std::vector<bool> inEffect = entriesInEffect(ledger);
    std::map<std::pair<std::string, std::string>, std::vector<std::uint64_t>> out;
    for (const LedgerEntry& e : ledger.entries) {
        if (!inEffect[e.sequence - 1] || e.decision.kind == DecisionKind::Withdraw)
            continue;
        for (const TotalChange& t : e.effect.totals) {
            if (t.change() != 0)
                out[{t.measure, t.region}].push_back(e.sequence);
        }
    }
    return out;
}

}  // namespace

std::vector<ReconciliationRow> reconcile(const Drop& drop, const Cleaned& cleaned,
                                         const Ledger& ledger) {
    auto explaining = explainingEntries(ledger);
    std::vector<ReconciliationRow> rows;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            ReconciliationRow row;
            row.region = drop.regionCodes[r];
            row.measure = drop.measures[m];
            row.rawTotal = rawTotal(drop, m, r);
            row.cleanedTotal = cleaned.total(m, r);
            auto it = explaining.find({row.measure, row.region});
            if (it != explaining.end())
                row.entries = it->second;
            rows.push_back(std::move(row));
        }
    }
    return rows;
}

std::vector<ReconciliationRow> reconcileFromLedger(const Ledger& ledger) {
    auto explaining = explainingEntries(ledger);
    std::vector<std::pair<std::string, std::string>> order;  // (region, measure) first seen
    std::map<std::pair<std::string, std::string>, ReconciliationRow> rows;
    for (const LedgerEntry& e : ledger.entries) {
        for (const TotalChange& t : e.effect.totals) {
            const auto key = std::make_pair(t.region, t.measure);
            auto it = rows.find(key);
            if (it == rows.end()) {
                ReconciliationRow row;
                row.region = t.region;
                row.measure = t.measure;
                row.rawTotal = t.before;
                it = rows.emplace(key, std::move(row)).first;
                order.push_back(key);
            }
            it->second.cleanedTotal = t.after;
        }
    }
    std::vector<ReconciliationRow> out;
    for (const auto& key : order) {
        ReconciliationRow row = rows[key];
        auto it = explaining.find({row.measure, row.region});
        if (it != explaining.end())
            row.entries = it->second;
        out.push_back(std::move(row));
    }
    return out;
}

std::optional<ReportFormat> reportFormatFromPath(std::string_view path) {
    auto endsWith = [&](std::string_view suffix) {
        if (path.size() < suffix.size())
            return false;
        for (std::size_t i = 0; i < suffix.size(); ++i) {
            const char a = path[path.size() - suffix.size() + i];
            const char lower = (a >= 'A' && a <= 'Z') ? static_cast<char>(a - 'A' + 'a') : a;
            if (lower != suffix[i])
                return false;
        }
        return true;
    };
    if (endsWith(".md"))
        return ReportFormat::Markdown;
    if (endsWith(".html") || endsWith(".htm"))
        return ReportFormat::Html;
    if (endsWith(".csv"))
        return ReportFormat::Csv;
    return std::nullopt;
}

namespace {

using siftwave::detail::htmlEscaped;

/// Markdown text from the ledger or the drop (untrusted): the one Markdown escape.
std::string mdCell(std::string_view s) {
    return siftwave::detail::markdownEscaped(s);
}

std::string parametersText(const LedgerEntry& e) {
    auto p = detail::decisionParameters(e.decision);
    std::string out;
    for (auto it = p.begin(); it != p.end(); ++it) {
        if (!out.empty())
            out += ", ";
        out += it.key() + "=";
        if (it->is_string())
            out += it->get<std::string>();
        else if (it->is_object() && it->contains("first"))
            out += (*it)["first"].get<std::string>() + ":" + (*it)["last"].get<std::string>();
        else
            out += it->dump();
    }
    return out;
}

std::string totalsText(const LedgerEntry& e) {
    std::string out;
    for (const TotalChange& t : e.effect.totals) {
        if (!out.empty())
            out += "; ";
        out += t.region + " " + t.measure + " " + std::to_string(t.before) + " -> " +
               std::to_string(t.after);
    }
    return out.empty() ? "-" : out;
}

std::string statusText(const LedgerEntry& e, const std::vector<bool>& inEffect) {
    return inEffect[e.sequence - 1] ? "in effect" : "withdrawn";
}

std::string signedNumber(std::int64_t v) {
    return v > 0 ? "+" + std::to_string(v) : std::to_string(v);
}

/// "3, 5" for the entries that explain a row's difference, "-" for none.
std::string explainingText(const ReconciliationRow& r) {
    return r.entries.empty() ? std::string("-") : joinIds(r.entries, ", ");
}

/// What the Markdown and HTML headers state about the ledger as a whole (text not yet escaped).
struct ReportFacts {
    std::string drop;        // the drop's path, or where the totals come from without one
    std::string dropSha256;  // the context's, else the one the entries name
    std::string entries;     // "N; hash chain verified" (or "not verified")
    CountsAdded added;       // the decisions that add counts
};

/// The facts of the report's header, from the ledger and the context.
ReportFacts reportFacts(const Ledger& ledger, const ReportContext& ctx) {
    ReportFacts f;
    f.drop = ctx.dropPath.empty() ? "(not given: totals from the entries)" : ctx.dropPath;
    f.dropSha256 = ctx.dropSha256.empty() ? ledger.dropSha256() : ctx.dropSha256;
    f.entries = std::to_string(ledger.entries.size()) + "; hash chain " +
                (ctx.chainVerified ? "verified" : "not verified");
    f.added = countsAddedByDecisions(ledger);
    return f;
}

/// CSV: one "entry" row per entry, then one "reconciliation" row per region and measure.
std::string csvReport(const Ledger& ledger, const std::vector<ReconciliationRow>& rows) {
    const std::vector<bool> inEffect = entriesInEffect(ledger);
    std::string out =
        "section,entry,time,author,kind,status,parameters,reason,region,measure,raw_total,"
        "cleaned_total,"
        "difference,entries\r\n";
    for (const LedgerEntry& e : ledger.entries) {
        out += "entry," + std::to_string(e.sequence) + "," + csvField(e.timestamp, true) + "," +
               csvField(e.author, true) + "," + decisionKindName(e.decision.kind) + "," +
               statusText(e, inEffect) + "," + csvField(parametersText(e), true) + "," +
               csvField(e.reason, true) + ",,,,,,\r\n";
    }
    for (const ReconciliationRow& r : rows) {
        out += "reconciliation,,,,,,,," + csvField(r.region, true) + "," +
               csvField(r.measure, true) + "," + std::to_string(r.rawTotal) + "," +
               std::to_string(r.cleanedTotal) + "," + std::to_string(r.difference()) + "," +
               joinIds(r.entries, ";") + "\r\n";
    }
    return out;
}

/// Markdown: the title and the list of facts, then a blank line.
std::string markdownHeader(const ReportContext& ctx, const ReportFacts& f) {
    std::string out = "# Ledger audit report\n\n";
    out += "- Ledger: " + mdCell(ctx.ledgerPath) + "\n";
    out += "- Drop: " + mdCell(f.drop) + "\n";
    out += "- Drop SHA-256: " + mdCell(f.dropSha256) + "\n";
    out += "- Entries: " + f.entries + "\n";
    if (f.added.any())
        out += "- Totals: " + f.added.describe() + "\n";
    return out + "\n";
}

/// Markdown: the table of entries.
std::string markdownEntries(const Ledger& ledger) {
    const std::vector<bool> inEffect = entriesInEffect(ledger);
    std::string out = "## Entries\n\n";
    out += "| # | Time (UTC) | Author | Kind | Status | Parameters | Totals moved | Reason |\n";
    out += "|---|---|---|---|---|---|---|---|\n";
    for (const LedgerEntry& e : ledger.entries) {
        out += "| " + std::to_string(e.sequence) + " | " + mdCell(e.timestamp) + " | " +
               mdCell(e.author) + " | " + decisionKindName(e.decision.kind) + " | " +
               statusText(e, inEffect) + " | " + mdCell(parametersText(e)) + " | " +
               mdCell(totalsText(e)) + " | " + mdCell(e.reason) + " |\n";
    }
    return out;
}

/// Markdown: the reconciliation table, after a blank line.
std::string markdownReconciliation(const std::vector<ReconciliationRow>& rows) {
    std::string out = "\n## Reconciliation per region\n\n";
    out +=
        "| Region | Measure | Raw total | Cleaned total | Difference | Explained by entries "
        "|\n";
    out += "|---|---|---:|---:|---:|---|\n";
    for (const ReconciliationRow& r : rows) {
        out += "| " + mdCell(r.region) + " | " + mdCell(r.measure) + " | " +
               std::to_string(r.rawTotal) + " | " + std::to_string(r.cleanedTotal) + " | " +
               signedNumber(r.difference()) + " | " + explainingText(r) + " |\n";
    }
    return out;
}

/// HTML: the document's head and style, the title and the list of facts.
std::string htmlHeader(const ReportContext& ctx, const ReportFacts& f) {
    std::string out =
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>Ledger audit "
        "report</title>\n"
        "<style>body{font-family:sans-serif;margin:2em}table{border-collapse:collapse}"
        "td,th{border:1px solid #999;padding:2px "
        "6px;vertical-align:top}td.n{text-align:right}</style>"
        "</head><body>\n<h1>Ledger audit report</h1>\n<ul>\n";
    out += "<li>Ledger: " + htmlEscaped(ctx.ledgerPath) + "</li>\n";
    out += "<li>Drop: " + htmlEscaped(f.drop) + "</li>\n";
    out += "<li>Drop SHA-256: " + htmlEscaped(f.dropSha256) + "</li>\n";
    out += "<li>Entries: " + f.entries + "</li>\n";
    if (f.added.any())
        out += "<li>Totals: " + htmlEscaped(f.added.describe()) + "</li>\n";
    return out + "</ul>\n";
}

/// HTML: the table of entries.
std::string htmlEntries(const Ledger& ledger) {
    const std::vector<bool> inEffect = entriesInEffect(ledger);
    std::string out =
        "<h2>Entries</h2>\n<table><tr><th>#</th><th>Time "
        "(UTC)</th><th>Author</th><th>Kind</th><th>Status</th>"
        "<th>Parameters</th><th>Totals moved</th><th>Reason</th></tr>\n";
    for (const LedgerEntry& e : ledger.entries) {
        out += "<tr><td class=\"n\">" + std::to_string(e.sequence) + "</td><td>" +
               htmlEscaped(e.timestamp) + "</td><td>" + htmlEscaped(e.author) + "</td><td>" +
               decisionKindName(e.decision.kind) + "</td><td>" + statusText(e, inEffect) +
               "</td><td>" + htmlEscaped(parametersText(e)) + "</td><td>" +
               htmlEscaped(totalsText(e)) + "</td><td>" + htmlEscaped(e.reason) + "</td></tr>\n";
    }
    return out + "</table>\n";
}

/// HTML: the reconciliation table.
std::string htmlReconciliation(const std::vector<ReconciliationRow>& rows) {
    std::string out =
        "<h2>Reconciliation per region</h2>\n<table><tr><th>Region</th><th>Measure</th>"
        "<th>Raw total</th><th>Cleaned total</th><th>Difference</th><th>Explained by "
        "entries</th></tr>\n";
    for (const ReconciliationRow& r : rows) {
        out += "<tr><td>" + htmlEscaped(r.region) + "</td><td>" + htmlEscaped(r.measure) +
               "</td><td class=\"n\">" + std::to_string(r.rawTotal) + "</td><td class=\"n\">" +
               std::to_string(r.cleanedTotal) + "</td><td class=\"n\">" +
               signedNumber(r.difference()) + "</td><td>" + explainingText(r) + "</td></tr>\n";
    }
    return out + "</table>\n";
}

}  // namespace

std::string renderReport(const Ledger& ledger, const std::vector<ReconciliationRow>& rows,
                         const ReportContext& ctx, ReportFormat format) {
    if (format == ReportFormat::Csv)
        return csvReport(ledger, rows);
    const ReportFacts facts = reportFacts(ledger, ctx);
    if (format == ReportFormat::Markdown)
        return markdownHeader(ctx, facts) + markdownEntries(ledger) + markdownReconciliation(rows);
    return htmlHeader(ctx, facts) + htmlEntries(ledger) + htmlReconciliation(rows) +
           "</body></html>\n";
}

Status writeReport(const std::string& path, const Ledger& ledger,
                   const std::vector<ReconciliationRow>& rows, const ReportContext& context) {
    auto format = reportFormatFromPath(path);
    if (!format) {
        Error e = makeError(ErrorCode::Usage, "the report file must end in .md, .html or .csv");
        e.file = path;
        return e;
    }
    return detail::writeFileAtomically(path, renderReport(ledger, rows, context, *format));
}

}  // namespace siftwave::ledger
