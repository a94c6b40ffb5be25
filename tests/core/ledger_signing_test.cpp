// Ed25519 signatures of ledger entries, the trusted-keys file and the user's key file.
#include "ledger_test_support.h"
#include "support/temp_path.h"

#include "siftwave/ledger/signing.h"

#include <gtest/gtest.h>

#include <sys/stat.h>
#include <filesystem>
#include <fstream>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;

// RFC 8032 (Edwards-Curve Digital Signature Algorithm), section 7.1, TEST 1 and TEST 2: the
// published secret keys, public keys and signatures of the empty message and of the byte 0x72.
TEST(Ed25519, MatchesTheTestVectorsOfRfc8032) {
    struct Vector {
        const char* secret;
        const char* publicKey;
        std::string message;
        const char* signature;
    };
    const Vector vectors[] = {
        {"9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60",
         "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a", "",
         "e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e3970"
         "1cf9b46bd25bf5f0595bbe24655141438e7a100b"},
        {"4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb",
         "3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c", "\x72",
         "92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613"
         "d0f11d8c387b2eaeb4302aeeb00d291612bb0c00"},
    };
    for (const Vector& v : vectors) {
        auto key = SigningKey::fromPrivateHex(v.secret);
        ASSERT_TRUE(key.ok());
        EXPECT_EQ(key->publicKeyHex(), v.publicKey);
        auto signature = key->sign(v.message);
        ASSERT_TRUE(signature.ok());
        EXPECT_EQ(*signature, v.signature);
        EXPECT_TRUE(verifySignature(v.publicKey, v.message, v.signature));
        EXPECT_FALSE(verifySignature(v.publicKey, v.message + "x", v.signature));
    }
}

class SignedLedger : public ::testing::Test {
protected:
    void SetUp() override {
        drop = makeDrop({"N1"}, {"cases"}, "2026-03-01", 6);
        setSeries(drop, 0, 0, {3, 4, 0, 40, 5, 6});
        Cleaned cleaned(drop);
        record(drop, ledger, cleaned,
               redistribution("N1", "2026-03-04", 30, "2026-03-01", "2026-03-03",
                              RedistributeMethod::Uniform),
               "backlog after the holiday");
        key = *SigningKey::generate();
    }
    Drop drop;
    Ledger ledger;
    SigningKey key;
};

TEST_F(SignedLedger, ASignedEntryVerifiesAndItsHashCoversTheSignature) {
    LedgerEntry& e = ledger.entries[0];
    const std::string unsignedHash = e.hash;
    ASSERT_TRUE(signEntry(e, key).ok());
    ASSERT_TRUE(e.signature.has_value());
    EXPECT_EQ(e.signature->publicKey, key.publicKeyHex());
    EXPECT_NE(e.hash, unsignedHash);
    EXPECT_TRUE(signatureMatches(e));
    EXPECT_TRUE(verifyChain(ledger).ok());
    // The line round-trips with its signature.
    auto line = entryLine(e);
    ASSERT_TRUE(line.ok());
    auto back = parseEntryLine(*line, 1);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    ASSERT_TRUE(back->signature.has_value());
    EXPECT_EQ(back->signature->value, e.signature->value);
    EXPECT_EQ(back->hash, e.hash);
}

TEST_F(SignedLedger, AnEditAfterSigningIsCaughtEvenWhenTheHashIsRecomputed) {
    LedgerEntry& e = ledger.entries[0];
    ASSERT_TRUE(signEntry(e, key).ok());
    e.reason = "a different story";
    ASSERT_TRUE(sealEntry(e, nullptr).ok());  // the hash is right again; the signature is not
    const Status s = verifyChain(ledger);
    ASSERT_FALSE(s.ok());
    EXPECT_NE(s.error().message.find("signature does not match"), std::string::npos);
}

TEST_F(SignedLedger, TrustDecidesWhoSignedNotTheSignatureAlone) {
    ASSERT_TRUE(signEntry(ledger.entries[0], key).ok());
    const std::vector<SignatureCheck> unknown = checkSignatures(ledger, {});
    ASSERT_EQ(unknown.size(), 1u);
    EXPECT_EQ(unknown[0].state, SignatureState::UnknownKey);
    EXPECT_NE(describeSignatures(unknown).find("proves nothing"), std::string::npos);
    const std::vector<SignatureCheck> trusted =
        checkSignatures(ledger, {TrustedKey{key.publicKeyHex(), "ana"}});
    EXPECT_EQ(trusted[0].state, SignatureState::Trusted);
    EXPECT_EQ(trusted[0].holder, "ana");
    EXPECT_EQ(describeSignatures(trusted), "1 of 1 entry signed by trusted keys (ana: 1)");
}

TEST(SigningKeyFile, IsWrittenForItsOwnerOnlyAndNeverOverwritten) {
    const std::string folder = testTempPath("signing-key").string();
    const std::string path = folder + "/keys/signing-key.pem";
    auto key = SigningKey::generate();
    ASSERT_TRUE(key.ok());
    ASSERT_TRUE(key->save(path).ok());
    struct stat st {};
    ASSERT_EQ(::stat(path.c_str(), &st), 0);
    EXPECT_EQ(st.st_mode & 0777, 0600u);
    auto loaded = SigningKey::load(path);
    ASSERT_TRUE(loaded.ok());
    EXPECT_EQ(loaded->publicKeyHex(), key->publicKeyHex());
    std::filesystem::create_directories(folder);
    auto other = SigningKey::generate();
    EXPECT_FALSE(other->save(path).ok());  // the first key stays
    EXPECT_EQ(SigningKey::load(path)->publicKeyHex(), key->publicKeyHex());
    std::ofstream(folder + "/not-a-key.pem") << "-----BEGIN NOTHING-----\n";
    EXPECT_FALSE(SigningKey::load(folder + "/not-a-key.pem").ok());
}

TEST(TrustedKeysFile, ReadsKeysWithHoldersAndNamesTheBadLine) {
    const std::string folder = testTempPath("trusted-keys").string();
    std::filesystem::create_directories(folder);
    const std::string good = folder + "/trusted.txt";
    std::ofstream(good) << "# the regional team\n"
                           "D75A980182B10AB7D54BFED3C964073A0EE172F3DAA62325AF021A68F707511A ana "
                           "k.\n\n"
                           "3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c ben\n";
    auto keys = readTrustedKeys(good);
    ASSERT_TRUE(keys.ok()) << keys.error().describe();
    ASSERT_EQ(keys->size(), 2u);
    EXPECT_EQ((*keys)[0].publicKey,
              "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a");
    EXPECT_EQ((*keys)[0].holder, "ana k.");
    const std::string bad = folder + "/bad.txt";
    std::ofstream(bad) << "3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c ben\n"
                          "d75a98 short\n";
    auto refused = readTrustedKeys(bad);
    ASSERT_FALSE(refused.ok());
    EXPECT_EQ(refused.error().line, 2u);
    EXPECT_TRUE(readTrustedKeys(folder + "/missing.txt")->empty());
}

}  // namespace
}  // namespace siftwave::ledger
