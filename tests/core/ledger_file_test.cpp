// The ledger on disk (JSON Lines, appended per entry) and the project file.
#include "ledger_test_support.h"

#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/project.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace siftwave::ledger {
namespace {

using namespace siftwave::testing;
namespace fs = std::filesystem;

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    return s.str();
}

void spit(const fs::path& p, const std::string& bytes) {
    std::ofstream out(p, std::ios::binary | std::ios::trunc);
    out << bytes;
}

class LedgerFile : public ::testing::Test {
protected:
    void SetUp() override {
        // One folder per test process (temp_path.h): other checkouts may run the same tests.
        dir = siftwave::testing::testTempPath(
            "siftwave-ledger-file-" +
            std::string(::testing::UnitTest::GetInstance()->current_test_info()->name()));
        fs::remove_all(dir);
        fs::create_directories(dir);
        path = (dir / "decisions.jsonl").string();
        drop = makeDrop({"N1"}, {"cases"}, "2026-03-01", 6);
        setSeries(drop, 0, 0, {2, 0, 0, 40, 3, -1});
        Cleaned cleaned(drop);
        record(drop, ledger, cleaned,
               redistribution("N1", "2026-03-04", 36, "2026-03-01", "2026-03-03",
                              RedistributeMethod::Uniform));
        Decision spread;
        spread.kind = DecisionKind::SpreadNegative;
        spread.region = "N1";
        spread.measure = "cases";
        spread.date = day("2026-03-06");
        record(drop, ledger, cleaned, spread, "correction of an earlier day");
        for (const LedgerEntry& e : ledger.entries)
            ASSERT_TRUE(appendLedgerEntry(path, e).ok());
    }
    void TearDown() override { fs::remove_all(dir); }

    fs::path dir;
    std::string path;
    Drop drop;
    Ledger ledger;
};

TEST_F(LedgerFile, AppendedEntriesReadBackAsOneLineEach) {
    const std::string bytes = slurp(path);
    EXPECT_EQ(std::count(bytes.begin(), bytes.end(), '\n'), 2);
    EXPECT_EQ(bytes.back(), '\n');
    auto back = readLedgerFile(path);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    ASSERT_EQ(back->entries.size(), 2u);
    EXPECT_EQ(back->entries[1].hash, ledger.entries[1].hash);
    EXPECT_EQ(back->entries[1].reason, "correction of an earlier day");
    auto cleaned = replay(drop, *back);
    ASSERT_TRUE(cleaned.ok()) << cleaned.error().describe();
}

TEST_F(LedgerFile, AnEntryMadeOnAnOlderStateOfTheFileIsNotAppended) {
    // Two writers read the same ledger; the second one's entry 3 arrives after the first's.
    Cleaned cleaned = *replay(drop, ledger);
    Decision accept;
    accept.kind = DecisionKind::Accept;
    accept.region = "N1";
    EntryMeta meta{"one", "2026-03-21T08:00:00Z", "first writer"};
    auto first = draftEntry(drop, ledger, cleaned, accept, meta);
    meta.author = "two";
    meta.reason = "second writer";
    auto second = draftEntry(drop, ledger, cleaned, accept, meta);
    ASSERT_TRUE(first.ok() && second.ok());
    ASSERT_TRUE(appendLedgerEntry(path, *first).ok());
    const std::string before = slurp(path);
    auto s = appendLedgerEntry(path, *second);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().code, ErrorCode::Conflict);
    EXPECT_EQ(slurp(path), before);
    EXPECT_FALSE(appendLedgerEntry(path, ledger.entries[1]).ok()) << "appending an entry twice";
}

TEST_F(LedgerFile, ATornLastLineIsReportedWithItsLineNumber) {
    std::string bytes = slurp(path);
    bytes.resize(bytes.size() - 30);  // the crash cut the second line short
    spit(path, bytes);
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Integrity);
    EXPECT_EQ(r.error().line, 2u);
    EXPECT_EQ(r.error().file, path);
    EXPECT_NE(r.error().message.find("incomplete"), std::string::npos);
}

TEST_F(LedgerFile, AMissingFinalLineEndIsAlsoATornLine) {
    std::string bytes = slurp(path);
    bytes.pop_back();
    spit(path, bytes);
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().line, 2u);
}

