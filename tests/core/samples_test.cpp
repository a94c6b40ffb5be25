// The bundled sample drop (samples/): its manifest is well formed, names only regions and dates
// that exist, and plants every kind of problem the scan is meant to find; Siftwave's reader reads
// the files as the manifest describes them (codes intact, the duplicate kept aside, the missing
// days absent, the semicolon copy equal to the long file). The scan's own tests check that the
// scan finds the planted problems; this file checks the sample itself.

#include "siftwave/date.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/sha256.h"

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
        // A region that appeared since the previous release is a revision about a code too.
        const bool aboutACode = kRegionWideKinds.count(kind) > 0 ||
                                (kind == "revision" && p.value("change", "") == "region_appeared");
        if (aboutACode) {
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

TEST(Samples, FilesAreTheBytesTheManifestDescribes) {
    // The manifest records each file's size and SHA-256 (FIPS 180-4), so a file edited by hand
    // without rerunning the generator is caught even where Python is not installed.
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    for (const auto& [name, info] : manifest["files"].items()) {
        const std::string bytes = readBytes(kSamples / name);
        EXPECT_EQ(bytes.size(), info.at("bytes").get<std::size_t>()) << name;
        EXPECT_EQ(sha256Hex(bytes), info.at("sha256").get<std::string>()) << name;
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

// --- The files as Siftwave's reader sees them
// ----------------------------------------------------

std::vector<json> plantedOfKind(const json& manifest, const std::string& kind) {
    std::vector<json> out;
    for (const auto& p : manifest["problems"]) {
        if (p.at("kind").get<std::string>() == kind)
            out.push_back(p);
    }
    return out;
}

Result<Drop> readSample(const char* name) {
    return ingest::readDrop((kSamples / name).string());
}

TEST(SamplesDrop, CurrentReleaseReadsWithTheNaAnd0412CodesIntact) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    const auto drop = readSample("quenmara_current.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    const json& info = manifest["files"]["quenmara_current.csv"];
    EXPECT_EQ(drop->source.layout, Layout::Long);
    EXPECT_EQ(drop->source.dialect.delimiter, ',');
    EXPECT_TRUE(drop->source.dialect.crlf);
    EXPECT_EQ(drop->measures, (std::vector<std::string>{"cases", "deaths"}));
    EXPECT_EQ(drop->rows, info["rows"].get<std::size_t>());
    EXPECT_EQ(drop->source.sha256, info["sha256"].get<std::string>());
    EXPECT_EQ(drop->source.bytes, info["bytes"].get<std::uint64_t>());
    EXPECT_EQ(drop->axis.first().iso(), info["first"].get<std::string>());
    EXPECT_EQ(drop->axis.lastStart().iso(), info["last"].get<std::string>());
    // 16 registered codes with rows (two provinces send none) and the variant
    // 412, verbatim.
    EXPECT_EQ(drop->regionCodes.size(), 17u);
    for (const char* code : {"NA", "0412", "412", "KV", "1102"}) {
        EXPECT_TRUE(drop->regionIndex(code)) << code;
    }
    EXPECT_EQ(drop->regionCodes.at(1),
              "NA");  // first-seen order: KV, then its first district
    // NA's cells are numbers read from the file, not missing values.
    const auto na = *drop->regionIndex("NA");
    const auto cases = *drop->measureIndex("cases");
    for (const Cell& cell : drop->series(cases, na))
        ASSERT_TRUE(cell.reported());
    EXPECT_TRUE(drop->warnings.size() <= 1u);  // at most the note about the duplicate row
    const auto counts = drop->countCells();
    EXPECT_EQ(counts.blank, 0u);
    EXPECT_EQ(counts.unparsable, 0u);
}

TEST(SamplesDrop, PlantedDuplicateRowIsKeptAsideWithBothLines) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    const auto drop = readSample("quenmara_current.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    const auto planted = plantedOfKind(manifest, "duplicate_row");
    ASSERT_FALSE(planted.empty());
    EXPECT_EQ(drop->duplicates.size(), planted.size());  // nothing else repeats
    for (const auto& p : planted) {
        SCOPED_TRACE(p.at("id").get<std::string>());
        const auto region = drop->regionIndex(p.at("region").get<std::string>());
        const auto measure = drop->measureIndex(p.at("measure").get<std::string>());
        const auto day = Date::fromIso(p.at("first").get<std::string>());
        ASSERT_TRUE(region && measure && day);
        const auto lines = p.at("lines").get<std::vector<std::uint32_t>>();
        ASSERT_EQ(lines.size(), 2u);
        bool found = false;
        for (const DuplicateRow& d : drop->duplicates) {
            if (d.region != *region || d.measure != *measure || drop->periodStart(d.day) != *day)
                continue;
            found = true;
            EXPECT_EQ(d.firstLine, lines[0]);
            EXPECT_EQ(d.cell.line, lines[1]);
            EXPECT_EQ(d.cell.value, p.at("value").get<int>());
            const Cell& kept = drop->cell(*measure, *region, d.day);
            EXPECT_EQ(kept.line, lines[0]);
            EXPECT_EQ(kept.value, d.cell.value);  // the values agree, as planted
        }
        EXPECT_TRUE(found);
    }
}

TEST(SamplesDrop, PlantedMissingDatesAreAbsentCellsBetweenReportedDays) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    const auto drop = readSample("quenmara_current.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    const auto planted = plantedOfKind(manifest, "missing_dates");
    ASSERT_FALSE(planted.empty());
    for (const auto& p : planted) {
        SCOPED_TRACE(p.at("id").get<std::string>());
        const auto region = drop->regionIndex(p.at("region").get<std::string>());
        const auto first = Date::fromIso(p.at("first").get<std::string>());
        const auto last = Date::fromIso(p.at("last").get<std::string>());
        ASSERT_TRUE(region && first && last);
        const auto i0 = drop->periodOf(*first);
        const auto i1 = drop->periodOf(*last);
        ASSERT_TRUE(i0 && i1);
        ASSERT_GT(*i0, 0);
        ASSERT_LT(*i1, drop->periods() - 1);
        // No row at all: every measure is absent on those days, reported on the days around.
        for (std::size_t m = 0; m < drop->measures.size(); ++m) {
            for (std::int32_t i = *i0; i <= *i1; ++i) {
                EXPECT_EQ(drop->cell(m, *region, i).state, CellState::Absent)
                    << drop->periodStart(i).iso();
            }
            EXPECT_TRUE(drop->cell(m, *region, *i0 - 1).reported());
            EXPECT_TRUE(drop->cell(m, *region, *i1 + 1).reported());
        }
    }
}

TEST(SamplesDrop, VariantCodeHoldsTheNewWeekAndItsCanonicalCodeTheRest) {
    const json manifest = loadManifest();
    ASSERT_FALSE(manifest.is_discarded());
    const auto drop = readSample("quenmara_current.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    const auto planted = plantedOfKind(manifest, "code_variant");
    ASSERT_EQ(planted.size(), 1u);
    const auto variant = drop->regionIndex(planted[0].at("region").get<std::string>());
    const auto canonical = drop->regionIndex(planted[0].at("canonical").get<std::string>());
    const auto from = Date::fromIso(planted[0].at("rows_first").get<std::string>());
    ASSERT_TRUE(variant && canonical && from);
    const auto cases = *drop->measureIndex("cases");
    for (std::int32_t i = 0; i < drop->periods(); ++i) {
        const bool newWeek = drop->periodStart(i) >= *from;
        EXPECT_EQ(drop->cell(cases, *variant, i).reported(), newWeek) << drop->periodStart(i).iso();
        EXPECT_EQ(drop->cell(cases, *canonical, i).reported(), !newWeek)
            << drop->periodStart(i).iso();
    }
}

TEST(SamplesDrop, SemicolonDatesDownCopyHoldsTheSameCases) {
    const auto longDrop = readSample("quenmara_current.csv");
    const auto wide = readSample("quenmara_cases_wide.csv");
    ASSERT_TRUE(longDrop.ok()) << longDrop.error().describe();
    ASSERT_TRUE(wide.ok()) << wide.error().describe();
    EXPECT_EQ(wide->source.dialect.delimiter, ';');
    EXPECT_TRUE(wide->source.dialect.bom);
    EXPECT_EQ(wide->source.layout, Layout::DatesDown);
    EXPECT_EQ(wide->source.dateFormat, "DD/MM/YYYY");
    EXPECT_EQ(wide->regionCodes, longDrop->regionCodes);
    ASSERT_EQ(wide->axis.first(), longDrop->axis.first());
    ASSERT_EQ(wide->periods(), longDrop->periods());
    ASSERT_EQ(wide->measures.size(), 1u);
    const auto cases = *longDrop->measureIndex("cases");
    for (std::size_t r = 0; r < longDrop->regionCodes.size(); ++r) {
        for (std::int32_t i = 0; i < longDrop->periods(); ++i) {
            const Cell& a = longDrop->cell(cases, r, i);
            const Cell& b = wide->cell(0, r, i);
            if (a.reported()) {
                ASSERT_TRUE(b.reported())
                    << longDrop->regionCodes[r] << " " << longDrop->periodStart(i).iso();
                ASSERT_EQ(a.value, b.value)
                    << longDrop->regionCodes[r] << " " << longDrop->periodStart(i).iso();
            } else {
                // No row in the long file is an empty cell in the wide one.
                ASSERT_EQ(b.state, CellState::Blank)
                    << longDrop->regionCodes[r] << " " << longDrop->periodStart(i).iso();
            }
        }
    }
}

TEST(SamplesDrop, RegisterReadsWithItsHierarchy) {
    const auto reg = ingest::readRegister((kSamples / "quenmara_regions.csv").string());
    ASSERT_TRUE(reg.ok()) << reg.error().describe();
    EXPECT_EQ(reg->entries.size(), 18u);
    EXPECT_TRUE(reg->hasHierarchy());
    ASSERT_TRUE(reg->find("NA"));
    ASSERT_TRUE(reg->find("0412"));
    EXPECT_FALSE(reg->find("412"));
    EXPECT_EQ(reg->find("NA")->name, "Nalvara, City of");
    EXPECT_EQ(reg->find("0412")->parent, "LM");
    EXPECT_EQ(reg->childrenOf("KV"), (std::vector<std::string>{"NA", "1102", "1105", "1109"}));
    EXPECT_EQ(reg->find("KV")->population, std::optional<std::int64_t>(1640250));
}

}  // namespace
}  // namespace siftwave
