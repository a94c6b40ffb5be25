// nowcast_complete (decision.h, ledger/nowcast_completion.h): the analyst's choice to work on a
// case list's nowcast-completed series, recorded in the ledger so that a replay gives the same
// series again.
#include "ledger_test_support.h"

#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/nowcast_completion.h"
#include "siftwave/report/figure_spec.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <set>

namespace siftwave {
namespace {

using testing::day;
using testing::makeDrop;
using testing::record;
using testing::values;

// The triangle worked by hand in nowcast_test.cpp (ChainLadderOnAHandWorkedTriangle): days
// 2026-03-01..04, now 2026-03-04, maximum delay 2; the chain-ladder (Lawless 1994, eq. 2.3)
// gives 12.5 for 2026-03-03 (10 reported) and 13.75 for 2026-03-04 (6 reported).
Drop handWorkedList() {
    std::string text = "onset,report\n";
    auto add = [&](const char* event, int delay, int n) {
        for (int i = 0; i < n; ++i)
            text += std::string(event) + "," + (day(event) + delay).iso() + "\n";
    };
    add("2026-03-01", 0, 4), add("2026-03-01", 1, 2), add("2026-03-01", 2, 2);
    add("2026-03-02", 0, 3), add("2026-03-02", 1, 3), add("2026-03-02", 2, 1);
    add("2026-03-03", 0, 5), add("2026-03-03", 1, 5);
    add("2026-03-04", 0, 6);
    Result<Drop> drop = ingest::parseDrop(text, "list.csv");
    EXPECT_TRUE(drop.ok()) << (drop.ok() ? "" : drop.error().describe());
    return drop.ok() ? std::move(*drop) : Drop{};
}

ledger::Decision completionOf(const Drop& drop, int maxDelay = 2) {
    ledger::NowcastCompletionRequest request;
    request.region = drop.regionCodes.at(0);
    request.maxDelay = maxDelay;
    Result<ledger::Decision> d = ledger::nowcastCompletion(drop, request);
    EXPECT_TRUE(d.ok()) << (d.ok() ? "" : d.error().describe());
    return d.ok() ? *d : ledger::Decision{};
}

// The settings left to the data are named in the decision: now = the last report date, the
// maximum delay = 99 % of the delays seen (here all are 0..2), the default window of 21 days.
TEST(LedgerNowcastComplete, TheDecisionNamesNowTheMaximumDelayAndTheWindow) {
    const Drop drop = handWorkedList();
    const ledger::Decision d = completionOf(drop, 0);
    EXPECT_EQ(d.kind, ledger::DecisionKind::NowcastComplete);
    EXPECT_EQ(d.date, day("2026-03-04"));
    EXPECT_EQ(d.maxDelay, 2);
    EXPECT_EQ(d.nowcastWindow, 21);
    EXPECT_EQ(d.measure, drop.measures.at(0));
}

// Each period still estimated gets round(nowcast - reported): 2026-03-03 10 + round(2.5) = 13,
// 2026-03-04 6 + round(7.75) = 14 (hand-worked values above); older days are complete.
TEST(LedgerNowcastComplete, AddsTheReportsStillToComeAndReplaysToTheSameSeries) {
    const Drop drop = handWorkedList();
    ledger::Ledger ledger;
    ledger::Cleaned cleaned(drop);
    const ledger::LedgerEntry e = record(drop, ledger, cleaned, completionOf(drop));
    EXPECT_EQ(values(cleaned, 0, 0), (std::vector<std::int64_t>{8, 7, 13, 14}));
    ASSERT_EQ(e.effect.totals.size(), 1u);
    EXPECT_EQ(e.effect.totals[0].before, 31);
    EXPECT_EQ(e.effect.totals[0].after, 42);
    Result<ledger::Cleaned> again = ledger::replay(drop, ledger);
    ASSERT_TRUE(again.ok()) << again.error().describe();
    EXPECT_EQ(values(*again, 0, 0), values(cleaned, 0, 0));
    EXPECT_TRUE(ledger::checkConservation(drop, *again, ledger).ok());
}

// The entry names every setting: replay needs nothing else.
TEST(LedgerNowcastComplete, TheEntryRecordsTheSettingsAndReadsThemBack) {
    const Drop drop = handWorkedList();
    ledger::Ledger ledger;
    ledger::Cleaned cleaned(drop);
    const ledger::LedgerEntry e = record(drop, ledger, cleaned, completionOf(drop));
    const Result<std::string> line = ledger::entryLine(e);
    ASSERT_TRUE(line.ok());
    const nlohmann::json p = nlohmann::json::parse(*line).at("parameters");
    EXPECT_EQ(p.at("date"), "2026-03-04");
    EXPECT_EQ(p.at("max_delay"), 2);
    EXPECT_EQ(p.at("nowcast_window"), 21);
    EXPECT_EQ(p.at("method"), "chain_ladder");
    const Result<ledger::LedgerEntry> back = ledger::parseEntryLine(*line, 1);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    EXPECT_EQ(back->decision.maxDelay, 2);
    EXPECT_EQ(ledger::entryLine(*back).value(), *line);
    std::string other = *line;
    other.replace(other.find("chain_ladder"), 12, "other_method");
    EXPECT_FALSE(ledger::parseEntryLine(other, 1).ok());
}

// A drop of counts has no reports' dates to nowcast from; now before the last report would
// count again the cases reported after it.
TEST(LedgerNowcastComplete, RefusesCountsAndANowBeforeTheLastReport) {
    const Drop counts = makeDrop({"0412"}, {"cases"}, "2026-03-01", 4);
    ledger::Decision d = completionOf(handWorkedList());
    d.region = "0412";
    d.measure = "cases";
    Result<ledger::Effect> refused = ledger::previewDecision(counts, ledger::Cleaned(counts), d);
    ASSERT_FALSE(refused.ok());
    EXPECT_NE(refused.error().message.find("needs a case list"), std::string::npos);

    const Drop list = handWorkedList();
    ledger::Decision early = completionOf(list);
    early.date = day("2026-03-03");
    refused = ledger::previewDecision(list, ledger::Cleaned(list), early);
    ASSERT_FALSE(refused.ok());
    EXPECT_NE(refused.error().message.find("reports up to 2026-03-04"), std::string::npos);
}

// Fits and figures say when they ran on the completed series, and stop saying so once the
// entry is withdrawn (which also restores the reported counts).
TEST(LedgerNowcastComplete, TheCaptionSaysSoUntilTheEntryIsWithdrawn) {
    const Drop drop = handWorkedList();
    ledger::Ledger ledger;
    ledger::Cleaned cleaned(drop);
    record(drop, ledger, cleaned, completionOf(drop));
    const std::string region = drop.regionCodes[0];
    const auto note =
        ledger::nowcastCompletionNote(drop, ledger, cleaned, region, drop.measures[0]);
    ASSERT_TRUE(note.has_value());
    EXPECT_NE(note->find("Counts from 2026-03-03 on are nowcast-completed (ledger entry #1: "
                         "chain-ladder as of 2026-03-04, max delay 2 days, window 21 days)"),
              std::string::npos)
        << *note;
    report::FigureRequest request;
    request.region = region;
    request.exportDate = "2026-03-20";
    Result<report::FigureSpec> spec = report::buildFigureSpec(drop, ledger, cleaned, request);
    ASSERT_TRUE(spec.ok()) << spec.error().describe();
    bool inCaption = false;
    for (const std::string& line : spec->captionLines)
        inCaption = inCaption || line == *note;
    EXPECT_TRUE(inCaption);

    ledger::Decision undo;
    undo.kind = ledger::DecisionKind::Withdraw;
    undo.target = 1;
    record(drop, ledger, cleaned, undo);
    EXPECT_EQ(values(cleaned, 0, 0), (std::vector<std::int64_t>{8, 7, 10, 6}));
    EXPECT_FALSE(ledger::nowcastCompletionNote(drop, ledger, cleaned, region, drop.measures[0]));
}

}  // namespace
}  // namespace siftwave
