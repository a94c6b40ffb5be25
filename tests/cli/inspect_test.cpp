// End-to-end: siftwave-cli inspect on files written by the test.
#include "siftwave/date.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/sha256.h"

#include "support/cli_run.h"
#include "support/temp_path.h"
#include "support/zip_builder.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>


#include <array>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <string>
#include <utility>
#include <vector>

namespace {

using CliRun = siftwave::testing::CliResult;

CliRun run(const std::string& args) {
    return siftwave::testing::runCli(args);
}

std::string writeDrop(const std::string& name, const std::string& text) {
    return siftwave::testing::writeTempFile(name, text);
}

TEST(CliInspect, JsonHasEveryFieldTheIssueNames) {
    const std::string text =
        "date,region,cases,deaths\n"
        "2026-03-01,NA,5,0\n"
        "2026-03-01,004,3,1\n"
        "2026-03-02,NA,,x\n"
        "2026-03-03,004,7,2\n"
        "2026-03-03,004,8,2\n";
    const std::string path = writeDrop("siftwave_inspect_fields.csv", text);
    const CliRun r = run("inspect " + path + " --json");
    ASSERT_EQ(r.exitCode, 0) << r.out << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["source"]["path"], path);
    EXPECT_EQ(j["source"]["bytes"], text.size());
    EXPECT_EQ(j["source"]["sha256"], siftwave::sha256Hex(text));
    EXPECT_EQ(j["source"]["delimiter"], ",");
    EXPECT_EQ(j["source"]["header"], true);
    EXPECT_EQ(j["layout"], "long");
    EXPECT_EQ(j["columns"]["date"], "date");
    EXPECT_EQ(j["columns"]["region"], "region");
    EXPECT_EQ(j["columns"]["values"], nlohmann::json({"cases", "deaths"}));
    EXPECT_EQ(j["rows"], 5);
    EXPECT_EQ(j["regions"], 2);
    EXPECT_EQ(j["region_codes"], nlohmann::json({"NA", "004"}));
    EXPECT_EQ(j["measures"], nlohmann::json({"cases", "deaths"}));
    EXPECT_EQ(j["first_date"], "2026-03-01");
    EXPECT_EQ(j["last_date"], "2026-03-03");
    // 2 regions x 3 days x 2 measures = 12 cells: 6 reported, 1 blank, 1 unparsable, 4 absent.
    EXPECT_EQ(j["cells"]["reported"], 6);
    EXPECT_EQ(j["cells"]["blank"], 1);
    EXPECT_EQ(j["cells"]["unparsable"], 1);
    EXPECT_EQ(j["cells"]["absent"], 4);
    EXPECT_EQ(j["duplicates"], 1);  // one row repeats (004, 2026-03-03) for both measures
    ASSERT_TRUE(j["warnings"].is_array());
    bool unparsableNamed = false;
    for (const auto& w : j["warnings"]) {
        ASSERT_TRUE(w.contains("message") && w.contains("line") && w.contains("column"));
        if (w["line"] == 4 && w["column"] == 4)
            unparsableNamed =
                w["message"].get<std::string>().find("'x' is not a number") != std::string::npos;
    }
    EXPECT_TRUE(unparsableNamed);
    std::filesystem::remove(path);
}

