// The scan on the bundled sample (samples/): every planted problem that the
// manifest says must be found is found with the right kind, region, measure
// and dates, and nothing of the kinds that matter most is raised besides.

#include "siftwave/ingest/ingest.h"
#include "siftwave/scan/scan.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <filesystem>
#include <fstream>

namespace siftwave::scan {
namespace {

const std::filesystem::path kSamples{SIFTWAVE_SAMPLES_DIR};

nlohmann::json readManifest() {
    std::ifstream in(kSamples / "manifest.json");
    return nlohmann::json::parse(in);
}

std::optional<std::string> textOrNull(const nlohmann::json& v) {
    if (v.is_null())
        return std::nullopt;
    return v.get<std::string>();
}

class ScanOnSample : public ::testing::Test {
protected:
    void SetUp() override {
        auto current = ingest::readDrop((kSamples / "quenmara_current.csv").string());
        ASSERT_TRUE(current.ok()) << current.error().describe();
        auto previous = ingest::readDrop((kSamples / "quenmara_previous.csv").string());
        ASSERT_TRUE(previous.ok()) << previous.error().describe();
        auto regions = ingest::readRegister((kSamples / "quenmara_regions.csv").string());
        ASSERT_TRUE(regions.ok()) << regions.error().describe();
        m_current = std::move(*current);
        m_previous = std::move(*previous);
        m_regions = std::move(*regions);
        auto report = scanDrop(m_current, {}, {&m_previous, &m_regions});
        ASSERT_TRUE(report.ok()) << report.error().describe();
        m_report = std::move(*report);
    }

    Drop m_current, m_previous;
    RegionRegister m_regions;
    ScanReport m_report;
};

TEST_F(ScanOnSample, FindsEveryPlantedProblemWithTheManifestsKindRegionMeasureAndDates) {
    const nlohmann::json manifest = readManifest();
    int checked = 0;
    for (const nlohmann::json& p : manifest["problems"]) {
        if (!p.value("expect_found", false))
            continue;
        const std::string kind = p["kind"];
        const auto region = textOrNull(p["region"]);
        const auto measure = textOrNull(p["measure"]);
        const auto first = textOrNull(p["first"]);
        const auto last = textOrNull(p["last"]);
        bool found = false;
        for (const Finding& f : m_report.findings) {
            if (findingKindName(f.kind) != kind || f.region != region || f.measure != measure) {
                continue;
            }
            const auto ff = f.first ? std::optional<std::string>(f.first->iso()) : std::nullopt;
            const auto fl = f.last ? std::optional<std::string>(f.last->iso()) : std::nullopt;
            if (ff == first && fl == last)
                found = true;
        }
        EXPECT_TRUE(found) << p["id"] << " " << kind << " " << region.value_or("(null)") << " "
                           << measure.value_or("(null)") << " " << first.value_or("-") << ".."
                           << last.value_or("-");
        ++checked;
    }
    EXPECT_GE(checked, 15);  // the manifest plants at least this many findable problems
}

TEST_F(ScanOnSample, RaisesNoBacklogNegativeOrMissingDatesBeyondThePlantedOnes) {
    const nlohmann::json manifest = readManifest();
    for (const Finding& f : m_report.findings) {
        if (f.kind != FindingKind::BacklogDump && f.kind != FindingKind::NegativeCount &&
            f.kind != FindingKind::MissingDates && f.kind != FindingKind::ReportingGap &&
            f.kind != FindingKind::StaleValues) {
            continue;
        }
        bool planted = false;
        for (const nlohmann::json& p : manifest["problems"]) {
            planted = planted || (p["kind"] == findingKindName(f.kind) &&
                                  textOrNull(p["region"]) == f.region &&
                                  textOrNull(p["first"]) == f.first->iso());
        }
        EXPECT_TRUE(planted) << "unplanted " << findingToJson(f).dump();
    }
}

TEST_F(ScanOnSample, BacklogExcessIsCloseToThePlantedExcess) {
    const nlohmann::json manifest = readManifest();
    for (const nlohmann::json& p : manifest["problems"]) {
        if (p["kind"] != "backlog_dump" || !p.value("expect_found", false))
            continue;
        for (const Finding& f : m_report.findings) {
            if (f.kind != FindingKind::BacklogDump || f.region != p["region"].get<std::string>() ||
                f.first->iso() != p["first"].get<std::string>()) {
                continue;
            }
            const double planted = p["excess"].get<double>();
            const double estimated = f.evidence["excess"].get<double>();
            // Within 10 % of what was planted: the baseline is an estimate from noisy days.
            EXPECT_NEAR(estimated, planted, 0.1 * planted) << p["id"];
            EXPECT_EQ(suggestionToJson(f)["window_first"].get<std::string>().substr(0, 4), "2026");
        }
    }
}

TEST_F(ScanOnSample, RanksTheBacklogDumpsFirst) {
    ASSERT_GE(m_report.findings.size(), 2u);
    EXPECT_EQ(m_report.findings[0].kind, FindingKind::BacklogDump);
    EXPECT_EQ(m_report.findings[1].kind, FindingKind::BacklogDump);
    EXPECT_EQ(m_report.findings[0].rank, 1);
}

}  // namespace
}  // namespace siftwave::scan
