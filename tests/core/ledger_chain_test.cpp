// The hash chain: every edit, deletion, insertion or reordering is detected and named.
#include "ledger_test_support.h"

#include "siftwave/ledger/ledger_file.h"

#include <gtest/gtest.h>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;

class Chain : public ::testing::Test {
protected:
    void SetUp() override {
        drop = makeDrop({"N1", "N2"}, {"cases"}, "2026-03-01", 8);
        setSeries(drop, 0, 0, {3, 4, 0, 0, 60, 5, 6, 7});
        setSeries(drop, 0, 1, {1, 1, 1, 1, 1, 1, 1, 1});
        Cleaned cleaned(drop);
        record(drop, ledger, cleaned,
               redistribution("N1", "2026-03-05", 50, "2026-03-01", "2026-03-04",
                              RedistributeMethod::Uniform),
               "backlog after the holiday, confirmed by phone");
        Decision accept;
        accept.kind = DecisionKind::Accept;
        accept.region = "N2";
        record(drop, ledger, cleaned, accept, "flat series is real: weekly batch");
        record(drop, ledger, cleaned, withdrawal(1), "the office withdrew its statement");
    }
    Status verify(const Ledger& l) { return verifyChain(l); }

    Drop drop;
    Ledger ledger;
};

TEST_F(Chain, AnIntactLedgerVerifiesAndReplays) {
    EXPECT_TRUE(verify(ledger).ok());
    auto cleaned = replay(drop, ledger);
    ASSERT_TRUE(cleaned.ok()) << cleaned.error().describe();
    EXPECT_EQ(values(*cleaned, 0, 0), (std::vector<std::int64_t>{3, 4, 0, 0, 60, 5, 6, 7}));
}

TEST_F(Chain, TheFirstEntryLinksToTheGenesisHashAndEachToItsPredecessor) {
    EXPECT_EQ(ledger.entries[0].previousHash, std::string(64, '0'));
    EXPECT_EQ(ledger.entries[1].previousHash, ledger.entries[0].hash);
    EXPECT_EQ(ledger.entries[2].previousHash, ledger.entries[1].hash);
    EXPECT_EQ(ledger.headHash(), ledger.entries[2].hash);
}

TEST_F(Chain, EditingAnyFieldIsDetectedAndNamesTheEntry) {
    Ledger edited = ledger;
    edited.entries[1].reason = "changed afterwards";
    auto s = verify(edited);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().code, ErrorCode::Integrity);
    EXPECT_EQ(s.error().message.rfind("entry 2:", 0), 0u) << s.error().message;

    edited = ledger;
    edited.entries[0].effect.cells[0].after.value += 1;
    auto cells = verify(edited);
    ASSERT_FALSE(cells.ok());
    EXPECT_EQ(cells.error().message.rfind("entry 1:", 0), 0u);
}

TEST_F(Chain, DeletingAnEntryIsDetected) {
    Ledger shortened = ledger;
    shortened.entries.erase(shortened.entries.begin() + 1);
    auto s = verify(shortened);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().message.rfind("entry 2:", 0), 0u) << s.error().message;
}

TEST_F(Chain, ReorderingEntriesIsDetected) {
    Ledger reordered = ledger;
    std::swap(reordered.entries[0], reordered.entries[1]);
    auto s = verify(reordered);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().message.rfind("entry 1:", 0), 0u) << s.error().message;
}

TEST_F(Chain, RenumberedAndResealedEntryStillBreaksTheLinkOfItsSuccessor) {
    // Someone edits entry 2 and recomputes its hash: entry 3 no longer links to it.
    Ledger forged = ledger;
    forged.entries[1].reason = "forged";
    ASSERT_TRUE(sealEntry(forged.entries[1], &forged.entries[0]).ok());
    auto s = verify(forged);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().message.rfind("entry 3:", 0), 0u) << s.error().message;
}

TEST_F(Chain, ReplayRefusesALedgerOfAnotherDrop) {
    Drop other = drop;
    other.source.sha256 = std::string(64, 'c');
    auto r = replay(other, ledger);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Integrity);
}

TEST_F(Chain, ReplayRefusesAConsistentlyResealedLedgerWhoseCellsDoNotFollowFromItsDecision) {
    // A forger who rewrites the cells and reseals the whole chain still fails: replay
    // re-derives each entry's cells from its decision and the drop.
    Ledger forged = ledger;
    forged.entries[0].effect.cells[0].after.value += 1;
    forged.entries[0].effect.cells[1].after.value -= 1;
    for (std::size_t i = 0; i < forged.entries.size(); ++i) {
        ASSERT_TRUE(sealEntry(forged.entries[i], i ? &forged.entries[i - 1] : nullptr).ok());
    }
    EXPECT_TRUE(verify(forged).ok());
    auto r = replay(drop, forged);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Integrity);
    EXPECT_EQ(r.error().message.rfind("entry 1:", 0), 0u) << r.error().message;
}

TEST_F(Chain, EntryLinesRoundTripThroughTheirCanonicalJson) {
    for (const LedgerEntry& e : ledger.entries) {
        auto line = entryLine(e);
        ASSERT_TRUE(line.ok());
        EXPECT_EQ(line->find('\n'), std::string::npos);
        auto back = parseEntryLine(*line, e.sequence);
        ASSERT_TRUE(back.ok()) << back.error().describe();
        auto again = entryLine(*back);
        ASSERT_TRUE(again.ok());
        EXPECT_EQ(*again, *line);
    }
}

TEST_F(Chain, CanonicalJsonSortsKeysAndHasNoWhitespaceOrFloatingPoint) {
    auto text = canonicalEntryJson(ledger.entries[0]);
    ASSERT_TRUE(text.ok());
    EXPECT_EQ(text->rfind("{\"author\":\"tester\",\"cells\":[{\"after\":{\"state\":", 0), 0u)
        << *text;
    EXPECT_EQ(text->find("\"hash\":"), std::string::npos);
    EXPECT_EQ(text->find(": "), std::string::npos);
    EXPECT_EQ(text->find('.'), std::string::npos);  // no decimal points anywhere in this entry
}

TEST_F(Chain, UnknownFieldsInALineAreRefused) {
    auto line = entryLine(ledger.entries[0]);
    ASSERT_TRUE(line.ok());
    std::string extra = *line;
    extra.insert(1, "\"note\":\"x\",");
    auto r = parseEntryLine(extra, 1);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Syntax);
}

}  // namespace
}  // namespace siftwave::ledger
