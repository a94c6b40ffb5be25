// End-to-end: siftwave-cli decide, apply and ledger on a small drop written here.
#include "siftwave/ingest/ingest.h"
#include "siftwave/scan/backlog.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace {

namespace fs = std::filesystem;

struct CliRun {
    int code = -1;
    std::string out;
    std::string err;
};

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

std::string quote(const std::string& s) {
    std::string q = "'";
    for (char c : s) {
        if (c == '\'')
            q += "'\\''";
        else
            q += c;
    }
    return q + "'";
}

class LedgerCli : public ::testing::Test {
protected:
    void SetUp() override {
        // One folder per test process (temp_path.h): other checkouts may run the same tests.
        dir = siftwave::testing::testTempPath(
            "siftwave-cli-ledger-" +
            std::string(::testing::UnitTest::GetInstance()->current_test_info()->name()));
        fs::remove_all(dir);
        fs::create_directories(dir);
        drop = dir / "release.csv";
        ledger = dir / "decisions.jsonl";
        // An invented release: region 0412 has a backlog dump on 03-06 after three zero
        // days; 412 is a variant code of it; +41 is a code a spreadsheet would read as a
        // formula; N7 has a negative correction on 03-05.
        spit(drop,
             "date,region,cases\n"
             "2026-03-01,0412,10\n2026-03-02,0412,12\n2026-03-03,0412,0\n2026-03-04,0412,0\n"
             "2026-03-05,0412,0\n2026-03-06,0412,95\n2026-03-07,0412,11\n"
             "2026-03-01,412,5\n2026-03-05,412,13\n"
             "2026-03-01,+41,3\n2026-03-02,+41,4\n"
             "2026-03-01,N7,6\n2026-03-02,N7,8\n2026-03-03,N7,5\n2026-03-04,N7,7\n2026-03-05,N7,-"
             "3\n");
    }
    void TearDown() override { fs::remove_all(dir); }

    CliRun cli(const std::string& args) {
        const fs::path out = dir / "stdout.txt";
        const fs::path err = dir / "stderr.txt";
        // The user's data folder (signing keys, trusted keys) is the test's own.
        const std::string command = "SIFTWAVE_DATA_DIR=" + quote((dir / "data").string()) + " " +
                                    std::string(SIFTWAVE_CLI_PATH) + " " + args + " >" +
                                    quote(out.string()) + " 2>" + quote(err.string());
        const int status = std::system(command.c_str());
        CliRun r;
        r.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
        r.out = slurp(out);
        r.err = slurp(err);
        return r;
    }
    std::string L() { return quote(ledger.string()); }
    std::string D() { return quote(drop.string()); }
    CliRun redistribute(const std::string& extra = "") {
        return cli("decide " + L() + " --drop " + D() +
                   " redistribute --region 0412 --measure cases --date 2026-03-06 --excess 80"
                   " --window 2026-03-03:2026-03-05 --method uniform --author tester"
                   " --reason 'backlog after the holiday, confirmed by the regional office' " +
                   extra);
    }

    fs::path dir;
    fs::path drop;
    fs::path ledger;
};

TEST_F(LedgerCli, DecideAppendsAnEntryAndApplyWritesTheCleanedLongCsv) {
    CliRun d = redistribute();
    ASSERT_EQ(d.code, 0) << d.err;
    EXPECT_NE(d.out.find("entry 1 recorded"), std::string::npos) << d.out;
    const fs::path cleaned = dir / "cleaned.csv";
    CliRun a = cli("apply " + D() + " --ledger " + L() + " --out " + quote(cleaned.string()));
    ASSERT_EQ(a.code, 0) << a.err;
    const std::string csv = slurp(cleaned);
    // 80 over 3 days by the largest remainder method: 27, 27, 26; the dump keeps 15.
    EXPECT_NE(csv.find("date,region,measure,value,raw_value,entries\r\n"
                       "2026-03-01,0412,cases,10,10,\r\n"
                       "2026-03-02,0412,cases,12,12,\r\n"
                       "2026-03-03,0412,cases,27,0,1\r\n"
                       "2026-03-04,0412,cases,27,0,1\r\n"
                       "2026-03-05,0412,cases,26,0,1\r\n"
                       "2026-03-06,0412,cases,15,95,1\r\n"
                       "2026-03-07,0412,cases,11,11,\r\n"),
              std::string::npos)
        << csv;
    EXPECT_NE(csv.find("2026-03-01,'+41,cases,3,3,\r\n"), std::string::npos)
        << "spreadsheet-safe code";
    // Byte-identical on a second run.
    const fs::path again = dir / "again.csv";
    ASSERT_EQ(cli("apply " + D() + " --ledger " + L() + " --out " + quote(again.string())).code, 0);
    EXPECT_EQ(slurp(again), csv);
}

