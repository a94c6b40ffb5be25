// missing_dates: runs of periods with no value inside a region's reporting span; absent rows
// amid low counts are probably true zeros; a suggested fill states the counts it adds.

#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/export.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/scan.h"
#include "siftwave/scan/suggested_decision.h"
#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <fstream>
#include <map>
#include <sstream>

namespace siftwave::scan {
namespace {

using siftwave::testing::handBuiltDrop;
using siftwave::testing::kBlank;
using siftwave::testing::kNoRow;
constexpr std::int32_t X = kNoRow;

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findMissingDates);
}

TEST(MissingDates, OneFindingPerRunInsideTheSpanNoneForTheTails) {
    const Drop drop = handBuiltDrop({"A"}, {{X, X, 5, 6, X, X, 7, 8, X, 9, X, X}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 2u);
    EXPECT_EQ(*found[0].first, drop.periodStart(4));
    EXPECT_EQ(*found[0].last, drop.periodStart(5));
    EXPECT_EQ(found[0].evidence["days"], 2);
    EXPECT_EQ(found[0].evidence["absent"], 2);
    EXPECT_EQ(*found[1].first, drop.periodStart(8));
    EXPECT_EQ(*found[1].last, drop.periodStart(8));
    EXPECT_EQ(suggestionToJson(found[0])["decision"], "fill_missing");
    EXPECT_EQ(*found[0].region, "A");
    EXPECT_EQ(*found[0].measure, "cases");  // a drop with one measure names it
}

TEST(MissingDates, CountsBlankCellsAndSuggestsShareBeforeACatchUp) {
    const Drop drop = handBuiltDrop({"A"}, {{10, 11, 9, 10, kBlank, X, 32, 10, 11, 9}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_EQ(found[0].evidence["blank"], 1);
    EXPECT_EQ(found[0].evidence["absent"], 1);
    EXPECT_EQ(found[0].evidence["value_after"], 32);
    EXPECT_EQ(suggestionToJson(found[0])["method"], "share");
}

TEST(MissingDates, NoMeasureWhenTheRowIsMissingForEveryMeasure) {
    const Drop drop = handBuiltDrop({"A"}, {"cases", "deaths"},
                                    {{{5, 6, X, 7, 8, 9, 4}}, {{1, 0, X, 0, X, 1, 0}}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 2u);
    EXPECT_FALSE(found[0].measure.has_value());  // no row at all on day 2
    EXPECT_EQ(*found[0].first, drop.periodStart(2));
    ASSERT_TRUE(found[1].measure.has_value());  // day 4 is missing for deaths only
    EXPECT_EQ(*found[1].measure, "deaths");
    EXPECT_EQ(*found[1].first, drop.periodStart(4));
}

TEST(MissingDates, AFullyReportedRegionHasNone) {
    EXPECT_TRUE(run(handBuiltDrop({"A", "B"}, {{1, 2, 3}, {0, 0, 0}})).empty());
}

/// What the finding's suggested decision does to the region's total on the drop as read.
std::int64_t totalChangeOfSuggestion(const Drop& drop, const Finding& f,
                                     const std::string& measure) {
    Result<ledger::Decision> d = suggestedDecision(f, measure);
    EXPECT_TRUE(d.ok()) << d.error().describe();
    Result<ledger::Cleaned> cleaned = ledger::replay(drop, ledger::Ledger{});
    EXPECT_TRUE(cleaned.ok());
    Result<ledger::Effect> effect = ledger::previewDecision(drop, *cleaned, *d);
    EXPECT_TRUE(effect.ok()) << effect.error().describe();
    std::int64_t change = 0;
    if (effect.ok()) {
        for (const ledger::TotalChange& t : effect->totals)
            change += t.change();
    }
    return change;
}

// A tally made from a case list writes no row for a day without cases (common practice, no
// source): the absent days below sit among counts of 1 to 3.
TEST(MissingDates, AbsentDaysAmidLowCountsAreProbablyTrueZerosAndFilledWithZero) {
    const Drop drop = handBuiltDrop({"A"}, {{1, 2, X, 1, 3, X, X, 2, 1, X, 2}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 3u);
    for (const Finding& f : found) {
        EXPECT_TRUE(f.evidence["probably_true_zeros"].get<bool>()) << f.evidence.dump();
        EXPECT_EQ(f.severity, Severity::Info);
        EXPECT_EQ(suggestionToJson(f)["decision"], "fill_missing");
        EXPECT_EQ(suggestionToJson(f)["method"], "zero");  // never interpolated
        EXPECT_EQ(f.evidence["suggestion_adds"]["cases"], 0);
        EXPECT_EQ(f.evidence["zeros_reported"], 0);  // the tally writes no zero rows
        EXPECT_EQ(totalChangeOfSuggestion(drop, f, "cases"), 0);
    }
    // Nearest three reported days on each side of day 2: 2, 1 and 1, 3, 2; median 2.
    EXPECT_DOUBLE_EQ(found[0].evidence["level_nearby"].get<double>(), 2.0);
    EXPECT_NEAR(found[0].evidence["zero_chance_nearby"].get<double>(), 0.1353, 1e-4);  // e^-2
    EXPECT_EQ(describeFinding(found[0]),
              "1 day(s) with no row amid low counts (about 2 a day nearby): probably true zeros");
    EXPECT_NE(suggestionToJson(found[0])["note"].get<std::string>().find("case list"),
              std::string::npos);
}

TEST(MissingDates, AnInterpolatingSuggestionSaysHowManyCountsItAdds) {
    const Drop drop = handBuiltDrop({"A"}, {{40, 42, X, X, 48, 50, 44, 47}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_FALSE(found[0].evidence["probably_true_zeros"].get<bool>());
    EXPECT_EQ(found[0].severity, Severity::Warning);
    EXPECT_EQ(suggestionToJson(found[0])["method"], "linear");
    // Rounded interpolation between 42 and 48 over two days: 44 and 46.
    EXPECT_EQ(found[0].evidence["suggestion_adds"]["cases"], 90);
    EXPECT_EQ(totalChangeOfSuggestion(drop, found[0], "cases"), 90);
}

TEST(MissingDates, ACatchUpAfterLowCountsIsSharedAndAddsNothing) {
    const Drop drop = handBuiltDrop({"A"}, {{2, 1, 2, X, X, 12, 2, 1, 2}});
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_FALSE(found[0].evidence["probably_true_zeros"].get<bool>());
    EXPECT_EQ(suggestionToJson(found[0])["method"], "share");
    EXPECT_EQ(found[0].evidence["suggestion_adds"]["cases"], 0);
    EXPECT_EQ(totalChangeOfSuggestion(drop, found[0], "cases"), 0);
}

TEST(MissingDates, WithNothingToInterpolateFromTheSuggestionIsToLookNotToFill) {
    Drop drop = handBuiltDrop({"A"}, {{40, 42, X, 48, 50}});
    drop.tables[0].at(0, 1).state = CellState::Unparsable;  // the day before has no number
    const auto found = run(drop);
    ASSERT_EQ(found.size(), 1u);
    EXPECT_EQ(suggestionToJson(found[0])["decision"], "accept");
    EXPECT_FALSE(found[0].evidence.contains("suggestion_adds"));
}

// Every fill the scan suggests on generated drops changes the total by exactly what its
// evidence says (support/synthetic_drop.h; the days are planted at random levels).
TEST(MissingDates, NoSuggestedFillAddsCountsTheEvidenceDoesNotState) {
    testing::SyntheticOptions o;
    o.seed = 41;
    o.regions = 20;
    o.minPeak = 1;
    o.maxPeak = 60;
    auto s = testing::makeSyntheticDrop(o);
    for (std::size_t r = 0; r < s.drop.regionCodes.size(); ++r)
        testing::plantMissingDates(s, r, static_cast<std::int32_t>(20 + 9 * r), 1 + r % 3);
    const auto found = run(s.drop);
    ASSERT_GE(found.size(), 20u);
    int zeros = 0, linear = 0;
    for (const Finding& f : found) {
        if (suggestionToJson(f)["decision"] != "fill_missing")
            continue;
        const std::int64_t stated = f.evidence["suggestion_adds"]["cases"].get<std::int64_t>();
        EXPECT_EQ(totalChangeOfSuggestion(s.drop, f, "cases"), stated) << f.evidence.dump();
        zeros += suggestionToJson(f)["method"] == "zero";
        linear += suggestionToJson(f)["method"] == "linear";
        if (suggestionToJson(f)["method"] == "zero") {
            EXPECT_LE(f.evidence["level_nearby"].get<double>(), 3.0);
        }
    }
    EXPECT_GT(zeros, 0);  // both rules met among 20 regions from 1 to 60 a day
    EXPECT_GT(linear, 0);
}

// Real data: r-cran-surveillance, dataset husO104Hosp (hospitalisation dates of 630 HUS cases
// of the STEC O104:H4 outbreak, Germany 2011; tests/data/real/SOURCES.md), tallied per day of
// hospitalisation as a case list tally is: a row only for a day with cases. Days without one
// inside the outbreak: 05-08 to 05-11, 06-20, 06-24, 06-26, 06-30 to 07-02, each amid 1 to 6
// cases a day.
TEST(MissingDates, RealCaseListTallyGetsTrueZeroSuggestionsThatKeepItsTotal) {
    std::ifstream in(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv");
    ASSERT_TRUE(in) << "husO104Hosp_case_list.csv";
    std::string line;
    std::getline(in, line);  // dHosp,dReport
    std::map<std::string, int> perDay;
    while (std::getline(in, line))
        ++perDay[line.substr(0, line.find(','))];
    std::ostringstream tally;
    tally << "date,region,cases\n";
    for (const auto& [date, cases] : perDay)
        tally << date << ",DE," << cases << "\n";
    Result<Drop> drop = ingest::parseDrop(tally.str(), "husO104Hosp-tally.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    ASSERT_FALSE(drop->axis.weekly());
    EXPECT_EQ(ledger::rawTotal(*drop, 0, 0), 630);

    Result<ScanReport> report = scanDrop(*drop);
    ASSERT_TRUE(report.ok());
    std::vector<std::pair<std::string, std::string>> runs;
    ledger::Ledger ledger;
    Result<ledger::Cleaned> cleaned = ledger::replay(*drop, ledger);
    ASSERT_TRUE(cleaned.ok());
    for (const Finding& f : report->findings) {
        if (f.kind != FindingKind::MissingDates)
            continue;
        runs.emplace_back(f.first->iso(), f.last->iso());
        EXPECT_TRUE(f.evidence["probably_true_zeros"].get<bool>()) << f.evidence.dump();
        EXPECT_EQ(suggestionToJson(f)["method"], "zero") << f.evidence.dump();
        Result<ledger::Decision> d = suggestedDecision(f, "cases");
        ASSERT_TRUE(d.ok());
        ledger::EntryMeta meta;
        meta.reason = "case list tally: no row means no case";
        meta.author = "tester";
        meta.timestamp = "2026-03-20T09:30:00Z";
        Result<ledger::LedgerEntry> entry = ledger::draftEntry(*drop, ledger, *cleaned, *d, meta);
        ASSERT_TRUE(entry.ok()) << entry.error().describe();
        ASSERT_TRUE(ledger::applyEntry(*drop, *cleaned, *entry).ok());
        ledger.entries.push_back(*entry);
    }
    const std::vector<std::pair<std::string, std::string>> expected = {
        {"2011-05-08", "2011-05-11"},
        {"2011-06-20", "2011-06-20"},
        {"2011-06-24", "2011-06-24"},
        {"2011-06-26", "2011-06-26"},
        {"2011-06-30", "2011-07-02"}};
    std::sort(runs.begin(), runs.end());
    EXPECT_EQ(runs, expected);
    EXPECT_EQ(cleaned->total(0, 0), 630);
    EXPECT_FALSE(ledger::countsAddedByDecisions(ledger).any());
}

}  // namespace
}  // namespace siftwave::scan
