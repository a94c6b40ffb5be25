// End-to-end: siftwave-cli scan --releases, the revisions between successive releases
// (release_history.h; --previous is the history of two).

#include "support/cli_run.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <filesystem>
#include <fstream>
#include <string>

namespace {

using siftwave::testing::runCli;

// Three daily releases as of 2026-03-04, 05 and 06 in a folder (a region register beside them
// is left out of the releases): r2 revises A and B, r3 revises A and adds region C.
std::filesystem::path releaseFolder() {
    const auto folder = siftwave::testing::testTempPath("scan_releases");
    std::filesystem::create_directories(folder);
    std::ofstream(folder / "r1.csv") << "date,region,cases\n"
                                        "2026-03-02,A,10\n2026-03-03,A,20\n2026-03-04,A,30\n"
                                        "2026-03-02,B,5\n2026-03-03,B,5\n2026-03-04,B,5\n";
    std::ofstream(folder / "r2.csv") << "date,region,cases\n"
                                        "2026-03-02,A,10\n2026-03-03,A,25\n2026-03-04,A,31\n"
                                        "2026-03-05,A,8\n2026-03-02,B,5\n2026-03-03,B,5\n"
                                        "2026-03-04,B,6\n2026-03-05,B,2\n";
    std::ofstream(folder / "r3.csv") << "date,region,cases\n"
                                        "2026-03-02,A,10\n2026-03-03,A,25\n2026-03-04,A,33\n"
                                        "2026-03-05,A,12\n2026-03-06,A,4\n2026-03-02,B,5\n"
                                        "2026-03-03,B,5\n2026-03-04,B,6\n2026-03-05,B,2\n"
                                        "2026-03-06,B,1\n2026-03-06,C,1\n";
    std::ofstream(folder / "r_regions.csv") << "code,name\nA,Alpha\nB,Beta\nC,Gamma\n";
    return folder;
}

TEST(CliScanReleases, TheLatestIsScannedAgainstTheOneBeforeAsPreviousWouldAndEveryPairIsListed) {
    const auto folder = releaseFolder();
    const auto history = runCli("scan --releases " + folder.string() + " --no-regions --json");
    ASSERT_EQ(history.exitCode, 0) << history.err;
    const auto previous = runCli("scan " + (folder / "r3.csv").string() + " --previous " +
                                 (folder / "r2.csv").string() + " --no-regions --json");
    ASSERT_EQ(previous.exitCode, 0) << previous.err;
    const auto h = nlohmann::json::parse(history.out);
    const auto p = nlohmann::json::parse(previous.out);
    // The findings and the newest pair's summary are exactly --previous's.
    EXPECT_EQ(h["findings"], p["findings"]);
    EXPECT_EQ(h["summary"]["revisions"], p["summary"]["revisions"]);
    EXPECT_FALSE(p["summary"].contains("release_revisions"));
    const auto& pairs = h["summary"]["release_revisions"];
    ASSERT_EQ(pairs.size(), 2u);
    EXPECT_EQ(pairs[0]["current_as_of"], "2026-03-05");
    EXPECT_EQ(pairs[1]["previous_as_of"], "2026-03-05");
    EXPECT_EQ(pairs[1]["revisions"], p["summary"]["revisions"]);
    // r1 -> r2: A 20->25 and 30->31, B 5->6: 3 cells changed, net +7 (by hand).
    EXPECT_EQ(pairs[0]["revisions"]["cells_changed"], 3);
    EXPECT_EQ(pairs[0]["revisions"]["net_change"], 7.0);
    EXPECT_EQ(pairs[1]["by_change"]["region_appeared"], 1);
}

TEST(CliScanReleases, TheTextListsOneLinePerRelease) {
    const auto folder = releaseFolder();
    const auto r =
        runCli("scan --releases " + (folder / "r2.csv").string() + " " +
               (folder / "r3.csv").string() + " " + (folder / "r1.csv").string() + " --no-regions");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    EXPECT_NE(r.out.find("r3.csv: "), std::string::npos) << r.out;  // the latest is scanned
    EXPECT_NE(r.out.find("revisions between successive releases (3 releases"), std::string::npos)
        << r.out;
    const auto table = r.out.find("revisions between successive releases");
    ASSERT_NE(table, std::string::npos) << r.out;
    const auto first = r.out.find("\n2026-03-04  ", table);
    const auto second = r.out.find("\n2026-03-05  ", table);
    const auto third = r.out.find("\n2026-03-06  ", table);
    EXPECT_NE(r.out.find("(first release)", first), std::string::npos);
    ASSERT_NE(third, std::string::npos) << r.out;
    EXPECT_LT(first, second);
    EXPECT_LT(second, third);
}

TEST(CliScanReleases, WrongUsageHasItsExitCode) {
    const auto folder = releaseFolder();
    const std::string r1 = (folder / "r1.csv").string();
    const std::string r2 = (folder / "r2.csv").string();
    const auto both = runCli("scan --releases " + r1 + " " + r2 + " --previous " + r1);
    EXPECT_EQ(both.exitCode, 2);
    EXPECT_NE(both.err.find("give one"), std::string::npos) << both.err;
    const auto one = runCli("scan --releases " + r1);
    EXPECT_EQ(one.exitCode, 2);
    EXPECT_NE(one.err.find("at least two releases"), std::string::npos) << one.err;
    EXPECT_EQ(runCli("scan --releases " + r1 + " " + (folder / "missing.csv").string()).exitCode,
              1);
    EXPECT_EQ(runCli("scan " + r1 + " " + r2).exitCode, 2);  // two files without --releases
}

}  // namespace
