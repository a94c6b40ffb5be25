#pragma once
// Recording a decision in a ledger file: the one path the CLI and the workbench take.
//
//   draft the entry on the ledger as the caller read it (replay.h), sign it when
//   a key is given (signing.h), append it (ledger_file.h).
//
// If another writer appended first (ErrorCode::Conflict), the ledger is read
// and replayed again and the same decision drafted on it: it is recorded when
// it is still valid there (previewDecision accepts it), and refused with the
// reason when it is not (say, the entry it withdraws was withdrawn meanwhile).
// At most `maxAttempts` tries; each is counted in Recorded::attempts.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/result.h"

#include <string>

namespace siftwave::ledger {

class SigningKey;

struct RecordRequest {
    std::string ledgerPath;
    Decision decision;
    EntryMeta meta;
    const SigningKey* signer = nullptr;  // nullptr = unsigned
    int maxAttempts = 5;
};

struct Recorded {
    LedgerEntry entry;  // as appended
    Ledger ledger;      // the ledger file's entries, the new one last
    Cleaned cleaned;    // the cleaned data after it
    int attempts = 1;   // 1 unless another writer got there first
};

/// Records `request.decision` after the entries of `ledger` (already replayed into `cleaned`).
Result<Recorded> recordDecision(const Drop& drop, const RecordRequest& request, Ledger ledger,
                                Cleaned cleaned);

}  // namespace siftwave::ledger
