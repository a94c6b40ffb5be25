// End-to-end: siftwave-cli delays and nowcast, on the real husO104Hosp list and on a generated
// release history.
#include "support/case_list_generator.h"
#include "support/cli_run.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace {

using siftwave::testing::runCli;

const std::string kHus = std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv";

TEST(CliNowcast, ACaseListGivesOneRowPerPeriodWithTheCaution) {
    const auto r = runCli("nowcast " + kHus +
                          " --event-col dHosp --report-col dReport --now 2011-06-05 "
                          "--max-delay 15 --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_NE(j["caution"].get<std::string>().find("not a forecast of new infections"),
              std::string::npos);
    EXPECT_EQ(j["now"], "2011-06-05");
    ASSERT_EQ(j["regions"].size(), 1u);
    const auto& region = j["regions"][0];
    EXPECT_EQ(region["max_delay"], 15);
    const auto& rows = region["rows"];
    // 2011-05-07 (the first hospitalisation) to now: 30 days.
    ASSERT_EQ(rows.size(), 30u);
    EXPECT_EQ(rows.back()["date"], "2011-06-05");
    for (const char* key : {"date", "reported", "nowcast", "lo", "hi", "p_complete"})
        EXPECT_TRUE(rows.back().contains(key)) << key;
    // A period 15 or more days old is complete: its nowcast is what was reported.
    EXPECT_EQ(rows[0]["nowcast"], rows[0]["reported"]);
    EXPECT_EQ(rows[0]["p_complete"], 1.0);
    // The delay model used is named (auto picks one of the two) with its trend test.
    const std::string model = region["delay_model"];
    EXPECT_TRUE(model == "constant" || model == "trend") << model;
    EXPECT_TRUE(region.contains("trend_z"));
    const auto fixed = runCli("nowcast " + kHus + " --now 2011-06-05 --delays constant --json");
    ASSERT_EQ(fixed.exitCode, 0) << fixed.err;
    EXPECT_EQ(nlohmann::json::parse(fixed.out)["regions"][0]["delay_model"], "constant");
    EXPECT_EQ(runCli("nowcast " + kHus + " --delays sometimes").exitCode, 2);
}

TEST(CliNowcast, TextAndCsvCarryTheRowsAndTheTextTheCaution) {
    const auto text = runCli("nowcast " + kHus + " --now 2011-06-05");
    ASSERT_EQ(text.exitCode, 0) << text.err;
    EXPECT_NE(text.out.find("Caution:"), std::string::npos);
    EXPECT_NE(text.out.find("2011-06-01"), std::string::npos);
    const auto csv = runCli("nowcast " + kHus + " --now 2011-06-05 --csv");
    ASSERT_EQ(csv.exitCode, 0);
    EXPECT_EQ(csv.out.rfind("region,date,reported,nowcast,lo,hi,p_complete", 0), 0u);
    // One region: its delays pooled with no other are its own.
    EXPECT_EQ(runCli("nowcast " + kHus + " --now 2011-06-05 --csv --pool-delays").out, csv.out);
}

TEST(CliNowcast, AReleaseHistoryInAFolderIsNowcastLikeTheCaseList) {
    siftwave::testing::CaseListSpec spec;
    spec.days = 30;
    spec.seed = 3;
    const auto cases = siftwave::testing::generateCases(spec);
    const siftwave::Date now = spec.first + 29;
    const std::string list =
        siftwave::testing::writeTempFile("list.csv", siftwave::testing::caseListText(cases));
    const auto folder = siftwave::testing::testTempPath("releases");
    std::filesystem::create_directories(folder);
    for (siftwave::Date d = spec.first; d <= now; d = d + 1) {
        std::ofstream(folder / ("cases_" + d.iso() + ".csv"))
            << siftwave::testing::releaseText(cases, spec.first, d);
    }
    const auto fromList =
        runCli("nowcast " + list + " --now " + now.iso() + " --max-delay 10 --csv");
    const auto fromReleases =
        runCli("nowcast --releases " + folder.string() + " --max-delay 10 --csv");
    ASSERT_EQ(fromList.exitCode, 0) << fromList.err;
    ASSERT_EQ(fromReleases.exitCode, 0) << fromReleases.err;
    EXPECT_EQ(fromList.out, fromReleases.out);
    EXPECT_EQ(runCli("nowcast --releases " + folder.string() + " --region nowhere").exitCode, 1);
}