TEST_F(LedgerCli, DecideJsonPrintsTheSealedEntry) {
    CliRun d = redistribute("--json");
    ASSERT_EQ(d.code, 0) << d.err;
    auto j = nlohmann::json::parse(d.out);
    const auto& e = j.at("entry");
    EXPECT_EQ(e.at("sequence"), 1);
    EXPECT_EQ(e.at("kind"), "redistribute");
    EXPECT_EQ(e.at("author"), "tester");
    EXPECT_EQ(e.at("previous_hash"), std::string(64, '0'));
    EXPECT_EQ(e.at("hash").get<std::string>().size(), 64u);
    EXPECT_EQ(e.at("totals").at(0).at("before"), e.at("totals").at(0).at("after"));
    EXPECT_EQ(e.at("time").get<std::string>().back(), 'Z');
}

TEST_F(LedgerCli, ADecisionWithoutAReasonIsAUsageErrorAndWritesNothing) {
    CliRun d = cli("decide " + L() + " --drop " + D() + " accept --region N7 --reason '  '");
    EXPECT_EQ(d.code, 2);
    EXPECT_FALSE(fs::exists(ledger));
}

TEST_F(LedgerCli, ARefusedDecisionNamesTheReasonAndLeavesTheLedgerAsItWas) {
    ASSERT_EQ(redistribute().code, 0);
    const std::string before = slurp(ledger);
    CliRun d = cli(
        "decide " + L() + " --drop " + D() +
        " redistribute --region 0412 --date 2026-03-06 --excess 50 --window 2026-03-01:2026-03-02"
        " --method uniform --reason 'too much'");
    EXPECT_EQ(d.code, 1);
    EXPECT_NE(d.err.find("negative"), std::string::npos) << d.err;
    EXPECT_NE(d.err.find("0412"), std::string::npos) << d.err;
    EXPECT_EQ(slurp(ledger), before);
}

TEST_F(LedgerCli, EveryKindCanBeRecordedAndWithdrawn) {
    ASSERT_EQ(redistribute().code, 0);
    const std::string base = "decide " + L() + " --drop " + D() + " ";
    EXPECT_EQ(
        cli(base + "spread_negative --region N7 --date 2026-03-05 --reason 'correction of 03-02'")
            .code,
        0);
    EXPECT_EQ(
        cli(base +
            "fill_missing --region 412 --days 2026-03-02:2026-03-04 --method share --reason gap")
            .code,
        0);
    EXPECT_EQ(
        cli(base + "merge_codes --variant 412 --into 0412 --reason 'one region, two codes'").code,
        0);
    EXPECT_EQ(cli(base + "exclude --region '+41' --reason 'test records'").code, 0);
    EXPECT_EQ(
        cli(base + "accept --region N7 --days 2026-03-01:2026-03-04 --reason 'looked fine'").code,
        0);
    EXPECT_EQ(cli(base + "withdraw --entry 5 --reason 'they are real after all'").code, 0);
    CliRun dup =
        cli(base + "resolve_duplicate --region N7 --date 2026-03-01 --keep max --reason x");
    EXPECT_EQ(dup.code, 1) << "no duplicate rows in this drop";
    CliRun v = cli("ledger " + L() + " --verify --drop " + D() + " --json");
    ASSERT_EQ(v.code, 0) << v.out << v.err;
    auto j = nlohmann::json::parse(v.out);
    EXPECT_EQ(j.at("entries"), 7);
    EXPECT_EQ(j.at("conservation"), "verified");
    const fs::path report = dir / "audit.md";
    CliRun r = cli("ledger " + L() + " --report " + quote(report.string()) + " --drop " + D());
    ASSERT_EQ(r.code, 0) << r.err;
    const std::string md = slurp(report);
    EXPECT_NE(md.find("| 5 | "), std::string::npos);
    EXPECT_NE(md.find("withdrawn"), std::string::npos);
    EXPECT_NE(md.find("| 0412 | cases | 128 | 146 | +18 | 4 |"), std::string::npos) << md;
    EXPECT_NE(md.find("| +41 | cases | 7 | 7 | 0 | - |"), std::string::npos) << md;
}