// Reliability issue, item 7: a region code with terminal control characters (ECMA-48: ESC
// starts a control sequence; U+009B is the C1 control sequence introducer) is printed as
// visible escapes by inspect, scan and fit, on stdout and stderr alike; no control byte
// reaches the terminal.
TEST(CliInspect, ControlCharactersInCodesNeverReachTheTerminal) {
    const std::filesystem::path file = siftwave::testing::testTempPath("control-codes.csv");
    {
        std::ofstream out(file, std::ios::binary);
        out << "date,region,cases\n";
        for (int d = 1; d <= 20; ++d)
            out << "2026-03-" << (d < 10 ? "0" : "") << d << ",\"A\x1b[2J\x07\xc2\x9b\"," << d
                << "\n";
    }
    auto clean = [](const std::string& text) {
        for (std::size_t i = 0; i < text.size(); ++i) {
            const auto c = static_cast<unsigned char>(text[i]);
            if ((c < 0x20 && c != '\n') || c == 0x7F)
                return false;
            if (c == 0xC2 && i + 1 < text.size() &&
                static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
                static_cast<unsigned char>(text[i + 1]) <= 0x9F)
                return false;
        }
        return true;
    };
    for (const std::string& command :
         {std::string("inspect "), std::string("scan "), std::string("fit --all ")}) {
        const CliRun r = run(command + file.string());
        EXPECT_TRUE(clean(r.out)) << command << r.out;
        EXPECT_TRUE(clean(r.err)) << command << r.err;
    }
    const CliRun r = run("inspect " + file.string());
    EXPECT_NE(r.out.find("A\\x1b[2J\\x07\\u009b"), std::string::npos) << r.out;
    // An error message quoting the code is escaped too.
    const CliRun bad = run("fit " + file.string() + " --region nowhere");
    EXPECT_TRUE(clean(bad.err)) << bad.err;
    // JSON carries the code exactly, its control characters escaped (RFC 8259, section 7):
    // no raw control byte in the output, the same bytes after a parse.
    for (const std::string& command : {std::string("inspect --json "), std::string("scan --json "),
                                       std::string("fit --json --all ")}) {
        const CliRun j = run(command + file.string());
        EXPECT_TRUE(clean(j.out)) << command << j.out;
        if (command != "scan --json ") {  // no finding on this series: no code in the output
            EXPECT_NE(j.out.find("A\\u001b[2J\\u0007\\u009b"), std::string::npos)
                << command << j.out;
        }
        EXPECT_FALSE(nlohmann::json::parse(j.out, nullptr, false).is_discarded()) << command;
    }
    const nlohmann::json inspected =
        nlohmann::json::parse(run("inspect --json " + file.string()).out);
    EXPECT_EQ(inspected["region_codes"][0], "A\x1b[2J\x07\xc2\x9b");
}

TEST(CliInspect, PlainTextSaysWhatWasRead) {
    const std::string path =
        writeDrop("siftwave_inspect_text.csv", "date;NA;007\n01/02/2026;1;2\n13/02/2026;3;4\n");
    const CliRun r = run("inspect " + path);
    ASSERT_EQ(r.exitCode, 0) << r.err;
    EXPECT_NE(r.out.find("semicolon (;) delimited"), std::string::npos) << r.out;
    EXPECT_NE(r.out.find("layout      dates-down"), std::string::npos) << r.out;
    EXPECT_NE(r.out.find("DD/MM/YYYY"), std::string::npos);
    EXPECT_NE(r.out.find("regions     2: NA, 007"), std::string::npos) << r.out;
    EXPECT_NE(r.out.find("calendar    daily, 2026-02-01 to 2026-02-13 (13 days)"),
              std::string::npos)
        << r.out;
    std::filesystem::remove(path);
}

TEST(CliInspect, IngestFlagsOverrideWhatIsDetected) {
    const std::string path =
        writeDrop("siftwave_inspect_flags.csv", "a|b|c|d\nX|03/04/2026|5|NA\nY|03/04/2026|6|1\n");
    const CliRun r = run("inspect " + path +
                         " --delimiter '|' --date-col b --region-col a --value-col d --value-col c"
                         " --date-format MM/DD/YYYY --missing NA --header --json");
    ASSERT_EQ(r.exitCode, 0) << r.out << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["source"]["delimiter"], "|");
    EXPECT_EQ(j["first_date"], "2026-03-04");
    EXPECT_EQ(j["measures"], nlohmann::json({"d", "c"}));
    EXPECT_EQ(j["region_codes"], nlohmann::json({"X", "Y"}));
    EXPECT_EQ(j["cells"]["blank"], 1);
    EXPECT_EQ(j["cells"]["reported"], 3);
    std::filesystem::remove(path);
}

TEST(CliInspect, AmbiguousDatesExitOneAndSayWhatToRerun) {
    const std::string path = writeDrop("siftwave_inspect_ambiguous.csv",
                                       "date,region,cases\n03/04/2026,A,1\n04/04/2026,A,2\n");
    const CliRun r = run("inspect " + path);
    EXPECT_EQ(r.exitCode, 1);
    EXPECT_EQ(r.err,
              "siftwave-cli: " + path +
                  ":2:1: dates such as 03/04/2026 could be day/month or month/day (no day of "
                  "the month in the file is above 12); rerun with --date-format DD/MM/YYYY or "
                  "MM/DD/YYYY\n");
    const CliRun j = run("inspect " + path + " --json");
    EXPECT_EQ(j.exitCode, 1);
    const auto e = nlohmann::json::parse(j.out)["error"];
    EXPECT_EQ(e["code"], "ambiguous");
    EXPECT_EQ(e["file"], path);
    EXPECT_EQ(e["line"], 2);
    EXPECT_EQ(e["column"], 1);
    std::filesystem::remove(path);
}

