// The bundled sample drop (samples/): its manifest is well formed, names only regions and dates
// that exist, and plants every kind of problem the scan is meant to find. The scan's own tests
// check that the scan finds them; this file checks the sample itself.

#include "siftwave/date.h"

#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

namespace siftwave {
namespace {

using nlohmann::json;

const std::filesystem::path kSamples{SIFTWAVE_SAMPLES_DIR};

std::string readBytes(const std::filesystem::path& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream out;
    out << in.rdbuf();
    return out.str();
}

json loadManifest() {
    const std::string text = readBytes(kSamples / "manifest.json");
    json manifest = json::parse(text, nullptr, /*allow_exceptions=*/false);
    return manifest;
}

// A small RFC 4180 record splitter (section 2: quoted fields, doubled quotes, CRLF or LF), enough
// to read the register independently of Siftwave's own reader.
std::vector<std::vector<std::string>> splitCsv(const std::string& text) {
    std::vector<std::vector<std::string>> records;
    std::vector<std::string> record;
    std::string field;
    bool quoted = false;
    for (std::size_t i = 0; i < text.size(); ++i) {
        const char c = text[i];
        if (quoted) {
            if (c == '"' && i + 1 < text.size() && text[i + 1] == '"') {
                field += '"';
                ++i;
            } else if (c == '"') {
                quoted = false;
            } else {
                field += c;
            }
        } else if (c == '"') {
            quoted = true;
        } else if (c == ',') {
            record.push_back(field);
            field.clear();
        } else if (c == '\r' || c == '\n') {
            if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n')
                ++i;
            record.push_back(field);
            field.clear();
            records.push_back(record);
            record.clear();
        } else {
            field += c;
        }
    }
    if (!field.empty() || !record.empty()) {
        record.push_back(field);
        records.push_back(record);
    }
    return records;
}

struct RegisterRow {
    std::string name;
    std::string parent;
    long long population = 0;
};

std::map<std::string, RegisterRow> loadRegister(std::vector<std::string>* header = nullptr) {
    const auto records = splitCsv(readBytes(kSamples / "quenmara_regions.csv"));
    std::map<std::string, RegisterRow> rows;
    if (records.empty())
        return rows;
    if (header)
        *header = records.front();
    for (std::size_t i = 1; i < records.size(); ++i) {
        const auto& r = records[i];
        if (r.size() != 4)
            continue;
        rows[r[0]] = RegisterRow{r[1], r[2], std::stoll(r[3])};
    }
    return rows;
}

// The kinds the scan knows (issue 3's list of identifiers).
const std::set<std::string> kScanKinds{
    "missing_dates",       "duplicate_row",      "negative_count", "backlog_dump", "reporting_gap",
    "stale_values",        "code_collision",     "code_variant",   "unknown_code", "weekday_effect",
    "cumulative_decrease", "hierarchy_mismatch", "revision"};

// Kinds that are about a code, not about days: the scan reports them without dates.
const std::set<std::string> kRegionWideKinds{"code_collision", "code_variant", "unknown_code"};
// Kinds that are about the whole drop (all regions pooled): region is null.
const std::set<std::string> kDropWideKinds{"weekday_effect"};

TEST(Samples, ManifestParsesAndRecordsItsSeedAndFiles) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded()) << "samples/manifest.json is not valid JSON";
    EXPECT_EQ(manifest.value("seed", 0), 20261201);
    EXPECT_TRUE(manifest.value("invented", false));
    ASSERT_TRUE(manifest.contains("parameters"));
    ASSERT_TRUE(manifest["files"].is_object());
    for (const auto& [name, info] : manifest["files"].items()) {
        EXPECT_TRUE(std::filesystem::exists(kSamples / name)) << name;
    }
    ASSERT_TRUE(manifest["problems"].is_array());
    EXPECT_GE(manifest["problems"].size(), 11u);
}

