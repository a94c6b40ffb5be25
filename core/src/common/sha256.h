#pragma once
// Incremental SHA-256 for the reader, which hashes a file while it scans it.

#include <openssl/types.h>

#include <cstddef>
#include <string>

namespace siftwave::detail {

/// Incremental SHA-256 over OpenSSL's EVP interface.
class Sha256 {
public:
    Sha256();
    ~Sha256();
    Sha256(const Sha256&) = delete;
    Sha256& operator=(const Sha256&) = delete;
    void update(const char* data, std::size_t size);
    /// The digest of everything updated so far, as lower-case hex; starts a new hash.
    std::string hexDigest();

private:
    EVP_MD_CTX* m_ctx;
};

}  // namespace siftwave::detail
