// Each decision kind on a small hand-built drop, with values worked out by hand.
#include "ledger_test_support.h"

#include "siftwave/ledger/replay.h"

#include <gtest/gtest.h>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;
using V = std::vector<std::int64_t>;

class Decisions : public ::testing::Test {
protected:
    void SetUp() override {
        drop = makeDrop({"0412", "412", "A"}, {"cases"}, "2026-03-01", 10);
        setSeries(drop, 0, 0, {10, 12, 0, 0, 0, 95, 11, 10, -4, 9});
        setSeries(drop, 0, 1, {5, 0, 0, 0, 13, 0, 0, 0, 0, 0});
        for (int d = 1; d <= 3; ++d)
            setAbsent(drop, 0, 1, d);
        setSeries(drop, 0, 2, {20, 22, 24, 26, 28, 30, 32, 100, 34, 36});
        cleaned = Cleaned(drop);
    }
    Result<Effect> preview(const Decision& d) { return previewDecision(drop, cleaned, d); }

    Drop drop;
    Cleaned cleaned;
    Ledger ledger;
};

TEST_F(Decisions, UniformRedistributionSplitsByLargestRemainderAndKeepsTheTotal) {
    // 80 over 3 days: quotas 26.67 each, floors 26 (78), 2 left to the lowest indices (ties).
    record(drop, ledger, cleaned,
           redistribution("0412", "2026-03-06", 80, "2026-03-03", "2026-03-05",
                          RedistributeMethod::Uniform));
    EXPECT_EQ(values(cleaned, 0, 0), (V{10, 12, 27, 27, 26, 15, 11, 10, -4, 9}));
    EXPECT_EQ(cleaned.total(0, 0), 143);
    ASSERT_EQ(ledger.entries.size(), 1u);
    const Effect& e = ledger.entries[0].effect;
    ASSERT_EQ(e.cells.size(), 4u);
    EXPECT_EQ(e.cells[0].date, day("2026-03-03"));
    EXPECT_EQ(e.cells[0].before.value, 0);
    EXPECT_EQ(e.cells[0].after.value, 27);
    EXPECT_EQ(e.cells[3].before.value, 95);
    EXPECT_EQ(e.cells[3].after.value, 15);
    ASSERT_EQ(e.totals.size(), 1u);
    EXPECT_EQ(e.totals[0].before, 143);
    EXPECT_EQ(e.totals[0].after, 143);
}

TEST_F(Decisions, ProportionalRedistributionFollowsTheValuesInTheWindow) {
    // 11 over (10, 12): 110/22 = 5 and 132/22 = 6 exactly.
    record(drop, ledger, cleaned,
           redistribution("0412", "2026-03-06", 11, "2026-03-01", "2026-03-02",
                          RedistributeMethod::Proportional));
    EXPECT_EQ(values(cleaned, 0, 0), (V{15, 18, 0, 0, 0, 84, 11, 10, -4, 9}));
}

TEST_F(Decisions, ProportionalRedistributionOverAWindowOfZerosIsRefused) {
    auto r = preview(redistribution("0412", "2026-03-06", 11, "2026-03-03", "2026-03-05",
                                    RedistributeMethod::Proportional));
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("uniform"), std::string::npos) << r.error().message;
}

TEST_F(Decisions, BaselineRedistributionFollowsACentredMovingAverageWithoutTheDumpDay) {
    // Width 3 worked by hand: averages (26+28+30)/3 = 28, (28+30+32)/3 = 30, (30+32)/2 = 31
    // (the dump day 03-08 left out). 60 x 28/89 = 18.88, 60 x 30/89 = 20.22, 60 x 31/89 = 20.90:
    // floors 18, 20, 20 (58); the 2 left go to the remainders .90 and .88 -> 19, 20, 21.
    Decision d = redistribution("A", "2026-03-08", 60, "2026-03-05", "2026-03-07",
                                RedistributeMethod::Baseline);
    d.baselineWidth = 3;
    record(drop, ledger, cleaned, d);
    EXPECT_EQ(values(cleaned, 0, 2), (V{20, 22, 24, 26, 47, 50, 53, 40, 34, 36}));
    EXPECT_EQ(cleaned.total(0, 2), 352);  // unchanged
}

