// Source places: wherever a finding, a warning, a plot or a report names where a value came from,
// a CSV drop names its file lines and a workbook drop names its sheet's cells or rows
// (sourcePlace(), ECMA-376 Part 1 §18.3.1.4 cell references). The workbook is the sample CSV
// written by openpyxl into sheet "data" from row 1 (tools/fixtures/make_spreadsheet_fixtures.py),
// so the sheet's row N is the CSV's line N: every place can be checked against the CSV's line.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/caption.h"
#include "siftwave/report/plot_model.h"
#include "siftwave/scan/scan.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <string>

using namespace siftwave;

namespace {

const std::string kCsv = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
const std::string kXlsx =
    std::string(SIFTWAVE_TEST_DATA_DIR) + "/spreadsheets/quenmara_current.xlsx";
const std::string kOds = std::string(SIFTWAVE_TEST_DATA_DIR) + "/spreadsheets/quenmara_current.ods";

Drop readOk(const std::string& path) {
    Result<Drop> drop = ingest::readDrop(path);
    EXPECT_TRUE(drop) << (drop ? std::string() : drop.error().describe());
    return drop ? std::move(*drop) : Drop{};
}

scan::ScanReport scanOk(const Drop& drop) {
    Result<scan::ScanReport> report = scan::scanDrop(drop);
    EXPECT_TRUE(report);
    return report ? std::move(*report) : scan::ScanReport{};
}

// The CSV's evidence as a workbook of the same rows must write it, spelled out key by key
// (independently of the scan's own renaming): a line N becomes the row reference "data!N:N".
nlohmann::json csvEvidenceAsSheetRows(const nlohmann::json& value) {
    if (value.is_array()) {
        nlohmann::json out = nlohmann::json::array();
        for (const nlohmann::json& item : value)
            out.push_back(csvEvidenceAsSheetRows(item));
        return out;
    }
    if (!value.is_object())
        return value;
    auto row = [](const nlohmann::json& line) {
        const std::string n = std::to_string(line.get<std::uint64_t>());
        return "data!" + n + ":" + n;
    };
    nlohmann::json out = nlohmann::json::object();
    for (auto it = value.begin(); it != value.end(); ++it) {
        if (it.key() == "line")
            out["place"] = row(it.value());
        else if (it.key() == "first_line")
            out["first_place"] = row(it.value());
        else if (it.key() == "line_after")
            out["place_after"] = row(it.value());
        else
            out[it.key()] = csvEvidenceAsSheetRows(it.value());
    }
    return out;
}

TEST(SourcePlaces, AWorkbookDropsFindingsNameSheetRowsWhereTheCsvsNameLines) {
    const scan::ScanReport csv = scanOk(readOk(kCsv));
    for (const std::string& book : {kXlsx, kOds}) {
        const scan::ScanReport sheet = scanOk(readOk(book));
        ASSERT_EQ(sheet.findings.size(), csv.findings.size()) << book;
        int placed = 0;
        for (std::size_t i = 0; i < csv.findings.size(); ++i) {
            const nlohmann::json& a = csv.findings[i].evidence.json();
            const nlohmann::json& b = sheet.findings[i].evidence.json();
            EXPECT_EQ(sheet.findings[i].id, csv.findings[i].id) << book;
            EXPECT_EQ(b, csvEvidenceAsSheetRows(a)) << book << " " << csv.findings[i].id;
            placed += b.dump().find("\"data!") != std::string::npos;
            EXPECT_EQ(b.dump().find("line\""), std::string::npos) << b.dump();
        }
        // The sample plants backlogs, a gap, stale values, missing dates, a negative count and
        // a duplicate row (samples/manifest.json): each names its rows.
        EXPECT_GE(placed, 8) << book;
    }
}

TEST(SourcePlaces, ACsvDropsFindingsKeepTheirFileLines) {
    const scan::ScanReport csv = scanOk(readOk(kCsv));
    bool sawDuplicate = false;
    for (const scan::Finding& f : csv.findings) {
        EXPECT_EQ(f.evidence.dump().find("place"), std::string::npos) << f.evidence.dump();
        if (f.kind != scan::FindingKind::DuplicateRow)
            continue;
        // The planted duplicate (samples/manifest.json): the row at line 1546 repeated at 4476.
        sawDuplicate = true;
        EXPECT_EQ(f.evidence.json()["rows"][0]["line"], 1546);
        EXPECT_EQ(f.evidence.json()["rows"][1]["line"], 4476);
    }
    EXPECT_TRUE(sawDuplicate);
}

TEST(SourcePlaces, ReaderMessagesNameTheSheetsRowWhereTheCsvNamesTheLine) {
    const Drop csv = readOk(kCsv);
    const Drop book = readOk(kXlsx);
    auto duplicateWarning = [](const Drop& drop) {
        for (const Warning& w : drop.warnings)
            if (w.message.find("first seen on") != std::string::npos)
                return w.message;
        return std::string();
    };
    EXPECT_NE(duplicateWarning(csv).find("first seen on line 1546)"), std::string::npos)
        << duplicateWarning(csv);
    EXPECT_NE(duplicateWarning(book).find("first seen on data!1546:1546)"), std::string::npos)
        << duplicateWarning(book);
}

TEST(SourcePlaces, APlotAndAFigureCaptionNameTheSheet) {
    const Drop book = readOk(kXlsx);
    const Drop csv = readOk(kCsv);
    for (const Drop* drop : {&book, &csv}) {
        const ledger::Cleaned cleaned(*drop);
        report::PlotRequest request;
        request.region = "1301";
        const report::PlotModel m =
            report::buildPlotModel(*drop, ledger::Ledger{}, cleaned, request).value();
        ASSERT_GT(m.sourceLine.size(), 0u);
        const std::uint32_t line = m.sourceLine[0];
        ASSERT_GT(line, 1u);
        const std::string n = std::to_string(line);
        EXPECT_EQ(sourcePlace(m.sourcePlaces, line),
                  drop == &book ? "data!" + n + ":" + n : "line " + n);
        const std::string source =
            report::captionLines(
                report::captionFacts(*drop, ledger::Ledger{}, nullptr, "2026-12-05"))
                .front();
        EXPECT_EQ(source.find("quenmara_current.xlsx, sheet data, 2026-02-23") != std::string::npos,
                  drop == &book)
            << source;
    }
}

}  // namespace
