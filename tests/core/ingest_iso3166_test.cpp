// The ISO 3166-1 collision: every country code must come back exactly as written.
//
// Reference data: tests/data/reference/iso3166-1.csv, ISO 3166-1 codes (ISO 3166
// Maintenance Agency) as republished by datasets/country-codes (ODC-PDDL-1.0); see
// tests/data/reference/README.md. Per ISO 3166-1, Namibia's alpha-2 code is "NA" and
// numeric codes are three digits with leading zeros (Afghanistan is 004).
#include "siftwave/ingest/ingest.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace siftwave::ingest {
namespace {

struct Country {
    std::string alpha2, alpha3, numeric, name;
};

/// The reference file read independently of the reader under test: it has no quotes
/// and no commas inside names (checked here), so splitting on ',' is exact.
std::vector<Country> referenceCountries() {
    std::ifstream in(std::string(SIFTWAVE_TEST_DATA_DIR) + "/reference/iso3166-1.csv",
                     std::ios::binary);
    std::vector<Country> out;
    std::string line;
    std::getline(in, line);
    EXPECT_EQ(line, "alpha2,alpha3,numeric,name");
    while (std::getline(in, line)) {
        EXPECT_EQ(line.find('"'), std::string::npos);
        std::vector<std::string> f;
        std::stringstream ss(line);
        std::string part;
        while (std::getline(ss, part, ','))
            f.push_back(part);
        EXPECT_EQ(f.size(), 4u) << line;
        if (f.size() == 4)
            out.push_back({f[0], f[1], f[2], f[3]});
    }
    return out;
}

std::vector<std::string> column(const std::vector<Country>& cs, std::string Country::*field) {
    std::vector<std::string> out;
    for (const Country& c : cs)
        out.push_back(c.*field);
    return out;
}

TEST(IngestIso3166, ReferenceFileHasAllAssignedCodes) {
    const std::vector<Country> countries = referenceCountries();
    EXPECT_EQ(countries.size(), 249u);  // the README's count of officially assigned codes
    bool namibia = false;
    for (const Country& c : countries)
        namibia = namibia || (c.alpha2 == "NA" && c.alpha3 == "NAM" && c.numeric == "516");
    EXPECT_TRUE(namibia);
}

TEST(IngestIso3166, EveryAlpha2CodeSurvivesALongFile) {
    const std::vector<Country> countries = referenceCountries();
    std::string text = "date,region,cases\n";
    for (std::size_t i = 0; i < countries.size(); ++i)
        text += "2026-01-01," + countries[i].alpha2 + "," + std::to_string(i) + "\n";
    for (std::size_t i = 0; i < countries.size(); ++i)
        text += "2026-01-02," + countries[i].alpha2 + ",\n";
    Result<Drop> drop = parseDrop(text, "iso-long.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->regionCodes, column(countries, &Country::alpha2));
    const std::size_t na = *drop->regionIndex("NA");
    EXPECT_EQ(countries[na].name, "Namibia");
    EXPECT_EQ(drop->cell(0, na, 0).state, CellState::Reported);
    EXPECT_EQ(drop->cell(0, na, 0).value, static_cast<std::int32_t>(na));
    EXPECT_EQ(drop->cell(0, na, 1).state, CellState::Blank);  // the empty value, not the code
    EXPECT_EQ(drop->countCells().unparsable, 0u);
}

TEST(IngestIso3166, NumericCodesKeepTheirLeadingZeros) {
    const std::vector<Country> countries = referenceCountries();
    std::string text = "date;code;cases\n";
    for (const Country& c : countries)
        text += "2026-01-01;" + c.numeric + ";1\n";
    Result<Drop> drop = parseDrop(text, "iso-numeric.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->regionCodes, column(countries, &Country::numeric));
    ASSERT_TRUE(drop->regionIndex("004"));
    EXPECT_FALSE(drop->regionIndex("4"));
}

TEST(IngestIso3166, CodesAsHeaderNamesSurviveBothWideLayouts) {
    const std::vector<Country> countries = referenceCountries();
    std::string down = "date";
    for (const Country& c : countries) {
        down += ',';
        down += c.alpha2;
    }
    down += "\n2026-01-01";
    for (std::size_t i = 0; i < countries.size(); ++i) {
        down += ',';
        down += std::to_string(i);
    }
    down += "\n";
    Result<Drop> datesDown = parseDrop(down, "iso-down.csv");
    ASSERT_TRUE(datesDown.ok()) << datesDown.error().describe();
    EXPECT_EQ(datesDown->source.layout, Layout::DatesDown);
    EXPECT_EQ(datesDown->regionCodes, column(countries, &Country::alpha2));

    std::string across = "numeric,name,2026-01-01,2026-01-02\n";
    for (const Country& c : countries)
        across += c.numeric + "," + c.name + ",1,2\n";
    Result<Drop> datesAcross = parseDrop(across, "iso-across.csv");
    ASSERT_TRUE(datesAcross.ok()) << datesAcross.error().describe();
    EXPECT_EQ(datesAcross->source.layout, Layout::DatesAcross);
    EXPECT_EQ(datesAcross->regionCodes, column(countries, &Country::numeric));
}

TEST(IngestIso3166, Utf8NamesAsCodesAreKeptByteForByte) {
    const std::vector<Country> countries = referenceCountries();
    std::string text = "date,region,cases\n";
    for (const Country& c : countries)
        text += "2026-01-01,\"" + c.name + "\",1\n";
    Result<Drop> drop = parseDrop(text, "iso-names.csv");
    ASSERT_TRUE(drop.ok()) << drop.error().describe();
    EXPECT_EQ(drop->regionCodes, column(countries, &Country::name));
}

TEST(IngestIso3166, TheRegisterReaderKeepsEveryCode) {
    const std::vector<Country> countries = referenceCountries();
    const std::filesystem::path path =
        siftwave::testing::testTempPath("siftwave_iso3166_register.csv");
    {
        std::ofstream out(path, std::ios::binary);
        out << "code,name,parent,population\n";
        for (const Country& c : countries)
            out << c.alpha2 << ',' << c.name << ",,\n";
    }
    Result<RegionRegister> reg = readRegister(path.string());
    std::filesystem::remove(path);
    ASSERT_TRUE(reg.ok()) << reg.error().describe();
    ASSERT_EQ(reg->entries.size(), countries.size());
    for (std::size_t i = 0; i < countries.size(); ++i)
        EXPECT_EQ(reg->entries[i].code, countries[i].alpha2);
    ASSERT_NE(reg->find("NA"), nullptr);
    EXPECT_EQ(reg->find("NA")->name, "Namibia");
}

}  // namespace
}  // namespace siftwave::ingest
