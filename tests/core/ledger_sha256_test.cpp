// The ledger's hash chain rests on SHA-256 (sha256Hex, shared with ingest); check it
// against the published example vectors.
#include "siftwave/sha256.h"

#include <gtest/gtest.h>

#include <string>

namespace siftwave {
namespace {

// FIPS 180-2, Appendix B.1 "SHA-256 Example (One-Block Message)": "abc".
TEST(LedgerSha256, MatchesTheFips180OneBlockExample) {
    EXPECT_EQ(sha256Hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

// FIPS 180-2, Appendix B.2 "SHA-256 Example (Multi-Block Message)".
TEST(LedgerSha256, MatchesTheFips180MultiBlockExample) {
    EXPECT_EQ(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
              "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
}

// FIPS 180-2, Appendix B.3 "SHA-256 Example (Long Message)": one million 'a'.
TEST(LedgerSha256, MatchesTheFips180LongMessageExample) {
    EXPECT_EQ(sha256Hex(std::string(1'000'000, 'a')),
              "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

// The empty message, from the NIST CSRC "Example Values" for SHA-256 (SHA256.pdf),
// value quoted from memory.
TEST(LedgerSha256, MatchesTheEmptyMessageValue) {
    EXPECT_EQ(sha256Hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

}  // namespace
}  // namespace siftwave