TEST_F(LedgerFile, AnEditedLineIsNamed) {
    std::string bytes = slurp(path);
    const auto at = bytes.find("correction of an earlier day");
    ASSERT_NE(at, std::string::npos);
    bytes.replace(at, 10, "CORRECTION");
    spit(path, bytes);
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Integrity);
    EXPECT_EQ(r.error().line, 2u);
    EXPECT_NE(r.error().describe().find("entry 2"), std::string::npos);
}

TEST_F(LedgerFile, AGarbledLineIsASyntaxErrorWithItsLine) {
    spit(path, slurp(path) + "{not json}\n");
    auto r = readLedgerFile(path);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().code, ErrorCode::Syntax);
    EXPECT_EQ(r.error().line, 3u);
}

TEST_F(LedgerFile, AnEmptyFileIsAnEmptyLedgerAndAMissingOneIsNotFound) {
    spit(path, "");
    auto empty = readLedgerFile(path);
    ASSERT_TRUE(empty.ok());
    EXPECT_TRUE(empty->entries.empty());
    auto missing = readLedgerFile((dir / "nope.jsonl").string());
    ASSERT_FALSE(missing.ok());
    EXPECT_EQ(missing.error().code, ErrorCode::NotFound);
}

TEST_F(LedgerFile, ProjectFileRoundTripsAndIsWrittenAtomically) {
    ProjectFile p;
    p.dropPath = "drops/release-2026-03-06.csv";
    p.dropSha256 = std::string(64, 'a');
    p.previousDropPath = "drops/release-2026-02-27.csv";
    p.previousDropSha256 = std::string(64, 'b');
    p.registerPath = "regions.csv";
    p.ledgerPath = "decisions.jsonl";
    p.ledgerEntries = ledger.entries.size();
    p.ledgerHeadHash = ledger.headHash();
    p.view.region = "N1";
    p.view.measure = "cases";
    p.view.visibleFirst = day("2026-03-01");
    p.fit.model = "logistic";
    p.fit.windowFirst = day("2026-03-02");
    p.fit.windowLast = day("2026-03-05");
    p.extra["plot.log_scale"] = "true";
    const std::string projectPath = (dir / "study.siftwave.json").string();
    ASSERT_TRUE(writeProjectFile(projectPath, p).ok());
    for (const auto& f : fs::directory_iterator(dir)) {
        EXPECT_EQ(f.path().filename().string().find(".tmp-"), std::string::npos)
            << "temporary file left behind";
    }
    auto back = readProjectFile(projectPath);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    EXPECT_EQ(back->dropPath, p.dropPath);
    EXPECT_EQ(back->previousDropSha256, p.previousDropSha256);
    EXPECT_EQ(back->registerPath, "regions.csv");
    EXPECT_EQ(back->ledgerHeadHash, ledger.headHash());
    EXPECT_EQ(back->view.visibleFirst, p.view.visibleFirst);
    EXPECT_FALSE(back->view.visibleLast.has_value());
    EXPECT_EQ(back->fit.model, "logistic");
    EXPECT_EQ(back->fit.windowLast, p.fit.windowLast);
    EXPECT_EQ(back->extra.at("plot.log_scale"), "true");
    EXPECT_EQ(resolveProjectPath(projectPath, back->ledgerPath),
              (dir / "decisions.jsonl").string());
    EXPECT_TRUE(checkLedgerHead(*back, ledger).ok());
}

TEST_F(LedgerFile, ProjectHeadNoticesALedgerShortenedFromTheEnd) {
    ProjectFile p;
    p.dropPath = "d.csv";
    p.dropSha256 = std::string(64, 'a');
    p.ledgerPath = path;
    p.ledgerEntries = 2;
    p.ledgerHeadHash = ledger.headHash();
    Ledger shortened = ledger;
    shortened.entries.pop_back();
    EXPECT_TRUE(verifyChain(shortened).ok()) << "a shorter chain is still a valid chain";
    auto s = checkLedgerHead(p, shortened);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.error().code, ErrorCode::Integrity);
}

TEST_F(LedgerFile, AProjectFileThatIsNotOneIsRefusedWithoutTouchingIt) {
    const std::string projectPath = (dir / "bad.json").string();
    spit(projectPath, "{\"format\": \"something-else\"}");
    auto r = readProjectFile(projectPath);
    ASSERT_FALSE(r.ok());
    EXPECT_EQ(r.error().file, projectPath);
    EXPECT_EQ(slurp(projectPath), "{\"format\": \"something-else\"}");
    ProjectFile invalid;
    EXPECT_FALSE(writeProjectFile(projectPath, invalid).ok());
    EXPECT_EQ(slurp(projectPath), "{\"format\": \"something-else\"}");
}

