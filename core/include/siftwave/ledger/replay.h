#pragma once
// Replay, preview and recording of decisions: the one door to the cleaned data.
//
//   replay(drop, ledger)            -> Cleaned     pure and deterministic
//   previewDecision(drop, cleaned, decision) -> Effect   nothing recorded
//   draftEntry(...)                 -> LedgerEntry sealed, ready to append
//   applyEntry(drop, cleaned, entry)               moves `cleaned` on by one entry
//
// A GUI shows previewDecision() while the analyst drags a window, then calls
// draftEntry(), appends the entry to the file (ledger_file.h) and, once that
// succeeded, pushes it onto its Ledger and calls applyEntry(). Undo is a
// withdraw Decision through the same door; history is never rewritten.
//
// Withdrawal rules: an entry in effect can be withdrawn when it is the last
// entry in effect on each cell it changed (undo is last-in first-out per
// cell); withdrawing a withdrawal restores the entry it undid, provided its
// cells still hold the values it found. A withdrawal's cells are the
// undone entry's cells with before and after swapped.
//
// Conservation: previewDecision refuses (ErrorCode::Conservation) a decision
// after which a total differs where the kind must keep it (see
// decisionConservesTotals), or that makes a day negative through
// redistribute, spread_negative or fill_missing. replay() re-derives every
// entry's effect from its decision, refuses an entry whose recorded cells or
// totals differ from that (Integrity, naming the entry), and finally checks
// every region and measure: cleaned total = raw total + the recorded changes.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <string>

namespace siftwave::ledger {

/// Who and when, for a new entry.
struct EntryMeta {
    std::string author;     // default "" = defaultAuthor()
    std::string timestamp;  // default "" = now, UTC
    std::string reason;     // required, not blank
};

/// The OS user (LOGNAME, USER, then the password database); "unknown" if none.
std::string defaultAuthor();
/// The current UTC time as "YYYY-MM-DDTHH:MM:SSZ".
std::string utcTimestampNow();
/// True for "YYYY-MM-DDTHH:MM:SSZ" naming a real instant.
bool isUtcTimestamp(std::string_view text);

/// What the decision would do to `cleaned`; nothing is changed or recorded.
Result<Effect> previewDecision(const Drop& drop, const Cleaned& cleaned, const Decision& decision);

/// A sealed entry for `decision`, next in `ledger`; nothing is changed.
/// Errors: a blank reason, a ledger for another drop, a decision that
/// previewDecision refuses.
Result<LedgerEntry> draftEntry(const Drop& drop, const Ledger& ledger, const Cleaned& cleaned,
                               const Decision& decision, const EntryMeta& meta);

/// Applies one entry (the next one: entry.sequence == cleaned.entryCount() + 1)
/// after re-deriving its effect and checking it equals the recorded one.
Status applyEntry(const Drop& drop, Cleaned& cleaned, const LedgerEntry& entry);

/// The cleaned data: every entry applied in order. Refuses a ledger for
/// another drop or with a broken chain, naming the first bad entry.
Result<Cleaned> replay(const Drop& drop, const Ledger& ledger);

/// Recomputes every total from the cells and checks
/// cleaned total = raw total + the sum of the entries' recorded changes.
Status checkConservation(const Drop& drop, const Cleaned& cleaned, const Ledger& ledger);

/// Raw total of a region for one measure: the sum of its reported cells.
std::int64_t rawTotal(const Drop& drop, std::size_t measure, std::size_t region);

}  // namespace siftwave::ledger
