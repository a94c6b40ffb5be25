// End-to-end: siftwave-cli transmission on EpiEstim's bundled data (tests/data/real/SOURCES.md),
// the invented sample drop (samples/README.md) and real weekly data (fluBYBW).
#include "support/cli_run.h"
#include "support/temp_path.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>
#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <sstream>
#include <string>

namespace {

using siftwave::testing::CliRun;

CliRun run(const std::string& args, bool withStderr = false) {
    return siftwave::testing::runShell(std::string(SIFTWAVE_CLI_PATH) + " transmission " + args +
                                       (withStderr ? " 2>&1" : " 2>/dev/null"));
}

const std::string kReal = std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/";
const std::string kFlu =
    kReal + "epiestim_Flu2009_incidence.csv --layout dates-down --region cases";
const std::string kDrop = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";

// Reference: EpiEstim::estimate_R (r-cran-epiestim 2.2-4) on Flu2009 with its own serial
// interval, 7-day windows, prior mean 5, sd 5 (tests/data/real/epiestim_Flu2009_cori_reference.csv,
// made by tools/fixtures/make_real_fixtures.R). Through the whole command (reading the drop, the
// SI file, the JSON), R and its quantiles match where R is reported (posterior CV <= 0.3), and
// R_cv is the reference's std/mean on every day both estimate.
TEST(CliTransmission, Flu2009MatchesEpiEstimThroughTheCommand) {
    const CliRun r = run(kFlu + " --si-file " + kReal + "epiestim_Flu2009_si.csv --json");
    ASSERT_EQ(r.exitCode, 0) << r.out;
    const auto j = nlohmann::json::parse(r.out);
    std::ifstream in(kReal + "epiestim_Flu2009_cori_reference.csv");
    std::string line;
    std::getline(in, line);
    int reported = 0, compared = 0;
    while (std::getline(in, line)) {
        std::stringstream s(line);
        std::array<double, 6> v{};
        for (double& x : v) {
            std::string f;
            std::getline(s, f, ',');
            x = std::stod(f);
        }
        const auto& row = j["rows"].at(static_cast<std::size_t>(v[1]) - 1);
        ASSERT_TRUE(row["R_cv"].is_number());
        EXPECT_NEAR(row["R_cv"].get<double>(), v[3] / v[2], 1e-9);
        ++compared;
        if (row["R"].is_null()) {
            EXPECT_NE(row["reason"].get<std::string>().find("posterior CV"), std::string::npos);
            continue;
        }
        ++reported;
        EXPECT_NEAR(row["R"].get<double>() / v[2], 1.0, 1e-9);
        EXPECT_NEAR(row["R_lo"].get<double>() / v[4], 1.0, 1e-9);
        EXPECT_NEAR(row["R_hi"].get<double>() / v[5], 1.0, 1e-9);
    }
    EXPECT_EQ(compared, 25);
    EXPECT_GT(reported, 15);
}

TEST(CliTransmission, JsonHasEveryFieldTheIssueNamesTheSettingsAndTheCaution) {
    const CliRun r = run(kDrop + " --region KV --si-mean 4.7 --si-sd 2.9 --json");
    ASSERT_EQ(r.exitCode, 0) << r.out;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["region"], "KV");
    EXPECT_EQ(j["measure"], "cases");
    EXPECT_EQ(j["settings"]["window"], 7);
    EXPECT_EQ(j["settings"]["prior_mean"], 5.0);
    EXPECT_NE(j["caution"].get<std::string>().find("public-health authority"), std::string::npos);
    ASSERT_EQ(j["rows"].size(), 280u);
    for (const char* key : {"date", "r", "r_lo", "r_hi", "doubling_time_days", "halving_time_days",
                            "R", "R_lo", "R_hi", "R_cv", "reason"}) {
        EXPECT_TRUE(j["rows"][0].contains(key)) << key;
    }
    EXPECT_EQ(j["rows"][0]["date"], "2026-02-23");
    EXPECT_TRUE(j["rows"][0]["R"].is_null());
    EXPECT_TRUE(j["rows"][0]["reason"].is_string());
    EXPECT_TRUE(j["rows"][100]["R"].is_number());
    EXPECT_TRUE(j["rows"][100]["r"].is_number());
}