TEST(CliInspect, BadInputNamesFileLineAndColumn) {
    const std::string path = writeDrop("siftwave_inspect_bad.csv",
                                       "date,region,cases\n2026-01-01,A,1\n2026-02-30,A,2\n");
    const CliRun r = run("inspect " + path);
    EXPECT_EQ(r.exitCode, 1);
    EXPECT_EQ(r.err,
              "siftwave-cli: " + path +
                  ":3:1: '2026-02-30' is not a real day of the calendar (read as YYYY-MM-DD)\n");
    const CliRun missing = run("inspect /nonexistent/drop.csv");
    EXPECT_EQ(missing.exitCode, 1);
    EXPECT_NE(missing.err.find("/nonexistent/drop.csv: cannot open the file"), std::string::npos);
    std::filesystem::remove(path);
}

TEST(CliInspect, UsageErrorsExitTwoAndHelpExitsZero) {
    EXPECT_EQ(run("inspect").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv b.csv").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv --no-such-flag").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv --layout sideways").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv --date-format DD.MM.YYYY").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv --delimiter ab").exitCode, 2);
    EXPECT_EQ(run("inspect a.csv --header --no-header").exitCode, 2);
    const CliRun help = run("inspect --help");
    EXPECT_EQ(help.exitCode, 0);
    EXPECT_NE(help.out.find("usage: siftwave-cli inspect FILE"), std::string::npos);
    EXPECT_NE(help.out.find("--date-format"), std::string::npos);
    const std::string path =
        writeDrop("siftwave_inspect_usage.csv", "date,region,cases\n2026-01-01,A,1\n");
    const CliRun wrongColumn = run("inspect " + path + " --value-col deaths");
    EXPECT_EQ(wrongColumn.exitCode, 2);
    EXPECT_NE(wrongColumn.err.find("--value-col names 'deaths', but there is no such column"),
              std::string::npos);
    std::filesystem::remove(path);
}

TEST(CliInspect, ALongFileSortedByRegionWithNumericCodesIsReportedAsLong) {
    // 450 weeks per region: the reader's sample (400 records) shows the first region only.
    std::string text = "week_start,region,cases\n";
    for (const char* code : {"8336", "8337", "8315"}) {
        for (int w = 0; w < 450; ++w) {
            text += (*siftwave::Date::fromIso("2001-01-01") + 7 * w).iso() + "," + code + "," +
                    std::to_string(w % 17) + "\n";
        }
    }
    const std::string path = writeDrop("siftwave_inspect_by_region.csv", text);
    const CliRun json = run("inspect " + path + " --json");
    ASSERT_EQ(json.exitCode, 0) << json.err;
    const auto j = nlohmann::json::parse(json.out);
    EXPECT_EQ(j["layout"], "long");
    EXPECT_EQ(j["columns"]["region"], "region");
    EXPECT_EQ(j["regions"], 3);
    EXPECT_EQ(j["region_codes"], nlohmann::json({"8336", "8337", "8315"}));
    EXPECT_EQ(j["rows"], 1350);
    const CliRun plain = run("inspect " + path);
    ASSERT_EQ(plain.exitCode, 0) << plain.err;
    EXPECT_NE(plain.out.find("layout      long"), std::string::npos) << plain.out;
    EXPECT_NE(plain.out.find("regions     3: 8336, 8337, 8315"), std::string::npos) << plain.out;
    std::filesystem::remove(path);
}

TEST(CliInspect, AnAmbiguousLayoutExitsOneAndNamesTheFlag) {
    std::string text = "date,8336,8337\n";
    for (int d = 0; d < 40; ++d)
        text += (*siftwave::Date::fromIso("2026-01-01") + d).iso() + ",7," +
                std::to_string(d % 11) + "\n";
    const std::string path = writeDrop("siftwave_inspect_ambiguous_layout.csv", text);
    const CliRun r = run("inspect " + path);
    EXPECT_EQ(r.exitCode, 1);
    EXPECT_NE(r.err.find("--layout long"), std::string::npos) << r.err;
    EXPECT_NE(r.err.find("--layout dates-down"), std::string::npos) << r.err;
    const CliRun j = run("inspect " + path + " --json");
    EXPECT_EQ(j.exitCode, 1);
    EXPECT_EQ(nlohmann::json::parse(j.out)["error"]["code"], "ambiguous");
    EXPECT_EQ(run("inspect " + path + " --layout dates-down").exitCode, 0);
    std::filesystem::remove(path);
}

TEST(CliInspect, ReadsTheBundledSampleDrop) {
    const CliRun r =
        run("inspect " + std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["layout"], "long");
    bool hasNa = false;
    for (const auto& code : j["region_codes"])
        hasNa = hasNa || code == "NA";
    EXPECT_TRUE(hasNa);  // the sample's district whose code collides with a missing-value token
}

