#pragma once
// The ledger on disk: JSON Lines, one entry per line (entry.h, entryLine()),
// each line ending in LF. Appending opens the file for append, writes one
// whole line and fsyncs it before returning (a new file's folder is fsynced
// too), so a crash loses at most the entry being written.
//
// A crash in the middle of a write leaves a torn last line: text without its
// final LF, or a last line that is not a complete entry. readLedgerFile()
// detects it and reports it (ErrorCode::Integrity, with file and line); it
// never drops or keeps such a line silently. Recovery is the analyst's call:
// remove the torn line by hand, then re-enter that decision.

#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <string>

namespace siftwave::ledger {

/// Reads and verifies (verifyChain) a ledger file. A missing file is
/// ErrorCode::NotFound; an empty file is an empty ledger.
Result<Ledger> readLedgerFile(const std::string& path);

/// Parses ledger bytes; `displayPath` is used in messages.
Result<Ledger> parseLedger(std::string_view bytes, const std::string& displayPath);

/// Appends one sealed entry as a line and fsyncs; creates the file if needed.
/// Holds an exclusive flock while it checks that the file (verified again) ends
/// exactly at the entry's predecessor, so two writers cannot fork the chain:
/// Conflict error, nothing appended, when another entry got there first (draft
/// the entry again on the ledger as it now is, see appendDecision in replay.h).
Status appendLedgerEntry(const std::string& path, const LedgerEntry& entry);

}  // namespace siftwave::ledger
