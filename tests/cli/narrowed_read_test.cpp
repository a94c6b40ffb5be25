// End-to-end: the reading options --from, --to and --only-regions (issue 19, bounded resources).
// The hostile file of the issue (10,000 regions with rows a century apart, about 400 KB) is
// refused with the options to type, then read with them; each option runs under an address-space
// limit enforced by the harness (ulimit -v 300 MB; not under AddressSanitizer, which reserves
// terabytes of address space for its shadow memory, so that stage checks the messages only).
#include "support/cli_run.h"
#include "support/sanitizer.h"
#include "support/temp_path.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <regex>
#include <string>

namespace {

using siftwave::testing::CliResult;
using siftwave::testing::runCli;
using siftwave::testing::writeTempFile;

// The address-space bound of the commands below (300 MB): far less than the 4.4 GB the dense table
// of the century file would take, far more than the narrowed reads need.
CliResult runLimited(const std::string& args) {
#if SIFTWAVE_TEST_UNDER_ASAN
    return runCli(args);
#else
    const std::filesystem::path errPath = siftwave::testing::testTempPath("limited.err");
    const siftwave::testing::CliRun run =
        siftwave::testing::runShell("sh -c 'ulimit -v 300000; " + std::string(SIFTWAVE_CLI_PATH) +
                                    " " + args + " 2>" + errPath.string() + "'");
    CliResult r{run.exitCode, run.out, siftwave::testing::slurpFile(errPath)};
    std::filesystem::remove(errPath);
    return r;
#endif
}

// 10,000 regions, each with one row in January 1926 and one in January 2026.
const std::string& centuryFile() {
    static const std::string path = [] {
        std::string text = "date,region,cases\n";
        for (int r = 0; r < 10000; ++r) {
            const std::string code = "R" + std::to_string(10000 + r);
            const std::string d = std::to_string(10 + r % 18);
            text += "1926-01-" + d + "," + code + ",3\n2026-01-" + d + "," + code + ",5\n";
        }
        return writeTempFile("century_apart.csv", text);
    }();
    return path;
}

std::string firstMatch(const std::string& text, const std::string& pattern) {
    std::smatch m;
    if (!std::regex_search(text, m, std::regex(pattern)))
        return {};
    return m[0];
}

TEST(CliNarrowedRead, TheCenturyFileIsRefusedWithWhatWasAskedAndWhatToType) {
    const CliResult r = runLimited("inspect " + centuryFile());
    EXPECT_EQ(r.exitCode, 1) << r.err;
    EXPECT_NE(r.err.find("asks for a table of 36543 days x 10000 regions"), std::string::npos)
        << r.err;
    EXPECT_NE(r.err.find("from 1926-01-10 (line 2) to 2026-01-27 (line 37)"), std::string::npos)
        << r.err;
    EXPECT_NE(r.err.find("20000 data rows justify at most 20000000 cells"), std::string::npos)
        << r.err;
    EXPECT_NE(r.err.find("Nothing was read"), std::string::npos) << r.err;
    EXPECT_NE(r.err.find("--from 2026-01-10 --to 2026-01-27"), std::string::npos) << r.err;
}

TEST(CliNarrowedRead, TheSuggestedDatesReadWithinTheMemoryBound) {
    const std::string err = runLimited("inspect " + centuryFile()).err;
    const std::string dates = firstMatch(err, "--from [0-9-]+ --to [0-9-]+");
    ASSERT_FALSE(dates.empty()) << err;
    const CliResult r = runLimited("inspect " + centuryFile() + " " + dates + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["rows"], 10000);
    EXPECT_EQ(j["first_date"], "2026-01-10");
    EXPECT_EQ(j["narrowed_read"]["rows_left_out"], 10000);
    EXPECT_EQ(j["narrowed_read"]["rows_outside_dates"], 10000);
}

TEST(CliNarrowedRead, TheSuggestedRegionsReadWithinTheMemoryBound) {
    const std::string err = runLimited("inspect " + centuryFile()).err;
    const std::string regions = firstMatch(err, "--only-regions [^ ]+");
    ASSERT_EQ(regions, "--only-regions R10000,R10001,R10002") << err;
    const CliResult r = runLimited("inspect " + centuryFile() + " " + regions + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["regions"], 3);
    EXPECT_EQ(j["narrowed_read"]["rows_of_other_regions"], 19994);
}

TEST(CliNarrowedRead, FromAloneReadsWithinTheMemoryBound) {
    const CliResult r = runLimited("inspect " + centuryFile() + " --from 2000-01-01");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    EXPECT_NE(r.out.find("read        narrowed read (--from 2000-01-01): 10000 data rows left out "
                         "(10000 before 2000-01-01)"),
              std::string::npos)
        << r.out;
}

TEST(CliNarrowedRead, ToAloneReadsWithinTheMemoryBound) {
    const CliResult r = runLimited("inspect " + centuryFile() + " --to 1926-12-31 --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["last_date"], "1926-01-27");
    EXPECT_EQ(j["narrowed_read"]["options"], "--to 1926-12-31");
}

TEST(CliNarrowedRead, RegionsFromAFileReadWithinTheMemoryBound) {
    const std::string list = writeTempFile("codes.txt", "R10007\r\n\r\nR19999\nNOT-THERE\n");
    const CliResult r =
        runLimited("inspect " + centuryFile() + " --only-regions @" + list + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["region_codes"], (nlohmann::json{"R10007", "R19999"}));
    EXPECT_EQ(j["narrowed_read"]["regions_not_found"], (nlohmann::json{"NOT-THERE"}));
}

TEST(CliNarrowedRead, WrongValuesAreUsageErrors) {
    EXPECT_EQ(runCli("inspect " + centuryFile() + " --from 26-01-01").exitCode, 2);
    EXPECT_EQ(runCli("inspect " + centuryFile() + " --from 2026-02-01 --to 2026-01-01").exitCode,
              2);
    EXPECT_EQ(runCli("inspect " + centuryFile() + " --only-regions @/nonexistent/codes").exitCode,
              2);
    EXPECT_EQ(runCli("inspect " + centuryFile() + " --only-regions ,").exitCode, 2);
}

// Every command that reads a drop takes the options through the one shared parser.
TEST(CliNarrowedRead, EveryCommandThatReadsADropTakesThem) {
    for (const char* command : {"inspect", "scan", "fit", "apply", "decide", "ledger", "delays",
                                "nowcast", "transmission"}) {
        const CliResult help = runCli(std::string(command) + " --help");
        EXPECT_NE(help.out.find("--only-regions"), std::string::npos) << command;
        EXPECT_NE(help.out.find("--from"), std::string::npos) << command;
    }
    const CliResult scan = runLimited("scan " + centuryFile() + " --from 2026-01-01 --json");
    EXPECT_EQ(scan.exitCode, 0) << scan.err;
}

// A decision made on a narrowed read is recorded with it; verify on another read is refused.
TEST(CliNarrowedRead, ALedgerMadeOnANarrowedReadVerifiesOnlyOnTheSameRead) {
    const std::string drop = writeTempFile("small.csv",
                                           "date,region,cases\n2026-03-01,A,1\n2026-03-02,A,2\n"
                                           "2026-03-03,B,3\n");
    const std::string ledger = siftwave::testing::testTempPath("small.ledger.jsonl").string();
    std::filesystem::remove(ledger);
    const CliResult d = runCli("decide " + ledger + " --drop " + drop +
                               " --from 2026-03-02 accept --region A --reason 'looked at it'");
    ASSERT_EQ(d.exitCode, 0) << d.out << d.err;
    EXPECT_NE(
        siftwave::testing::slurpFile(ledger).find("\"narrowed_read\":{\"from\":\"2026-03-02\"}"),
        std::string::npos);
    const CliResult same =
        runCli("ledger " + ledger + " --verify --drop " + drop + " --from 2026-03-02");
    EXPECT_EQ(same.exitCode, 0) << same.out << same.err;
    EXPECT_NE(same.out.find("made on: the read narrowed by --from 2026-03-02"), std::string::npos)
        << same.out;
    const CliResult whole = runCli("ledger " + ledger + " --verify --drop " + drop);
    EXPECT_EQ(whole.exitCode, 1);
    EXPECT_NE(whole.err.find("read it as the ledger was, with --from 2026-03-02"),
              std::string::npos)
        << whole.err;
}

}  // namespace
