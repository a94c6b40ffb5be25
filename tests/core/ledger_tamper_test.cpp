// Tampering with a ledger by someone who recomputes the hashes: each attack of the reliability
// issue, with no anchor, with a head recorded before the attack (anchor.h), and with entries
// signed by a trusted key (signing.h). The chain alone cannot catch a consistent reseal; the
// test pins that limitation too, so the documentation stays true.
#include "ledger_test_support.h"

#include "siftwave/ledger/anchor.h"
#include "siftwave/ledger/signing.h"
#include "siftwave/sha256.h"

#include <gtest/gtest.h>

#include <functional>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;

/// Recomputes every hash from entry `from` (0-based) on, as a forger without the key would.
void resealFrom(Ledger& ledger, std::size_t from) {
    for (std::size_t i = from; i < ledger.entries.size(); ++i) {
        ledger.entries[i].sequence = i + 1;
        ledger.entries[i].signature.reset();  // a kept signature would no longer match
        ASSERT_TRUE(sealEntry(ledger.entries[i], i == 0 ? nullptr : &ledger.entries[i - 1]).ok());
    }
}

struct Attack {
    const char* name;
    std::function<void(Ledger&)> apply;
    AnchorOutcome withHead;  // what a head recorded before the attack shows
};

std::vector<Attack> attacks() {
    return {
        {"change a reason",
         [](Ledger& l) {
             l.entries[1].reason = "typed in later";
             resealFrom(l, 1);
         },
         AnchorOutcome::Missing},
        {"change an author",
         [](Ledger& l) {
             l.entries[1].author = "someone else";
             resealFrom(l, 1);
         },
         AnchorOutcome::Missing},
        {"backdate an entry",
         [](Ledger& l) {
             l.entries[2].timestamp = "2026-03-01T08:00:00Z";
             resealFrom(l, 2);
         },
         AnchorOutcome::Missing},
        {"delete a middle entry and renumber",
         [](Ledger& l) {
             l.entries.erase(l.entries.begin() + 1);
             resealFrom(l, 1);
         },
         AnchorOutcome::Missing},
        {"drop the last entry", [](Ledger& l) { l.entries.pop_back(); }, AnchorOutcome::Missing},
        {"forge an appended entry",
         [](Ledger& l) {
             LedgerEntry forged = l.entries.back();
             forged.sequence = l.entries.size() + 1;
             forged.reason = "forged";
             forged.signature.reset();
             ASSERT_TRUE(sealEntry(forged, &l.entries.back()).ok());
             l.entries.push_back(forged);
         },
         AnchorOutcome::Extended},
    };
}

class Tamper : public ::testing::Test {
protected:
    void SetUp() override {
        drop = makeDrop({"N1", "N2"}, {"cases"}, "2026-03-01", 8);
        setSeries(drop, 0, 0, {3, 4, 0, 0, 60, 5, 6, 7});
        setSeries(drop, 0, 1, {1, 1, 1, 1, 1, 1, 1, 1});
        Cleaned cleaned(drop);
        Decision accept;
        accept.kind = DecisionKind::Accept;
        accept.region = "N2";
        record(drop, ledger, cleaned, accept, "flat series is real: weekly batch");
        Decision accept1 = accept;
        accept1.region = "N1";
        record(drop, ledger, cleaned, accept1, "checked with the office");
        record(drop, ledger, cleaned, withdrawal(2), "the office withdrew its statement");
        record(drop, ledger, cleaned, withdrawal(1), "batch turned out to be late reports");
        key = *SigningKey::generate();
    }
    /// The same ledger with every entry signed by `key`, sealed in order.
    Ledger signedCopy() const {
        Ledger l = ledger;
        for (std::size_t i = 0; i < l.entries.size(); ++i) {
            EXPECT_TRUE(sealEntry(l.entries[i], i == 0 ? nullptr : &l.entries[i - 1]).ok());
            EXPECT_TRUE(signEntry(l.entries[i], key).ok());
        }
        return l;
    }
    Drop drop;
    Ledger ledger;
    SigningKey key;
};