TEST(Samples, EveryPlantedProblemHasAScanKindAFileAndValidDates) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    std::set<std::string> ids;
    for (const auto& p : manifest["problems"]) {
        const std::string id = p.at("id").get<std::string>();
        SCOPED_TRACE(id);
        EXPECT_TRUE(ids.insert(id).second) << "ids must be unique";
        const std::string kind = p.at("kind").get<std::string>();
        EXPECT_TRUE(kScanKinds.count(kind)) << kind;
        // The region is a verbatim code, or null for a drop-wide kind (weekday_effect).
        if (kDropWideKinds.count(kind)) {
            EXPECT_TRUE(p.at("region").is_null());
        } else {
            EXPECT_FALSE(p.at("region").get<std::string>().empty());
        }
        EXPECT_TRUE(p.at("expect_found").is_boolean());
        const std::string file = p.at("file").get<std::string>();
        ASSERT_TRUE(manifest["files"].contains(file)) << file;
        if (kRegionWideKinds.count(kind)) {
            EXPECT_TRUE(p.at("first").is_null());
            EXPECT_TRUE(p.at("last").is_null());
            EXPECT_TRUE(p.at("measure").is_null());
            continue;
        }
        // measure is null for a run of missing rows (every measure misses those days).
        if (kind == "missing_dates") {
            EXPECT_TRUE(p.at("measure").is_null());
        } else {
            const std::string measure = p.at("measure").get<std::string>();
            EXPECT_TRUE(measure == "cases" || measure == "deaths") << measure;
        }
        const auto first = Date::fromIso(p.at("first").get<std::string>());
        const auto last = Date::fromIso(p.at("last").get<std::string>());
        ASSERT_TRUE(first && last);
        EXPECT_LE(*first, *last);
        const auto fileFirst = Date::fromIso(manifest["files"][file]["first"].get<std::string>());
        const auto fileLast = Date::fromIso(manifest["files"][file]["last"].get<std::string>());
        ASSERT_TRUE(fileFirst && fileLast);
        EXPECT_LE(*fileFirst, *first);
        EXPECT_LE(*last, *fileLast);
    }
}

TEST(Samples, EveryKindTheSampleMustDemonstrateIsPlanted) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    std::set<std::string> planted;
    for (const auto& p : manifest["problems"])
        planted.insert(p.at("kind").get<std::string>());
    for (const char* kind : {"backlog_dump", "reporting_gap", "missing_dates", "negative_count",
                             "duplicate_row", "stale_values", "code_collision", "code_variant",
                             "hierarchy_mismatch", "revision", "weekday_effect"}) {
        EXPECT_TRUE(planted.count(kind)) << kind;
    }
}

TEST(Samples, RegisterHasTheAgreedColumnsAndConsistentParents) {
    std::vector<std::string> header;
    const auto reg = loadRegister(&header);
    EXPECT_EQ(header, (std::vector<std::string>{"code", "name", "parent", "population"}));
    ASSERT_EQ(reg.size(), 18u);
    // The two planted collisions are real register codes, spelled exactly so.
    EXPECT_TRUE(reg.count("NA"));
    EXPECT_TRUE(reg.count("0412"));
    EXPECT_EQ(reg.at("NA").name, "Nalvara, City of");  // a quoted field with a comma
    std::map<std::string, long long> childSum;
    for (const auto& [code, row] : reg) {
        EXPECT_GT(row.population, 0) << code;
        if (row.parent.empty())
            continue;
        ASSERT_TRUE(reg.count(row.parent)) << code << " has unknown parent " << row.parent;
        EXPECT_TRUE(reg.at(row.parent).parent.empty()) << "two levels only";
        childSum[row.parent] += row.population;
    }
    for (const auto& [parent, sum] : childSum)
        EXPECT_EQ(reg.at(parent).population, sum) << parent;
}

TEST(Samples, EveryPlantedRegionIsInTheRegisterOrIsThePlantedVariant) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    const auto reg = loadRegister();
    std::set<std::string> variants;
    for (const auto& p : manifest["problems"]) {
        const std::string kind = p.at("kind").get<std::string>();
        if (kind == "code_variant" || kind == "unknown_code") {
            const std::string code = p.at("region").get<std::string>();
            EXPECT_FALSE(reg.count(code)) << code << " is planted as unknown but is registered";
            ASSERT_TRUE(p.contains("canonical"));
            EXPECT_TRUE(reg.count(p["canonical"].get<std::string>()));
            variants.insert(code);
        }
    }
    EXPECT_EQ(variants, (std::set<std::string>{"412"}));
    for (const auto& p : manifest["problems"]) {
        if (p.at("region").is_null()) {
            for (const auto& r : p.value("regions", json::array())) {
                EXPECT_TRUE(reg.count(r.at("region").get<std::string>())) << p.at("id");
            }
            continue;
        }
        const std::string code = p.at("region").get<std::string>();
        EXPECT_TRUE(reg.count(code) || variants.count(code)) << p.at("id") << " names " << code;
    }
}

TEST(Samples, StayUnderTwoMegabytesInAll) {
    std::uintmax_t total = 0;
    for (const auto& entry : std::filesystem::recursive_directory_iterator(kSamples)) {
        if (entry.is_regular_file())
            total += entry.file_size();
    }
    EXPECT_GT(total, 0u);
    EXPECT_LT(total, 2u * 1024u * 1024u);
}

}  // namespace
}  // namespace siftwave
