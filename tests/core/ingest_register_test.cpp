// The region register: code, name, parent, population; codes verbatim.
#include "siftwave/ingest/ingest.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

namespace siftwave::ingest {
namespace {

std::string writeTemp(const std::string& name, const std::string& text) {
    const std::filesystem::path path = siftwave::testing::testTempPath(name);
    std::ofstream out(path, std::ios::binary);
    out << text;
    return path.string();
}

TEST(IngestRegister, ReadsCodesNamesParentsAndPopulations) {
    const std::string path = writeTemp("siftwave_register_ok.csv",
                                       "\xEF\xBB\xBF"
                                       "code,name,parent,population\r\n"
                                       "KV,Kelvarra,,1640250\r\n"
                                       "NA,\"Nalvara, City of\",KV,812400\r\n"
                                       "0412,Old Ford,KV,\r\n");
    Result<RegionRegister> reg = readRegister(path);
    std::filesystem::remove(path);
    ASSERT_TRUE(reg.ok()) << reg.error().describe();
    ASSERT_EQ(reg->entries.size(), 3u);
    EXPECT_EQ(reg->entries[1].code, "NA");
    EXPECT_EQ(reg->entries[1].name, "Nalvara, City of");
    EXPECT_EQ(reg->entries[1].parent, "KV");
    EXPECT_EQ(reg->entries[1].population, 812400);
    EXPECT_EQ(reg->entries[1].line, 3u);
    EXPECT_EQ(reg->entries[2].code, "0412");
    EXPECT_FALSE(reg->entries[2].population.has_value());
    EXPECT_TRUE(reg->hasHierarchy());
    EXPECT_EQ(reg->childrenOf("KV"), (std::vector<std::string>{"NA", "0412"}));
    EXPECT_EQ(reg->find("0412")->name, "Old Ford");
    EXPECT_EQ(reg->find("412"), nullptr);
}

TEST(IngestRegister, ColumnsMayComeInAnyOrderAndWithSemicolons) {
    const std::string path =
        writeTemp("siftwave_register_semicolon.csv", "name;code\nAlpha;A\nBeta;B\n");
    Result<RegionRegister> reg = readRegister(path);
    std::filesystem::remove(path);
    ASSERT_TRUE(reg.ok()) << reg.error().describe();
    EXPECT_EQ(reg->entries[1].code, "B");
    EXPECT_EQ(reg->entries[1].name, "Beta");
    EXPECT_FALSE(reg->hasHierarchy());
}

TEST(IngestRegister, BadRegistersAreErrorsWithLineAndColumn) {
    struct Case {
        const char* text;
        std::uint64_t line, column;
        const char* words;
    } cases[] = {
        {"region,label\nA,x\n", 1, 0, "needs a header with the columns code and name"},
        {"code,name,population\nA,x,12k\n", 2, 3, "population '12k' is not a whole number"},
        {"code,name\nA,x\nA,y\n", 3, 1, "listed twice (first on line 2)"},
        {"code,name\nA,x,z\n", 2, 3, "this row has 3 fields but the header has 2"},
        {"code,name\n,x\n", 2, 1, "the region code is empty"},
    };
    for (const Case& c : cases) {
        const std::string path = writeTemp("siftwave_register_bad.csv", c.text);
        Result<RegionRegister> reg = readRegister(path);
        std::filesystem::remove(path);
        ASSERT_FALSE(reg.ok()) << c.text;
        EXPECT_EQ(reg.error().file, path);
        EXPECT_EQ(reg.error().line, c.line) << c.text;
        EXPECT_EQ(reg.error().column, c.column) << c.text;
        EXPECT_NE(reg.error().message.find(c.words), std::string::npos) << reg.error().message;
    }
}

}  // namespace
}  // namespace siftwave::ingest
