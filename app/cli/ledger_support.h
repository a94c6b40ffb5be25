#pragma once
// What the decide, apply and ledger subcommands share: opening a ledger file,
// replaying it on a drop with file names in the errors, and entries as JSON.

#include "args.h"
#include "common.h"

#include "siftwave/drop.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/result.h"

#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace siftwave::cli {

/// The flags of apply, decide and ledger: `own`, then --json (described by `jsonHelp`) and
/// --help, then the ingest flags.
std::vector<FlagSpec> withJsonHelpAndIngestFlags(std::vector<FlagSpec> own, const char* jsonHelp);

/// parseCommandLine, then a usage error (its exit code in `exitCode`, no `args`) unless exactly
/// `positionals` arguments are given; `missing` says what they are.
CommandLine parseWithPositionals(int argc, char** argv, int first,
                                 const std::vector<FlagSpec>& specs, const std::string& usage,
                                 std::size_t positionals, const char* missing);

/// True when the ingest flags are right; otherwise prints the usage error and returns false.
bool ingestFlagsValid(const ParsedArgs& args, bool json);

/// The value of `result`, or nullopt after printing its error.
template <class T>
std::optional<T> valueOrPrintError(Result<T> result, bool json) {
    if (!result) {
        printError(result.error(), json);
        return std::nullopt;
    }
    return std::move(*result);
}

/// Reads and verifies the ledger; with `allowMissing` a missing file is an empty ledger.
Result<ledger::Ledger> openLedger(const std::string& path, bool allowMissing);

/// replay(drop, ledger) with the ledger's path in the error.
Result<ledger::Cleaned> replayLedger(const Drop& drop, const ledger::Ledger& ledger,
                                     const std::string& ledgerPath);

/// A ledger and the cleaned data its replay on a drop gives.
struct ReplayedLedger {
    ledger::Ledger ledger;
    ledger::Cleaned cleaned;
};

/// openLedger then replayLedger: nullopt after printing the error of the first that fails.
std::optional<ReplayedLedger> openAndReplay(const Drop& drop, const std::string& ledgerPath,
                                            bool allowMissing, bool json);

/// The entry as it stands in the ledger file, as a JSON object.
nlohmann::json entryToJsonObject(const ledger::LedgerEntry& entry);

/// True when two paths name the same file (or the same not-yet-existing path).
bool samePath(const std::string& a, const std::string& b);

}  // namespace siftwave::cli