TEST_F(LedgerCli, ATamperedLedgerIsRefusedNamingTheEntryAndNothingIsWritten) {
    ASSERT_EQ(redistribute().code, 0);
    ASSERT_EQ(
        cli("decide " + L() + " --drop " + D() + " accept --region N7 --reason 'looked at it'")
            .code,
        0);
    std::string text = slurp(ledger);
    const auto at = text.find("looked at it");
    ASSERT_NE(at, std::string::npos);
    text.replace(at, 6, "LOOKED");
    spit(ledger, text);
    CliRun v = cli("ledger " + L() + " --verify");
    EXPECT_EQ(v.code, 1);
    EXPECT_NE(v.err.find("entry 2"), std::string::npos) << v.err;
    const fs::path out = dir / "cleaned.csv";
    CliRun a = cli("apply " + D() + " --ledger " + L() + " --out " + quote(out.string()));
    EXPECT_EQ(a.code, 1);
    EXPECT_FALSE(fs::exists(out));
    const fs::path report = dir / "audit.html";
    EXPECT_EQ(cli("ledger " + L() + " --report " + quote(report.string())).code, 1);
    EXPECT_FALSE(fs::exists(report));
    const std::string before = slurp(ledger);
    EXPECT_EQ(cli("decide " + L() + " --drop " + D() + " accept --region N7 --reason again").code,
              1);
    EXPECT_EQ(slurp(ledger), before);
}

TEST_F(LedgerCli, ATornLastLineIsReportedWithItsLine) {
    ASSERT_EQ(redistribute().code, 0);
    std::string text = slurp(ledger);
    text.pop_back();
    spit(ledger, text);
    CliRun v = cli("ledger " + L() + " --verify");
    EXPECT_EQ(v.code, 1);
    EXPECT_NE(v.err.find(":1: "), std::string::npos) << v.err;
    EXPECT_NE(v.err.find("incomplete"), std::string::npos) << v.err;
}

TEST_F(LedgerCli, ALedgerOfAnotherDropIsRefused) {
    ASSERT_EQ(redistribute().code, 0);
    const fs::path other = dir / "other.csv";
    spit(other, slurp(drop) + "2026-03-07,N7,1\n");
    CliRun v = cli("ledger " + L() + " --verify --drop " + quote(other.string()));
    EXPECT_EQ(v.code, 1);
    EXPECT_NE(v.err.find("another drop"), std::string::npos) << v.err;
}

TEST_F(LedgerCli, ReportsInHtmlAndCsvAndAWrongExtensionIsAUsageError) {
    ASSERT_EQ(redistribute().code, 0);
    EXPECT_EQ(cli("ledger " + L() + " --report " + quote((dir / "a.html").string())).code, 0);
    EXPECT_NE(slurp(dir / "a.html").find("<table>"), std::string::npos);
    EXPECT_EQ(
        cli("ledger " + L() + " --report " + quote((dir / "a.csv").string()) + " --drop " + D())
            .code,
        0);
    EXPECT_NE(slurp(dir / "a.csv").find("reconciliation,,,,,,,,0412,cases,128,128,0,\r\n"),
              std::string::npos)
        << slurp(dir / "a.csv");
    EXPECT_EQ(cli("ledger " + L() + " --report " + quote((dir / "a.txt").string())).code, 2);
    EXPECT_FALSE(fs::exists(dir / "a.txt"));
}

