// redistribute's `level` method (ledger/decision.h): the window weighted by its expected level,
// the trend between the periods around it times the weekday factors, derived again on replay.
#include "ledger_test_support.h"

#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;
using V = std::vector<std::int64_t>;

TEST(LevelRedistribution, FillsAGapAlongTheGeometricTrendBetweenItsSides) {
    // Weekly (no weekday factors). Sides of 3 weeks: 10 before the gap (centre week 1), 40 after
    // the catch-up (centre week 8). Worked by hand: e(w) = exp(ln 10.5 + (w - 1)/7 (ln 40.5 -
    // ln 10.5)) - 0.5 = 14.94, 18.23, 22.21 for weeks 3-5 (sum 55.38); 55 x e / 55.38 = 14.84,
    // 18.10, 22.06: floors 14, 18, 22 (54), the unit left to the largest remainder (.84).
    Drop drop = makeWeeklyDrop({"A"}, {"cases"}, "2026-03-02", 10);
    setSeries(drop, 0, 0, {10, 10, 10, 0, 0, 0, 100, 40, 40, 40});
    Cleaned cleaned(drop);
    Ledger ledger;
    Decision d = redistribution("A", "2026-04-13", 55, "2026-03-23", "2026-04-12",
                                RedistributeMethod::Level);
    d.baselineWidth = 3;
    const LedgerEntry e = record(drop, ledger, cleaned, d);
    EXPECT_EQ(values(cleaned, 0, 0), (V{10, 10, 10, 15, 18, 22, 45, 40, 40, 40}));
    ASSERT_EQ(e.effect.totals.size(), 1u);
    EXPECT_EQ(e.effect.totals[0].after, e.effect.totals[0].before);
    // The uniform method would give 19, 18, 18: flat across a rising curve.
}

class DailyLevel : public ::testing::Test {
protected:
    // Eight weeks from Monday 2026-03-02 of a steady weekly pattern (weekdays 12, Saturday 6,
    // Sunday 4: factors 1.2, 0.6, 0.4 of a mean of 10); the fifth week (03-30..04-05) reported
    // as zeros and its 70 counts on the Monday after (12 + 70 = 82).
    void SetUp() override {
        drop = makeDrop({"A"}, {"cases"}, "2026-03-02", 56);
        const int week[] = {12, 12, 12, 12, 12, 6, 4};
        for (std::int32_t i = 0; i < 56; ++i) {
            Cell& c = drop.tables[0].at(0, static_cast<std::size_t>(i));
            c.state = CellState::Reported;
            c.value = i >= 28 && i < 35 ? 0 : week[i % 7] + (i == 35 ? 70 : 0);
            c.line = static_cast<std::uint32_t>(2 + i);
        }
        cleaned = Cleaned(drop);
    }
    Decision gapFill(RedistributeMethod method) const {
        return redistribution("A", "2026-04-06", 70, "2026-03-30", "2026-04-05", method);
    }

    Drop drop;
    Cleaned cleaned;
    Ledger ledger;
};

TEST_F(DailyLevel, FollowsTheWeekdayFactorsOfTheRegionsOwnSeries) {
    // The factors come from the whole weeks outside the gap and the catch-up day (each is
    // exactly 1.2, 0.6 or 0.4 there), both sides' adjusted median is 10: the week comes back
    // as it was, where uniform would give 10 a day.
    record(drop, ledger, cleaned, gapFill(RedistributeMethod::Level));
    const V v = values(cleaned, 0, 0);
    EXPECT_EQ(V(v.begin() + 28, v.begin() + 36), (V{12, 12, 12, 12, 12, 6, 4, 12}));
    EXPECT_EQ(cleaned.total(0, 0), 8 * 70);
}

TEST_F(DailyLevel, ReplayDerivesTheSameWeightsFromTheEntryAlone) {
    record(drop, ledger, cleaned, gapFill(RedistributeMethod::Level));
    // The entry names the method and the width, nothing about the weights.
    const Result<std::string> line = entryLine(ledger.entries.at(0));
    ASSERT_TRUE(line);
    const nlohmann::json p = nlohmann::json::parse(*line).at("parameters");
    EXPECT_EQ(p.at("method"), "level");
    EXPECT_EQ(p.at("baseline_width"), 7);
    const Result<LedgerEntry> back = parseEntryLine(*line, 1);
    ASSERT_TRUE(back);
    EXPECT_EQ(back->decision.redistributeMethod, RedistributeMethod::Level);
    Ledger reread;
    reread.entries.push_back(*back);
    const Result<Cleaned> replayed = replay(drop, reread);
    ASSERT_TRUE(replayed) << replayed.error().describe();
    EXPECT_EQ(values(*replayed, 0, 0), values(cleaned, 0, 0));
}

TEST_F(DailyLevel, AWindowWithNothingAroundItIsRefused) {
    // A window from the first day to the day before the last: no period before the window,
    // none after the dump day.
    Drop tiny = makeDrop({"A"}, {"cases"}, "2026-03-02", 4);
    setSeries(tiny, 0, 0, {0, 0, 0, 30});
    Cleaned c(tiny);
    const Result<Effect> r =
        previewDecision(tiny, c,
                        redistribution("A", "2026-03-05", 20, "2026-03-02", "2026-03-04",
                                       RedistributeMethod::Level));
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("level"), std::string::npos) << r.error().message;
}

}  // namespace
}  // namespace siftwave::ledger
