// siftwave-cli ledger LEDGER --verify [--drop FILE] | --report FILE.md|.html|.csv [--drop FILE]
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/anchor.h"
#include "siftwave/ledger/export.h"
#include "siftwave/ledger/signing.h"

#include <cstdio>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli ledger LEDGER --verify [--head HASH] [--drop FILE] [ingest flags] "
    "[--json]\n"
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
    "--head HASH anchors the check to a head recorded elsewhere (a briefing, a figure's caption,\n"
    "an earlier --verify): the first 16 or more hex digits of the last entry's hash then. The\n"
    "chain alone cannot show that nobody edited an entry and recomputed every hash after it, or\n"
    "cut entries off the end; a recorded head can. Entries added after the recorded head are\n"
    "named, and are not covered by it.\n"
    "Entries signed with decide --sign are checked against their signatures always, and each\n"
    "signer is named when their public key is in the trusted-keys file (--trusted-keys, or the\n"
    "one in your data folder; your own key is always trusted). A signature by a key you do not\n"
    "trust proves nothing about who made the entry.\n"
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
            {"head", true, false, "HASH",
             "--verify: the head recorded elsewhere (16 to 64 hex digits)"},
            {"trusted-keys", true, false, "FILE",
             "--verify: whose signatures to trust (default: your data folder's list)"},
        },
        "print JSON instead of text");
}

std::string usageText() {
    return std::string(kUsage) + formatFlags(ledgerFlagSpecs());
}

/// The usage checks of the flags, before anything is read; 0 when they pass.
int checkLedgerUsage(const ParsedArgs& args, bool json) {
    if (!args.has("verify") && !args.has("report"))
        return usageError("ledger needs --verify or --report FILE", json, usageText());
    const std::string& ledgerPath = args.positional[0];
    const std::string reportPath = args.value("report");
    if (args.has("report")) {
        if (!ledger::reportFormatFromPath(reportPath))
            return usageError("the report file must end in .md, .html or .csv", json, usageText());
        if (samePath(reportPath, ledgerPath) ||
            (args.has("drop") && samePath(reportPath, args.value("drop"))))
            return usageError("the report must not overwrite the ledger or the drop", json,
                              usageText());
    }
    if (args.has("head")) {
        ledger::Ledger empty;
        if (auto a = ledger::checkAnchor(empty, args.value("head")); !a)
            return usageError(a.error().message, json, usageText());
    }
    if (!ingestFlagsValid(args, json))
        return kExitUsage;
    return kExitOk;
}

/// --head: the anchor check (nullopt without --head). A head no entry has is a tampered or
/// shortened ledger: printed as an integrity error.
std::optional<ledger::AnchorCheck> anchorOf(const ParsedArgs& args, const ledger::Ledger& ledger,
                                            const std::string& ledgerPath, bool json,
                                            bool& tampered) {
    tampered = false;
    if (!args.has("head"))
        return std::nullopt;
    ledger::AnchorCheck check = *ledger::checkAnchor(ledger, args.value("head"));
    if (check.outcome == ledger::AnchorOutcome::Missing) {
        Error e = makeError(ErrorCode::Integrity, check.describe());
        e.file = ledgerPath;
        printError(e, json);
        tampered = true;
    }
    return check;
}

/// What a verification without and with a recorded head can show, in one sentence.
std::string scopeOfCheck(const std::optional<ledger::AnchorCheck>& anchor) {
    if (!anchor)
        return "without a head recorded elsewhere (--head), this shows the ledger is consistent, "
               "not that nobody edited an entry and recomputed the hashes after it or cut "
               "entries off the end";
    return anchor->describe();
}

/// Each entry's signer as the user's trusted keys say; nullopt after printing a bad trust file.
std::optional<std::vector<ledger::SignatureCheck>> signersOf(const ParsedArgs& args,
                                                             const ledger::Ledger& ledger,
                                                             bool json) {
    const std::string trustPath =
        args.has("trusted-keys") ? args.value("trusted-keys") : ledger::defaultTrustedKeysPath();
    const std::optional<std::vector<ledger::TrustedKey>> trusted =
        valueOrPrintError(ledger::userTrust(trustPath, ledger::defaultSigningKeyPath()), json);
    if (!trusted)
        return std::nullopt;
    return ledger::checkSignatures(ledger, *trusted);
}

