#pragma once
// The generated long drop of the ingest benchmarks (ingest_bench.cpp, spreadsheet_bench.cpp):
// 3,000 regions x 1,000 days (3 M rows), the size named in issue 2's performance target, and
// the process's CPU time and peak resident size.

#include "siftwave/date.h"

#include <sys/resource.h>
#include <unistd.h>

#include <cstdio>
#include <ctime>
#include <filesystem>
#include <string>

namespace siftwave::bench {

constexpr int kRegions = 3000;
constexpr int kDays = 1000;

inline std::string generate(int measures, bool weekly) {
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

inline double processCpuSeconds() {
    timespec ts{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) * 1e-9;
}

inline double peakRssBytes() {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return static_cast<double>(usage.ru_maxrss) * 1024.0;  // ru_maxrss is in KiB on Linux
}

}  // namespace siftwave::bench
