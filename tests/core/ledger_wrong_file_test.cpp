// The wrong file given as a ledger (a folder, the drop itself, a binary file, a mistyped path)
// is named for what it is, not verified as an empty ledger or called a torn entry.
#include "siftwave/ledger/ledger_file.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace siftwave::ledger {
namespace {

namespace fs = std::filesystem;

class LedgerWrongFile : public ::testing::Test {
protected:
    void SetUp() override {
        dir = testing::testTempPath("siftwave-ledger-wrong-file");
        fs::remove_all(dir);
        fs::create_directories(dir);
    }
    void TearDown() override { fs::remove_all(dir); }
    std::string write(const std::string& name, const std::string& bytes) {
        const fs::path p = dir / name;
        std::ofstream(p, std::ios::binary) << bytes;
        return p.string();
    }
    fs::path dir;
};

TEST_F(LedgerWrongFile, AFolderIsNotAnEmptyLedger) {
    // It used to read as "0 entries, hash chain verified".
    auto r = readLedgerFile(dir.string());
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Io);
    EXPECT_EQ(r.error().file, dir.string());
    EXPECT_NE(r.error().message.find("this is a folder, not a ledger file"), std::string::npos)
        << r.error().message;
}

TEST_F(LedgerWrongFile, TheDropGivenAsTheLedgerIsNotALedger) {
    const std::string path = write("release.csv", "date,region,cases\n2026-03-01,A,1\n");
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Syntax);
    EXPECT_EQ(r.error().line, 1u);
    EXPECT_NE(r.error().message.find("this is not a ledger file: line 1"), std::string::npos)
        << r.error().message;
}

TEST_F(LedgerWrongFile, ABinaryFileIsNotCalledATornEntry) {
    // No line end and NUL bytes: not a write cut short, another kind of file.
    const std::string path = write("picture.png", std::string("\x89PNG\r\n\x1a\n\0\0\0\rIHDR", 16));
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("this is not a ledger file"), std::string::npos)
        << r.error().message;
    EXPECT_EQ(r.error().message.find("interrupted"), std::string::npos) << r.error().message;
}

TEST_F(LedgerWrongFile, AMissingLedgerSaysToCheckThePath) {
    const std::string path = (dir / "decisons.jsonl").string();
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::NotFound);
    EXPECT_NE(r.error().message.find("check the path"), std::string::npos) << r.error().message;
}

TEST_F(LedgerWrongFile, ATornEntryIsStillReportedAsTorn) {
    const std::string path = write("cut.jsonl", "{\"sequence\":1,\"time\":\"2026-");
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Integrity);
    EXPECT_NE(r.error().message.find("incomplete"), std::string::npos) << r.error().message;
}

}  // namespace
}  // namespace siftwave::ledger