TEST_F(Decisions, RedistributingMoreThanTheDayHoldsIsRefusedAsAConservationError) {
    auto r = preview(redistribution("0412", "2026-03-06", 96, "2026-03-03", "2026-03-05",
                                    RedistributeMethod::Uniform));
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Conservation);
    EXPECT_EQ(r.error().region, "0412");
    EXPECT_EQ(r.error().date, "2026-03-06");
}

TEST_F(Decisions, RedistributionWindowMustComeBeforeTheDumpDay) {
    auto r = preview(redistribution("0412", "2026-03-06", 5, "2026-03-05", "2026-03-07",
                                    RedistributeMethod::Uniform));
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Usage);
}

TEST_F(Decisions, SpreadNegativeAbsorbsTheCorrectionInProportionToEarlierDays) {
    // 4 over the positive earlier days 10, 12, 95, 11, 10 (sum 138): quotas .29, .35, 2.75,
    // .32, .29 -> floors 0, 0, 2, 0, 0; the 2 left go to .75 (95) and .35 (12).
    Decision d;
    d.kind = DecisionKind::SpreadNegative;
    d.region = "0412";
    d.measure = "cases";
    d.date = day("2026-03-09");
    record(drop, ledger, cleaned, d);
    EXPECT_EQ(values(cleaned, 0, 0), (V{10, 11, 0, 0, 0, 92, 11, 10, 0, 9}));
    EXPECT_EQ(cleaned.total(0, 0), 143);
}

TEST_F(Decisions, SpreadNegativeThatWouldMakeDaysNegativeIsRefused) {
    Decision d;
    d.kind = DecisionKind::SpreadNegative;
    d.region = "0412";
    d.measure = "cases";
    d.date = day("2026-03-09");
    d.window = DayRange{day("2026-03-03"), day("2026-03-05")};  // all zeros
    auto r = preview(d);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Conservation);
    d.date = day("2026-03-08");  // 10, not negative
    d.window.reset();
    EXPECT_FALSE(preview(d).ok());
}

Decision fill(FillMethod method, const char* first = "2026-03-02",
              const char* last = "2026-03-04") {
    Decision d;
    d.kind = DecisionKind::FillMissing;
    d.region = "412";
    d.measure = "cases";
    d.window = DayRange{day(first), day(last)};
    d.fillMethod = method;
    return d;
}

TEST_F(Decisions, FillWithZeroStatesNoChangeOfTotal) {
    auto e = record(drop, ledger, cleaned, fill(FillMethod::Zero));
    EXPECT_EQ(values(cleaned, 0, 1), (V{5, 0, 0, 0, 13, 0, 0, 0, 0, 0}));
    EXPECT_EQ(cleaned.cell(0, 1, 1).state, CleanedState::Filled);
    EXPECT_EQ(e.effect.netChange(), 0);
}

TEST_F(Decisions, LinearFillInterpolatesAndStatesTheChange) {
    // Between 5 and 13 over 3 days: 7, 9, 11; the total rises by 27 and the entry says so.
    auto e = record(drop, ledger, cleaned, fill(FillMethod::Linear));
    EXPECT_EQ(values(cleaned, 0, 1), (V{5, 7, 9, 11, 13, 0, 0, 0, 0, 0}));
    ASSERT_EQ(e.effect.totals.size(), 1u);
    EXPECT_EQ(e.effect.totals[0].before, 18);
    EXPECT_EQ(e.effect.totals[0].after, 45);
}

TEST_F(Decisions, ShareFillSplitsTheCatchUpValueOverTheGapAndItself) {
    // 13 over 4 days: 3.25 each -> 3, 3, 3, 3 and the one left to the earliest day.
    record(drop, ledger, cleaned, fill(FillMethod::Share));
    EXPECT_EQ(values(cleaned, 0, 1), (V{5, 4, 3, 3, 3, 0, 0, 0, 0, 0}));
    EXPECT_EQ(cleaned.total(0, 1), 18);
}

TEST_F(Decisions, FillingADayThatHasAValueOrAGapAtTheEdgeIsRefused) {
    auto overlapping = preview(fill(FillMethod::Zero, "2026-03-02", "2026-03-05"));
    ASSERT_FALSE(overlapping.ok());
    EXPECT_EQ(overlapping.error().date, "2026-03-05");
    setAbsent(drop, 0, 1, 0);
    cleaned = Cleaned(drop);
    EXPECT_FALSE(preview(fill(FillMethod::Linear, "2026-03-01", "2026-03-04")).ok());
}

