#pragma once
// Per-author signatures of ledger entries: Ed25519 (RFC 8032) through OpenSSL.
//
// What a signature adds to the hash chain: the chain shows the entries are
// consistent with each other; anyone can edit an entry and recompute the
// hashes. A signature can only be made with its author's private key, so an
// edited, reordered, renumbered or forged entry no longer carries a valid
// signature from a key you trust. It cannot show that entries were not cut
// from the end (a recorded head can, anchor.h), and it proves nothing about a
// key you do not know: anyone can make a key and sign with it.
//
// The signature covers the entry's canonical JSON without "hash" and
// "signature" (signedEntryJson, entry.h), prefixed by kSignatureContext, so it
// binds the entry's sequence number and its previous_hash: its place in the chain.
//
// Keys live in the user's data folder (userDataFolder()):
//   keys/signing-key.pem   the private key, PKCS #8 PEM, readable by its owner only
//   trusted-keys.txt       one trusted public key per line: 64 hex digits, a
//                          space, the holder's name; '#' starts a comment
// The user's own public key is always trusted.

#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <memory>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ledger {

inline constexpr std::string_view kSignatureContext = "siftwave ledger entry signature v1\n";

/// An Ed25519 private key.
class SigningKey {
public:
    /// A new random key.
    static Result<SigningKey> generate();
    /// From the 32-byte private key as 64 hex digits (RFC 8032's test vectors).
    static Result<SigningKey> fromPrivateHex(std::string_view hex);
    /// From a PKCS #8 PEM file (as save() writes it).
    static Result<SigningKey> load(const std::string& path);

    /// Writes the key as PKCS #8 PEM, mode 0600, refusing to overwrite a file.
    Status save(const std::string& path) const;
    /// The public key, 64 lower-case hex digits.
    std::string publicKeyHex() const;
    /// The signature of `message`, 128 lower-case hex digits.
    Result<std::string> sign(std::string_view message) const;

private:
    std::shared_ptr<void> m_key;  // EVP_PKEY, freed by EVP_PKEY_free
};

/// True if `signatureHex` is `publicKeyHex`'s Ed25519 signature of `message`.
bool verifySignature(std::string_view publicKeyHex, std::string_view message,
                     std::string_view signatureHex);

/// Signs a sealed entry (previous_hash set) and seals it again: the hash covers the signature.
Status signEntry(LedgerEntry& entry, const SigningKey& key);
/// True if the entry's signature is its public key's signature of its content.
bool signatureMatches(const LedgerEntry& entry);

struct TrustedKey {
    std::string publicKey;  // 64 lower-case hex digits
    std::string holder;     // the name it was trusted under
};

/// Reads a trusted-keys file (format above); Syntax errors name the line. A missing file is
/// an empty list.
Result<std::vector<TrustedKey>> readTrustedKeys(const std::string& path);

/// The keys this user trusts: the trusted-keys file's, and the user's own public key (holder
/// "you") when there is a signing key at `ownKeyPath`.
Result<std::vector<TrustedKey>> userTrust(const std::string& trustedPath,
                                          const std::string& ownKeyPath);

enum class SignatureState {
    Unsigned,
    Trusted,     // valid, by a trusted key
    UnknownKey,  // valid, by a key that is not trusted: proves nothing about who signed
};

struct SignatureCheck {
    std::uint64_t entry = 0;
    SignatureState state = SignatureState::Unsigned;
    std::string holder;  // Trusted: the holder's name
    std::string keyId;   // the public key's first 16 hex digits ("" when unsigned)
};

/// Each entry's signature state. Run on a verified ledger (verifyChain checks that every
/// signature matches its content).
std::vector<SignatureCheck> checkSignatures(const Ledger& ledger,
                                            const std::vector<TrustedKey>& trusted);

/// A short summary: "3 of 5 entries signed by trusted keys (ana: 2, ben: 1); 2 unsigned".
std::string describeSignatures(const std::vector<SignatureCheck>& checks);

/// The user's data folder: $SIFTWAVE_DATA_DIR, else $XDG_DATA_HOME/Siftwave/siftwave, else
/// $HOME/.local/share/Siftwave/siftwave (the folder the workbench uses for its ledgers).
std::string userDataFolder();
std::string defaultSigningKeyPath();
std::string defaultTrustedKeysPath();

}  // namespace siftwave::ledger
