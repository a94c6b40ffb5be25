// Property tests: random decision sequences on random drops keep every total
// exactly (or change it by what the entries state), never create a negative
// count, and replay gives byte-identical output every time.
#include "ledger_test_support.h"

#include "siftwave/ledger/export.h"
#include "siftwave/ledger/ledger_file.h"

#include <gtest/gtest.h>

#include <map>
#include <random>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;

Drop randomDrop(std::mt19937_64& rng) {
    const std::size_t regions = 2 + rng() % 3;
    const std::size_t measures = 1 + rng() % 2;
    const std::int32_t days = 15 + static_cast<std::int32_t>(rng() % 25);
    std::vector<std::string> codes;
    for (std::size_t r = 0; r < regions; ++r)
        codes.push_back(r == 1 ? "07" : "R" + std::to_string(r));
    if (regions > 2)
        codes[2] = "7";  // a code variant of "07"
    std::vector<std::string> names{"cases", "deaths"};
    names.resize(measures);
    Drop drop = makeDrop(codes, names, "2026-01-05", days, std::string(64, '5'));
    std::uint32_t line = 2;
    for (std::size_t m = 0; m < measures; ++m) {
        for (std::size_t r = 0; r < regions; ++r) {
            for (std::int32_t d = 0; d < days; ++d) {
                Cell& c = drop.tables[m].at(r, static_cast<std::size_t>(d));
                const auto roll = rng() % 100;
                c.line = line++;
                if (roll < 8) {
                    c = Cell{};
                } else if (roll < 10) {
                    c.state = CellState::Blank;
                } else if (roll < 13) {
                    c.state = CellState::Reported;
                    c.value = -static_cast<std::int32_t>(1 + rng() % 6);
                } else if (roll < 16) {
                    c.state = CellState::Reported;
                    c.value = static_cast<std::int32_t>(100 + rng() % 400);  // a dump
                } else {
                    c.state = CellState::Reported;
                    c.value = static_cast<std::int32_t>(rng() % 40);
                }
            }
        }
    }
    for (int k = 0; k < 3; ++k) {
        DuplicateRow dup;
        dup.measure = rng() % measures;
        dup.region = rng() % regions;
        dup.day = static_cast<std::int32_t>(rng() % static_cast<std::uint64_t>(days));
        dup.cell = Cell{static_cast<std::int32_t>(rng() % 50), line++, CellState::Reported};
        drop.duplicates.push_back(dup);
    }
    return drop;
}

/// A day of the chosen series matching `want`, searched from a random start; -1 if none.
template <class Pred>
std::int32_t findDay(std::mt19937_64& rng, const Cleaned& cleaned, std::size_t m, std::size_t r,
                     Pred want) {
    const std::int32_t start =
        static_cast<std::int32_t>(rng() % static_cast<std::uint64_t>(cleaned.days()));
    for (std::int32_t k = 0; k < cleaned.days(); ++k) {
        const std::int32_t d = (start + k) % cleaned.days();
        if (want(cleaned.cell(m, r, d)))
            return d;
    }
    return -1;
}

