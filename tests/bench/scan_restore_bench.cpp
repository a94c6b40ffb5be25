// The restoration evaluation of issue 14 (tests/support/restoration_eval.h) and the
// scan's false-alarm rate on clean generated drops, printed as figures. Not a timing
// benchmark: run it by hand, `build-noqt/bench/scan_restore_bench [seeds]`.
//
// Targets (issue 14): median share of the error removed >= 85 %, no region below 50 %,
// no cleaned window whose maximum exceeds 1.5 x the true maximum, every fault found;
// clean drops: at most one warning per 100 region-years.

#include "siftwave/scan/scan.h"
#include "support/restoration_eval.h"
#include "support/synthetic_drop.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <string>
#include <vector>

namespace {

/// The median share removed among the faults of one kind.
double kindMedian(const siftwave::testing::RestorationSummary& sum, const std::string& kind) {
    std::vector<double> removed;
    for (const auto& r : sum.regions)
        if (r.kind == kind)
            removed.push_back(r.removed);
    if (removed.empty())
        return 0;
    std::sort(removed.begin(), removed.end());
    return removed[removed.size() / 2];
}

void printRestoration(int seeds) {
    std::vector<std::uint64_t> list;
    for (int s = 1; s <= seeds; ++s)
        list.push_back(static_cast<std::uint64_t>(s));
    const auto sum = siftwave::testing::evaluateRestoration(list);
    std::printf("restoration over %d seeds x 24 regions (%zu faults)\n", seeds, sum.regions.size());
    for (const auto& r : sum.regions) {
        if (r.removed < 0.85 || r.cleanedMax > 1.5 * r.trueMax || !r.found) {
            std::printf(
                "  seed %llu %s %-7s days %2d share %.2f dump %3d: removed %5.1f %%, "
                "max %.0f (true %.0f), found %d, applied %d, refused %d %s; moved %lld of %lld "
                "over %d\n",
                static_cast<unsigned long long>(r.seed), r.region.c_str(), r.kind.c_str(),
                r.faultDays, r.share, r.dumpDay, 100 * r.removed, r.cleanedMax, r.trueMax,
                r.found ? 1 : 0, r.applied, r.refused, r.refusal.c_str(),
                static_cast<long long>(r.moved), static_cast<long long>(r.planted),
                r.windowPeriods);
            if (!r.why.empty())
                std::printf("    not found: %s\n", r.why.c_str());
        }
    }
    std::printf("median error removed: %.1f %% (target >= 85 %%)\n", 100 * sum.median);
    for (const char* kind : {"backlog", "gap"})
        std::printf("  %-7s median %.1f %%\n", kind, 100 * kindMedian(sum, kind));
    std::printf("worst region:         %.1f %% (target >= 50 %%)\n", 100 * sum.worst);
    std::printf("spikes > 1.5 x true:  %d (target 0)\n", sum.spikes);
    std::printf("faults found:         %d of %zu\n", sum.found, sum.regions.size());
}

/// The chance a finding's evidence gives for it under the local level, if any.
std::string chanceText(const siftwave::scan::Finding& f) {
    if (!f.evidence.contains("chance_under_local_level"))
        return {};
    char text[96];
    const nlohmann::json e = f.evidence.json();
    std::snprintf(text, sizeof text, " (level %.1f, chance %.2g)", e.value("level_around", 0.0),
                  e.value("chance_under_local_level", 0.0));
    return text;
}

void printFalseAlarms(int seeds) {
    using namespace siftwave;
    int warnings = 0, critical = 0;
    double regionYears = 0;
    std::map<std::string, int> byKind;
    for (int s = 1; s <= seeds; ++s) {
        testing::SyntheticOptions o;
        o.seed = static_cast<std::uint64_t>(1000 + s);
        o.regions = 40;
        o.days = 365;
        const auto synthetic = testing::makeSyntheticDrop(o);
        const auto report = scan::scanDrop(synthetic.drop);
        if (!report)
            continue;
        regionYears += o.regions * o.days / 365.0;
        for (const auto& f : report->findings) {
            if (f.severity == scan::Severity::Info)
                continue;
            (f.severity == scan::Severity::Critical ? critical : warnings) += 1;
            ++byKind[scan::findingKindName(f.kind)];
            std::printf("  seed %d %s: %s%s\n", 1000 + s, f.region ? f.region->c_str() : "",
                        describeFinding(f).c_str(), chanceText(f).c_str());
        }
    }
    std::printf(
        "clean drops: %.0f region-years, %d warnings + %d critical = %.2f per 100 "
        "region-years (target <= 1)\n",
        regionYears, warnings, critical, 100.0 * (warnings + critical) / regionYears);
    for (const auto& [kind, n] : byKind)
        std::printf("  %s: %d\n", kind.c_str(), n);
}

}  // namespace

// With `seed region`: the findings of that region in that seed's drop, as JSON.
void printRegion(std::uint64_t seed, const std::string& region) {
    const auto sum = siftwave::testing::evaluateRestoration({seed}, 24, {}, region);
    (void)sum;
}

int main(int argc, char** argv) {
    if (argc > 2) {
        printRegion(std::strtoull(argv[1], nullptr, 10), argv[2]);
        return 0;
    }
    const int seeds = argc > 1 ? std::atoi(argv[1]) : 10;
    printRestoration(seeds);
    printFalseAlarms(seeds);
    return 0;
}