class Duplicates : public Decisions {
protected:
    void SetUp() override {
        Decisions::SetUp();
        drop.duplicates.push_back(DuplicateRow{0, 2, 0, Cell{25, 40, CellState::Reported}, 2});
        drop.duplicates.push_back(DuplicateRow{0, 2, 0, Cell{18, 41, CellState::Reported}, 2});
        cleaned = Cleaned(drop);
    }
    std::int64_t resolved(DuplicateRule rule) {
        Decision d;
        d.kind = DecisionKind::ResolveDuplicate;
        d.region = "A";
        d.measure = "cases";
        d.date = day("2026-03-01");
        d.duplicateRule = rule;
        auto e = preview(d);
        EXPECT_TRUE(e.ok());
        if (!e.ok() || e->cells.empty())
            return cleaned.cell(0, 2, 0).value;
        return e->cells[0].after.value;
    }
};

TEST_F(Duplicates, ResolveKeepsFirstLastSumOrMaxOfTheRepeatedRows) {
    EXPECT_EQ(resolved(DuplicateRule::First), 20);
    EXPECT_EQ(resolved(DuplicateRule::Last), 18);
    EXPECT_EQ(resolved(DuplicateRule::Sum), 63);
    EXPECT_EQ(resolved(DuplicateRule::Max), 25);
}

TEST_F(Duplicates, ResolvingADayWithoutDuplicatesIsRefused) {
    Decision d;
    d.kind = DecisionKind::ResolveDuplicate;
    d.region = "A";
    d.measure = "cases";
    d.date = day("2026-03-02");
    auto r = preview(d);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::NotFound);
}

Decision merge(const char* variant, const char* into) {
    Decision d;
    d.kind = DecisionKind::MergeCodes;
    d.variant = variant;
    d.into = into;
    return d;
}

TEST_F(Decisions, MergeCodesFoldsTheVariantIntoTheCanonicalCode) {
    auto e = record(drop, ledger, cleaned, merge("412", "0412"));
    EXPECT_EQ(values(cleaned, 0, 0), (V{15, 12, 0, 0, 13, 95, 11, 10, -4, 9}));
    EXPECT_EQ(cleaned.total(0, 0), 161);
    EXPECT_EQ(cleaned.total(0, 1), 0);
    for (std::int32_t d = 0; d < 10; ++d)
        EXPECT_EQ(cleaned.cell(0, 1, d).state, CleanedState::Merged);
    ASSERT_EQ(e.effect.totals.size(), 2u);
    EXPECT_EQ(e.effect.netChange(), 0);
    // The variant can no longer be decided on.
    auto r = preview(redistribution("412", "2026-03-05", 3, "2026-03-01", "2026-03-02",
                                    RedistributeMethod::Uniform));
    EXPECT_FALSE(r.ok());
}

TEST_F(Decisions, ExcludeLowersTheTotalByTheExcludedCounts) {
    Decision d;
    d.kind = DecisionKind::Exclude;
    d.region = "A";
    d.window = DayRange{day("2026-03-01"), day("2026-03-02")};
    auto e = record(drop, ledger, cleaned, d);
    EXPECT_EQ(cleaned.total(0, 2), 352 - 42);
    EXPECT_EQ(cleaned.cell(0, 2, 0).state, CleanedState::Excluded);
    EXPECT_EQ(e.effect.netChange(), -42);
    EXPECT_FALSE(preview(d).ok()) << "excluding the same cells twice";
}

TEST_F(Decisions, AcceptChangesNothingButIsRecordedWithTheTotals) {
    Decision d;
    d.kind = DecisionKind::Accept;
    d.region = "A";
    d.finding = "backlog_dump-A-cases-2026-03-08";
    auto e = record(drop, ledger, cleaned, d);
    EXPECT_TRUE(e.effect.cells.empty());
    ASSERT_EQ(e.effect.totals.size(), 1u);
    EXPECT_EQ(e.effect.totals[0].before, e.effect.totals[0].after);
}