// --excess auto takes the scan's own estimate (scan/backlog.h) for the day and, without
// --window, the window it suggests. The bundled sample's manifest plants a catch-up in
// region 1304 on 2026-04-27 after a reporting gap of 2026-04-22..26 (problem P08).
TEST_F(LedgerCli, ExcessAutoTakesTheScansBacklogEstimateAndSuggestedWindow) {
    const std::string sample = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
    CliRun d = cli("decide " + L() + " --drop " + quote(sample) +
                   " redistribute --region 1304 --measure cases --date 2026-04-27 --excess auto"
                   " --method uniform --reason 'catch-up after the gap' --json");
    ASSERT_EQ(d.code, 0) << d.out << d.err;
    const auto j = nlohmann::json::parse(d.out);
    const auto& p = j.at("entry").at("parameters");
    auto drop = siftwave::ingest::readDrop(sample);
    ASSERT_TRUE(drop.ok());
    auto estimate = siftwave::scan::estimateBacklog(*drop, "cases", "1304",
                                                    *siftwave::Date::fromIso("2026-04-27"));
    ASSERT_TRUE(estimate.ok());
    EXPECT_EQ(p.at("excess"), estimate->excess);
    EXPECT_EQ(p.at("window").at("first"), "2026-04-22");  // the planted gap (manifest P08)
    EXPECT_EQ(p.at("window").at("last"), "2026-04-26");
    EXPECT_EQ(j.at("excess_from"), "scan backlog estimate");
    const auto& t = j.at("entry").at("totals").at(0);
    EXPECT_EQ(t.at("before"), t.at("after"));
}

TEST_F(LedgerCli, ExcessAutoWithAGivenWindowSaysTheWindowWasGiven) {
    // The README's morning walk-through: --excess auto with --window. The window is the
    // analyst's, not the scan's suggestion, and the output must not credit it to the scan.
    const std::string sample = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
    const std::string decide = "decide " + L() + " --drop " + quote(sample) +
                               " redistribute --region 1301 --measure cases --date 2026-08-24"
                               " --excess auto --window 2026-08-03:2026-08-23 --method uniform"
                               " --reason 'backlog of three weeks'";
    CliRun dry = cli(decide + " --dry-run");
    ASSERT_EQ(dry.code, 0) << dry.out << dry.err;
    EXPECT_NE(
        dry.out.find("from the scan's backlog estimate; window 2026-08-03:2026-08-23 as given"),
        std::string::npos)
        << dry.out;
    EXPECT_FALSE(fs::exists(ledger));
    CliRun text = cli(decide);
    ASSERT_EQ(text.code, 0) << text.out << text.err;
    EXPECT_NE(text.out.find("window 2026-08-03:2026-08-23 as given"), std::string::npos)
        << text.out;
    EXPECT_EQ(text.out.find("and window"), std::string::npos) << text.out;
    fs::remove(ledger);  // the day was spread back; start again for the JSON form
    CliRun json = cli(decide + " --json");
    ASSERT_EQ(json.code, 0) << json.out << json.err;
    const auto j = nlohmann::json::parse(json.out);
    EXPECT_EQ(j.at("excess_from"), "scan backlog estimate");
    EXPECT_EQ(j.at("window_from"), "--window");
    // Without --window both numbers are the scan's.
    fs::remove(ledger);
    CliRun suggested = cli("decide " + L() + " --drop " + quote(sample) +
                           " redistribute --region 1301 --measure cases --date 2026-08-24"
                           " --excess auto --method uniform --reason 'backlog' --json");
    ASSERT_EQ(suggested.code, 0) << suggested.out << suggested.err;
    EXPECT_EQ(nlohmann::json::parse(suggested.out).at("window_from"), "scan backlog estimate");
}

