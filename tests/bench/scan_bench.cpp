// Benchmarks of the anomaly scan (issue 3's targets, on one core):
//   scan of 3,000 regions x 1,000 days after ingest        <= 0.2 s
//   the whole scan command on the 3 M-row file             <= 0.5 s
// The drop is the seeded synthetic one of tests/support (negative-binomial
// noise, weekday effect, three waves) with a few planted problems. Run:
//   build/bench/scan_bench --benchmark_min_time=1s

#include "siftwave/ingest/ingest.h"
#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <benchmark/benchmark.h>
#include <nlohmann/json.hpp>

#include <unistd.h>
#include <cstdio>
#include <filesystem>
#include <fstream>

namespace {

using namespace siftwave;

const testing::SyntheticDrop& bigDrop() {
    static const testing::SyntheticDrop s = [] {
        testing::SyntheticOptions o;
        o.seed = 2026;
        o.regions = 3000;
        o.days = 1000;
        o.waves = 6;
        testing::SyntheticDrop d = testing::makeSyntheticDrop(o);
        for (std::size_t r = 0; r < 3000; r += 97)
            testing::plantBacklogDump(d, r, 500, 5);
        for (std::size_t r = 11; r < 3000; r += 131)
            testing::plantReportingGap(d, r, 300, 3);
        for (std::size_t r = 5; r < 3000; r += 211)
            testing::plantNegative(d, r, 700, -40);
        return d;
    }();
    return s;
}

std::string g_writtenFile;  // removed at exit

const std::string& bigFile() {
    static const std::string path = [] {
        const std::string p = (std::filesystem::temp_directory_path() /
                               ("siftwave_scan_bench_" + std::to_string(getpid()) + ".csv"))
                                  .string();
        std::ofstream out(p, std::ios::binary);
        out << testing::toLongCsv(bigDrop().drop);
        g_writtenFile = p;
        return p;
    }();
    return path;
}

void BM_ScanAfterIngest_3000x1000(benchmark::State& state) {
    const Drop& drop = bigDrop().drop;
    std::size_t findings = 0;
    for (auto _ : state) {
        auto report = scan::scanDrop(drop);
        findings = report->findings.size();
        benchmark::DoNotOptimize(findings);
    }
    state.counters["findings"] = static_cast<double>(findings);
    state.counters["cells"] = static_cast<double>(drop.regionCodes.size()) * drop.periods();
}
BENCHMARK(BM_ScanAfterIngest_3000x1000)->Unit(benchmark::kMillisecond);

void BM_ScanWithPreviousRelease_3000x1000(benchmark::State& state) {
    const Drop& drop = bigDrop().drop;
    const Drop& previous = bigDrop().drop;  // same history: every cell compared, none changed
    for (auto _ : state) {
        auto report = scan::scanDrop(drop, {}, {&previous, nullptr});
        benchmark::DoNotOptimize(report->findings.size());
    }
}
BENCHMARK(BM_ScanWithPreviousRelease_3000x1000)->Unit(benchmark::kMillisecond);

// What `siftwave-cli scan FILE --json` does: read the file, scan, write the JSON.
void BM_ScanCommand_3MRowFile(benchmark::State& state) {
    const std::string& path = bigFile();
    std::size_t bytes = 0;
    for (auto _ : state) {
        auto drop = ingest::readDrop(path);
        if (!drop) {
            state.SkipWithError(drop.error().describe().c_str());
            return;
        }
        auto report = scan::scanDrop(*drop);
        const std::string json = scan::scanReportToJson(*report).dump(2);
        bytes = drop->source.bytes;
        benchmark::DoNotOptimize(json.size());
    }
    state.counters["file_MB"] = static_cast<double>(bytes) / 1e6;
    state.counters["rows"] = static_cast<double>(bigDrop().drop.rows);
}
BENCHMARK(BM_ScanCommand_3MRowFile)->Unit(benchmark::kMillisecond);

}  // namespace

int main(int argc, char** argv) {
    benchmark::Initialize(&argc, argv);
    benchmark::RunSpecifiedBenchmarks();
    benchmark::Shutdown();
    if (!g_writtenFile.empty())
        std::filesystem::remove(g_writtenFile);
    return 0;
}