nlohmann::json signaturesJson(const std::vector<ledger::SignatureCheck>& checks) {
    nlohmann::json entries = nlohmann::json::array();
    for (const ledger::SignatureCheck& c : checks) {
        if (c.state == ledger::SignatureState::Unsigned)
            continue;
        entries.push_back(
            {{"entry", c.entry},
             {"state", c.state == ledger::SignatureState::Trusted ? "trusted" : "unknown_key"},
             {"holder", c.holder},
             {"key", c.keyId}});
    }
    return {{"summary", ledger::describeSignatures(checks)}, {"signed", std::move(entries)}};
}

void printVerifyText(const std::string& ledgerPath, const ledger::Ledger& ledger, const Drop* drop,
                     const ledger::CountsAdded& added,
                     const std::optional<ledger::AnchorCheck>& anchor,
                     const std::vector<ledger::SignatureCheck>& signers) {
    std::printf("%s: %zu %s, hash chain verified", terminalText(ledgerPath).c_str(),
                ledger.entries.size(), ledger.entries.size() == 1 ? "entry" : "entries");
    if (drop)
        std::printf("; replayed on %s%s", terminalText(drop->source.path).c_str(),
                    added.any() ? "" : ", every region's totals reconcile");
    if (added.any())
        std::printf("; %s", added.describe().c_str());
    std::printf("\nhead %s (record it to check this ledger later with --head)\n%s\n",
                ledger.headHash().c_str(), scopeOfCheck(anchor).c_str());
    if (!ledger.entries.empty())
        std::printf("signatures: %s\n", terminalText(ledger::describeSignatures(signers)).c_str());
    if (!ledger.entries.empty() && ledger.entries.front().narrowing.active())
        std::printf("made on: %s\n",
                    terminalText(ledger::describeRead(ledger.entries.front().narrowing)).c_str());
}

}  // namespace

int runLedger(int argc, char** argv, int first) {
    const CommandLine line = parseWithPositionals(argc, argv, first, ledgerFlagSpecs(), usageText(),
                                                  1, "ledger needs the LEDGER file");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs& args = *line.args;
    const bool json = line.json;
    if (int code = checkLedgerUsage(args, json); code != kExitOk)
        return code;
    const std::string& ledgerPath = args.positional[0];

    const std::optional<ledger::Ledger> ledger =
        valueOrPrintError(openLedger(ledgerPath, false), json);
    if (!ledger)
        return kExitBadInput;
    bool tampered = false;
    const std::optional<ledger::AnchorCheck> anchor =
        anchorOf(args, *ledger, ledgerPath, json, tampered);
    if (tampered)
        return kExitBadInput;
    const std::optional<std::vector<ledger::SignatureCheck>> signers =
        signersOf(args, *ledger, json);
    if (!signers)
        return kExitBadInput;
    std::optional<Drop> drop;
    std::optional<ledger::Cleaned> cleaned;
    if (args.has("drop")) {
        drop = valueOrPrintError(loadDrop(args.value("drop"), args), json);
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
                          {"counts_added", {{"total", added.total}, {"entries", added.entries}}},
                          {"scope", scopeOfCheck(anchor)},
                          {"signatures", signaturesJson(*signers)}};
    // The read the entries were made on: the options of a narrowed read, null for the whole file.
    out["narrowed_read"] = !ledger->entries.empty() && ledger->entries.front().narrowing.active()
                               ? nlohmann::json(ledger->entries.front().narrowing.asOptions())
                               : nlohmann::json(nullptr);
    if (anchor)
        out["anchor"] = {{"recorded", anchor->recorded},
                         {"outcome", anchor->outcomeName()},
                         {"entry", anchor->entry},
                         {"entries_after", anchor->unanchored}};
    if (drop) {
        out["replayed_on"] = drop->source.path;
        out["conservation"] = "verified";  // every entry re-derived and its kind's rules hold
        out["totals_reconcile"] = !added.any();
    }
    if (args.has("report")) {
        const std::string reportPath = args.value("report");
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
        return kExitOk;
    }
    printVerifyText(ledgerPath, *ledger, drop ? &*drop : nullptr, added, anchor, *signers);
    if (args.has("report"))
        std::printf("report written to %s\n", terminalText(args.value("report")).c_str());
    return kExitOk;
}

}  // namespace siftwave::cli
