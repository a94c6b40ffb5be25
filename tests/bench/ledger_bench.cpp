// Ledger benchmarks: recording and replaying decisions on a large drop, and
// writing the cleaned CSV. No target in the issue; figures for the note.
#include "siftwave/ledger/export.h"
#include "siftwave/ledger/replay.h"
#include "support/synthetic_drop.h"

#include <benchmark/benchmark.h>

namespace {

using namespace siftwave;

const testing::SyntheticDrop& bigDrop() {
    static const testing::SyntheticDrop s = [] {
        testing::SyntheticOptions o;
        o.regions = 3000;
        o.days = 1000;
        auto d = testing::makeSyntheticDrop(o);
        d.drop.source.sha256 = std::string(64, 'e');
        return d;
    }();
    return s;
}

/// One redistribution per region (uniform, 14 days before day 500), recorded through the one door.
ledger::Ledger hundredsOfDecisions(const Drop& drop, int count) {
    ledger::Ledger ledger;
    ledger::Cleaned cleaned(drop);
    for (int i = 0; i < count; ++i) {
        const std::size_t r = static_cast<std::size_t>(i) % drop.regionCodes.size();
        ledger::Decision d;
        d.kind = ledger::DecisionKind::Redistribute;
        d.region = drop.regionCodes[r];
        d.measure = drop.measures[0];
        d.date = drop.periodStart(500);
        const std::int64_t held = cleaned.cell(0, r, 500).counted();
        d.excess = held > 1 ? held / 2 : 1;
        d.window = ledger::DayRange{drop.periodStart(486), drop.periodStart(499)};
        d.redistributeMethod =
            i % 2 ? ledger::RedistributeMethod::Proportional : ledger::RedistributeMethod::Baseline;
        ledger::EntryMeta meta{"bench", "2026-01-01T00:00:00Z", "benchmark"};
        auto entry = ledger::draftEntry(drop, ledger, cleaned, d, meta);
        if (!entry.ok()) {
            d.redistributeMethod = ledger::RedistributeMethod::Uniform;
            entry = ledger::draftEntry(drop, ledger, cleaned, d, meta);
        }
        if (!entry.ok())
            continue;
        (void)ledger::applyEntry(drop, cleaned, *entry);
        ledger.entries.push_back(std::move(*entry));
    }
    return ledger;
}

void BM_RecordDecision(benchmark::State& state) {
    const Drop& drop = bigDrop().drop;
    const ledger::Cleaned cleaned(drop);
    ledger::Decision d;
    d.kind = ledger::DecisionKind::Redistribute;
    d.region = drop.regionCodes[7];
    d.measure = drop.measures[0];
    d.date = drop.periodStart(500);
    d.excess = 1;
    d.window = ledger::DayRange{drop.periodStart(486), drop.periodStart(499)};
    d.redistributeMethod = ledger::RedistributeMethod::Baseline;
    for (auto _ : state) {
        auto effect = ledger::previewDecision(drop, cleaned, d);
        benchmark::DoNotOptimize(effect);
    }
}
BENCHMARK(BM_RecordDecision)->Unit(benchmark::kMicrosecond);

void BM_ReplayThousandEntries(benchmark::State& state) {
    const Drop& drop = bigDrop().drop;
    const ledger::Ledger ledger = hundredsOfDecisions(drop, 1000);
    state.counters["entries"] = static_cast<double>(ledger.entries.size());
    for (auto _ : state) {
        auto cleaned = ledger::replay(drop, ledger);
        benchmark::DoNotOptimize(cleaned);
    }
}
BENCHMARK(BM_ReplayThousandEntries)->Unit(benchmark::kMillisecond);

void BM_CleanedCsv(benchmark::State& state) {
    const Drop& drop = bigDrop().drop;
    const ledger::Cleaned cleaned(drop);
    for (auto _ : state) {
        std::string csv = ledger::cleanedCsv(drop, cleaned);
        benchmark::DoNotOptimize(csv);
    }
}
BENCHMARK(BM_CleanedCsv)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
