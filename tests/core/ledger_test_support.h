#pragma once
// Hand-built drops and small helpers for the ledger tests.

#include "siftwave/drop.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/replay.h"

#include <gtest/gtest.h>

#include <initializer_list>
#include <string>
#include <vector>

namespace siftwave::testing {

inline Date day(const char* iso) {
    return *Date::fromIso(iso);
}

/// A drop of `regions` x `days` for the given measures, every cell absent.
inline Drop makeDrop(std::vector<std::string> regions, std::vector<std::string> measures,
                     const char* firstDay, std::int32_t days,
                     std::string sha = std::string(64, 'a')) {
    Drop drop;
    drop.source.path = "hand-built.csv";
    drop.source.sha256 = std::move(sha);
    drop.regionCodes = std::move(regions);
    drop.measures = std::move(measures);
    drop.axis = TimeAxis::daily(day(firstDay), days);
    for (std::size_t m = 0; m < drop.measures.size(); ++m)
        drop.tables.emplace_back(drop.regionCodes.size(), days);
    drop.indexRegions();
    return drop;
}

/// The same with ISO weeks (Monday start): `weeks` weeks from the Monday `firstMonday`.
inline Drop makeWeeklyDrop(std::vector<std::string> regions, std::vector<std::string> measures,
                           const char* firstMonday, std::int32_t weeks,
                           std::string sha = std::string(64, 'b')) {
    Drop drop =
        makeDrop(std::move(regions), std::move(measures), firstMonday, weeks, std::move(sha));
    drop.axis = TimeAxis::weekly(day(firstMonday), weeks, WeekStart::Monday);
    return drop;
}

/// Sets a region's series of one measure to reported values, line numbers made up.
inline void setSeries(Drop& drop, std::size_t measure, std::size_t region,
                      std::initializer_list<int> values) {
    std::int32_t d = 0;
    for (int v : values) {
        Cell& c = drop.tables[measure].at(region, static_cast<std::size_t>(d));
        c.value = v;
        c.state = CellState::Reported;
        c.line = static_cast<std::uint32_t>(2 + region * 1000 + static_cast<std::size_t>(d));
        ++d;
    }
}

inline void setAbsent(Drop& drop, std::size_t measure, std::size_t region, std::int32_t d) {
    drop.tables[measure].at(region, static_cast<std::size_t>(d)) = Cell{};
}

inline std::vector<std::int64_t> values(const ledger::Cleaned& cleaned, std::size_t measure,
                                        std::size_t region) {
    std::vector<std::int64_t> out;
    for (const ledger::CleanedCell& c : cleaned.series(measure, region))
        out.push_back(c.hasValue() ? c.value : -999);
    return out;
}

/// Records a decision through the one door and returns its entry (fails the test on error).
inline ledger::LedgerEntry record(const Drop& drop, ledger::Ledger& ledger,
                                  ledger::Cleaned& cleaned, const ledger::Decision& decision,
                                  const std::string& reason = "checked with the regional office") {
    ledger::EntryMeta meta;
    meta.author = "tester";
    meta.timestamp = "2026-03-20T09:30:00Z";
    meta.reason = reason;
    auto entry = ledger::draftEntry(drop, ledger, cleaned, decision, meta);
    EXPECT_TRUE(entry.ok()) << (entry.ok() ? "" : entry.error().describe());
    if (!entry.ok())
        return {};
    auto applied = ledger::applyEntry(drop, cleaned, *entry);
    EXPECT_TRUE(applied.ok()) << (applied.ok() ? "" : applied.error().describe());
    ledger.entries.push_back(*entry);
    return *entry;
}

inline ledger::Decision redistribution(const std::string& region, const char* date,
                                       std::int64_t excess, const char* first, const char* last,
                                       ledger::RedistributeMethod method) {
    ledger::Decision d;
    d.kind = ledger::DecisionKind::Redistribute;
    d.region = region;
    d.measure = "cases";
    d.date = day(date);
    d.excess = excess;
    d.window = ledger::DayRange{day(first), day(last)};
    d.redistributeMethod = method;
    return d;
}

inline ledger::Decision withdrawal(std::uint64_t target) {
    ledger::Decision d;
    d.kind = ledger::DecisionKind::Withdraw;
    d.target = target;
    return d;
}

}  // namespace siftwave::testing
