#pragma once
// Ledger entries and the ledger: the audit trail of one Drop.
//
// An entry records one Decision with its reason, author and time, what it did
// (the cells before and after, the region totals before and after) and the
// SHA-256 of the Drop it applies to. Entries form a hash chain:
//
//   hash_k = SHA-256( canonical JSON of entry k without "hash",
//                     which includes "previous_hash" = hash_(k-1) )
//
// with previous_hash of the first entry = 64 zeros. Canonical JSON is object
// keys sorted by byte value, no insignificant whitespace, integers only (no
// floating point anywhere in an entry), strings in UTF-8 with only the
// characters JSON requires escaped: the subset of RFC 8785 (JSON
// Canonicalization Scheme) our entries need. Changing any field of an entry
// changes its hash; deleting, inserting or reordering entries breaks the
// sequence numbers or the previous_hash links. verifyChain() names the first
// entry that does not fit. (Removing trailing entries leaves a valid shorter
// chain; a project file can pin the head, see project.h.)
//
// An entry made on a narrowed read (IngestOptions::narrowing) records it as "narrowed_read";
// replay, draftEntry and verifyChain refuse to mix it with another read of the drop.
//
// An entry may carry its author's Ed25519 signature (signing.h): "signature"
// {"algorithm": "ed25519", "public_key", "value"} over the canonical JSON
// without "hash" and "signature". The hash covers the signature, so the next
// entry's previous_hash binds it. Entries without one hash as before.
//
// SHA-256 is FIPS 180-4 (OpenSSL libcrypto).

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace siftwave::ledger {

/// An Ed25519 signature of an entry (RFC 8032), as lower-case hex.
struct EntrySignature {
    std::string publicKey;  // 64 hex digits: the signer's public key
    std::string value;      // 128 hex digits
};

struct LedgerEntry {
    std::uint64_t sequence = 0;  // 1-based position in the ledger; the entry's id
    std::string timestamp;       // UTC, ISO 8601 "YYYY-MM-DDTHH:MM:SSZ"
    std::string author;
    std::string reason;  // required, not blank
    Decision decision;
    Effect effect;
    std::string dropSha256;  // lower-case hex
    /// The read the entry was made on, when it was narrowed (--from, --to, --only-regions):
    /// "narrowed_read" {"from", "to", "regions"} in the entry, absent for a read of the whole
    /// file (and then the entry hashes as before). Replay refuses a drop read otherwise.
    ReadNarrowing narrowing;
    std::string previousHash;                 // lower-case hex; 64 zeros for the first entry
    std::string hash;                         // lower-case hex of the canonical JSON without "hash"
    std::optional<EntrySignature> signature;  // unset = unsigned
};

struct Ledger {
    std::vector<LedgerEntry> entries;

    /// The drop hash the entries are bound to ("" for an empty ledger).
    std::string dropSha256() const {
        return entries.empty() ? std::string() : entries.front().dropSha256;
    }
    /// Hash of the last entry, or 64 zeros for an empty ledger.
    std::string headHash() const;
};

/// 64 zeros: previous_hash of the first entry.
const std::string& genesisHash();

/// Canonical JSON of the entry without "hash" (what the hash covers).
Result<std::string> canonicalEntryJson(const LedgerEntry& entry);
/// Canonical JSON of the entry without "hash" and "signature": what a signature covers.
Result<std::string> signedEntryJson(const LedgerEntry& entry);
/// Canonical JSON of the whole entry, "hash" included: one ledger file line.
Result<std::string> entryLine(const LedgerEntry& entry);
/// Parses one ledger line; `lineNumber` goes into error messages.
Result<LedgerEntry> parseEntryLine(std::string_view line, std::uint64_t lineNumber);
/// Sets previousHash from `previous` (or genesis) and computes hash.
Status sealEntry(LedgerEntry& entry, const LedgerEntry* previous);

/// A read as the ledger's messages name it: "the whole file" or "the read narrowed by --from
/// 2026-01-01 --only-regions A,B".
std::string describeRead(const ReadNarrowing& narrowing);

/// Checks sequence numbers, previous_hash links, each hash against its
/// content, each signature against its content and its own public key (who
/// holds that key is for checkSignatures(), signing.h) and that every entry
/// names the same drop. The Integrity error names
/// the first bad entry (its sequence number in Error::line is the file line).
Status verifyChain(const Ledger& ledger);

}  // namespace siftwave::ledger
