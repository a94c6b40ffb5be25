// Issue 14's check on the bundled sample: the backlog of region 1301 (samples/manifest.json,
// problem P06: 45 % of three weeks' cases, 2026-08-03 .. 08-23, held back and reported on
// 2026-08-24). The scan's own suggestion, applied through the ledger, restores the three
// weeks, and the largest wave of the cleaned series is the one of the true series, not a
// plateau the redistribution made.

#include "siftwave/fit/waves.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/scan.h"
#include "siftwave/scan/suggested_decision.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <vector>

namespace siftwave::scan {
namespace {

const std::filesystem::path kSamples{SIFTWAVE_SAMPLES_DIR};

nlohmann::json problemP06() {
    std::ifstream in(kSamples / "manifest.json");
    const nlohmann::json manifest = nlohmann::json::parse(in);
    for (const nlohmann::json& p : manifest["problems"])
        if (p["id"] == "P06")
            return p;
    return {};
}

const fit::Wave* largest(const std::vector<fit::Wave>& waves) {
    const fit::Wave* best = nullptr;
    for (const fit::Wave& w : waves)
        if (!best || w.peakValue > best->peakValue)
            best = &w;
    return best;
}

TEST(SampleBacklog, TheSuggestionRestoresThePlantedThreeWeeksWithoutAnArtefactWave) {
    const nlohmann::json p = problemP06();
    ASSERT_FALSE(p.is_null());
    auto drop = ingest::readDrop((kSamples / "quenmara_current.csv").string());
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    const auto report = scanDrop(*drop);
    ASSERT_TRUE(report.ok()) << report.error().describe();
    const Date dumpDay = *Date::fromIso(p["first"].get<std::string>());
    const Finding* dump = nullptr;
    for (const Finding& f : report->findings)
        if (f.kind == FindingKind::BacklogDump && f.region == "1301" && f.first == dumpDay)
            dump = &f;
    ASSERT_NE(dump, nullptr);
    EXPECT_EQ(dump->evidence["window_basis"], "deficit");
    auto decision = suggestedDecision(*dump, "cases");
    ASSERT_TRUE(decision.ok());
    // The planted window is 21 days: the suggested one starts within 3 days of it.
    const Date plantedFirst = *Date::fromIso(p["window_first"].get<std::string>());
    EXPECT_LE(std::abs(decision->window->first.serial - plantedFirst.serial), 3)
        << decision->window->first.iso();
    EXPECT_EQ(decision->window->last.iso(), p["window_last"].get<std::string>());
    EXPECT_NEAR(static_cast<double>(decision->excess), p["excess"].get<double>(),
                0.1 * p["excess"].get<double>());

    ledger::Cleaned cleaned(*drop);
    ledger::Ledger ledger;
    auto entry = ledger::draftEntry(*drop, ledger, cleaned, *decision,
                                    {"tester", "2026-12-01T00:00:00Z", "the scan's suggestion"});
    ASSERT_TRUE(entry.ok()) << entry.error().describe();
    ASSERT_TRUE(ledger::applyEntry(*drop, cleaned, *entry).ok());

    // Error against the manifest's true counts over the window and the dump day.
    const std::size_t m = *drop->measureIndex("cases"), r = *drop->regionIndex("1301");
    std::vector<double> truth, clean;
    for (std::int32_t t = 0; t < drop->periods(); ++t) {
        const ledger::CleanedCell& c = cleaned.cell(m, r, t);
        clean.push_back(c.hasValue() ? static_cast<double>(c.value) : std::nan(""));
        const Cell& raw = drop->cell(m, r, t);
        truth.push_back(raw.reported() ? static_cast<double>(raw.value) : std::nan(""));
    }
    double before = 0, after = 0;
    const auto at = [&](const std::string& iso) { return *drop->periodOf(*Date::fromIso(iso)); };
    for (const nlohmann::json& day : p["window"]) {
        const std::int32_t t = at(day["date"]);
        truth[static_cast<std::size_t>(t)] = day["true"].get<double>();
    }
    truth[static_cast<std::size_t>(at(p["first"]))] = p["true_value"].get<double>();
    for (std::int32_t t = at(p["window_first"]); t <= at(p["first"]); ++t) {
        const double tv = truth[static_cast<std::size_t>(t)];
        before += std::fabs(drop->cell(m, r, t).value - tv);
        after += std::fabs(clean[static_cast<std::size_t>(t)] - tv);
    }
    EXPECT_GE(1.0 - after / before, 0.85) << "error before " << before << ", after " << after;

    // The largest wave: the same peak (within a week) and height (within 15 %) as the truth's.
    const std::vector<fit::Wave> trueWaves = fit::detectWaves(truth);
    const std::vector<fit::Wave> cleanWaves = fit::detectWaves(clean);
    const fit::Wave* trueWave = largest(trueWaves);
    const fit::Wave* cleanWave = largest(cleanWaves);
    ASSERT_NE(trueWave, nullptr);
    ASSERT_NE(cleanWave, nullptr);
    EXPECT_LE(std::abs(cleanWave->peak - trueWave->peak), 7);
    EXPECT_NEAR(cleanWave->peakValue, trueWave->peakValue, 0.15 * trueWave->peakValue);
}

}  // namespace
}  // namespace siftwave::scan
