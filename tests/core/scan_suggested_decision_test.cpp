// suggestedDecision(): the scan's proposal becomes a ledger Decision the ledger accepts.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/scan.h"
#include "siftwave/scan/suggested_decision.h"

#include <gtest/gtest.h>

namespace siftwave::scan {
namespace {

const Finding* firstOfKind(const ScanReport& report, FindingKind kind) {
    for (const Finding& f : report.findings)
        if (f.kind == kind)
            return &f;
    return nullptr;
}

TEST(SuggestedDecision, BacklogDumpOfTheSampleBecomesARedistributionThatConservesTheTotal) {
    // The samples README plants a backlog dump in 1301 cases on 2026-08-24.
    const Result<Drop> drop = readDrop(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");
    ASSERT_TRUE(drop.ok());
    const Result<ScanReport> report = scanDrop(*drop);
    ASSERT_TRUE(report.ok());
    const Finding* dump = firstOfKind(*report, FindingKind::BacklogDump);
    ASSERT_NE(dump, nullptr);
    const Result<Decision> decision = suggestedDecision(*dump, "cases");
    ASSERT_TRUE(decision.ok()) << decision.error().message;
    EXPECT_EQ(decision->kind, DecisionKind::Redistribute);
    EXPECT_EQ(decision->region, *dump->region);
    EXPECT_EQ(decision->finding, dump->id);
    EXPECT_EQ(decision->date, dump->first);
    EXPECT_GT(decision->excess, 0);
    EXPECT_TRUE(decision->validate().ok());

    const Cleaned cleaned(*drop);
    const Result<Effect> effect = previewDecision(*drop, cleaned, *decision);
    ASSERT_TRUE(effect.ok()) << effect.error().message;
    EXPECT_EQ(effect->netChange(), 0);
    EXPECT_FALSE(effect->cells.empty());
}

TEST(SuggestedDecision, AFindingAboutEveryMeasureIsDecidedForTheGivenOne) {
    Finding f;
    f.id = "missing_dates-test";
    f.kind = FindingKind::MissingDates;
    f.region = "AB";
    f.suggestion = {{"decision", "fill_missing"},
                    {"first", "2026-07-13"},
                    {"last", "2026-07-16"},
                    {"method", "linear"}};
    const Result<Decision> d = suggestedDecision(f, "deaths");
    ASSERT_TRUE(d.ok());
    EXPECT_EQ(d->measure, "deaths");
    EXPECT_EQ(d->fillMethod, FillMethod::Linear);
    EXPECT_EQ(d->window->length(), 4);
}

TEST(SuggestedDecision, NoSuggestionOrAMalformedOneIsAnError) {
    Finding none;
    none.id = "x";
    EXPECT_EQ(suggestedDecision(none, "cases").error().code, ErrorCode::NotFound);
    Finding bad;
    bad.id = "y";
    bad.suggestion = {{"decision", "redistribute"}, {"date", "2026-02-30"}};
    EXPECT_EQ(suggestedDecision(bad, "cases").error().code, ErrorCode::InvalidValue);
    Finding unknown;
    unknown.id = "z";
    unknown.suggestion = {{"decision", "shred"}};
    EXPECT_EQ(suggestedDecision(unknown, "cases").error().code, ErrorCode::InvalidValue);
}

}  // namespace
}  // namespace siftwave::scan
