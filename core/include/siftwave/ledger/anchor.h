#pragma once
// Anchoring the ledger to a head recorded elsewhere.
//
// The hash chain (entry.h) shows that a ledger is internally consistent. It
// cannot show that nobody edited an entry and recomputed every hash after it,
// or cut entries off the end: a resealed or shortened ledger is a valid chain
// too. What catches that is a head hash recorded somewhere the editor could
// not change (a briefing, a figure's caption, an e-mail, the project file):
//
//   - the recorded head is the ledger's last entry: nothing changed since;
//   - it is an earlier entry's hash: the entries up to it are exactly the ones
//     recorded, and the later ones were appended after it (they are not covered
//     by this anchor: check them against a later head, or their signatures);
//   - no entry has it: an entry at or before the recorded head was edited,
//     removed, inserted or reordered, or the ledger was cut short.
//
// A head may be given as a prefix of at least kMinAnchorDigits hex digits
// (64 bits), the length every figure and report prints; the full 64 digits
// are stronger.

#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace siftwave::ledger {

inline constexpr std::size_t kMinAnchorDigits = 16;

enum class AnchorOutcome {
    AtHead,    // the recorded head is the last entry (or both are empty)
    Extended,  // the recorded head is an earlier entry; later entries were appended
    Missing,   // no entry has the recorded head: the ledger was changed or cut short
};

struct AnchorCheck {
    AnchorOutcome outcome = AnchorOutcome::Missing;
    std::uint64_t entry = 0;       // the entry with the recorded head (0 = the empty ledger)
    std::uint64_t unanchored = 0;  // entries appended after it
    std::string recorded;          // the head as given, lower case

    /// One plain sentence for the analyst: what the check proved.
    std::string describe() const;
    /// "at_head", "extended" or "missing".
    const char* outcomeName() const;
};

/// Usage error unless `head` is kMinAnchorDigits..64 hex digits (either case).
Result<AnchorCheck> checkAnchor(const Ledger& ledger, std::string_view head);

/// The head as figures and reports print it: its first kMinAnchorDigits hex digits.
std::string printedHead(const Ledger& ledger);

}  // namespace siftwave::ledger