// Real data: r-cran-surveillance 1.20.3, dataset fluBYBW, 16 districts x 156 ISO weeks written
// as an ISO year and an ISO week column (tests/data/real/SOURCES.md).
TEST(CliInspect, AYearAndAWeekColumnAreShownAsTheDate) {
    const CliRun r = run("inspect " + std::string(SIFTWAVE_TEST_DATA_DIR) +
                         "/real/fluBYBW_weekly_year_week.csv --json");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    const auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["columns"]["date"], "year+week");
    EXPECT_EQ(j["columns"]["year"], "year");
    EXPECT_EQ(j["columns"]["week"], "week");
    EXPECT_EQ(j["columns"]["region"], "region");
    EXPECT_EQ(j["columns"]["values"], nlohmann::json({"cases"}));
    EXPECT_EQ(j["date_format"], "year+ISO week");
    EXPECT_EQ(j["cadence"], "weekly");
    EXPECT_EQ(j["week_start"], "monday");
    EXPECT_EQ(j["periods"], 156);
    EXPECT_EQ(j["first_date"], "2001-01-01");
    EXPECT_EQ(j["regions"], 16);

    // Named with the flags, Sunday-start weeks (epi week 1 of 2026 starts on Sunday 2026-01-04:
    // tests/data/reference/calendar_weeks/epi_weeks_sunday.csv), and shown in plain text.
    const std::string path =
        writeDrop("siftwave_inspect_year_week.csv", "region;J;W;n\nA;2026;1;5\nA;2026;2;6\n");
    const CliRun named = run("inspect " + path +
                             " --year-col J --week-col W --week-start sunday --value-col n --json");
    ASSERT_EQ(named.exitCode, 0) << named.err;
    const auto k = nlohmann::json::parse(named.out);
    EXPECT_EQ(k["columns"]["year"], "J");
    EXPECT_EQ(k["date_format"], "year+epi week");
    EXPECT_EQ(k["first_date"], "2026-01-04");
    const CliRun text = run("inspect " + path + " --year-col J --week-col W --value-col n");
    EXPECT_NE(text.out.find("date column J+W (year+ISO week)"), std::string::npos) << text.out;
    const CliRun both = run("inspect " + path + " --year-col J --date-col W");
    EXPECT_EQ(both.exitCode, 2);

    // A week that does not exist: file, line and column of the cell.
    const std::string bad = writeDrop("siftwave_inspect_year_week_bad.csv",
                                      "year,week,region,cases\n2025,52,A,1\n2025,53,A,2\n");
    const CliRun e = run("inspect " + bad);
    EXPECT_EQ(e.exitCode, 1);
    EXPECT_NE(e.err.find(bad + ":3:2: week 53 in the week column 'week' does not exist: 2025 has "
                               "52 ISO 8601 weeks"),
              std::string::npos)
        << e.err;
    std::filesystem::remove(path);
    std::filesystem::remove(bad);
}

/// The inspect text from its "layout" line on: all but the source block (file, bytes, sha256,
/// and the dialect or the sheet).
std::string afterSourceBlock(const std::string& text) {
    const std::size_t at = text.find("\nlayout ");
    return at == std::string::npos ? std::string() : text.substr(at + 1);
}

/// A workbook's places written as a CSV's: "data!4476:4476" as "line 4476", "data!C8" as
/// "line 8, column 3" (a sheet row is a CSV line, a table column a CSV field).
std::string placesAsLines(std::string text) {
    text = std::regex_replace(text, std::regex("data!([0-9]+):[0-9]+"), "line $1");
    std::smatch m;
    while (std::regex_search(text, m, std::regex("data!([A-Z])([0-9]+)"))) {
        const int column = m[1].str()[0] - 'A' + 1;
        text.replace(static_cast<std::size_t>(m.position(0)), static_cast<std::size_t>(m.length(0)),
                     "line " + m[2].str() + ", column " + std::to_string(column));
    }
    return text;
}

nlohmann::json withoutSourceAndPlaces(nlohmann::json j) {
    j.erase("source");
    for (auto& w : j["warnings"]) {  // places, also inside the texts, are the intended difference
        w.erase("place");
        w["message"] = placesAsLines(w["message"].get<std::string>());
    }
    return j;
}

