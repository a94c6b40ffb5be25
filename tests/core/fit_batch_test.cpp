// Batch fitting: every region independently, failures reported per region, same results for
// any number of threads.
#include "siftwave/fit/batch.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <stdexcept>
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

// A formatter that names the region, its status and its first parameter: enough to see that
// each text comes from its own region's fit.
std::string describe(const RegionFit& r) {
    char text[128];
    std::snprintf(text, sizeof text, "%s %s %.17g", r.region.c_str(),
                  fitStatusName(regionStatus(r)), r.fit ? r.fit->parameterValues()[0] : -1.0);
    return text;
}

// The streamed batch writes every region once, in input order, with the same text as the
// results fitRegions() keeps, for one worker and for two; the tally counts each status.
TEST(FitBatch, StreamedBatchWritesEachRegionInOrderAsTheKeptResults) {
    const Date first = *Date::fromIso("2026-03-02");
    std::vector<std::vector<double>> counts;
    for (unsigned seed = 20; seed < 30; ++seed)
        counts.push_back(test::generateCounts({}, seed));
    counts[4].assign(counts[4].size(), 0.0);  // fails: no wave
    std::vector<RegionSeries> regions;
    for (std::size_t i = 0; i < counts.size(); ++i)
        regions.push_back({regionCode(i), {first, counts[i]}, {}});
    BatchOptions o;
    o.threads = 1;
    const auto kept = fitRegions(regions, o);
    for (const int threads : {1, 2}) {
        o.threads = threads;
        std::vector<std::size_t> order;
        std::vector<std::string> texts;
        const BatchTally tally =
            fitRegionsStreamed(regions, o, describe, [&](std::size_t index, std::string_view text) {
                order.push_back(index);
                texts.emplace_back(text);
            });
        ASSERT_EQ(texts.size(), regions.size()) << threads << " threads";
        EXPECT_EQ(tally.regions, regions.size());
        std::array<int, 4> expected{};
        for (std::size_t i = 0; i < regions.size(); ++i) {
            EXPECT_EQ(order[i], i);
            EXPECT_EQ(texts[i], describe(kept[i])) << threads << " threads";
            ++expected[static_cast<std::size_t>(regionStatus(kept[i]))];
        }
        EXPECT_EQ(tally.perStatus, expected);
        EXPECT_EQ(tally.perStatus[static_cast<std::size_t>(FitStatus::NoWave)], 1);
    }
}

// A formatter that throws stops the batch and the exception reaches the caller (it is not lost
// on a worker thread, nor does it end the program).
TEST(FitBatch, StreamedBatchPassesAFormattersExceptionToTheCaller) {
    const Date first = *Date::fromIso("2026-03-02");
    std::vector<std::vector<double>> counts;
    for (unsigned seed = 1; seed <= 4; ++seed)
        counts.push_back(test::generateCounts({}, seed));
    std::vector<RegionSeries> regions;
    for (std::size_t i = 0; i < counts.size(); ++i)
        regions.push_back({regionCode(i), {first, counts[i]}, {}});
    BatchOptions o;
    o.threads = 2;
    auto throwing = [](const RegionFit& r) -> std::string {
        if (r.region == "R2")
            throw std::runtime_error("cannot format R2");
        return r.region;
    };
    std::vector<std::string> written;
    EXPECT_THROW(
        fitRegionsStreamed(regions, o, throwing,
                           [&](std::size_t, std::string_view t) { written.emplace_back(t); }),
        std::runtime_error);
    EXPECT_LE(written.size(), 2u);  // R0, R1 at most: nothing after the failed region
}

// Invalid options: every region is written with the options' error, nothing is fitted.
TEST(FitBatch, StreamedBatchWritesInvalidOptionsAsEachRegionsError) {
    const Date first = *Date::fromIso("2026-03-02");
    const auto counts = test::generateCounts({}, 1);
    const std::vector<RegionSeries> regions{{"A", {first, counts}, {}}, {"B", {first, counts}, {}}};
    BatchOptions o;
    o.threads = -1;
    std::vector<std::string> written;
    const BatchTally tally = fitRegionsStreamed(
        regions, o, [](const RegionFit& r) { return r.region + ": " + r.error->message; },
        [&](std::size_t, std::string_view t) { written.emplace_back(t); });
    ASSERT_EQ(written.size(), 2u);
    EXPECT_EQ(written[1], "B: threads must be 0 (one per core) or more");
    EXPECT_EQ(tally.perStatus[static_cast<std::size_t>(FitStatus::NotConverged)], 2);
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
