#pragma once
// Deriving an Effect from a Decision on the current cleaned data, and
// applying an Effect. Shared by preview, drafting and replay.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"

namespace siftwave::ledger::detail {

/// What `decision` does to `cleaned` (see decision.h and replay.h for the rules).
Result<Effect> deriveEffect(const Drop& drop, const Cleaned& cleaned, const Decision& decision);

/// Moves `cleaned` on by one entry with sequence number cleaned.entryCount() + 1.
/// `effect` must come from deriveEffect on the same state.
Status applyEffect(const Drop& drop, Cleaned& cleaned, const Decision& decision,
                   const Effect& effect);

}  // namespace siftwave::ledger::detail