TEST_F(LedgerCli, DryRunSaysWhenADecisionWouldCreateANewAnomaly) {
    // Issue 14, step 4: the sample's 2,479-count backlog in 1301 (manifest P06: three weeks
    // under-reported) spread evenly over six days makes a block of about 400 more a day. The
    // dry run re-scans the series as it would be and names what that creates.
    const std::string sample = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
    const std::string decide = "decide " + L() + " --drop " + quote(sample) +
                               " redistribute --region 1301 --measure cases --date 2026-08-24"
                               " --excess 2479 --window 2026-08-18:2026-08-23 --method uniform"
                               " --dry-run";
    CliRun text = cli(decide);
    ASSERT_EQ(text.code, 0) << text.out << text.err;
    EXPECT_NE(text.out.find("check: this decision would create what a scan flags"),
              std::string::npos)
        << text.out;
    EXPECT_NE(text.out.find("new backlog_dump"), std::string::npos) << text.out;
    CliRun json = cli(decide + " --json");
    ASSERT_EQ(json.code, 0) << json.out << json.err;
    const auto check = nlohmann::json::parse(json.out).at("check");
    EXPECT_FALSE(check.at("clean").get<bool>());
    ASSERT_FALSE(check.at("new_findings").empty());
    for (const auto& f : check.at("new_findings")) {
        EXPECT_EQ(f.at("region"), "1301");
        EXPECT_GE(f.at("first").get<std::string>(), "2026-08-18");
        EXPECT_LE(f.at("last").get<std::string>(), "2026-08-23");
    }
    EXPECT_FALSE(fs::exists(ledger));
}

TEST_F(LedgerCli, OneEntryIsCountedInTheSingular) {
    ASSERT_EQ(redistribute().code, 0);
    CliRun v = cli("ledger " + L() + " --verify");
    ASSERT_EQ(v.code, 0) << v.err;
    EXPECT_NE(v.out.find(": 1 entry, hash chain verified"), std::string::npos) << v.out;
    CliRun a =
        cli("apply " + D() + " --ledger " + L() + " --out " + quote((dir / "c.csv").string()));
    ASSERT_EQ(a.code, 0) << a.err;
    EXPECT_NE(a.out.find("1 ledger entry replayed (1 in effect)"), std::string::npos) << a.out;
    ASSERT_EQ(
        cli("decide " + L() + " --drop " + D() + " accept --region N7 --reason 'looked at'").code,
        0);
    EXPECT_NE(cli("ledger " + L() + " --verify").out.find(": 2 entries, hash chain verified"),
              std::string::npos);
}

