// The table of decision kinds (siftwave/ledger/decision_kinds.h): one descriptor per kind,
// in DecisionKind order; each entry's JSON holds the parameters its kind lists and reads
// back the same; and the one text naming the cells a decision touched.
#include "siftwave/ledger/decision_kinds.h"

#include "siftwave/ledger/entry.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <map>
#include <set>
#include <string>

namespace siftwave::ledger {
namespace {

Date day(const char* iso) {
    return *Date::fromIso(iso);
}

/// A valid decision of each kind, with every parameter its kind writes set.
Decision sampleOf(DecisionKind kind) {
    Decision d;
    d.kind = kind;
    switch (kind) {
        case DecisionKind::Redistribute:
            d.region = "0412";
            d.measure = "cases";
            d.date = day("2026-03-10");
            d.window = DayRange{day("2026-03-01"), day("2026-03-07")};
            d.excess = 5;
            d.redistributeMethod = RedistributeMethod::Baseline;
            d.baselineWidth = 9;
            break;
        case DecisionKind::SpreadNegative:
            d.region = "0412";
            d.measure = "cases";
            d.date = day("2026-03-10");
            d.window = DayRange{day("2026-03-01"), day("2026-03-07")};
            break;
        case DecisionKind::FillMissing:
            d.region = "0412";
            d.measure = "cases";
            d.window = DayRange{day("2026-03-01"), day("2026-03-07")};
            d.fillMethod = FillMethod::Linear;
            break;
        case DecisionKind::ResolveDuplicate:
            d.region = "0412";
            d.measure = "cases";
            d.date = day("2026-03-10");
            d.duplicateRule = DuplicateRule::Max;
            break;
        case DecisionKind::MergeCodes:
            d.variant = "412";
            d.into = "0412";
            break;
        case DecisionKind::Exclude:
        case DecisionKind::Accept:
            d.region = "0412";
            d.measure = "cases";
            d.window = DayRange{day("2026-03-01"), day("2026-03-07")};
            break;
        case DecisionKind::Withdraw:
            d.target = 3;
            break;
        case DecisionKind::NowcastComplete:
            d.region = "0412";
            d.measure = "cases";
            d.date = day("2026-03-14");
            d.maxDelay = 10;
            d.nowcastWindow = 21;
            break;
        default:  // a new kind checks its own entry in its own test
            break;
    }
    return d;
}

TEST(LedgerKinds, EveryKindHasOneDescriptorInEnumOrderWithAUniqueName) {
    const auto kinds = decisionKinds();
    ASSERT_FALSE(kinds.empty());
    std::set<std::string> names;
    for (std::size_t i = 0; i < kinds.size(); ++i) {
        const DecisionKindInfo& k = *kinds[i];
        EXPECT_EQ(static_cast<std::size_t>(k.kind), i);
        EXPECT_EQ(&decisionKindInfo(k.kind), &k);
        EXPECT_TRUE(names.insert(k.name).second) << k.name;
        EXPECT_EQ(decisionKindFromName(k.name), k.kind);
        EXPECT_STREQ(decisionKindName(k.kind), k.name);
        EXPECT_FALSE(k.flags.empty()) << k.name;
        EXPECT_FALSE(k.parameters.empty()) << k.name;
        EXPECT_EQ(std::string(k.help).back(), '\n') << k.name;
    }
}

TEST(LedgerKinds, AnEntryWritesTheParametersItsKindListsAndReadsThemBack) {
    const std::map<DecisionKind, std::set<std::string>> expected = {
        {DecisionKind::Redistribute,
         {"region", "measure", "date", "window", "excess", "method", "baseline_width"}},
        {DecisionKind::SpreadNegative, {"region", "measure", "date", "window"}},
        {DecisionKind::FillMissing, {"region", "measure", "window", "method"}},
        {DecisionKind::ResolveDuplicate, {"region", "measure", "date", "keep"}},
        {DecisionKind::MergeCodes, {"variant", "into"}},
        {DecisionKind::Exclude, {"region", "measure", "window"}},
        {DecisionKind::Accept, {"region", "measure", "window"}},
        {DecisionKind::Withdraw, {"entry"}},
        {DecisionKind::NowcastComplete,
         {"region", "measure", "date", "max_delay", "nowcast_window", "method"}},
    };
    for (const auto& [kind, keysOfKind] : expected) {
        const DecisionKindInfo* k = &decisionKindInfo(kind);
        LedgerEntry e;
        e.sequence = 1;
        e.timestamp = "2026-03-11T09:00:00Z";
        e.author = "analyst";
        e.reason = "checked";
        e.dropSha256 = std::string(64, 'a');
        e.decision = sampleOf(k->kind);
        ASSERT_TRUE(e.decision.validate()) << k->name;
        ASSERT_TRUE(sealEntry(e, nullptr)) << k->name;
        const Result<std::string> line = entryLine(e);
        ASSERT_TRUE(line) << k->name;
        std::set<std::string> keys;
        const nlohmann::json parameters = nlohmann::json::parse(*line).at("parameters");
        for (auto it = parameters.begin(); it != parameters.end(); ++it)
            keys.insert(it.key());
        EXPECT_EQ(keys, keysOfKind) << k->name;
        const Result<LedgerEntry> back = parseEntryLine(*line, 1);
        ASSERT_TRUE(back) << k->name;
        EXPECT_EQ(entryLine(*back).value(), *line) << k->name;
    }
}

TEST(LedgerKinds, TheWhereTextNamesTheCellsOfEachKind) {
    Decision d = sampleOf(DecisionKind::ResolveDuplicate);
    EXPECT_EQ(decisionWhere(d, WhereStyle::Prose), "0412, cases, 2026-03-10");
    EXPECT_EQ(decisionWhere(d, WhereStyle::Compact), "0412 cases 2026-03-10");

    d = Decision{};
    d.kind = DecisionKind::Exclude;
    d.window = DayRange{day("2026-03-01"), day("2026-03-14")};
    EXPECT_EQ(decisionWhere(d, WhereStyle::Prose),
              "every region, every measure, 2026-03-01 to 2026-03-14");
    EXPECT_EQ(decisionWhere(d, WhereStyle::Compact), "2026-03-01:2026-03-14");

    d = sampleOf(DecisionKind::MergeCodes);
    EXPECT_EQ(decisionWhere(d, WhereStyle::Prose), "412 into 0412");
    EXPECT_EQ(decisionWhere(d, WhereStyle::Compact), "412 \u2192 0412");

    d = sampleOf(DecisionKind::Withdraw);
    EXPECT_EQ(decisionWhere(d, WhereStyle::Prose), "entry #3");
    EXPECT_EQ(decisionWhere(d, WhereStyle::Compact), "");
}

}  // namespace
}  // namespace siftwave::ledger
