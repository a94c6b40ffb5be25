// Nowcast figures: speed over 3,000 regions x 60 releases, and the many-seed accuracy studies the
// unit tests only sample (interval coverage, error against the naive count, a shortening delay).
//
//   cmake --build build-noqt -j2 --target nowcast_bench
//   taskset -c 0 build-noqt/bench/nowcast_bench
// Read the CPU-time column on a shared machine; the studies report their figures as counters.
#include "siftwave/ingest/ingest.h"
#include "siftwave/nowcast/nowcast.h"
#include "support/case_list_generator.h"

#include <benchmark/benchmark.h>

#include <cmath>
#include <random>

namespace {

using namespace siftwave;

// 3,000 regions, 60 daily releases; each release holds its last 40 days (a rolling window, as
// many dashboards publish). Counts: Poisson(5 .. 50) a day per region, delays from the
// generator's default distribution (0 .. 10 days).
struct History {
    std::vector<Drop> releases;
    std::vector<std::string> codes;
};

const History& history() {
    static const History h = [] {
        constexpr int kRegions = 3000, kReleases = 60, kKept = 40, kDays = 100;
        const Date first = *Date::fromIso("2026-01-01");
        const testing::CaseListSpec spec;
        std::mt19937_64 rng(20261205);
        std::discrete_distribution<int> delay(spec.delayPmf.begin(), spec.delayPmf.end());
        const int D = static_cast<int>(spec.delayPmf.size());
        // cumulative[r][t][d]: region r's cases of day t reported within d days.
        std::vector<std::int32_t> cum(static_cast<std::size_t>(kRegions) * kDays * D, 0);
        History out;
        for (int r = 0; r < kRegions; ++r) {
            out.codes.push_back("R" + std::to_string(10000 + r));
            std::poisson_distribution<int> count(5.0 + 45.0 * (r % 10) / 9.0);
            for (int t = 0; t < kDays; ++t) {
                std::int32_t* row = &cum[(static_cast<std::size_t>(r) * kDays + t) * D];
                for (int n = count(rng); n > 0; --n)
                    ++row[delay(rng)];
                for (int d = 1; d < D; ++d)
                    row[d] += row[d - 1];
            }
        }
        for (int k = 0; k < kReleases; ++k) {
            const int asOf = kDays - kReleases + k;
            Drop drop;
            drop.source.path = "release_" + std::to_string(k) + ".csv";
            drop.regionCodes = out.codes;
            drop.measures = {"cases"};
            drop.axis = TimeAxis::daily(first + (asOf - kKept + 1), kKept);
            CellTable table(kRegions, kKept);
            for (int r = 0; r < kRegions; ++r) {
                for (int i = 0; i < kKept; ++i) {
                    const int t = asOf - kKept + 1 + i;
                    const int d = std::min(asOf - t, D - 1);
                    Cell& c = table.at(static_cast<std::size_t>(r), static_cast<std::size_t>(i));
                    c.state = CellState::Reported;
                    c.value = cum[(static_cast<std::size_t>(r) * kDays + t) * D + d];
                }
            }
            drop.tables.push_back(std::move(table));
            drop.indexRegions();
            out.releases.push_back(std::move(drop));
        }
        return out;
    }();
    return h;
}

void NowcastAllRegionsFromReleases(benchmark::State& state) {
    const History& h = history();
    std::vector<const Drop*> releases;
    for (const Drop& d : h.releases)
        releases.push_back(&d);
    double sink = 0;
    for (auto _ : state) {
        for (const std::string& code : h.codes) {
            Result<nowcast::ReportingTriangle> tri =
                nowcast::triangleFromReleases(releases, code, "cases", 14);
            Result<nowcast::NowcastResult> r = nowcast::nowcast(*tri);
            sink += r->rows.back().hi;
        }
    }
    benchmark::DoNotOptimize(sink);
    state.counters["regions"] = static_cast<double>(h.codes.size());
    state.counters["releases"] = static_cast<double>(h.releases.size());
}
BENCHMARK(NowcastAllRegionsFromReleases)->Unit(benchmark::kMillisecond)->Iterations(3);

struct Score {
    double intervals = 0, covered = 0, absError = 0, absNaive = 0;
};

void scoreLastWeek(const testing::CaseListSpec& spec, int nowDay, nowcast::NowcastOptions o,
                   Score& s) {
    const auto cases = testing::generateCases(spec);
    const auto truth = testing::finalCounts(cases, spec.first, spec.days);
    Result<Drop> drop = ingest::parseDrop(testing::caseListText(cases), "list.csv");
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromCases(*drop, 0, spec.first + nowDay, 10);
    Result<nowcast::NowcastResult> r = nowcast::nowcast(*tri, o);
    for (std::size_t i = r->rows.size() - 7; i < r->rows.size(); ++i) {
        const nowcast::NowcastRow& row = r->rows[i];
        if (std::isnan(row.nowcast))
            continue;
        const double y = truth[static_cast<std::size_t>(row.date - spec.first)];
        s.intervals += 1;
        s.covered += (y >= row.lo && y <= row.hi) ? 1 : 0;
        s.absError += std::abs(row.nowcast - y);
        s.absNaive += std::abs(row.reported - y);
    }
}

void report(benchmark::State& state, const Score& s) {
    state.counters["intervals"] = s.intervals;
    state.counters["coverage"] = s.covered / s.intervals;
    state.counters["mae"] = s.absError / s.intervals;
    state.counters["naive_mae"] = s.absNaive / s.intervals;
    state.counters["mae_over_naive"] = s.absError / s.absNaive;
}

// 200 seeds x "now" at days 38, 50, 62 of the generator's wave (rising, peak, falling); the
// argument is the delay model (0 constant, 1 trend, 2 auto).
void CoverageStableDelay(benchmark::State& state) {
    nowcast::NowcastOptions o;
    o.delayModel = static_cast<nowcast::DelayModel>(state.range(0));
    Score s;
    for (auto _ : state) {
        s = {};
        for (std::uint64_t seed = 1000; seed < 1200; ++seed) {
            for (int now : {38, 50, 62}) {
                testing::CaseListSpec spec;
                spec.seed = seed;
                scoreLastWeek(spec, now, o, s);
            }
        }
    }
    report(state, s);
}
BENCHMARK(CoverageStableDelay)->DenseRange(0, 2)->Unit(benchmark::kMillisecond)->Iterations(1);

// Delays shortening on day 35 (mean 4.7 days to 0.9); now = 35 + lag days; window and delay
// model (0 constant, 1 trend, 2 auto) as given.
void ShorteningDelay(benchmark::State& state) {
    const int window = static_cast<int>(state.range(0));
    const int lag = static_cast<int>(state.range(1));
    const auto model = static_cast<nowcast::DelayModel>(state.range(2));
    Score s;
    for (auto _ : state) {
        s = {};
        for (std::uint64_t seed = 2000; seed < 2100; ++seed) {
            testing::CaseListSpec spec;
            spec.seed = seed;
            spec.days = 80;
            spec.delayPmf = {0.02, 0.08, 0.12, 0.14, 0.14, 0.13, 0.12, 0.10, 0.07, 0.05, 0.03};
            spec.laterPmf = {0.45, 0.35, 0.12, 0.05, 0.03};
            spec.changeDay = 35;
            nowcast::NowcastOptions o;
            o.windowPeriods = window;
            o.delayModel = model;
            scoreLastWeek(spec, 35 + lag, o, s);
        }
    }
    report(state, s);
}
BENCHMARK(ShorteningDelay)
    ->ArgsProduct({{14, 21, 42}, {7, 14, 21, 28, 35}, {0, 1, 2}})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1);

}  // namespace

BENCHMARK_MAIN();