TEST(CliTransmission, CsvHasAHeaderAndOneRowPerPeriodAndTextEndsWithTheCaution) {
    const CliRun csv = run(kDrop + " --region NA --si-mean 4.7 --si-sd 2.9 --csv");
    ASSERT_EQ(csv.exitCode, 0);
    EXPECT_EQ(csv.out.rfind("date,period,r,r_lo,r_hi,", 0), 0u);
    EXPECT_EQ(std::count(csv.out.begin(), csv.out.end(), '\n'), 281);
    const CliRun text = run(kDrop + " --region NA --si-mean 4.7 --si-sd 2.9");
    ASSERT_EQ(text.exitCode, 0);
    EXPECT_NE(text.out.find("Caution: "), std::string::npos);
}

// --ledger: the command reads the cleaned series the way fit does. An exclusion of ten days
// leaves those days without a value, so the windows that hold them have no estimate and say so.
TEST(CliTransmission, LedgerExclusionsGiveReasonsInTheirWindows) {
    const std::string ledger = siftwave::testing::testTempPath("transmission.jsonl").string();
    const std::string decide = std::string(SIFTWAVE_CLI_PATH) + " decide " + ledger + " --drop " +
                               kDrop +
                               " exclude --region KV --measure cases --days "
                               "2026-07-01:2026-07-10 --reason 'transmission test' >/dev/null 2>&1";
    ASSERT_EQ(std::system(decide.c_str()), 0);
    const std::string args = kDrop + " --region KV --si-mean 4.7 --si-sd 2.9 --json";
    const auto plain = nlohmann::json::parse(run(args).out);
    const CliRun cleaned = run(args + " --ledger " + ledger);
    ASSERT_EQ(cleaned.exitCode, 0) << cleaned.out;
    const auto c = nlohmann::json::parse(cleaned.out);
    for (const auto* j : {&plain, &c}) {
        const auto& row = (*j)["rows"][0];
        EXPECT_EQ(row["date"], "2026-02-23");
    }
    const std::size_t july5 = 132;  // 2026-02-23 + 132 days
    ASSERT_EQ(c["rows"][july5]["date"], "2026-07-05");
    EXPECT_TRUE(plain["rows"][july5]["R"].is_number());
    EXPECT_TRUE(c["rows"][july5]["R"].is_null());
    EXPECT_NE(c["rows"][july5]["reason"].get<std::string>().find("missing"), std::string::npos);
    EXPECT_NE(c["rows"][july5]["r_reason"].get<std::string>().find("missing"), std::string::npos);
}

// Real weekly data: r-cran-surveillance's fluBYBW (tests/data/real/SOURCES.md). Influenza's
// serial interval (mean 2.6 d, sd 1.5 d) mostly falls within one week: R_t is refused with that
// reason; r is per day and rows are named by their ISO week.
TEST(CliTransmission, WeeklyCountsWithAShortSerialIntervalAreRefusedWithTheReason) {
    const CliRun r = run(kReal +
                         "fluBYBW_weekly_long_by_date.csv --region 8315 --si-mean 2.6 "
                         "--si-sd 1.5 --json");
    ASSERT_EQ(r.exitCode, 0) << r.out;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["cadence"], "weekly");
    EXPECT_EQ(j["settings"]["window"], 4);
    ASSERT_TRUE(j["refusal"].is_string());
    EXPECT_NE(j["refusal"].get<std::string>().find("within one week"), std::string::npos);
    EXPECT_EQ(j["rows"][0]["period"], "2001-W01");
    for (const auto& row : j["rows"])
        EXPECT_TRUE(row["R"].is_null());
}

