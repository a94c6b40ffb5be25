#include "siftwave/ledger/record.h"

#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/signing.h"

namespace siftwave::ledger {
namespace {

/// The ledger file as it is now, replayed; a missing file is an empty ledger.
Status rereadAndReplay(const Drop& drop, const std::string& path, Ledger& ledger,
                       Cleaned& cleaned) {
    Result<Ledger> fresh = readLedgerFile(path);
    if (!fresh && fresh.error().code != ErrorCode::NotFound)
        return fresh.error();
    Ledger read = fresh ? std::move(*fresh) : Ledger{};
    Result<Cleaned> replayed = replay(drop, read);
    if (!replayed)
        return replayed.error();
    ledger = std::move(read);
    cleaned = std::move(*replayed);
    return Ok{};
}

/// The decision drafted (and signed) as the next entry of `ledger`.
Result<LedgerEntry> draftSigned(const Drop& drop, const RecordRequest& request,
                                const Ledger& ledger, const Cleaned& cleaned) {
    Result<LedgerEntry> entry = draftEntry(drop, ledger, cleaned, request.decision, request.meta);
    if (!entry)
        return entry;
    if (request.signer) {
        if (Status s = signEntry(*entry, *request.signer); !s)
            return s.error();
    }
    return entry;
}

}  // namespace

Result<Recorded> recordDecision(const Drop& drop, const RecordRequest& request, Ledger ledger,
                                Cleaned cleaned) {
    for (int attempt = 1;; ++attempt) {
        Result<LedgerEntry> entry = draftSigned(drop, request, ledger, cleaned);
        if (!entry) {
            Error e = entry.error();
            if (attempt > 1)
                e.message = "after the entries another writer added meanwhile, " + e.message;
            return e;
        }
        Status appended = appendLedgerEntry(request.ledgerPath, *entry);
        if (appended) {
            if (Status applied = applyEntry(drop, cleaned, *entry); !applied)
                return applied.error();
            ledger.entries.push_back(*entry);
            return Recorded{std::move(*entry), std::move(ledger), std::move(cleaned), attempt};
        }
        if (appended.error().code != ErrorCode::Conflict || attempt >= request.maxAttempts)
            return appended.error();
        if (Status s = rereadAndReplay(drop, request.ledgerPath, ledger, cleaned); !s)
            return s.error();
    }
}

}  // namespace siftwave::ledger
