// Decisions on a weekly drop act on weeks: a date anywhere in a week selects that week,
// changed cells are recorded under the weeks' first days, totals are conserved exactly
// where the kind says so, and the entries replay.
#include "ledger_test_support.h"

#include "siftwave/ledger/export.h"
#include "siftwave/ledger/replay.h"

#include <gtest/gtest.h>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;
using V = std::vector<std::int64_t>;
constexpr std::int64_t kNone = -999;  // values(): a cell without a value

class WeeklyDecisions : public ::testing::Test {
protected:
    void SetUp() override {
        // Ten ISO weeks from 2026-W10 (Monday 2026-03-02). Region W has a catch-up week
        // (2026-W15, 2026-04-06) after three low weeks; region G misses 2026-W13 and W14;
        // region N has a negative correction in 2026-W17.
        drop = makeWeeklyDrop({"W", "G", "N"}, {"cases"}, "2026-03-02", 10);
        setSeries(drop, 0, 0, {40, 44, 10, 8, 9, 160, 42, 45, 41, 43});
        setSeries(drop, 0, 1, {30, 32, 31, 0, 0, 36, 33, 30, 34, 35});
        setAbsent(drop, 0, 1, 3);
        setAbsent(drop, 0, 1, 4);
        setSeries(drop, 0, 2, {20, 22, 24, 26, 28, 30, 32, -12, 34, 36});
        cleaned = Cleaned(drop);
    }

    Drop drop;
    Cleaned cleaned;
    Ledger ledger;
};

Decision fillWeeks(const char* first, const char* last, FillMethod method) {
    Decision d;
    d.kind = DecisionKind::FillMissing;
    d.region = "G";
    d.measure = "cases";
    d.window = DayRange{day(first), day(last)};
    d.fillMethod = method;
    return d;
}

TEST_F(WeeklyDecisions, RedistributionMovesCountsOverWholeWeeksNamedByAnyOfTheirDays) {
    // The catch-up named by its Thursday, the window by a Wednesday and a Sunday: weeks
    // 2026-W12 to W14. 90 over three weeks, uniform: 30 each.
    const LedgerEntry e = record(drop, ledger, cleaned,
                                 redistribution("W", "2026-04-09", 90, "2026-03-18", "2026-04-05",
                                                RedistributeMethod::Uniform));
    EXPECT_EQ(values(cleaned, 0, 0), (V{40, 44, 40, 38, 39, 70, 42, 45, 41, 43}));
    EXPECT_EQ(cleaned.total(0, 0), rawTotal(drop, 0, 0));
    ASSERT_EQ(e.effect.cells.size(), 4u);
    EXPECT_EQ(e.effect.cells[0].date, day("2026-03-16"));  // the Monday of 2026-W12
    EXPECT_EQ(e.effect.cells[3].date, day("2026-04-06"));  // the Monday of 2026-W15
    // The entry replays on the drop to the same cells.
    Result<Cleaned> again = replay(drop, ledger);
    ASSERT_TRUE(again.ok()) << again.error().describe();
    EXPECT_EQ(values(*again, 0, 0), values(cleaned, 0, 0));
}

TEST_F(WeeklyDecisions, AWindowThatReachesIntoTheDumpsOwnWeekIsRefused) {
    // 2026-04-06 is the Monday of the catch-up week itself, although it comes before the
    // Thursday named as the dump.
    Result<Effect> e = previewDecision(drop, cleaned,
                                       redistribution("W", "2026-04-09", 30, "2026-03-16",
                                                      "2026-04-06", RedistributeMethod::Uniform));
    ASSERT_FALSE(e.ok());
    EXPECT_NE(e.error().message.find("before the week"), std::string::npos) << e.error().message;
}

TEST_F(WeeklyDecisions, FillingWithZeroWritesZeroWeeksAndKeepsTheTotal) {
    const LedgerEntry e =
        record(drop, ledger, cleaned, fillWeeks("2026-03-25", "2026-03-31", FillMethod::Zero));
    EXPECT_EQ(values(cleaned, 0, 1), (V{30, 32, 31, 0, 0, 36, 33, 30, 34, 35}));
    EXPECT_EQ(cleaned.cell(0, 1, 3).state, CleanedState::Filled);
    ASSERT_EQ(e.effect.totals.size(), 1u);
    EXPECT_EQ(e.effect.totals[0].before, e.effect.totals[0].after);
    EXPECT_TRUE(decisionConservesTotals(e.decision));
    EXPECT_FALSE(countsAddedByDecisions(ledger).any());
}

