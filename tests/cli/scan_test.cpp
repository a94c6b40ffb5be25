// End-to-end: siftwave-cli scan on the sample and on bad input.

#include "siftwave/scan/scan.h"
#include "siftwave/date.h"
#include "siftwave/ingest/ingest.h"
#include "support/cli_run.h"
#include "support/sanitizer.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>
#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>

namespace {

const std::string kCli = SIFTWAVE_CLI_PATH;
const std::filesystem::path kSamples{SIFTWAVE_SAMPLES_DIR};

struct CliRun {
    int exitCode = -1;
    std::string out;
};

CliRun run(const std::string& arguments) {
    CliRun r;
    const std::string command = kCli + " " + arguments + " 2>/dev/null";
    FILE* pipe = popen(command.c_str(), "r");
    if (pipe == nullptr)
        return r;
    std::array<char, 4096> buffer{};
    std::size_t n = 0;
    while ((n = std::fread(buffer.data(), 1, buffer.size(), pipe)) > 0)
        r.out.append(buffer.data(), n);
    const int status = pclose(pipe);
    r.exitCode = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    return r;
}

std::string sample(const char* name) {
    return (kSamples / name).string();
}

TEST(ScanCommand, PrintsRankedFindingsAndASummaryAsJson) {
    const CliRun r = run("scan " + sample("quenmara_current.csv") + " --previous " +
                         sample("quenmara_previous.csv") + " --regions " +
                         sample("quenmara_regions.csv") + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.out;
    const auto j = nlohmann::json::parse(r.out);
    ASSERT_TRUE(j["findings"].is_array());
    ASSERT_FALSE(j["findings"].empty());
    int rank = 0;
    std::size_t total = 0;
    for (const auto& f : j["findings"]) {
        for (const char* key :
             {"id", "kind", "severity", "rank", "region", "measure", "evidence", "suggestion"}) {
            EXPECT_TRUE(f.contains(key)) << key << " in " << f.dump();
        }
        EXPECT_EQ(f["rank"].get<int>(), ++rank);
        const std::string s = f["severity"];
        EXPECT_TRUE(s == "info" || s == "warning" || s == "critical");
        if (f["kind"] == "code_collision") {
            EXPECT_FALSE(f.contains("first"));
        }
    }
    for (const auto& [kind, n] : j["summary"]["by_kind"].items())
        total += n.get<std::size_t>();
    EXPECT_EQ(total, j["findings"].size());
    EXPECT_EQ(j["summary"]["by_kind"]["backlog_dump"], 2);
    EXPECT_TRUE(j["summary"].contains("revisions"));
    EXPECT_EQ(j["summary"]["revisions"]["regions_revised"], 2);
}

TEST(ScanCommand, GivesTheSameIdsOnEveryRun) {
    const std::string args = "scan " + sample("quenmara_current.csv") + " --json";
    const auto a = nlohmann::json::parse(run(args).out);
    const auto b = nlohmann::json::parse(run(args).out);
    ASSERT_EQ(a["findings"].size(), b["findings"].size());
    for (std::size_t i = 0; i < a["findings"].size(); ++i) {
        EXPECT_EQ(a["findings"][i]["id"], b["findings"][i]["id"]);
    }
}

TEST(ScanCommand, PrintsAReadableTableWithoutJson) {
    const CliRun r = run("scan " + sample("quenmara_current.csv"));
    ASSERT_EQ(r.exitCode, 0);
    EXPECT_NE(r.out.find("rank"), std::string::npos);
    EXPECT_NE(r.out.find("backlog_dump"), std::string::npos);
    EXPECT_NE(r.out.find("2026-08-24"), std::string::npos);
}

TEST(ScanCommand, SetChangesAThresholdAndRejectsUnknownNames) {
    const std::string file = sample("quenmara_current.csv");
    const auto off =
        nlohmann::json::parse(run("scan " + file + " --set backlog_dump.enabled=false --json").out);
    EXPECT_EQ(off["summary"]["by_kind"]["backlog_dump"], 0);
    const auto strict = nlohmann::json::parse(
        run("scan " + file + " --set backlog_dump.min_excess=1000 --json").out);
    EXPECT_EQ(strict["summary"]["by_kind"]["backlog_dump"], 1);  // only the 2,444 excess remains
    EXPECT_EQ(run("scan " + file + " --set backlog_dump.no_such=1").exitCode, 2);
    EXPECT_EQ(run("scan " + file + " --set backlog_dump.min_excess=-5").exitCode, 2);
    EXPECT_EQ(run("scan " + file + " --set backlog_dump.min_excess").exitCode, 2);
}

// Real data: r-cran-surveillance, dataset fluBYBW (weekly influenza notifications, 16 districts
// x 156 ISO weeks, every week reported; tests/data/real/SOURCES.md), labelled by ISO week.
TEST(ScanCommand, ScansAWeeklyReleaseInWeeksAndSaysSo) {
    const std::string file =
        std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/fluBYBW_weekly_isoweek.csv";
    const CliRun text = run("scan " + file);
    ASSERT_EQ(text.exitCode, 0);
    EXPECT_NE(text.out.find(": 0 finding(s)"), std::string::npos) << text.out;
    EXPECT_NE(text.out.find("2001-W01 to 2003-W52 (156 weeks); dates are the first days of weeks"),
              std::string::npos)
        << text.out;
    const auto j = nlohmann::json::parse(run("scan " + file + " --json").out);
    EXPECT_EQ(j["summary"]["cadence"], "weekly");
    EXPECT_EQ(j["summary"]["by_kind"]["missing_dates"], 0);
    EXPECT_EQ(j["summary"]["by_kind"]["weekday_effect"], 0);
    // Settings that count periods have a weekly value of their own.
    const CliRun help = run("scan --help");
    EXPECT_NE(help.out.find("backlog_dump.window_weeks"), std::string::npos);
    EXPECT_NE(help.out.find("missing_dates.true_zero_max_level"), std::string::npos);
}

TEST(ScanCommand, ExitsZeroOnACleanDropOneOnUnreadableInputTwoOnWrongUsage) {
    siftwave::testing::SyntheticOptions o;
    o.regions = 5;
    o.days = 60;
    const auto s = siftwave::testing::makeSyntheticDrop(o);
    const std::filesystem::path clean =
        std::filesystem::temp_directory_path() /
        ("siftwave_scan_clean_" + std::to_string(getpid()) + ".csv");
    {
        std::ofstream out(clean);
        out << siftwave::testing::toLongCsv(s.drop);
    }
    EXPECT_EQ(run("scan " + clean.string()).exitCode, 0);
    std::filesystem::remove(clean);
    EXPECT_EQ(run("scan /nonexistent/drop.csv").exitCode, 1);
    EXPECT_EQ(
        run("scan " + sample("quenmara_current.csv") + " --previous /nonexistent.csv").exitCode, 1);
    EXPECT_EQ(run("scan").exitCode, 2);
    EXPECT_EQ(run("scan a.csv b.csv").exitCode, 2);
    EXPECT_EQ(run("scan --bogus x.csv").exitCode, 2);
}

TEST(ScanCommand, StreamsTheSameJsonTheReportWouldDumpWhole) {
    // scan --json writes one finding at a time (issue 14, step 5); the text must be exactly
    // the document nlohmann::json would print whole, with and without findings.
    // The sample (the CLI also reads the register beside it): the streamed text is the one
    // nlohmann::json prints for the same document.
    const CliRun r = run("scan " + sample("quenmara_current.csv") + " --json");
    ASSERT_EQ(r.exitCode, 0);
    const auto whole = nlohmann::json::parse(r.out);
    ASSERT_GT(whole["findings"].size(), 10u);
    EXPECT_EQ(r.out, whole.dump(2) + "\n");

    // No findings: an empty list, written as nlohmann::json writes one.
    const std::filesystem::path quiet =
        std::filesystem::temp_directory_path() /
        ("siftwave_scan_quiet_" + std::to_string(getpid()) + ".csv");
    {
        std::ofstream out(quiet);
        out << "date,region,cases\n";
        const int values[] = {3, 1, 4, 1, 5, 2, 6, 2, 5, 3, 5, 0, 2, 4};
        for (int d = 0; d < 14; ++d)
            out << "2026-03-" << (d + 2 < 10 ? "0" : "") << d + 2 << ",Q1," << values[d] << "\n";
    }
    auto quietDrop = siftwave::ingest::readDrop(quiet.string());
    ASSERT_TRUE(quietDrop.ok());
    auto quietReport = siftwave::scan::scanDrop(*quietDrop);
    ASSERT_TRUE(quietReport.ok());
    ASSERT_TRUE(quietReport->findings.empty()) << quietReport->findings.front().id;
    const CliRun q = run("scan " + quiet.string() + " --json");
    std::filesystem::remove(quiet);
    ASSERT_EQ(q.exitCode, 0);
    EXPECT_EQ(q.out, siftwave::scan::scanReportToJson(*quietReport).dump(2) + "\n");
}

// Issue 14, step 5: scan --json on a 1 MB weekly file used 335 MB. A file of the same size whose
// every third cell is a problem (19,371 findings, 15 MB of JSON) is scanned under a 120 MB
// address-space limit (ulimit -v), about twice what it needs: the findings are written one at a
// time and their evidence is kept as CBOR bytes. (Under AddressSanitizer, whose shadow memory
// takes terabytes of address space, the command runs without the limit.)
TEST(ScanCommand, ThousandsOfFindingsFromAWeeklyFileStayWithinAMemoryBound) {
    std::string text = "week_start,region,cases\n";
    const char* values[] = {"0", "0", "0", "1", "2", "3", "50", "500", "7", "7", "7", "-3", "", ""};
    std::uint64_t state = 4;
    siftwave::Date week = *siftwave::Date::fromIso("2001-01-01");
    for (int r = 0; r < 140; ++r) {
        for (int w = 0; w < 420; ++w) {
            state = state * 6364136223846793005ull + 1442695040888963407ull;  // Knuth's MMIX LCG
            text += (week + 7 * w).iso() + "," + std::to_string(8000 + r) + "," +
                    values[(state >> 33) % 14] + "\n";
        }
    }
    ASSERT_GT(text.size(), 1'000'000u);
    const std::filesystem::path path = siftwave::testing::testTempPath("weekly_faults.csv");
    {
        std::ofstream out(path);
        out << text;
    }
    const std::string limited = SIFTWAVE_TEST_UNDER_ASAN ? "" : "ulimit -v 120000; ";
    const std::filesystem::path outPath = siftwave::testing::testTempPath("weekly_faults.json");
    const int status = std::system(("sh -c '" + limited + kCli + " scan " + path.string() +
                                    " --json >" + outPath.string() + " 2>&1'")
                                       .c_str());
    ASSERT_TRUE(WIFEXITED(status));
    ASSERT_EQ(WEXITSTATUS(status), 0) << siftwave::testing::slurpFile(outPath).substr(0, 300);
    // The whole document was written (its summary comes last), at about 15 MB.
    EXPECT_GT(std::filesystem::file_size(outPath), 10'000'000u);
    const std::string json = siftwave::testing::slurpFile(outPath);
    EXPECT_NE(json.find("\"cadence\": \"weekly\"", json.size() - 60), std::string::npos)
        << json.substr(json.size() - 200);
    std::filesystem::remove(path);
    std::filesystem::remove(outPath);
}

}  // namespace