// Found by fuzz_project (tests/fuzz/corpus/project/duplicate_format_key.siftwave): a repeated
// key leaves "format" an object, and reading it as text threw out of the reader. Fields of the
// wrong type are refused with a message, never an exception.
TEST(ProjectFileBytes, FieldsOfTheWrongTypeAreRefusedNotThrown) {
    for (const char* text :
         {R"({"format":{"entries":2}})", R"({"format":"siftwave-project","version":"1"})",
          R"({"format":"siftwave-project","format":{"path":"x"},"version":1})",
          R"({"format":"siftwave-project","version":1,"drop":[],"ledger":{"path":"l"}})",
          R"({"format":"siftwave-project","version":1,"drop":{"path":"d","sha256":7}})"}) {
        Result<ProjectFile> r = parseProjectFile(text, "fuzzed.siftwave");
        ASSERT_FALSE(r.ok()) << text;
        EXPECT_EQ(r.error().file, "fuzzed.siftwave") << text;
    }
    // A float far beyond any count where a whole number belongs (converting it is undefined
    // behaviour; fuzz_project, tests/fuzz/corpus/project/huge_entry_count.siftwave), a negative
    // count, a float where a day count belongs: refused by name, in an otherwise valid file.
    const std::string head = R"({"format":"siftwave-project","version":1,"drop":{"path":"d",)"
                             R"("sha256":")" +
                             std::string(64, 'a') + R"("},)";
    for (const std::string& rest :
         {std::string(R"("ledger":{"path":"l","entries":777777777777777777777777777777777772}})"),
          std::string(R"("ledger":{"path":"l","entries":-3}})"),
          std::string(R"("ledger":{"path":"l"},"fit":{"smoothing_days":1e300}})")}) {
        Result<ProjectFile> r = parseProjectFile(head + rest, "fuzzed.siftwave");
        ASSERT_FALSE(r.ok()) << rest;
        EXPECT_NE(r.error().message.find("must be a whole number in range"), std::string::npos)
            << r.error().message;
    }
    EXPECT_TRUE(parseProjectFile(head + R"("ledger":{"path":"l","entries":3}})", "ok").ok());
}

// The release history behind a nowcast is kept in the project, each release pinned by its
// SHA-256; a project without one is written as before (no "release_history" key), and a
// malformed list is refused by name.
TEST(ProjectFileBytes, TheReleaseHistoryRoundTripsAndIsCheckedByType) {
    ProjectFile p;
    p.dropPath = "releases/cases_2026-03-10.csv";
    p.dropSha256 = std::string(64, 'a');
    p.ledgerPath = "decisions.jsonl";
    const std::string dir = siftwave::testing::testTempPath("history").string();
    std::filesystem::create_directories(dir);
    const std::string without = dir + "/without.siftwave.json";
    ASSERT_TRUE(writeProjectFile(without, p).ok());
    EXPECT_EQ(slurp(without).find("release_history"), std::string::npos);
    p.releaseHistory = {{"releases/cases_2026-03-08.csv", std::string(64, 'b')},
                        {"releases/cases_2026-03-09.csv", std::string(64, 'c')}};
    const std::string with = dir + "/with.siftwave.json";
    ASSERT_TRUE(writeProjectFile(with, p).ok());
    Result<ProjectFile> back = readProjectFile(with);
    ASSERT_TRUE(back.ok()) << back.error().describe();
    EXPECT_EQ(back->releaseHistory, p.releaseHistory);
    const std::string head = R"({"format":"siftwave-project","version":1,"drop":{"path":"d",)"
                             R"("sha256":")" +
                             std::string(64, 'a') + R"("},"ledger":{"path":"l"},)";
    for (const std::string& rest :
         {std::string(R"("release_history":{"path":"r"}})"),
          std::string(R"("release_history":[{"path":"r"}]})"),
          std::string(R"("release_history":[{"path":"r","sha256":"short"}]})"),
          std::string(R"("release_history":[{"path":3,"sha256":"x"}]})")}) {
        Result<ProjectFile> r = parseProjectFile(head + rest, "hand.siftwave");
        ASSERT_FALSE(r.ok()) << rest;
        EXPECT_NE(r.error().message.find("release"), std::string::npos) << r.error().message;
    }
}

}  // namespace
}  // namespace siftwave::ledger