Decision randomDecision(std::mt19937_64& rng, const Drop& drop, const Cleaned& cleaned,
                        std::uint64_t entries) {
    Decision d;
    d.kind = static_cast<DecisionKind>(rng() % 8);
    d.region = drop.regionCodes[rng() % drop.regionCodes.size()];
    d.measure = drop.measures[rng() % drop.measures.size()];
    const auto days = static_cast<std::uint64_t>(drop.periods());
    const auto a = static_cast<std::int32_t>(rng() % days);
    const auto b = static_cast<std::int32_t>(rng() % days);
    const Date lo = drop.periodStart(std::min(a, b));
    const Date hi = drop.periodStart(std::max(a, b));
    switch (d.kind) {
        case DecisionKind::Redistribute: {
            const auto m = *drop.measureIndex(d.measure);
            const auto r = *drop.regionIndex(d.region);
            const std::int32_t dump = findDay(rng, cleaned, m, r, [](const CleanedCell& c) {
                return c.hasValue() && c.value >= 20;
            });
            const std::int32_t at = dump >= 1 ? dump : std::max(1, std::max(a, b));
            const std::int32_t from =
                static_cast<std::int32_t>(rng() % static_cast<std::uint64_t>(at));
            d.date = drop.periodStart(at);
            d.window = DayRange{drop.periodStart(from), drop.periodStart(at - 1)};
            const std::int64_t held = cleaned.cell(m, r, at).counted();
            d.excess =
                1 + static_cast<std::int64_t>(
                        rng() % static_cast<std::uint64_t>(std::max<std::int64_t>(held + 5, 1)));
            d.redistributeMethod = static_cast<RedistributeMethod>(rng() % 3);
            break;
        }
        case DecisionKind::SpreadNegative: {
            const auto m = *drop.measureIndex(d.measure);
            const auto r = *drop.regionIndex(d.region);
            const std::int32_t neg = findDay(rng, cleaned, m, r, [](const CleanedCell& c) {
                return c.hasValue() && c.value < 0;
            });
            d.date = neg >= 0 ? drop.periodStart(neg) : hi;
            if (rng() % 4 == 0 && lo < *d.date)
                d.window = DayRange{lo, *d.date - 1};
            break;
        }
        case DecisionKind::FillMissing: {
            const auto m = *drop.measureIndex(d.measure);
            const auto r = *drop.regionIndex(d.region);
            std::int32_t gap = findDay(rng, cleaned, m, r, [](const CleanedCell& c) {
                return !c.hasValue() && c.state != CleanedState::Excluded &&
                       c.state != CleanedState::Merged;
            });
            if (gap < 0)
                gap = a;
            std::int32_t end = gap;
            while (end + 1 < drop.periods() && !cleaned.cell(m, r, end + 1).hasValue() && rng() % 2)
                ++end;
            d.window = DayRange{drop.periodStart(gap), drop.periodStart(end)};
            d.fillMethod = static_cast<FillMethod>(rng() % 3);
            break;
        }
        case DecisionKind::ResolveDuplicate: {
            const DuplicateRow& dup = drop.duplicates[rng() % drop.duplicates.size()];
            d.region = drop.regionCodes[dup.region];
            d.measure = drop.measures[dup.measure];
            d.date = drop.periodStart(dup.day);
            d.duplicateRule = static_cast<DuplicateRule>(rng() % 4);
            break;
        }
        case DecisionKind::MergeCodes:
            d.variant = drop.regionCodes[rng() % drop.regionCodes.size()];
            d.into = drop.regionCodes[rng() % drop.regionCodes.size()];
            break;
        case DecisionKind::Exclude:
            if (rng() % 3 == 0)
                d.region.clear();
            if (rng() % 2)
                d.measure.clear();
            if (rng() % 2 || d.region.empty())
                d.window = DayRange{lo, hi};
            break;
        case DecisionKind::Accept:
            if (rng() % 2)
                d.window = DayRange{lo, hi};
            break;
        case DecisionKind::Withdraw:
            // Mostly the latest entries, as an undo stack would.
            d.target = entries == 0 ? 1 : entries - rng() % std::min<std::uint64_t>(entries, 3);
            break;
        case DecisionKind::NowcastComplete:  // not drawn (rng() % 8): these drops hold counts
            break;
    }
    return d;
}

struct Invariants {
    const Drop& drop;
    std::map<std::pair<std::string, std::string>, std::int64_t> stated;

    void check(const Cleaned& cleaned, const LedgerEntry& entry, const std::string& context) {
        for (const TotalChange& t : entry.effect.totals) {
            stated[{t.measure, t.region}] += t.change();
            if (decisionConservesTotals(entry.decision)) {
                EXPECT_EQ(t.before, t.after)
                    << context << " kind " << decisionKindName(entry.decision.kind);
            }
        }
        const DecisionKind k = entry.decision.kind;
        if (k == DecisionKind::Redistribute || k == DecisionKind::SpreadNegative ||
            k == DecisionKind::FillMissing) {
            for (const CellChange& c : entry.effect.cells) {
                if (c.after.hasValue() && c.after.value < 0) {
                    EXPECT_GE(c.after.value, c.before.counted())
                        << context << " made a day negative";
                }
            }
        }
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
                std::int64_t sum = 0;
                for (const CleanedCell& c : cleaned.series(m, r))
                    sum += c.counted();
                const auto key = std::make_pair(drop.measures[m], drop.regionCodes[r]);
                EXPECT_EQ(sum, rawTotal(drop, m, r) + stated[key]) << context;
                EXPECT_EQ(sum, cleaned.total(m, r)) << context;
            }
        }
    }
};