// The issue "Real releases": `ledger --verify` never reports that totals reconcile after
// decisions that added counts, and says by how much and which entries.
TEST_F(LedgerCli, VerifySaysTotalsReconcileOnlyWhenNoDecisionAddedCounts) {
    ASSERT_EQ(redistribute().code, 0);
    CliRun v = cli("ledger " + L() + " --verify --drop " + D());
    ASSERT_EQ(v.code, 0) << v.err;
    EXPECT_NE(v.out.find("every region's totals reconcile"), std::string::npos) << v.out;
    EXPECT_EQ(v.out.find("add counts"), std::string::npos) << v.out;
    auto j =
        nlohmann::json::parse(cli("ledger " + L() + " --verify --drop " + D() + " --json").out);
    EXPECT_EQ(j.at("totals_reconcile"), true);
    EXPECT_EQ(j.at("counts_added").at("total"), 0);
    EXPECT_TRUE(j.at("counts_added").at("entries").empty());

    // 412 has 5 on 03-01 and 13 on 03-05: interpolating 03-02..03-04 writes 7, 9, 11 (+27).
    ASSERT_EQ(cli("decide " + L() + " --drop " + D() +
                  " fill_missing --region 412 --days 2026-03-02:2026-03-04 --method linear"
                  " --reason 'interpolated for the chart'")
                  .code,
              0);
    v = cli("ledger " + L() + " --verify --drop " + D());
    ASSERT_EQ(v.code, 0) << v.err;
    EXPECT_EQ(v.out.find("reconcile"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("totals changed by decisions that add counts: +27 (entries #2)"),
              std::string::npos)
        << v.out;
    j = nlohmann::json::parse(cli("ledger " + L() + " --verify --drop " + D() + " --json").out);
    EXPECT_EQ(j.at("totals_reconcile"), false);
    EXPECT_EQ(j.at("counts_added").at("total"), 27);
    EXPECT_EQ(j.at("counts_added").at("entries"), nlohmann::json::array({2}));
    // Without the drop the ledger's own totals tell the same.
    v = cli("ledger " + L() + " --verify");
    EXPECT_NE(v.out.find("+27 (entries #2)"), std::string::npos) << v.out;

    // Withdrawn, the interpolation adds nothing and the totals reconcile again.
    ASSERT_EQ(cli("decide " + L() + " --drop " + D() + " withdraw --entry 2 --reason 'undo'").code,
              0);
    v = cli("ledger " + L() + " --verify --drop " + D());
    EXPECT_NE(v.out.find("every region's totals reconcile"), std::string::npos) << v.out;
}

// A weekly drop (ISO weeks from Monday 2026-03-02): --periods names weeks by any of their
// days, and the output names each week.
TEST_F(LedgerCli, DecisionsOnAWeeklyDropActOnTheWeeksTheirDatesFallIn) {
    const fs::path weekly = dir / "weekly.csv";
    spit(weekly,
         "week_start,region,cases\n"
         "2026-03-02,W1,3\n2026-03-09,W1,2\n2026-03-23,W1,1\n2026-03-30,W1,2\n"
         "2026-03-02,W2,40\n2026-03-09,W2,42\n2026-03-16,W2,41\n2026-03-23,W2,44\n"
         "2026-03-30,W2,43\n");
    const std::string W = quote(weekly.string());
    // The scan calls the absent week of W1 probably true zeros and suggests filling 0.
    CliRun scan = cli("scan " + W + " --json");
    ASSERT_EQ(scan.code, 0) << scan.err;
    const auto report = nlohmann::json::parse(scan.out);
    EXPECT_EQ(report.at("summary").at("cadence"), "weekly");
    ASSERT_EQ(report.at("findings").size(), 1u) << scan.out;
    const auto& f = report.at("findings").at(0);
    EXPECT_EQ(f.at("kind"), "missing_dates");
    EXPECT_EQ(f.at("first"), "2026-03-16");
    EXPECT_EQ(f.at("evidence").at("probably_true_zeros"), true);
    EXPECT_EQ(f.at("suggestion").at("method"), "zero");

    // Wednesday 2026-03-18 names 2026-W12.
    CliRun d = cli("decide " + L() + " --drop " + W +
                   " fill_missing --region W1 --periods 2026-03-18:2026-03-18 --method zero"
                   " --reason 'no row means no case'");
    ASSERT_EQ(d.code, 0) << d.err;
    EXPECT_NE(d.out.find("2026-03-16 (2026-W12) W1 cases: absent -> 0"), std::string::npos)
        << d.out;
    CliRun v = cli("ledger " + L() + " --verify --drop " + W);
    EXPECT_NE(v.out.find("every region's totals reconcile"), std::string::npos) << v.out;
    EXPECT_EQ(cli("decide " + L() + " --drop " + W +
                  " exclude --region W2 --days 2026-03-02:2026-03-02 --periods "
                  "2026-03-02:2026-03-02 --reason x")
                  .code,
              2)
        << "--days and --periods are one flag";
}

TEST_F(LedgerCli, AnImpossibleWindowSaysWhichPartIsWrong) {
    // 2026 is not a leap year: February has 28 days (ISO 8601 / Gregorian calendar).
    const std::string base = "decide " + L() + " --drop " + D() +
                             " redistribute --region 0412 --measure cases --date 2026-03-06"
                             " --excess 80 --method uniform --reason 'backlog' --window ";
    CliRun noDay = cli(base + "2026-02-30:2026-03-05");
    EXPECT_EQ(noDay.code, 2);
    EXPECT_NE(noDay.err.find("--window: '2026-02-30' is not a day of the calendar"),
              std::string::npos)
        << noDay.err;
    CliRun backwards = cli(base + "2026-03-05:2026-03-03");
    EXPECT_EQ(backwards.code, 2);
    EXPECT_NE(backwards.err.find("'2026-03-05:2026-03-03' ends before it starts"),
              std::string::npos)
        << backwards.err;
    CliRun garbled = cli(base + "last-week");
    EXPECT_EQ(garbled.code, 2);
    EXPECT_NE(garbled.err.find("takes FIRST:LAST as YYYY-MM-DD:YYYY-MM-DD"), std::string::npos)
        << garbled.err;
    EXPECT_FALSE(fs::exists(ledger));
}

TEST_F(LedgerCli, UsageErrorsExitTwoAndHelpListsEveryKind) {
    EXPECT_EQ(cli("decide " + L() + " --drop " + D() + " tidy_up --reason x").code, 2);
    EXPECT_EQ(cli("decide " + L() + " --drop " + D() +
                  " merge_codes --variant 412 --into 0412 --date 2026-03-01 "
                  "--reason x")
                  .code,
              2)
        << "--date does not apply to merge_codes";
    EXPECT_EQ(cli("apply " + D() + " --ledger " + L()).code, 2);
    EXPECT_EQ(cli("apply " + D() + " --ledger " + L() + " --out " + D()).code, 2)
        << "never write the input";
    EXPECT_EQ(cli("ledger " + L()).code, 2);
    CliRun help = cli("decide --help");
    EXPECT_EQ(help.code, 0);
    for (const char* kind :
         {"redistribute", "spread_negative", "fill_missing", "resolve_duplicate", "merge_codes",
          "exclude", "accept", "withdraw", "--excess N|auto", "--keep", "--variant", "--entry"}) {
        EXPECT_NE(help.out.find(kind), std::string::npos) << kind;
    }
}

// Issue 19, "an anchored audit trail": a head recorded elsewhere catches a ledger cut short
// and names entries added after it.
TEST_F(LedgerCli, VerifyAgainstARecordedHeadCatchesACutEndAndNamesLaterEntries) {
    ASSERT_EQ(redistribute().code, 0);
    CliRun first = cli("ledger " + L() + " --verify --json");
    ASSERT_EQ(first.code, 0) << first.err;
    const std::string head = nlohmann::json::parse(first.out)["head_hash"];
    CliRun text = cli("ledger " + L() + " --verify");
    EXPECT_NE(text.out.find("head " + head), std::string::npos) << text.out;
    EXPECT_NE(text.out.find("not that nobody edited an entry"), std::string::npos) << text.out;

    CliRun second = cli("decide " + L() + " --drop " + D() +
                        " accept --region N7 --measure cases --days 2026-03-01:2026-03-04"
                        " --author tester --reason 'checked'");
    ASSERT_EQ(second.code, 0) << second.err;
    CliRun later = cli("ledger " + L() + " --verify --head " + head.substr(0, 16));
    EXPECT_EQ(later.code, 0) << later.err;
    EXPECT_NE(later.out.find("is entry 1: entries 1 to 1 are unchanged; 1 entry was added after "
                             "it, which this head does not cover"),
              std::string::npos)
        << later.out;

    // Cut the last line off: still a valid chain, but not the one the head was recorded from.
    const std::string bytes = slurp(ledger);
    const std::size_t lastLine = bytes.rfind('\n', bytes.size() - 2);
    const std::string secondHead =
        nlohmann::json::parse(cli("ledger " + L() + " --verify --json").out)["head_hash"];
    spit(ledger, bytes.substr(0, lastLine + 1));
    EXPECT_EQ(cli("ledger " + L() + " --verify").code, 0) << "a shorter chain is a valid chain";
    CliRun cut = cli("ledger " + L() + " --verify --head " + secondHead);
    EXPECT_EQ(cut.code, 1);
    EXPECT_NE(cut.err.find("no entry has the recorded head"), std::string::npos) << cut.err;
    EXPECT_EQ(cli("ledger " + L() + " --verify --head 12ab").code, 2) << "too short to check";
}

TEST_F(LedgerCli, SignedDecisionsNameTheirSignerWhenTheKeyIsTrusted) {
    CliRun noKey = redistribute("--sign");
    EXPECT_EQ(noKey.code, 1);
    EXPECT_NE(noKey.err.find("signing-key --create"), std::string::npos) << noKey.err;
    EXPECT_FALSE(fs::exists(ledger)) << "nothing recorded without the key";

    CliRun created = cli("signing-key --create --json");
    ASSERT_EQ(created.code, 0) << created.err;
    const nlohmann::json key = nlohmann::json::parse(created.out);
    EXPECT_EQ(key["key_file"], (dir / "data" / "keys" / "signing-key.pem").string());
    EXPECT_EQ(fs::status(key["key_file"].get<std::string>()).permissions() & fs::perms::all,
              fs::perms::owner_read | fs::perms::owner_write);
    EXPECT_EQ(cli("signing-key --create").code, 1) << "an existing key is never overwritten";
    const nlohmann::json shown = nlohmann::json::parse(cli("signing-key --show --json").out);
    EXPECT_EQ(shown["public_key"], key["public_key"]);
    EXPECT_EQ(shown["created"], false);

    CliRun signedDecision = redistribute("--sign");
    ASSERT_EQ(signedDecision.code, 0) << signedDecision.err;
    const std::string keyPrefix = key["public_key"].get<std::string>().substr(0, 16);
    EXPECT_NE(signedDecision.out.find("signed with key " + keyPrefix), std::string::npos);
    CliRun own = cli("ledger " + L() + " --verify");
    EXPECT_NE(own.out.find("1 of 1 entry signed by trusted keys (you: 1)"),
              std::string::npos)
        << own.out;

    // Someone else checks the ledger: with an empty trust list the key proves nothing; with
    // the line signing-key printed, the signer is named.
    fs::remove(key["key_file"].get<std::string>());
    spit(dir / "trusted.txt", "");
    CliRun stranger =
        cli("ledger " + L() + " --verify --trusted-keys " + quote((dir / "trusted.txt").string()));
    EXPECT_NE(stranger.out.find("keys you do not trust, which proves nothing"), std::string::npos)
        << stranger.out;
    spit(dir / "trusted.txt", key["trusted_keys_line"].get<std::string>() + "\n");
    CliRun colleague = cli("ledger " + L() + " --verify --json --trusted-keys " +
                           quote((dir / "trusted.txt").string()));
    const nlohmann::json v = nlohmann::json::parse(colleague.out);
    EXPECT_EQ(v["signatures"]["signed"][0]["state"], "trusted");
    EXPECT_EQ(v["signatures"]["signed"][0]["key"], keyPrefix);
}

// Issue 19: terminal control characters in codes, names and paths are never echoed raw by
// decide, apply or ledger (an escape sequence could rewrite the analyst's screen).
TEST_F(LedgerCli, ControlCharactersInPathsAndAuthorsNeverReachTheTerminal) {
    const fs::path hostileDrop = dir / "rel\x1b[2Jease.csv";
    const fs::path hostileLedger = dir / "dec\x1b]0;owned\x07.jsonl";
    fs::copy_file(drop, hostileDrop);
    const std::string d = quote(hostileDrop.string());
    const std::string l = quote(hostileLedger.string());
    const auto clean = [](const CliRun& r) {
        return r.out.find_first_of("\x1b\x07") == std::string::npos &&
               r.err.find_first_of("\x1b\x07") == std::string::npos;
    };
    CliRun decided = cli("decide " + l + " --drop " + d +
                         " accept --region N7 --measure cases --days 2026-03-01:2026-03-04"
                         " --author " +
                         quote("\x1b[31mmallory") + " --reason checked");
    ASSERT_EQ(decided.code, 0) << decided.err;
    EXPECT_TRUE(clean(decided)) << decided.out;
    CliRun applied =
        cli("apply " + d + " --ledger " + l + " --out " + quote((dir / "out\x1b[1m.csv").string()));
    ASSERT_EQ(applied.code, 0) << applied.err;
    EXPECT_TRUE(clean(applied)) << applied.out;
    CliRun verified = cli("ledger " + l + " --verify --drop " + d + " --report " +
                          quote((dir / "audit\x1b[5m.md").string()));
    ASSERT_EQ(verified.code, 0) << verified.err;
    EXPECT_TRUE(clean(verified)) << verified.out;
    CliRun refused = cli("ledger " + quote((dir / "missing\x1b[8m.jsonl").string()) + " --verify");
    EXPECT_EQ(refused.code, 1);
    EXPECT_TRUE(clean(refused)) << refused.err;
}

}  // namespace