TEST_F(Decisions, WithdrawRestoresTheValuesAndWithdrawingTheWithdrawalRedoesIt) {
    const V raw = values(cleaned, 0, 0);
    record(drop, ledger, cleaned,
           redistribution("0412", "2026-03-06", 80, "2026-03-03", "2026-03-05",
                          RedistributeMethod::Uniform));
    const V redistributed = values(cleaned, 0, 0);
    record(drop, ledger, cleaned, withdrawal(1));
    EXPECT_EQ(values(cleaned, 0, 0), raw);
    EXPECT_FALSE(cleaned.inEffect(1));
    record(drop, ledger, cleaned, withdrawal(2));
    EXPECT_EQ(values(cleaned, 0, 0), redistributed);
    EXPECT_TRUE(cleaned.inEffect(1));
    EXPECT_FALSE(cleaned.inEffect(2));
    // Every cell knows which entries touched it, history included.
    const auto touched = cleaned.touchedBy(0, 0, 2);
    EXPECT_EQ(std::vector<std::uint64_t>(touched.begin(), touched.end()),
              (std::vector<std::uint64_t>{1, 2, 3}));
    EXPECT_TRUE(cleaned.touchedBy(0, 0, 0).empty());
}

TEST_F(Decisions, UndoIsLastInFirstOutOnSharedCells) {
    const V raw = values(cleaned, 0, 0);
    record(drop, ledger, cleaned,
           redistribution("0412", "2026-03-06", 30, "2026-03-03", "2026-03-05",
                          RedistributeMethod::Uniform));
    record(drop, ledger, cleaned,
           redistribution("0412", "2026-03-06", 20, "2026-03-04", "2026-03-05",
                          RedistributeMethod::Uniform));
    auto refused = preview(withdrawal(1));
    ASSERT_FALSE(refused.ok());
    EXPECT_NE(refused.error().message.find("withdraw entry 2 first"), std::string::npos)
        << refused.error().message;
    // Undo, undo (as a GUI undo stack does), then redo both.
    record(drop, ledger, cleaned, withdrawal(2));
    record(drop, ledger, cleaned, withdrawal(1));
    EXPECT_EQ(values(cleaned, 0, 0), raw);
    record(drop, ledger, cleaned, withdrawal(4));  // redo entry 1
    record(drop, ledger, cleaned, withdrawal(3));  // redo entry 2
    EXPECT_EQ(values(cleaned, 0, 0), (V{10, 12, 10, 20, 20, 45, 11, 10, -4, 9}));
    EXPECT_FALSE(preview(withdrawal(3)).ok()) << "entry 3 is already withdrawn";
    EXPECT_FALSE(preview(withdrawal(99)).ok());
    auto again = replay(drop, ledger);
    ASSERT_TRUE(again.ok()) << again.error().describe();
    EXPECT_EQ(values(*again, 0, 0), values(cleaned, 0, 0));
}

TEST_F(Decisions, AnEntryNeedsAReasonAndTheRightDrop) {
    EntryMeta meta;
    meta.reason = "   ";
    Decision d;
    d.kind = DecisionKind::Accept;
    d.region = "A";
    auto blank = draftEntry(drop, ledger, cleaned, d, meta);
    ASSERT_FALSE(blank.ok());
    EXPECT_EQ(blank.error().code, ErrorCode::Usage);
    record(drop, ledger, cleaned, d);
    Drop other = drop;
    other.source.sha256 = std::string(64, 'b');
    meta.reason = "looked at it";
    auto wrongDrop = draftEntry(other, ledger, Cleaned(other), d, meta);
    EXPECT_FALSE(wrongDrop.ok());
}

TEST_F(Decisions, PreviewDoesNotChangeAnything) {
    auto e = preview(redistribution("0412", "2026-03-06", 80, "2026-03-03", "2026-03-05",
                                    RedistributeMethod::Uniform));
    ASSERT_TRUE(e.ok());
    EXPECT_EQ(e->cells.size(), 4u);
    EXPECT_EQ(cleaned.entryCount(), 0u);
    EXPECT_EQ(cleaned.cell(0, 0, 5).value, 95);
}

TEST_F(Decisions, UnknownRegionMeasureOrDayIsNamed) {
    auto r = preview(redistribution("9999", "2026-03-06", 1, "2026-03-03", "2026-03-05",
                                    RedistributeMethod::Uniform));
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::NotFound);
    EXPECT_EQ(r.error().region, "9999");
    auto late = preview(redistribution("0412", "2026-04-06", 1, "2026-03-03", "2026-03-05",
                                       RedistributeMethod::Uniform));
    ASSERT_FALSE(late.ok());
    EXPECT_EQ(late.error().date, "2026-04-06");
}

}  // namespace
}  // namespace siftwave::ledger
