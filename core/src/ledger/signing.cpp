// Ed25519 signatures of ledger entries through OpenSSL's EVP interface (RFC 8032 via
// EVP_PKEY_ED25519), and the trusted-keys file.
#include "siftwave/ledger/signing.h"

#include "ledger/file_io.h"
#include "siftwave/sha256.h"

#include <openssl/evp.h>
#include <openssl/pem.h>

#include <fcntl.h>
#include <unistd.h>
#include <cctype>
#include <cerrno>
#include <cstdlib>
#include <filesystem>
#include <map>

namespace siftwave::ledger {
namespace {

using KeyPtr = std::unique_ptr<EVP_PKEY, decltype(&EVP_PKEY_free)>;
using MdCtxPtr = std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)>;
using BioPtr = std::unique_ptr<BIO, decltype(&BIO_free)>;

std::string toHex(const unsigned char* bytes, std::size_t size) {
    static const char* digits = "0123456789abcdef";
    std::string out;
    out.reserve(size * 2);
    for (std::size_t i = 0; i < size; ++i) {
        out += digits[bytes[i] >> 4];
        out += digits[bytes[i] & 15];
    }
    return out;
}

/// Bytes from lower- or upper-case hex of exactly `size` bytes; empty on any other text.
std::vector<unsigned char> fromHex(std::string_view hex, std::size_t size) {
    auto nibble = [](char c) -> int {
        if (c >= '0' && c <= '9')
            return c - '0';
        if (c >= 'a' && c <= 'f')
            return c - 'a' + 10;
        if (c >= 'A' && c <= 'F')
            return c - 'A' + 10;
        return -1;
    };
    if (hex.size() != size * 2)
        return {};
    std::vector<unsigned char> out(size);
    for (std::size_t i = 0; i < size; ++i) {
        const int hi = nibble(hex[2 * i]);
        const int lo = nibble(hex[2 * i + 1]);
        if (hi < 0 || lo < 0)
            return {};
        out[i] = static_cast<unsigned char>(hi * 16 + lo);
    }
    return out;
}

Error keyError(const std::string& message, const std::string& path = {}) {
    Error e = makeError(ErrorCode::Integrity, message);
    e.file = path;
    return e;
}

std::string signedMessage(const std::string& canonical) {
    return std::string(kSignatureContext) + canonical;
}

std::string envOr(const char* name) {
    const char* v = std::getenv(name);
    return v ? std::string(v) : std::string();
}

}  // namespace

Result<SigningKey> SigningKey::generate() {
    EVP_PKEY* raw = EVP_PKEY_Q_keygen(nullptr, nullptr, "ED25519");
    if (!raw)
        return keyError("OpenSSL could not make an Ed25519 key");
    SigningKey key;
    key.m_key =
        std::shared_ptr<void>(raw, [](void* p) { EVP_PKEY_free(static_cast<EVP_PKEY*>(p)); });
    return key;
}

Result<SigningKey> SigningKey::fromPrivateHex(std::string_view hex) {
    const std::vector<unsigned char> bytes = fromHex(hex, 32);
    if (bytes.empty())
        return makeError(ErrorCode::Usage, "an Ed25519 private key is 64 hex digits");
    EVP_PKEY* raw =
        EVP_PKEY_new_raw_private_key(EVP_PKEY_ED25519, nullptr, bytes.data(), bytes.size());
    if (!raw)
        return keyError("OpenSSL refused the Ed25519 private key");
    SigningKey key;
    key.m_key =
        std::shared_ptr<void>(raw, [](void* p) { EVP_PKEY_free(static_cast<EVP_PKEY*>(p)); });
    return key;
}

Result<SigningKey> SigningKey::load(const std::string& path) {
    auto bytes = detail::readWholeFile(path);
    if (!bytes)
        return bytes.error();
    BioPtr bio(BIO_new_mem_buf(bytes->data(), static_cast<int>(bytes->size())), &BIO_free);
    EVP_PKEY* raw = bio ? PEM_read_bio_PrivateKey(bio.get(), nullptr, nullptr, nullptr) : nullptr;
    if (!raw || EVP_PKEY_get_id(raw) != EVP_PKEY_ED25519) {
        EVP_PKEY_free(raw);
        return keyError(
            "this is not an Ed25519 private key in PEM form (siftwave-cli "
            "signing-key --create makes one)",
            path);
    }
    SigningKey key;
    key.m_key =
        std::shared_ptr<void>(raw, [](void* p) { EVP_PKEY_free(static_cast<EVP_PKEY*>(p)); });
    return key;
}