TEST_F(Tamper, WithoutAnAnchorAConsistentResealPassesTheChainCheck) {
    // The limitation the verify output states ("not that nobody edited an entry and
    // recomputed the hashes"): each attack leaves a valid chain.
    for (const Attack& a : attacks()) {
        Ledger l = ledger;
        a.apply(l);
        EXPECT_TRUE(verifyChain(l).ok()) << a.name;
    }
}

TEST_F(Tamper, AHeadRecordedBeforeTheAttackCatchesEveryOne) {
    const std::string recorded = ledger.headHash();
    for (const Attack& a : attacks()) {
        Ledger l = ledger;
        a.apply(l);
        auto check = checkAnchor(l, recorded);
        ASSERT_TRUE(check.ok()) << a.name;
        EXPECT_EQ(check->outcome, a.withHead) << a.name << ": " << check->describe();
        if (a.withHead == AnchorOutcome::Extended) {
            EXPECT_EQ(check->entry, ledger.entries.size()) << a.name;
            EXPECT_EQ(check->unanchored, 1u) << a.name;
            EXPECT_NE(check->describe().find("does not cover"), std::string::npos);
        } else {
            EXPECT_NE(check->describe().find("no entry has the recorded head"), std::string::npos);
        }
    }
    // The printed prefix (16 hex digits) is enough, in either case.
    std::string printed = printedHead(ledger);
    for (char& c : printed)
        c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    EXPECT_EQ(checkAnchor(ledger, printed)->outcome, AnchorOutcome::AtHead);
    EXPECT_FALSE(checkAnchor(ledger, recorded.substr(0, 12)).ok());  // too short to be checked
    EXPECT_FALSE(checkAnchor(ledger, "zz" + recorded.substr(2)).ok());
}

TEST_F(Tamper, TrustedSignaturesCatchEveryAttackButACutEnd) {
    const Ledger original = signedCopy();
    ASSERT_TRUE(verifyChain(original).ok());
    const std::vector<TrustedKey> trusted{TrustedKey{key.publicKeyHex(), "ana"}};
    for (const Attack& a : attacks()) {
        Ledger l = original;
        a.apply(l);
        ASSERT_TRUE(verifyChain(l).ok()) << a.name;
        std::size_t notTrusted = 0;
        for (const SignatureCheck& c : checkSignatures(l, trusted))
            notTrusted += c.state != SignatureState::Trusted;
        if (std::string(a.name) == "drop the last entry")
            EXPECT_EQ(notTrusted, 0u) << "signatures cannot show a cut end; the head can";
        else
            EXPECT_GE(notTrusted, 1u) << a.name;
    }
}

TEST_F(Tamper, ReSigningWithTheForgersOwnKeyShowsAnUnknownKey) {
    Ledger l = signedCopy();
    l.entries[1].reason = "typed in later";
    const SigningKey forger = *SigningKey::generate();
    for (std::size_t i = 1; i < l.entries.size(); ++i) {
        ASSERT_TRUE(sealEntry(l.entries[i], &l.entries[i - 1]).ok());
        ASSERT_TRUE(signEntry(l.entries[i], forger).ok());
    }
    ASSERT_TRUE(verifyChain(l).ok());
    const auto checks = checkSignatures(l, {TrustedKey{key.publicKeyHex(), "ana"}});
    EXPECT_EQ(checks[0].state, SignatureState::Trusted);
    for (std::size_t i = 1; i < checks.size(); ++i)
        EXPECT_EQ(checks[i].state, SignatureState::UnknownKey) << i;
}

TEST_F(Tamper, KeepingTheOldSignatureOnAnEditedEntryBreaksTheChain) {
    Ledger l = signedCopy();
    l.entries[2].timestamp = "2026-03-01T08:00:00Z";  // backdated, signature kept
    for (std::size_t i = 2; i < l.entries.size(); ++i) {
        auto signature = l.entries[i].signature;
        l.entries[i].signature.reset();
        ASSERT_TRUE(sealEntry(l.entries[i], &l.entries[i - 1]).ok());
        l.entries[i].signature = signature;
        l.entries[i].hash = sha256Hex(*canonicalEntryJson(l.entries[i]));
    }
    const Status s = verifyChain(l);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().line, 3u);
}

}  // namespace
}  // namespace siftwave::ledger
