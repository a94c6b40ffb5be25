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
    const Result<Drop> drop = ingest::readDrop(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");
    ASSERT_TRUE(drop.ok());
    const Result<ScanReport> report = scanDrop(*drop);
    ASSERT_TRUE(report.ok());
    const Finding* dump = firstOfKind(*report, FindingKind::BacklogDump);
    ASSERT_NE(dump, nullptr);
    const Result<ledger::Decision> decision = suggestedDecision(*dump, "cases");
    ASSERT_TRUE(decision.ok()) << decision.error().message;
    EXPECT_EQ(decision->kind, ledger::DecisionKind::Redistribute);
    EXPECT_EQ(decision->region, *dump->region);
    EXPECT_EQ(decision->finding, dump->id);
    EXPECT_EQ(decision->date, dump->first);
    EXPECT_GT(decision->excess, 0);
    EXPECT_TRUE(decision->validate().ok());

    const ledger::Cleaned cleaned(*drop);
    const Result<ledger::Effect> effect = ledger::previewDecision(*drop, cleaned, *decision);
    ASSERT_TRUE(effect.ok()) << effect.error().message;
    EXPECT_EQ(effect->netChange(), 0);
    EXPECT_FALSE(effect->cells.empty());
}

TEST(SuggestedDecision, AFindingAboutEveryMeasureIsDecidedForTheGivenOne) {
    Finding f;
    f.id = "missing_dates-test";
    f.kind = FindingKind::MissingDates;
    f.region = "AB";
    ledger::Decision fill;
    fill.kind = ledger::DecisionKind::FillMissing;
    fill.region = "AB";
    fill.window = ledger::DayRange{*Date::fromIso("2026-07-13"), *Date::fromIso("2026-07-16")};
    fill.fillMethod = ledger::FillMethod::Linear;
    f.suggestion = fill;
    const Result<ledger::Decision> d = suggestedDecision(f, "deaths");
    ASSERT_TRUE(d.ok());
    EXPECT_EQ(d->measure, "deaths");
    EXPECT_EQ(d->finding, "missing_dates-test");
    EXPECT_EQ(d->fillMethod, ledger::FillMethod::Linear);
    EXPECT_EQ(d->window->length(), 4);
}

TEST(SuggestedDecision, AnAcceptOfEveryMeasureStaysAboutEveryMeasure) {
    Finding f;
    f.id = "weekday_effect-test";
    f.kind = FindingKind::WeekdayEffect;
    ledger::Decision accept;
    accept.kind = ledger::DecisionKind::Accept;
    f.suggestion = accept;
    const Result<ledger::Decision> d = suggestedDecision(f, "cases");
    ASSERT_TRUE(d.ok());
    EXPECT_TRUE(d->measure.empty());
}

TEST(SuggestedDecision, NoSuggestionIsNotFound) {
    Finding none;
    none.id = "x";
    EXPECT_EQ(suggestedDecision(none, "cases").error().code, ErrorCode::NotFound);
    EXPECT_EQ(suggestionText(none), "{}");
}

TEST(SuggestedDecision, TheScanFillsInTheFindingsIdAndItsRegion) {
    const Result<Drop> drop = ingest::readDrop(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");
    ASSERT_TRUE(drop.ok());
    const Result<ScanReport> report = scanDrop(*drop);
    ASSERT_TRUE(report.ok());
    for (const Finding& f : report->findings) {
        if (!f.suggestion)
            continue;
        EXPECT_EQ(f.suggestion->finding, f.id);
        if (f.suggestion->kind != ledger::DecisionKind::MergeCodes) {
            EXPECT_EQ(f.suggestion->region, f.region.value_or(std::string())) << f.id;
        }
        EXPECT_EQ(f.suggestion->measure, f.measure.value_or(std::string())) << f.id;
    }
}

TEST(SuggestedDecision, AnExcludeOfAWholeRegionIsWrittenWithTheRegionAndNotes) {
    Finding f;
    f.kind = FindingKind::UnknownCode;
    f.region = "ZZ9";
    ledger::Decision exclude;
    exclude.kind = ledger::DecisionKind::Exclude;
    exclude.region = "ZZ9";
    f.suggestion = exclude;
    f.suggestionNotes.note = "or add the region to the register";
    EXPECT_EQ(
        suggestionText(f),
        R"({"decision":"exclude","note":"or add the region to the register","region":"ZZ9"})");
    f.suggestion->window =
        ledger::DayRange{*Date::fromIso("2026-01-05"), *Date::fromIso("2026-01-06")};
    f.suggestionNotes = {};
    f.suggestionNotes.absorbable = false;
    EXPECT_EQ(
        suggestionText(f),
        R"({"absorbable":false,"decision":"exclude","first":"2026-01-05","last":"2026-01-06"})");
}

}  // namespace
}  // namespace siftwave::scan
