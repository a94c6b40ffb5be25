#pragma once
// What the decide, apply and ledger subcommands share: opening a ledger file,
// replaying it on a drop with file names in the errors, and entries as JSON.

#include "args.h"

#include "siftwave/drop.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/result.h"

#include <nlohmann/json.hpp>

#include <string>

namespace siftwave::cli {

/// Reads and verifies the ledger; with `allowMissing` a missing file is an empty ledger.
Result<Ledger> openLedger(const std::string& path, bool allowMissing);

/// replay(drop, ledger) with the ledger's path in the error.
Result<Cleaned> replayLedger(const Drop& drop, const Ledger& ledger, const std::string& ledgerPath);

/// The entry as it stands in the ledger file, as a JSON object.
nlohmann::json entryToJsonObject(const LedgerEntry& entry);

/// True when two paths name the same file (or the same not-yet-existing path).
bool samePath(const std::string& a, const std::string& b);

}  // namespace siftwave::cli