TEST_F(WeeklyDecisions, ShareSplitsTheNextWeeksCountAndKeepsTheTotal) {
    // 36 over the two empty weeks and the week after: 12 each.
    record(drop, ledger, cleaned, fillWeeks("2026-03-23", "2026-03-30", FillMethod::Share));
    EXPECT_EQ(values(cleaned, 0, 1), (V{30, 32, 31, 12, 12, 12, 33, 30, 34, 35}));
    EXPECT_EQ(cleaned.total(0, 1), rawTotal(drop, 0, 1));
}

TEST_F(WeeklyDecisions, LinearFillingAddsCountsAndTheLedgerSaysSo) {
    // Between 31 and 36 over two weeks: round(32.67) = 33 and round(34.33) = 34.
    const LedgerEntry e =
        record(drop, ledger, cleaned, fillWeeks("2026-03-23", "2026-03-30", FillMethod::Linear));
    EXPECT_EQ(values(cleaned, 0, 1), (V{30, 32, 31, 33, 34, 36, 33, 30, 34, 35}));
    EXPECT_EQ(e.effect.totals[0].change(), 67);
    const CountsAdded added = countsAddedByDecisions(ledger);
    EXPECT_EQ(added.total, 67);
    EXPECT_EQ(added.entries, (std::vector<std::uint64_t>{1}));
    EXPECT_EQ(added.describe(), "totals changed by decisions that add counts: +67 (entries #1)");
}

TEST_F(WeeklyDecisions, ANegativeWeekIsSpreadOverTheWeeksBeforeIt) {
    Decision d;
    d.kind = DecisionKind::SpreadNegative;
    d.region = "N";
    d.measure = "cases";
    d.date = day("2026-04-22");                                 // Wednesday of 2026-W17
    d.window = DayRange{day("2026-03-30"), day("2026-04-19")};  // 2026-W14 to W16
    record(drop, ledger, cleaned, d);
    // 12 from 28, 30, 32 (sum 90) in proportion: quotas 3.73, 4, 4.27; floors 3, 4, 4 and the
    // unit left to the largest remainder (.73): 4, 4, 4.
    EXPECT_EQ(values(cleaned, 0, 2), (V{20, 22, 24, 26, 24, 26, 28, 0, 34, 36}));
    EXPECT_EQ(cleaned.total(0, 2), rawTotal(drop, 0, 2));
    // A window that ends in the correction's own week is refused.
    Cleaned fresh(drop);
    d.window = DayRange{day("2026-03-30"), day("2026-04-20")};  // Monday of 2026-W17
    EXPECT_FALSE(previewDecision(drop, fresh, d).ok());
}

TEST_F(WeeklyDecisions, ExclusionByDatesLeavesOutEveryWeekTheyTouch) {
    Decision d;
    d.kind = DecisionKind::Exclude;
    d.region = "W";
    d.window = DayRange{day("2026-03-19"), day("2026-03-24")};  // Thursday W12 to Tuesday W13
    record(drop, ledger, cleaned, d);
    EXPECT_EQ(values(cleaned, 0, 0), (V{40, 44, kNone, kNone, 9, 160, 42, 45, 41, 43}));
    EXPECT_EQ(cleaned.total(0, 0), rawTotal(drop, 0, 0) - 18);
}

TEST_F(WeeklyDecisions, ADateOutsideTheWeeksIsNamedWithTheCalendarsLastDay) {
    Result<Effect> e =
        previewDecision(drop, cleaned, fillWeeks("2026-05-11", "2026-05-11", FillMethod::Zero));
    ASSERT_FALSE(e.ok());
    // The last week, 2026-W19, ends on Sunday 2026-05-10.
    EXPECT_NE(e.error().message.find("week 2026-05-11 is outside the drop's calendar "
                                     "(2026-03-02 to 2026-05-10)"),
              std::string::npos)
        << e.error().message;
}

}  // namespace
}  // namespace siftwave::ledger