Status SigningKey::save(const std::string& path) const {
    BioPtr bio(BIO_new(BIO_s_mem()), &BIO_free);
    if (!bio || PEM_write_bio_PrivateKey(bio.get(), static_cast<EVP_PKEY*>(m_key.get()), nullptr,
                                         nullptr, 0, nullptr, nullptr) != 1)
        return keyError("OpenSSL could not write the key", path);
    char* data = nullptr;
    const long size = BIO_get_mem_data(bio.get(), &data);
    std::error_code ec;
    const std::filesystem::path folder = std::filesystem::path(path).parent_path();
    if (!folder.empty())
        std::filesystem::create_directories(folder, ec);
    // O_EXCL: an existing key is never overwritten; 0600: only its owner can read it.
    const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
    if (fd < 0)
        return detail::ioError(path, errno == EEXIST ? "a key is already there; it is kept"
                                                     : "cannot create the key file");
    const bool written =
        detail::writeAll(fd, std::string_view(data, static_cast<std::size_t>(size)));
    const bool synced = ::fsync(fd) == 0;
    if (::close(fd) != 0 || !written || !synced)
        return detail::ioError(path, "cannot write the key file");
    return Ok{};
}

std::string SigningKey::publicKeyHex() const {
    unsigned char bytes[32];
    std::size_t size = sizeof bytes;
    if (!m_key ||
        EVP_PKEY_get_raw_public_key(static_cast<EVP_PKEY*>(m_key.get()), bytes, &size) != 1)
        return {};
    return toHex(bytes, size);
}

Result<std::string> SigningKey::sign(std::string_view message) const {
    MdCtxPtr ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
    unsigned char signature[64];
    std::size_t size = sizeof signature;
    if (!ctx || !m_key ||
        EVP_DigestSignInit(ctx.get(), nullptr, nullptr, nullptr,
                           static_cast<EVP_PKEY*>(m_key.get())) != 1 ||
        EVP_DigestSign(ctx.get(), signature, &size,
                       reinterpret_cast<const unsigned char*>(message.data()), message.size()) != 1)
        return keyError("OpenSSL could not sign");
    return toHex(signature, size);
}

bool verifySignature(std::string_view publicKeyHex, std::string_view message,
                     std::string_view signatureHex) {
    const std::vector<unsigned char> key = fromHex(publicKeyHex, 32);
    const std::vector<unsigned char> signature = fromHex(signatureHex, 64);
    if (key.empty() || signature.empty())
        return false;
    KeyPtr pub(EVP_PKEY_new_raw_public_key(EVP_PKEY_ED25519, nullptr, key.data(), key.size()),
               &EVP_PKEY_free);
    MdCtxPtr ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
    return pub && ctx &&
           EVP_DigestVerifyInit(ctx.get(), nullptr, nullptr, nullptr, pub.get()) == 1 &&
           EVP_DigestVerify(ctx.get(), signature.data(), signature.size(),
                            reinterpret_cast<const unsigned char*>(message.data()),
                            message.size()) == 1;
}

Status signEntry(LedgerEntry& entry, const SigningKey& key) {
    entry.signature.reset();
    auto content = signedEntryJson(entry);
    if (!content)
        return content.error();
    auto value = key.sign(signedMessage(*content));
    if (!value)
        return value.error();
    entry.signature = EntrySignature{key.publicKeyHex(), *value};
    auto hashed = canonicalEntryJson(entry);
    if (!hashed)
        return hashed.error();
    entry.hash = sha256Hex(*hashed);
    return Ok{};
}

bool signatureMatches(const LedgerEntry& entry) {
    if (!entry.signature)
        return false;
    auto content = signedEntryJson(entry);
    return content && verifySignature(entry.signature->publicKey, signedMessage(*content),
                                      entry.signature->value);
}