TEST(CliInspect, TheSameDropAsCsvXlsxAndOdsPrintsTheSameApartFromTheSource) {
    // Workbooks made from the CSV files by openpyxl and odfpy (tests/data/spreadsheets/SOURCES.md):
    // a weekly drop, a drop whose codes have leading zeros, a daily drop with a region "NA".
    const std::string data = SIFTWAVE_TEST_DATA_DIR;
    const std::string sheets = data + "/spreadsheets/";
    const std::vector<std::pair<std::string, std::string>> drops{
        {data + "/real/fluBYBW_weekly_wide.csv", sheets + "flu_weekly_wide"},
        {sheets + "flu_weekly_ags.csv", sheets + "flu_weekly_ags"},
        {std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv", sheets + "quenmara_current"}};
    for (const auto& [csvPath, stem] : drops) {
        const CliRun csv = run("inspect " + csvPath);
        ASSERT_EQ(csv.exitCode, 0) << csv.err;
        ASSERT_FALSE(afterSourceBlock(csv.out).empty()) << csv.out;
        for (const char* ext : {".xlsx", ".ods"}) {
            const CliRun sheet = run("inspect " + stem + ext);
            ASSERT_EQ(sheet.exitCode, 0) << sheet.err;
            EXPECT_EQ(placesAsLines(afterSourceBlock(sheet.out)), afterSourceBlock(csv.out))
                << stem << ext;
            EXPECT_NE(sheet.out.find("sheet       data (sheet 1 of 1: data)"), std::string::npos)
                << sheet.out;
        }
        const auto j = nlohmann::json::parse(run("inspect " + stem + ".xlsx --json").out);
        const auto k = nlohmann::json::parse(run("inspect " + csvPath + " --json").out);
        EXPECT_EQ(j["source"]["format"], "xlsx");
        EXPECT_EQ(j["source"]["sheet"], "data");
        EXPECT_EQ(withoutSourceAndPlaces(j), withoutSourceAndPlaces(k)) << stem;
    }
}

TEST(CliInspect, AWorkbookNamesItsSheetsAndItsCells) {
    const std::string book = std::string(SIFTWAVE_TEST_DATA_DIR) + "/spreadsheets/layout.xlsx";
    const CliRun r = run("inspect " + book);
    ASSERT_EQ(r.exitCode, 0) << r.err;
    EXPECT_NE(r.out.find("sheet       data (sheet 2 of 3: notes, data, empty)"), std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("  - data!C8: the cell holds the error value #N/A"), std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("  - data!1:1: a title or note row above the table was skipped"),
              std::string::npos);
    const CliRun empty = run("inspect " + book + " --sheet empty");
    EXPECT_EQ(empty.exitCode, 1);
    EXPECT_NE(empty.err.find("sheet 'empty' is empty"), std::string::npos) << empty.err;
    const CliRun bad = run("inspect " + std::string(SIFTWAVE_TEST_DATA_DIR) +
                           "/spreadsheets/fictitious_day.xlsx --json");
    EXPECT_EQ(bad.exitCode, 1);
    EXPECT_EQ(nlohmann::json::parse(bad.out)["error"]["cell"], "data!A3") << bad.out;
    // A CSV-only flag on a workbook is wrong usage, said rather than ignored.
    const CliRun delimiter = run("inspect " + book + " --delimiter ';'");
    EXPECT_EQ(delimiter.exitCode, 2);
    EXPECT_NE(delimiter.err.find("--delimiter applies to a CSV file"), std::string::npos)
        << delimiter.err;
    const auto j = nlohmann::json::parse(run("inspect " + book + " --json").out);
    EXPECT_EQ(j["source"]["dated_sheets"], nlohmann::json::array({"data"}));
}

TEST(CliInspect, AWorkbookOfTwoTablesSaysWhichOtherSheetHoldsDates) {
    const std::filesystem::path file = siftwave::testing::testTempPath("two tables.xlsx");
    {
        std::ofstream out(file, std::ios::binary);
        out << siftwave::testing::makeTwoTableXlsx();
    }
    const CliRun r = run("inspect '" + file.string() + "'");
    ASSERT_EQ(r.exitCode, 0) << r.err;
    EXPECT_NE(r.out.find("sheet       north (sheet 2 of 3: notes, north, south)"),
              std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("dates also on: south (choose with --sheet)"), std::string::npos) << r.out;
    const CliRun south = run("inspect '" + file.string() + "' --sheet south");
    ASSERT_EQ(south.exitCode, 0) << south.err;
    EXPECT_NE(south.out.find("dates also on: north (choose with --sheet)"), std::string::npos)
        << south.out;
    std::filesystem::remove(file);
}

}  // namespace

// The sparse century of rows (issue 19, "bounded resources") is refused and then read narrowed
// in narrowed_read_test.cpp.