TEST(CliTransmission, WrongUsageExitsWithTwoAndBadInputWithOne) {
    EXPECT_EQ(run(kDrop + " --si-mean 4 --si-sd 2").exitCode, 2);                // no --region
    EXPECT_EQ(run(kDrop + " --region KV --si-mean 4").exitCode, 2);              // no --si-sd
    EXPECT_EQ(run(kDrop + " --region KV --si-mean x --si-sd 2").exitCode, 2);    // not a number
    EXPECT_EQ(run(kDrop + " --region KV --si-mean 0.5 --si-sd 2").exitCode, 2);  // mean <= 1
    EXPECT_EQ(run(kDrop + " --region KV --window 2").exitCode, 2);
    EXPECT_EQ(run(kDrop + " --region KV --weekday").exitCode, 2);  // window 7 < 14
    EXPECT_EQ(run(kDrop + " --region KV --json --csv").exitCode, 2);
    EXPECT_EQ(run(kDrop + " --region NOPE").exitCode, 1);
    EXPECT_EQ(
        run(kReal + "fluBYBW_weekly_long_by_date.csv --region 8315 --weekday --window 14").exitCode,
        2);
    const std::string bad = siftwave::testing::testTempPath("bad_si.csv").string();
    std::ofstream(bad) << "day,weight\n0,0\n1,0.6\n2,zero\n";
    const CliRun r = run(kDrop + " --region KV --si-file " + bad, true);
    EXPECT_EQ(r.exitCode, 1);
    EXPECT_NE(r.out.find(bad + ":4:3: "), std::string::npos) << r.out;
}

}  // namespace

#if SIFTWAVE_TEST_WITH_QT
namespace {

std::string slurp(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

// figure and report draw the same panel under the plot (the renderer, siftwave-cli-render), with
// its caption line and the caution; a malformed serial-interval file stops them as it stops
// transmission.
TEST(CliTransmission, FigureAndReportDrawThePanelWithItsCaution) {
    const std::string svg = siftwave::testing::testTempPath("panel.svg").string();
    const CliRun figure = siftwave::testing::runShell(
        std::string(SIFTWAVE_CLI_PATH) + " figure " + kDrop +
        " --region 1301 --si-mean 4.7 --si-sd 2.9 --out " + svg + " 2>&1");
    ASSERT_EQ(figure.exitCode, 0) << figure.out;
    const std::string text = slurp(svg);
    EXPECT_NE(text.find("R_t, 95% CrI"), std::string::npos);
    EXPECT_NE(text.find("Lower panel: R_t (Cori et al. 2013"), std::string::npos);
    const std::string growth = siftwave::testing::testTempPath("growth.svg").string();
    ASSERT_EQ(
        siftwave::testing::runShell(std::string(SIFTWAVE_CLI_PATH) + " figure " + kDrop +
                                    " --region 1301 --transmission r --out " + growth + " 2>&1")
            .exitCode,
        0);
    EXPECT_NE(slurp(growth).find("r per day, 95% CI"), std::string::npos);

    const std::string ledger = siftwave::testing::testTempPath("report.jsonl").string();
    ASSERT_EQ(
        std::system((std::string(SIFTWAVE_CLI_PATH) + " decide " + ledger + " --drop " + kDrop +
                     " exclude --region KV --measure cases --days 2026-07-01:2026-07-03 "
                     "--reason 'report test' >/dev/null 2>&1")
                        .c_str()),
        0);
    const std::string html = siftwave::testing::testTempPath("brief.html").string();
    const CliRun report = siftwave::testing::runShell(
        std::string(SIFTWAVE_CLI_PATH) + " report " + kDrop + " --ledger " + ledger +
        " --si-mean 4.7 --si-sd 2.9 --out " + html + " 2>&1");
    ASSERT_EQ(report.exitCode, 0) << report.out;
    const std::string page = slurp(html);
    EXPECT_NE(page.find("<h3>Transmission</h3>"), std::string::npos);
    EXPECT_NE(page.find("Do not act on them alone"), std::string::npos);

    const std::string bad = siftwave::testing::testTempPath("bad_si_figure.csv").string();
    std::ofstream(bad) << "day,weight\n0,0\n1,x\n";
    const CliRun refused =
        siftwave::testing::runShell(std::string(SIFTWAVE_CLI_PATH) + " figure " + kDrop +
                                    " --region 1301 --si-file " + bad + " --out " + svg + " 2>&1");
    EXPECT_EQ(refused.exitCode, 1);
    EXPECT_NE(refused.out.find(bad + ":3:3"), std::string::npos) << refused.out;
}

}  // namespace
#endif
