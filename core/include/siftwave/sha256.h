#pragma once
// SHA-256 (FIPS 180-4) over OpenSSL's libcrypto: the hash that names a drop and chains the
// ledger's entries. Shared by ingest (the file's hash) and the ledger (entry hashes, checks).

#include <string>
#include <string_view>

namespace siftwave {

/// Lower-case hex SHA-256 of a byte string.
std::string sha256Hex(std::string_view bytes);

/// True when `text` is 64 lower-case hex digits, the form sha256Hex() writes.
bool isSha256Hex(std::string_view text);

}  // namespace siftwave
