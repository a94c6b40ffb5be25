// proposeDecision: one rule for the cell an analyst points at (the GUI's picked bar and
// `decide --excess auto`).

#include "siftwave/scan/propose.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>

namespace siftwave::scan {
namespace {

using siftwave::testing::handBuiltDrop;

// The hand-worked series of scan_backlog_dump_test: day 7 holds 100 where about 20.5 is
// expected (excess 80), no gap before it.
const std::vector<std::int32_t> kSeries = {20, 22, 19, 21, 23, 20, 18, 100,
                                           21, 19, 22, 20, 24, 18, 21};

ProposalRequest requestFor(const Drop& drop, std::int32_t period) {
    ProposalRequest r;
    r.region = "D1";
    r.measure = "cases";
    r.day = drop.periodStart(period);
    return r;
}

TEST(ProposeDecision, TheScansOwnSuggestionForTheCellComesFirstAndNamesTheFinding) {
    const Drop drop = handBuiltDrop({"D1"}, {kSeries});
    const Result<ScanReport> report = scanDrop(drop);
    ASSERT_TRUE(report.ok());
    ProposalRequest r = requestFor(drop, 7);
    r.findings = report->findings;
    const Result<Proposal> p = proposeDecision(drop, r);
    ASSERT_TRUE(p.ok()) << p.error().describe();
    ASSERT_EQ(p->source, ProposalSource::Finding);
    EXPECT_EQ(p->finding->kind, FindingKind::BacklogDump);
    EXPECT_EQ(p->decision.finding, p->finding->id);
    EXPECT_EQ(p->decision.excess, 80);

    // Without the finding: the same numbers from the estimate, and no finding named.
    const Result<Proposal> estimated = proposeDecision(drop, requestFor(drop, 7));
    ASSERT_TRUE(estimated.ok());
    EXPECT_EQ(estimated->source, ProposalSource::BacklogEstimate);
    EXPECT_TRUE(estimated->decision.finding.empty());
    EXPECT_EQ(estimated->decision.kind, ledger::DecisionKind::Redistribute);
    EXPECT_EQ(estimated->decision.excess, p->decision.excess);
    EXPECT_EQ(estimated->decision.window, p->decision.window);
    EXPECT_EQ(estimated->decision.redistributeMethod, p->decision.redistributeMethod);
    EXPECT_EQ(estimated->reported, 100);
}

TEST(ProposeDecision, AnEmptyCellOrTheFirstPeriodHasNothingToRedistribute) {
    std::vector<std::int32_t> series = kSeries;
    series[3] = siftwave::testing::kNoRow;
    const Drop drop = handBuiltDrop({"D1"}, {series});
    EXPECT_EQ(proposeDecision(drop, requestFor(drop, 0)).error().code, ErrorCode::InvalidValue);
    const Result<Proposal> empty = proposeDecision(drop, requestFor(drop, 3));
    ASSERT_FALSE(empty.ok());
    EXPECT_EQ(empty.error().code, ErrorCode::InvalidValue);
    EXPECT_NE(empty.error().message.find("no reported cases"), std::string::npos);
}

TEST(ProposeDecision, WithoutAnEstimateTheAnalystSetsTheCountsOverTheWeekBefore) {
    // Three periods: too few neighbours for a baseline.
    const Drop drop = handBuiltDrop({"D1"}, {{5, 6, 40}});
    const Result<Proposal> p = proposeDecision(drop, requestFor(drop, 2));
    ASSERT_TRUE(p.ok()) << p.error().describe();
    EXPECT_EQ(p->source, ProposalSource::NoEstimate);
    ASSERT_TRUE(p->noEstimate.has_value());
    EXPECT_EQ(p->decision.excess, 0);
    EXPECT_EQ(p->decision.window->first, drop.periodStart(0));  // up to 7 days, from the start
    EXPECT_EQ(p->decision.window->last, drop.periodStart(1));
}

TEST(ProposeDecision, AFindingsDecideProposesWhatThePickedCellWould) {
    // One rule for the three front ends: a finding's Decide, a picked bar, decide --excess auto.
    const Drop drop = handBuiltDrop({"D1"}, {kSeries});
    const Result<ScanReport> report = scanDrop(drop);
    ASSERT_TRUE(report.ok());
    const Finding* dump = nullptr;
    for (const Finding& f : report->findings)
        if (f.kind == FindingKind::BacklogDump)
            dump = &f;
    ASSERT_NE(dump, nullptr);
    const Result<Proposal> byFinding = proposeDecision(drop, *dump, "cases");
    ASSERT_TRUE(byFinding.ok()) << byFinding.error().describe();
    EXPECT_EQ(byFinding->source, ProposalSource::Finding);
    EXPECT_EQ(byFinding->finding, dump);
    EXPECT_EQ(byFinding->reported, 100);
    ProposalRequest r = requestFor(drop, 7);
    r.findings = report->findings;
    const Result<Proposal> byCell = proposeDecision(drop, r);
    ASSERT_TRUE(byCell.ok());
    EXPECT_EQ(byFinding->decision.excess, byCell->decision.excess);
    EXPECT_EQ(byFinding->decision.window, byCell->decision.window);
    EXPECT_EQ(byFinding->decision.redistributeMethod, byCell->decision.redistributeMethod);
    EXPECT_EQ(byFinding->decision.finding, dump->id);
    EXPECT_EQ(proposeDecision(drop, *dump, "deaths").error().code, ErrorCode::NotFound);
}

}  // namespace
}  // namespace siftwave::scan
