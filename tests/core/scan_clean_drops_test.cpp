// The scan on generated drops: few false alarms on clean data, and every
// planted problem found with the right kind, region and dates.

#include "siftwave/scan/scan.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <map>

namespace siftwave::scan {
namespace {

using siftwave::testing::makeSyntheticDrop;
using siftwave::testing::plantBacklogDump;
using siftwave::testing::plantDuplicate;
using siftwave::testing::plantMissingDates;
using siftwave::testing::plantNegative;
using siftwave::testing::plantReportingGap;
using siftwave::testing::plantStaleValues;
using siftwave::testing::SyntheticOptions;

std::map<std::string, int> countKinds(const ScanReport& report) {
    std::map<std::string, int> counts;
    for (const Finding& f : report.findings)
        ++counts[findingKindName(f.kind)];
    return counts;
}

// Issue 3's quality bar: at most one false backlog_dump, negative_count or
// missing_dates per 40 regions, over several seeds (40 regions x 240 days,
// negative-binomial noise, a weekday effect, three waves, nothing planted).
TEST(ScanOnCleanDrops, RaisesAtMostOneFalseAlarmPerFortyRegionsOverEightSeeds) {
    for (std::uint64_t seed = 1; seed <= 8; ++seed) {
        SyntheticOptions options;
        options.seed = seed;
        options.deaths = seed % 2 == 0;
        const auto synthetic = makeSyntheticDrop(options);
        const auto report = scanDrop(synthetic.drop);
        ASSERT_TRUE(report.ok()) << report.error().describe();
        auto counts = countKinds(*report);
        const int alarms =
            counts["backlog_dump"] + counts["negative_count"] + counts["missing_dates"];
        EXPECT_LE(alarms, 1) << "seed " << seed << ": " << counts["backlog_dump"]
                             << " backlog_dump, " << counts["negative_count"] << " negative_count, "
                             << counts["missing_dates"] << " missing_dates";
        for (const Finding& f : report->findings) {
            if (f.kind == FindingKind::BacklogDump) {
                ADD_FAILURE() << "seed " << seed << " " << findingToJson(f).dump();
            }
        }
    }
}

// A finding of this kind and region whose day range covers the planted one.
bool found(const ScanReport& report, const Drop& drop, const siftwave::testing::PlantedProblem& p) {
    for (const Finding& f : report.findings) {
        if (findingKindName(f.kind) != p.kind || !f.region ||
            *f.region != drop.regionCodes[p.region] || !f.first || !f.last) {
            continue;
        }
        if (*f.first == drop.periodStart(p.first) && *f.last == drop.periodStart(p.last))
            return true;
    }
    return false;
}

TEST(ScanOnPlantedDrops, FindsEveryPlantedProblemWithItsKindRegionAndDates) {
    for (std::uint64_t seed = 11; seed <= 14; ++seed) {
        SyntheticOptions options;
        options.seed = seed;
        auto s = makeSyntheticDrop(options);
        // Regions are drawn at random sizes; plant where the counts are not tiny.
        std::vector<std::size_t> busy;
        for (std::size_t r = 0; r < s.drop.regionCodes.size(); ++r) {
            double peak = 0;
            for (int t = 0; t < s.drop.periods(); ++t) {
                peak = std::max(peak, s.mean[r * static_cast<std::size_t>(s.drop.periods()) +
                                             static_cast<std::size_t>(t)]);
            }
            if (peak > 60)
                busy.push_back(r);
        }
        ASSERT_GE(busy.size(), 6u) << "seed " << seed;
        // Days where the region is in a wave (mean >= 30) so the problems are visible.
        auto activeDay = [&](std::size_t r, int from) {
            for (int t = from; t < s.drop.periods() - 10; ++t) {
                if (s.mean[r * static_cast<std::size_t>(s.drop.periods()) +
                           static_cast<std::size_t>(t)] >= 30) {
                    return t;
                }
            }
            return from;
        };
        plantBacklogDump(s, busy[0], activeDay(busy[0], 40) + 5, 4);
        plantReportingGap(s, busy[1], activeDay(busy[1], 60) + 3, 3);
        plantMissingDates(s, busy[2], 100, 3);
        plantNegative(s, busy[3], 120, -25);
        plantDuplicate(s, busy[4], 130, 7);
        plantStaleValues(s, busy[5], activeDay(busy[5], 30) + 4, 5);
        const auto report = scanDrop(s.drop);
        ASSERT_TRUE(report.ok());
        for (const auto& p : s.planted) {
            EXPECT_TRUE(found(*report, s.drop, p))
                << "seed " << seed << ": " << p.kind << " in " << s.drop.regionCodes[p.region]
                << " on " << s.drop.periodStart(p.first).iso() << ".."
                << s.drop.periodStart(p.last).iso();
        }
        // And no other alarm of the three kinds that matter most.
        int extra = 0;
        for (const Finding& f : report->findings) {
            if (f.kind != FindingKind::BacklogDump && f.kind != FindingKind::NegativeCount &&
                f.kind != FindingKind::MissingDates) {
                continue;
            }
            bool planted = false;
            for (const auto& p : s.planted) {
                planted = planted || (findingKindName(f.kind) == p.kind &&
                                      *f.region == s.drop.regionCodes[p.region] &&
                                      *f.first == s.drop.periodStart(p.first));
            }
            extra += !planted;
        }
        EXPECT_LE(extra, 1) << "seed " << seed;
    }
}

}  // namespace
}  // namespace siftwave::scan