Result<std::vector<TrustedKey>> readTrustedKeys(const std::string& path) {
    std::error_code ec;
    if (!std::filesystem::exists(path, ec))
        return std::vector<TrustedKey>{};
    auto bytes = detail::readWholeFile(path);
    if (!bytes)
        return bytes.error();
    std::vector<TrustedKey> keys;
    std::size_t pos = 0;
    for (std::uint64_t line = 1; pos < bytes->size(); ++line) {
        std::size_t end = bytes->find('\n', pos);
        if (end == std::string::npos)
            end = bytes->size();
        std::string text = bytes->substr(pos, end - pos);
        pos = end + 1;
        text = text.substr(0, text.find('#'));
        const std::size_t first = text.find_first_not_of(" \t\r");
        if (first == std::string::npos)
            continue;
        const std::size_t space = text.find_first_of(" \t", first);
        const std::string hex =
            text.substr(first, space == std::string::npos ? std::string::npos : space - first);
        std::string holder = space == std::string::npos ? std::string() : text.substr(space);
        holder.erase(0, holder.find_first_not_of(" \t"));
        holder.erase(holder.find_last_not_of(" \t\r") + 1);
        if (fromHex(hex, 32).empty() || holder.empty()) {
            Error e = makeError(ErrorCode::Syntax,
                                "a trusted key is 64 hex digits, a space and the holder's name");
            e.file = path;
            e.line = line;
            return e;
        }
        std::string lower = hex;
        for (char& c : lower)
            c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
        keys.push_back(TrustedKey{lower, holder});
    }
    return keys;
}

Result<std::vector<TrustedKey>> userTrust(const std::string& trustedPath,
                                          const std::string& ownKeyPath) {
    auto keys = readTrustedKeys(trustedPath);
    if (!keys)
        return keys;
    std::error_code ec;
    if (std::filesystem::exists(ownKeyPath, ec)) {
        auto own = SigningKey::load(ownKeyPath);
        if (!own)
            return own.error();
        keys->push_back(TrustedKey{own->publicKeyHex(), "you"});
    }
    return keys;
}

std::vector<SignatureCheck> checkSignatures(const Ledger& ledger,
                                            const std::vector<TrustedKey>& trusted) {
    std::map<std::string, std::string> holders;
    for (const TrustedKey& k : trusted)
        holders.emplace(k.publicKey, k.holder);
    std::vector<SignatureCheck> out;
    for (const LedgerEntry& e : ledger.entries) {
        SignatureCheck check;
        check.entry = e.sequence;
        if (e.signature) {
            check.keyId = e.signature->publicKey.substr(0, 16);
            const auto it = holders.find(e.signature->publicKey);
            check.state =
                it == holders.end() ? SignatureState::UnknownKey : SignatureState::Trusted;
            if (it != holders.end())
                check.holder = it->second;
        }
        out.push_back(std::move(check));
    }
    return out;
}

std::string describeSignatures(const std::vector<SignatureCheck>& checks) {
    std::map<std::string, std::size_t> byHolder;
    std::size_t trusted = 0, unknown = 0, unsignedCount = 0;
    for (const SignatureCheck& c : checks) {
        if (c.state == SignatureState::Trusted) {
            ++trusted;
            ++byHolder[c.holder];
        } else if (c.state == SignatureState::UnknownKey) {
            ++unknown;
        } else {
            ++unsignedCount;
        }
    }
    std::string text = std::to_string(trusted) + " of " + std::to_string(checks.size()) +
                       (checks.size() == 1 ? " entry" : " entries") + " signed by trusted keys";
    if (!byHolder.empty()) {
        text += " (";
        for (auto it = byHolder.begin(); it != byHolder.end(); ++it)
            text += (it == byHolder.begin() ? "" : ", ") + it->first + ": " +
                    std::to_string(it->second);
        text += ")";
    }
    if (unknown > 0)
        text += "; " + std::to_string(unknown) +
                " signed by keys you do not trust, which proves nothing about who made them";
    if (unsignedCount > 0)
        text += "; " + std::to_string(unsignedCount) + " unsigned";
    return text;
}

std::string userDataFolder() {
    if (std::string dir = envOr("SIFTWAVE_DATA_DIR"); !dir.empty())
        return dir;
    if (std::string xdg = envOr("XDG_DATA_HOME"); !xdg.empty())
        return xdg + "/Siftwave/siftwave";
    const std::string home = envOr("HOME");
    return (home.empty() ? std::string(".") : home) + "/.local/share/Siftwave/siftwave";
}

std::string defaultSigningKeyPath() {
    return userDataFolder() + "/keys/signing-key.pem";
}

std::string defaultTrustedKeysPath() {
    return userDataFolder() + "/trusted-keys.txt";
}

}  // namespace siftwave::ledger