TEST(CliNowcast, WrongUsageAndBadInputHaveTheirExitCodes) {
    EXPECT_EQ(runCli("nowcast").exitCode, 2);
    EXPECT_EQ(runCli("nowcast " + kHus + " --now 2011-13-01").exitCode, 2);
    EXPECT_EQ(runCli("nowcast " + kHus + " --max-delay x").exitCode, 2);
    EXPECT_EQ(runCli("nowcast " + kHus + " --region nowhere").exitCode, 1);
    const std::string counts = siftwave::testing::writeTempFile(
        "counts.csv", "date,region,cases\n2026-03-01,A,3\n2026-03-02,A,4\n");
    const auto r = runCli("nowcast " + counts);
    EXPECT_EQ(r.exitCode, 2);
    EXPECT_NE(r.err.find("case list"), std::string::npos);
}

TEST(CliDelays, HusO104QuantilesAndMonthsAsJson) {
    const auto r = runCli("delays " + kHus + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    // Python's statistics.quantiles(..., method="inclusive") on the fixture: median 7, q95 15.
    EXPECT_EQ(j["overall"]["median"], 7.0);
    EXPECT_EQ(j["overall"]["q95"], 15.0);
    EXPECT_EQ(j["overall"]["cases"], 630);
    EXPECT_EQ(j["groups"].size(), 3u);
    const auto w = runCli("delays " + kHus + " --by window --window-days 14 --csv");
    ASSERT_EQ(w.exitCode, 0) << w.err;
    EXPECT_EQ(w.out.rfind("first,last,cases,mean,q05", 0), 0u);
    EXPECT_EQ(runCli("delays " + kHus + " --by year").exitCode, 2);
}

}  // namespace

namespace {

// The analyst's choice to fit on the completed series goes through the ledger: decide records
// nowcast_complete with its settings, the ledger verifies, and fit --ledger says it fitted the
// completed counts and adds the nowcast's caution. Without the entry the fit says nothing.
TEST(CliNowcast, FittingTheCompletedSeriesIsADecisionTheLedgerRecords) {
    const std::string ledger = siftwave::testing::testTempPath("completed.jsonl").string();
    const auto decided = runCli("decide " + ledger + " --drop " + kHus +
                                " nowcast_complete --region all --max-delay 15 "
                                "--reason 'brief on completed counts' --json");
    ASSERT_EQ(decided.exitCode, 0) << decided.err;
    const auto verified = runCli("ledger " + ledger + " --drop " + kHus + " --verify");
    EXPECT_EQ(verified.exitCode, 0) << verified.err;
    const auto fitted = runCli("fit " + kHus + " --region all --ledger " + ledger + " --json");
    ASSERT_EQ(fitted.exitCode, 0) << fitted.err;
    const auto j = nlohmann::json::parse(fitted.out);
    ASSERT_TRUE(j.contains("nowcast_completed"));
    // husO104Hosp's last report is 2011-07-05 (the list's dReport column).
    EXPECT_NE(j["nowcast_completed"].get<std::string>().find(
                  "chain-ladder as of 2011-07-05, max delay 15 days"),
              std::string::npos);
    EXPECT_NE(j["caution"].get<std::string>().find("not a forecast of new infections"),
              std::string::npos);
    const auto plain = runCli("fit " + kHus + " --region all --json");
    ASSERT_EQ(plain.exitCode, 0) << plain.err;
    EXPECT_FALSE(nlohmann::json::parse(plain.out).contains("nowcast_completed"));
    // A count release cannot be completed: it has no report dates.
    const auto counts = siftwave::testing::writeTempFile(
        "counts.csv", "region,date,cases\nA,2026-03-01,3\nA,2026-03-02,4\n");
    const auto refused = runCli("decide " + ledger + ".2 --drop " + counts +
                                " nowcast_complete --region A --reason x");
    EXPECT_EQ(refused.exitCode, 1);
    EXPECT_NE(refused.err.find("needs a case list"), std::string::npos) << refused.err;
}

}  // namespace
