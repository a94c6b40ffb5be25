// checkDecision: a decision that would create a new anomaly says so before Apply (issue 14,
// step 4). The cases are the ones the issue names: a redistribution that leaves a plateau or
// new spikes, and one that builds a wave the counts did not have. The series are built by
// hand; what counts as a spike or a wave is the scan's and the wave detection's own rule
// (common practice, no source).

#include "siftwave/ledger/cleaned.h"
#include "siftwave/scan/decision_check.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>

namespace siftwave::scan {
namespace {

using siftwave::testing::handBuiltDrop;

// A steady daily series around `level` (a fixed small wobble, no trend), `days` long.
std::vector<std::int32_t> steady(int days, std::int32_t level) {
    static const std::int32_t wobble[] = {0, 2, -1, 1, -2, 1, 0, -1, 2, -2, 1, 0, -1};
    std::vector<std::int32_t> out;
    for (int d = 0; d < days; ++d)
        out.push_back(level + wobble[d % 13] * std::max(1, level / 20));
    return out;
}

ledger::Decision redistribute(const Drop& drop, std::int32_t dumpDay, std::int32_t windowFirst,
                              std::int32_t windowLast, std::int64_t excess,
                              ledger::RedistributeMethod method) {
    ledger::Decision d;
    d.kind = ledger::DecisionKind::Redistribute;
    d.region = "D1";
    d.measure = "cases";
    d.date = drop.periodStart(dumpDay);
    d.window = ledger::DayRange{drop.periodStart(windowFirst), drop.periodStart(windowLast)};
    d.excess = excess;
    d.redistributeMethod = method;
    return d;
}

TEST(DecisionCheck, AnEvenSpreadOverAShortWindowLeavesSpikesAndSaysSo) {
    std::vector<std::int32_t> series = steady(60, 100);
    series[40] = 3100;  // 3,000 held back, reported on one day
    const Drop drop = handBuiltDrop({"D1"}, {series});
    const ledger::Cleaned cleaned(drop);
    const Result<DecisionCheck> check = checkDecision(
        drop, cleaned, redistribute(drop, 40, 37, 39, 3000, ledger::RedistributeMethod::Uniform));
    ASSERT_TRUE(check.ok()) << check.error().describe();
    // 1,000 more on each of three days at a level of 100: each is a new spike.
    ASSERT_FALSE(check->newFindings.empty());
    for (const Finding& f : check->newFindings) {
        EXPECT_EQ(f.region, "D1");
        ASSERT_TRUE(f.first.has_value());
        EXPECT_GE(*f.first, drop.periodStart(37));
        EXPECT_LE(*f.first, drop.periodStart(39));
    }
    EXPECT_TRUE(std::any_of(check->newFindings.begin(), check->newFindings.end(),
                            [](const Finding& f) { return f.kind == FindingKind::BacklogDump; }));
    EXPECT_FALSE(check->clean());
    const std::vector<std::string> lines = describeDecisionCheck(*check, Cadence::Daily);
    ASSERT_FALSE(lines.empty());
    EXPECT_NE(lines.front().find("new backlog_dump"), std::string::npos) << lines.front();
}

TEST(DecisionCheck, ASpreadThatFollowsTheLevelIsClean) {
    std::vector<std::int32_t> series = steady(60, 100);
    series[40] = 400;  // 300 held back over the 30 days before: 10 a day
    const Drop drop = handBuiltDrop({"D1"}, {series});
    const ledger::Cleaned cleaned(drop);
    const Result<DecisionCheck> check = checkDecision(
        drop, cleaned,
        redistribute(drop, 40, 10, 39, 300, ledger::RedistributeMethod::Proportional));
    ASSERT_TRUE(check.ok()) << check.error().describe();
    EXPECT_TRUE(check->clean()) << describeDecisionCheck(*check, Cadence::Daily).front();
    EXPECT_TRUE(describeDecisionCheck(*check, Cadence::Daily).empty());
}

TEST(DecisionCheck, ADumpSpreadIntoABlockBuildsAWaveTheCountsDidNotHave) {
    // 150 quiet days around 20, a dump of 5,000 on day 120. Spread evenly over the 10 days
    // before, it makes a block of about 520 a day: a wave, and the largest, that no reported
    // count supports.
    std::vector<std::int32_t> series = steady(150, 20);
    series[120] = 5020;
    const Drop drop = handBuiltDrop({"D1"}, {series});
    const ledger::Cleaned cleaned(drop);
    const Result<DecisionCheck> check =
        checkDecision(drop, cleaned,
                      redistribute(drop, 120, 110, 119, 5000, ledger::RedistributeMethod::Uniform));
    ASSERT_TRUE(check.ok()) << check.error().describe();
    ASSERT_EQ(check->newWaves.size(), 1u);
    const NewWave& w = check->newWaves.front();
    EXPECT_EQ(w.region, "D1");
    EXPECT_EQ(w.measure, "cases");
    EXPECT_TRUE(w.largest);
    EXPECT_GE(w.peak, drop.periodStart(110));
    EXPECT_LE(w.peak, drop.periodStart(119));
    EXPECT_GT(w.peakValue, 200);

    const nlohmann::json json = decisionCheckToJson(*check);
    EXPECT_FALSE(json["clean"].get<bool>());
    ASSERT_EQ(json["new_waves"].size(), 1u);
    EXPECT_TRUE(json["new_waves"][0]["largest"].get<bool>());
    const std::vector<std::string> lines = describeDecisionCheck(*check, Cadence::Daily);
    EXPECT_TRUE(std::any_of(lines.begin(), lines.end(), [](const std::string& l) {
        return l.find("would become the largest wave") != std::string::npos;
    }));
}

TEST(DecisionCheck, AProblemThatWasThereBeforeIsNotNew) {
    // A negative correction on day 20 stays where it is; the decision elsewhere is clean.
    std::vector<std::int32_t> series = steady(60, 100);
    series[20] = -40;
    series[40] = 400;
    const Drop drop = handBuiltDrop({"D1"}, {series});
    const Result<ScanReport> before = scanDrop(drop);
    ASSERT_TRUE(before.ok());
    ASSERT_TRUE(std::any_of(before->findings.begin(), before->findings.end(),
                            [](const Finding& f) { return f.kind == FindingKind::NegativeCount; }));
    const ledger::Cleaned cleaned(drop);
    const Result<DecisionCheck> check = checkDecision(
        drop, cleaned,
        redistribute(drop, 40, 25, 39, 300, ledger::RedistributeMethod::Proportional));
    ASSERT_TRUE(check.ok()) << check.error().describe();
    EXPECT_TRUE(
        std::none_of(check->newFindings.begin(), check->newFindings.end(),
                     [](const Finding& f) { return f.kind == FindingKind::NegativeCount; }));
}

TEST(DecisionCheck, OtherRegionsAreNotReported) {
    // D2 has its own spike; a decision in D1 does not report it.
    std::vector<std::int32_t> d1 = steady(60, 100);
    d1[40] = 400;
    std::vector<std::int32_t> d2 = steady(60, 100);
    d2[30] = 2000;
    const Drop drop = handBuiltDrop({"D1", "D2"}, {d1, d2});
    const ledger::Cleaned cleaned(drop);
    const Result<DecisionCheck> check = checkDecision(
        drop, cleaned,
        redistribute(drop, 40, 10, 39, 300, ledger::RedistributeMethod::Proportional));
    ASSERT_TRUE(check.ok()) << check.error().describe();
    for (const Finding& f : check->newFindings)
        EXPECT_EQ(f.region, "D1");
    for (const NewWave& w : check->newWaves)
        EXPECT_EQ(w.region, "D1");
}

TEST(DecisionCheck, ADecisionTheLedgerRefusesIsAnError) {
    std::vector<std::int32_t> series = steady(30, 100);
    const Drop drop = handBuiltDrop({"D1"}, {series});
    const ledger::Cleaned cleaned(drop);
    // More to move than the day holds.
    const Result<DecisionCheck> check = checkDecision(
        drop, cleaned, redistribute(drop, 20, 10, 19, 5000, ledger::RedistributeMethod::Uniform));
    EXPECT_FALSE(check.ok());
}

}  // namespace
}  // namespace siftwave::scan
