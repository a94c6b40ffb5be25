#include "siftwave/sha256.h"
#include "common/sha256.h"

#include <openssl/evp.h>

namespace siftwave::detail {

Sha256::Sha256() : m_ctx(EVP_MD_CTX_new()) {
    if (m_ctx)
        EVP_DigestInit_ex(m_ctx, EVP_sha256(), nullptr);
}

Sha256::~Sha256() {
    EVP_MD_CTX_free(m_ctx);
}

void Sha256::update(const char* data, std::size_t size) {
    if (m_ctx && size > 0)
        EVP_DigestUpdate(m_ctx, data, size);
}

std::string Sha256::hexDigest() {
    unsigned char digest[EVP_MAX_MD_SIZE];
    unsigned int length = 0;
    if (!m_ctx || EVP_DigestFinal_ex(m_ctx, digest, &length) != 1)
        return {};
    static const char* hex = "0123456789abcdef";
    std::string out;
    out.reserve(length * 2);
    for (unsigned int i = 0; i < length; ++i) {
        out += hex[digest[i] >> 4];
        out += hex[digest[i] & 15];
    }
    EVP_DigestInit_ex(m_ctx, EVP_sha256(), nullptr);
    return out;
}

}  // namespace siftwave::detail

namespace siftwave {

std::string sha256Hex(std::string_view bytes) {
    detail::Sha256 sha;
    sha.update(bytes.data(), bytes.size());
    return sha.hexDigest();
}

bool isSha256Hex(std::string_view text) {
    if (text.size() != 64)
        return false;
    for (char c : text) {
        if (!((c >= '0' && c <= '9') || (c >= 'a' && c <= 'f')))
            return false;
    }
    return true;
}

}  // namespace siftwave
