// siftwave-cli ledger LEDGER --verify [--drop FILE] | --report FILE.md|.html|.csv [--drop FILE]
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/export.h"

#include <cstdio>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli ledger LEDGER --verify [--drop FILE] [ingest flags] [--json]\n"
    "       siftwave-cli ledger LEDGER --report FILE.md|FILE.html|FILE.csv [--drop FILE]\n"
    "\n"
    "--verify checks the ledger's hash chain (every entry's hash, its link to the one before,\n"
    "the sequence numbers, a torn last line); with --drop it also replays every entry on the\n"
    "drop and checks that each region's totals reconcile exactly. The first bad entry is named.\n"
    "When decisions in effect added counts (fill_missing linear, resolve_duplicate sum or max)\n"
    "the totals do not reconcile with the raw ones, and --verify says by how much and which\n"
    "entries: 'totals changed by decisions that add counts: +N (entries #a, #b)'.\n"
    "--report writes an audit report (atomically): each entry with its time, author, kind,\n"
    "parameters, reason and the totals it moved, and a reconciliation table per region (raw\n"
    "total, cleaned total, difference, the entries that explain it). Without --drop the table\n"
    "covers the regions the entries touched, from the totals they recorded.\n"
    "Exit codes: 0 good, 1 a bad or tampered ledger (nothing written), 2 wrong usage.\n"
    "\n"
    "options:\n";

std::vector<FlagSpec> ledgerFlagSpecs() {
    return withJsonHelpAndIngestFlags(
        {
            {"verify", false, false, "",
             "check the chain (and, with --drop, replay and conservation)"},
            {"report", true, false, "FILE", "write an audit report: .md, .html or .csv"},
            {"drop", true, false, "FILE", "the drop the ledger belongs to"},
        },
        "print JSON instead of text");
}

std::string usageText() {
    return std::string(kUsage) + formatFlags(ledgerFlagSpecs());
}

}  // namespace

int runLedger(int argc, char** argv, int first) {
    const CommandLine line = parseWithPositionals(argc, argv, first, ledgerFlagSpecs(), usageText(),
                                                  1, "ledger needs the LEDGER file");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs* args = &*line.args;
    const bool json = line.json;
    if (!args->has("verify") && !args->has("report"))
        return usageError("ledger needs --verify or --report FILE", json, usageText());
    const std::string ledgerPath = args->positional[0];
    const std::string reportPath = args->value("report");
    if (args->has("report")) {
        if (!ledger::reportFormatFromPath(reportPath))
            return usageError("the report file must end in .md, .html or .csv", json, usageText());
        if (samePath(reportPath, ledgerPath) ||
            (args->has("drop") && samePath(reportPath, args->value("drop"))))
            return usageError("the report must not overwrite the ledger or the drop", json,
                              usageText());
    }
    if (!ingestFlagsValid(*args, json))
        return kExitUsage;

    const std::optional<ledger::Ledger> ledger =
        valueOrPrintError(openLedger(ledgerPath, false), json);
    if (!ledger)
        return kExitBadInput;
    std::optional<Drop> drop;
    std::optional<ledger::Cleaned> cleaned;
    if (args->has("drop")) {
        drop = valueOrPrintError(loadDrop(args->value("drop"), *args), json);
        if (drop)
            cleaned = valueOrPrintError(replayLedger(*drop, *ledger, ledgerPath), json);
        if (!cleaned)
            return kExitBadInput;
    }

    const ledger::CountsAdded added = ledger::countsAddedByDecisions(*ledger);
    nlohmann::json out = {{"ledger", ledgerPath},
                          {"entries", ledger->entries.size()},
                          {"chain", "verified"},
                          {"head_hash", ledger->headHash()},
                          {"drop_sha256", ledger->dropSha256()},
                          {"counts_added", {{"total", added.total}, {"entries", added.entries}}}};
    if (drop) {
        out["replayed_on"] = drop->source.path;
        out["conservation"] = "verified";  // every entry re-derived and its kind's rules hold
        out["totals_reconcile"] = !added.any();
    }
    if (args->has("report")) {
        const std::vector<ledger::ReconciliationRow> rows =
            drop ? ledger::reconcile(*drop, *cleaned, *ledger)
                 : ledger::reconcileFromLedger(*ledger);
        ledger::ReportContext ctx;
        ctx.ledgerPath = ledgerPath;
        ctx.dropPath = drop ? drop->source.path : std::string();
        ctx.dropSha256 = drop ? drop->source.sha256 : ledger->dropSha256();
        ctx.chainVerified = true;
        if (Status s = ledger::writeReport(reportPath, *ledger, rows, ctx); !s) {
            printError(s.error(), json);
            return kExitBadInput;
        }
        out["report"] = reportPath;
    }
    if (json) {
        printJson(out);
    } else {
        std::printf("%s: %zu %s, hash chain verified", ledgerPath.c_str(), ledger->entries.size(),
                    ledger->entries.size() == 1 ? "entry" : "entries");
        if (drop && !added.any()) {
            std::printf("; replayed on %s, every region's totals reconcile",
                        drop->source.path.c_str());
        } else if (drop) {
            std::printf("; replayed on %s", drop->source.path.c_str());
        }
        if (added.any())
            std::printf("; %s", added.describe().c_str());
        std::printf("\n");
        if (args->has("report"))
            std::printf("report written to %s\n", reportPath.c_str());
    }
    return kExitOk;
}

}  // namespace siftwave::cli
