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

#include <benchmark/benchmark.h>
#include <sys/resource.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>
#include <string>

namespace {

constexpr int kRegions = 3000;
constexpr int kDays = 1000;

std::string generate(int measures, bool weekly) {
    const std::filesystem::path path =
        std::filesystem::temp_directory_path() /
        ("siftwave_ingest_bench_" + std::to_string(measures) + (weekly ? "w" : "d") + "_" +
         std::to_string(::getpid()) + ".csv");
    std::FILE* f = std::fopen(path.c_str(), "wb");
    if (!f)
        return {};
    std::fputs(measures == 1 ? "date,region,cases\n" : "date,region,cases,deaths\n", f);
    std::uint64_t state = 0x9E3779B97F4A7C15ull;  // a fixed xorshift seed: the same file every run
    auto next = [&] {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        return state;
    };
    // 2023-01-02 is a Monday: weekly dates then start ISO weeks (ISO 8601).
    const siftwave::Date first = *siftwave::Date::fromIso(weekly ? "2023-01-02" : "2023-01-01");
    char line[96];
    for (int d = 0; d < kDays; ++d) {
        const std::string date = (first + (weekly ? 7 * d : d)).iso();
        for (int r = 0; r < kRegions; ++r) {
            const unsigned cases = static_cast<unsigned>(next() % 400);
            int n;
            if (measures == 1) {
                n = std::snprintf(line, sizeof line, "%s,D%04d,%u\n", date.c_str(), r, cases);
            } else {
                n = std::snprintf(line, sizeof line, "%s,D%04d,%u,%u\n", date.c_str(), r, cases,
                                  static_cast<unsigned>(next() % 5));
            }
            std::fwrite(line, 1, static_cast<std::size_t>(n), f);
        }
    }
    std::fclose(f);
    return path.string();
}

double processCpuSeconds() {
    timespec ts{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) * 1e-9;
}

double peakRssBytes() {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return static_cast<double>(usage.ru_maxrss) * 1024.0;  // ru_maxrss is in KiB on Linux
}

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
