// Ingest throughput and peak memory on a generated long CSV of 3,000 regions x
// 1,000 days (3 M rows), the size named in issue 2's performance target
// (>= 300 MB/s end to end on one core, peak memory <= 1.5 x the file size).
// The second argument makes the same file weekly: 1,000 Mondays 7 days apart
// (the reader then reads weeks), so daily and weekly throughput compare in one run.
//
// The file is generated at start into the temporary folder and removed at the
// end. Counters: bytes_per_second (wall clock, end to end: open, hash, check,
// parse, fill the tables), cpu_MB_per_s (the same over process CPU time),
// file_MB, and peak_rss_x_file: the process's peak resident size (getrusage
// ru_maxrss) divided by the file size. ru_maxrss only grows, so the one-measure
// case runs first and each case reports the peak reached so far.
#include "siftwave/ingest/ingest.h"

#include "bench_long_drop.h"

#include <benchmark/benchmark.h>
#include <sys/resource.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>
#include <string>

namespace {

using namespace siftwave::bench;

void ingestLong(benchmark::State& state) {
    const int measures = static_cast<int>(state.range(0));
    const bool weekly = state.range(1) != 0;
    const std::string path = generate(measures, weekly);
    if (path.empty()) {
        state.SkipWithError("cannot write the benchmark file");
        return;
    }
    const auto bytes = static_cast<double>(std::filesystem::file_size(path));
    const double cpuStart = processCpuSeconds();
    for (auto _ : state) {
        siftwave::Result<siftwave::Drop> drop = siftwave::ingest::readDrop(path);
        if (!drop) {
            state.SkipWithError(drop.error().describe().c_str());
            break;
        }
        if (drop->rows != static_cast<std::size_t>(kRegions) * kDays || drop->periods() != kDays ||
            drop->axis.weekly() != weekly) {
            state.SkipWithError("wrong row count or calendar");
            break;
        }
        benchmark::DoNotOptimize(drop->tables.data());
    }
    state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations()) *
                            static_cast<std::int64_t>(bytes));
    const double cpuSeconds = processCpuSeconds() - cpuStart;
    // Wall-clock MB/s (bytes_per_second) suffers when other work shares the cores; this
    // one counts only the CPU time the reading took.
    state.counters["cpu_MB_per_s"] =
        bytes * static_cast<double>(state.iterations()) / 1e6 / cpuSeconds;
    state.counters["file_MB"] = bytes / 1e6;
    state.counters["peak_rss_x_file"] = peakRssBytes() / bytes;
    std::filesystem::remove(path);
}

// {measures, weekly}: daily first (ru_maxrss only grows: the weekly cases report their own peak
// only if it is higher than the daily ones').
BENCHMARK(ingestLong)
    ->Args({1, 0})
    ->Args({2, 0})
    ->Args({1, 1})
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