TEST(LedgerProperties, RandomDecisionSequencesConserveTotalsAndReplayByteIdentically) {
    int accepted = 0;
    int refused = 0;
    std::map<DecisionKind, int> acceptedByKind;
    for (std::uint64_t seed = 1; seed <= 40; ++seed) {
        std::mt19937_64 rng(seed);
        const Drop drop = randomDrop(rng);
        Ledger ledger;
        Cleaned cleaned(drop);
        Invariants invariants{drop, {}};
        for (int step = 0; step < 60; ++step) {
            const Decision d = randomDecision(rng, drop, cleaned, ledger.entries.size());
            EntryMeta meta{"prop", "2026-01-31T12:00:00Z", "random step " + std::to_string(step)};
            const std::string before = cleanedCsv(drop, cleaned);
            auto entry = draftEntry(drop, ledger, cleaned, d, meta);
            if (!entry.ok()) {
                ++refused;
                EXPECT_EQ(cleanedCsv(drop, cleaned), before)
                    << "a refused decision changed the data";
                continue;
            }
            ASSERT_TRUE(applyEntry(drop, cleaned, *entry).ok());
            ledger.entries.push_back(*entry);
            ++accepted;
            ++acceptedByKind[d.kind];
            invariants.check(cleaned, *entry,
                             "seed " + std::to_string(seed) + " step " + std::to_string(step));
        }
        // Replay from scratch twice, and from the ledger's own file text: byte-identical output.
        auto first = replay(drop, ledger);
        ASSERT_TRUE(first.ok()) << first.error().describe();
        auto second = replay(drop, ledger);
        ASSERT_TRUE(second.ok());
        const std::string csv = cleanedCsv(drop, *first);
        EXPECT_EQ(csv, cleanedCsv(drop, *second));
        EXPECT_EQ(csv, cleanedCsv(drop, cleaned))
            << "replay differs from the state built entry by entry";
        std::string text;
        for (const LedgerEntry& e : ledger.entries)
            text += *entryLine(e) + "\n";
        auto parsed = parseLedger(text, "random.jsonl");
        ASSERT_TRUE(parsed.ok()) << parsed.error().describe();
        auto third = replay(drop, *parsed);
        ASSERT_TRUE(third.ok()) << third.error().describe();
        EXPECT_EQ(csv, cleanedCsv(drop, *third));
    }
    // The generator must actually exercise the kinds, or the test proves little.
    EXPECT_GT(accepted, 400);
    EXPECT_GT(refused, 50);
    for (int k = 0; k < 8; ++k) {
        EXPECT_GT(acceptedByKind[static_cast<DecisionKind>(k)], 3)
            << decisionKindName(static_cast<DecisionKind>(k));
    }
}

TEST(LedgerProperties, WithdrawingEverythingInReverseOrderRestoresTheRawDrop) {
    for (std::uint64_t seed = 100; seed < 120; ++seed) {
        std::mt19937_64 rng(seed);
        const Drop drop = randomDrop(rng);
        Ledger ledger;
        Cleaned cleaned(drop);
        std::vector<std::uint64_t> applied;
        for (int step = 0; step < 40; ++step) {
            Decision d = randomDecision(rng, drop, cleaned, ledger.entries.size());
            if (d.kind == DecisionKind::Withdraw)
                continue;
            EntryMeta meta{"prop", "2026-01-31T12:00:00Z", "step"};
            auto entry = draftEntry(drop, ledger, cleaned, d, meta);
            if (!entry.ok())
                continue;
            ASSERT_TRUE(applyEntry(drop, cleaned, *entry).ok());
            ledger.entries.push_back(*entry);
            applied.push_back(entry->sequence);
        }
        for (auto it = applied.rbegin(); it != applied.rend(); ++it) {
            EntryMeta meta{"prop", "2026-01-31T12:00:00Z", "undo"};
            auto entry = draftEntry(drop, ledger, cleaned, withdrawal(*it), meta);
            ASSERT_TRUE(entry.ok()) << "seed " << seed << ": " << entry.error().describe();
            ASSERT_TRUE(applyEntry(drop, cleaned, *entry).ok());
            ledger.entries.push_back(*entry);
        }
        // Values and states are back to the drop's; only the touch history remains.
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
                for (std::int32_t d = 0; d < drop.periods(); ++d) {
                    const Cell& c = drop.cell(m, r, d);
                    EXPECT_EQ(cleaned.cell(m, r, d),
                              (CleanedCell{c.reported() ? c.value : 0, cleanedStateOf(c.state)}));
                }
                EXPECT_EQ(cleaned.total(m, r), rawTotal(drop, m, r));
            }
        }
    }
}

}  // namespace
}  // namespace siftwave::ledger
