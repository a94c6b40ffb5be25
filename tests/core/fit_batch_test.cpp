// Batch fitting: every region independently, failures reported per region, same results for
// any number of threads.
#include "siftwave/fit/batch.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <cstdio>
#include <string>
#include <vector>

namespace siftwave::fit {
namespace {

std::string regionCode(std::size_t i) {
    char code[32];
    std::snprintf(code, sizeof code, "R%zu", i);
    return code;
}

TEST(FitBatch, AFailingRegionIsReportedAndTheOthersAreFitted) {
    const Date first = *Date::fromIso("2026-03-02");
    std::vector<std::vector<double>> counts;
    for (unsigned seed = 1; seed <= 6; ++seed)
        counts.push_back(test::generateCounts({}, seed));
    counts[3].assign(counts[3].size(), 0.0);  // nothing to fit
    std::vector<RegionSeries> regions;
    for (std::size_t i = 0; i < counts.size(); ++i) {
        regions.push_back({regionCode(i), {first, counts[i]}, 50000.0});
    }
    BatchOptions o;
    o.threads = 2;
    const auto results = fitRegions(regions, o);
    ASSERT_EQ(results.size(), regions.size());
    for (std::size_t i = 0; i < results.size(); ++i) {
        EXPECT_EQ(results[i].region, regions[i].region);
        if (i == 3) {
            EXPECT_FALSE(results[i].fit);
            ASSERT_TRUE(results[i].error);
            EXPECT_EQ(results[i].error->region, "R3");
        } else {
            ASSERT_TRUE(results[i].fit) << results[i].error->message;
            EXPECT_TRUE(results[i].fit->summary.converged());
        }
    }
}

TEST(FitBatch, ResultsDoNotDependOnTheThreadCount) {
    const Date first = *Date::fromIso("2026-03-02");
    std::vector<std::vector<double>> counts;
    for (unsigned seed = 10; seed < 18; ++seed)
        counts.push_back(test::generateCounts({}, seed));
    std::vector<RegionSeries> regions;
    for (std::size_t i = 0; i < counts.size(); ++i)
        regions.push_back({regionCode(i), {first, counts[i]}, {}});
    BatchOptions one, two;
    one.threads = 1;
    two.threads = 2;
    const auto a = fitRegions(regions, one);
    const auto b = fitRegions(regions, two);
    for (std::size_t i = 0; i < regions.size(); ++i) {
        ASSERT_TRUE(a[i].fit && b[i].fit);
        EXPECT_EQ(a[i].fit->parameterValues(), b[i].fit->parameterValues());
    }
}

TEST(FitBatch, BestModelKeepsTheLowestAiccAndTheComparison) {
    const Date first = *Date::fromIso("2026-03-02");
    const auto counts = test::generateCounts({}, 3);
    const std::vector<RegionSeries> regions{{"X", {first, counts}, {}}};
    BatchOptions o;
    o.fit.modelChoice = ModelChoice::LowestAicc;
    const auto r = fitRegions(regions, o);
    ASSERT_TRUE(r[0].fit);
    ASSERT_EQ(r[0].comparison.size(), 4u);
    for (const auto& row : r[0].comparison) {
        if (row.fit && row.fit->summary.converged()) {
            EXPECT_LE(r[0].fit->goodness.aicc, row.fit->goodness.aicc) << modelName(row.model);
        }
    }
}

}  // namespace
}  // namespace siftwave::fit
