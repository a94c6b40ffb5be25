// siftwave-cli apply FILE --ledger LEDGER --out CLEANED.csv: the cleaned data as long CSV.
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/export.h"

#include <cstdio>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli apply FILE --ledger LEDGER --out CLEANED.csv [ingest flags] [--json]\n"
    "\n"
    "Replays the ledger LEDGER on the drop FILE and writes the cleaned data as long CSV\n"
    "(RFC 4180, CRLF, spreadsheet-safe): date,region,measure,value,raw_value,entries, where\n"
    "entries lists the ids of the ledger entries that changed the cell (separated by ';').\n"
    "The output is written atomically and is byte-identical for the same drop and ledger.\n"
    "A ledger that is tampered with, broken or made for another drop is refused and nothing\n"
    "is written. Exit codes: 0 written, 1 bad input, 2 wrong usage.\n"
    "\n"
    "options:\n";

std::vector<FlagSpec> applyFlagSpecs() {
    return withJsonHelpAndIngestFlags(
        {
            {"ledger", true, false, "LEDGER", "the ledger to replay (required)"},
            {"out", true, false, "CLEANED.csv", "where to write the cleaned data (required)"},
        },
        "print a JSON summary instead of text");
}

std::string usageText() {
    return std::string(kUsage) + formatFlags(applyFlagSpecs());
}

}  // namespace

int runApply(int argc, char** argv, int first) {
    const CommandLine line = parseWithPositionals(argc, argv, first, applyFlagSpecs(), usageText(),
                                                  1, "apply needs the drop FILE");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs* args = &*line.args;
    const bool json = line.json;
    if (!args->has("ledger") || !args->has("out"))
        return usageError("apply needs --ledger LEDGER and --out CLEANED.csv", json, usageText());
    const std::string dropPath = args->positional[0];
    const std::string ledgerPath = args->value("ledger");
    const std::string outPath = args->value("out");
    if (samePath(outPath, dropPath) || samePath(outPath, ledgerPath))
        return usageError("--out must not be the drop or the ledger; inputs are never written",
                          json, usageText());
    if (!ingestFlagsValid(*args, json))
        return kExitUsage;
    const std::optional<Drop> drop = valueOrPrintError(loadDrop(dropPath, *args), json);
    if (!drop)
        return kExitBadInput;
    const std::optional<ReplayedLedger> replayed = openAndReplay(*drop, ledgerPath, false, json);
    if (!replayed)
        return kExitBadInput;
    const ledger::Ledger* ledger = &replayed->ledger;
    const ledger::Cleaned* cleaned = &replayed->cleaned;
    const std::string csv = ledger::cleanedCsv(*drop, *cleaned);
    if (Status s = ledger::writeCleanedCsv(outPath, *drop, *cleaned); !s) {
        printError(s.error(), json);
        return kExitBadInput;
    }
    std::size_t rows = 0;
    for (char c : csv)
        rows += c == '\n';
    rows -= 1;  // the header
    std::size_t inEffect = 0;
    for (const ledger::LedgerEntry& e : ledger->entries)
        inEffect += cleaned->inEffect(e.sequence) ? 1 : 0;
    if (json) {
        printJson({{"out", outPath},
                   {"rows", rows},
                   {"entries", ledger->entries.size()},
                   {"entries_in_effect", inEffect},
                   {"drop_sha256", drop->source.sha256}});
    } else {
        std::printf("wrote %s: %zu rows, %zu ledger %s replayed (%zu in effect)\n",
                    terminalText(outPath).c_str(), rows, ledger->entries.size(),
                    ledger->entries.size() == 1 ? "entry" : "entries", inEffect);
    }
    return kExitOk;
}

}  // namespace siftwave::cli
