// End-to-end: siftwave-cli figure and report on the invented sample drop. With Qt
// they write the files; without Qt (SIFTWAVE_WITH_QT=OFF) they refuse with exit 2.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/replay.h"

#include "support/cli_run.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>
#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>

namespace {

namespace fs = std::filesystem;

using siftwave::testing::CliRun;  // out: stdout and stderr together (run() adds 2>&1)
using siftwave::testing::runShell;

CliRun run(const std::string& args) {
    return runShell(std::string(SIFTWAVE_CLI_PATH) + " " + args + " 2>&1");
}

const std::string kDrop = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
const std::string kPrevious = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_previous.csv";
const std::string kRegister = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_regions.csv";

class CliFigure : public ::testing::Test {
protected:
    void SetUp() override {
        m_dir = fs::temp_directory_path() /
                ("siftwave-figure-test-" + std::to_string(::getpid()) + "-" +
                 ::testing::UnitTest::GetInstance()->current_test_info()->name());
        fs::create_directories(m_dir);
    }
    void TearDown() override { fs::remove_all(m_dir); }

    // A ledger with the sample's planted backlog redistributed (samples/manifest.json, P06).
    std::string writeLedger() {
        const siftwave::Drop drop = siftwave::ingest::readDrop(kDrop).value();
        siftwave::ledger::Decision d;
        d.kind = siftwave::ledger::DecisionKind::Redistribute;
        d.region = "1301";
        d.measure = "cases";
        d.date = siftwave::Date::fromIso("2026-08-24");
        d.window = siftwave::ledger::DayRange{*siftwave::Date::fromIso("2026-08-03"),
                                              *siftwave::Date::fromIso("2026-08-23")};
        d.excess = 2444;
        const siftwave::ledger::Ledger empty;
        const siftwave::ledger::Cleaned cleaned(drop);
        auto entry = siftwave::ledger::draftEntry(
            drop, empty, cleaned, d,
            {"tester", "2026-12-01T09:00:00Z", "three weeks held back, sent on 24 August"});
        EXPECT_TRUE(entry.ok());
        const std::string path = (m_dir / "ledger.jsonl").string();
        EXPECT_TRUE(siftwave::ledger::appendLedgerEntry(path, *entry).ok());
        m_headHash = entry->hash;
        return path;
    }

    std::string path(const char* name) const { return (m_dir / name).string(); }

    fs::path m_dir;
    std::string m_headHash;
};

#if SIFTWAVE_TEST_WITH_QT

TEST_F(CliFigure, WritesAPngOfTheRequestedSizeAndDpi) {
    const std::string ledger = writeLedger();
    const std::string out = path("fig.png");
    const CliRun r =
        run("figure " + kDrop + " --ledger " + ledger + " --regions " + kRegister +
            " --region 1301 --fit gumbel --out " + out + " --size 1600x900px --dpi 160 --json");
    ASSERT_EQ(r.exitCode, 0) << r.out;
    // PNG: IHDR width and height, big-endian, at bytes 16..23 (W3C PNG specification).
    std::ifstream file(out, std::ios::binary);
    const std::string bytes((std::istreambuf_iterator<char>(file)), {});
    ASSERT_GT(bytes.size(), 24u);
    auto u32 = [&](std::size_t at) {
        return (static_cast<unsigned>(static_cast<unsigned char>(bytes[at])) << 24) |
               (static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 1])) << 16) |
               (static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 2])) << 8) |
               static_cast<unsigned>(static_cast<unsigned char>(bytes[at + 3]));
    };
    EXPECT_EQ(bytes.substr(12, 4), "IHDR");
    EXPECT_EQ(u32(16), 1600u);
    EXPECT_EQ(u32(20), 900u);
    const std::size_t phys = bytes.find("pHYs");
    ASSERT_NE(phys, std::string::npos);
    EXPECT_EQ(u32(phys + 4), 6299u);  // 160 / 0.0254 = 6299.2 pixels per metre
}

// Reliability issue, item 7: =1+2 and +1=2 both make the file name part _1_2; each figure keeps
// its own file and "wrote" names each once.
TEST_F(CliFigure, EachRegionGetsItsOwnFileWhenCodesMapToOneName) {
    const std::string drop = path("collide.csv");
    {
        std::ofstream f(drop, std::ios::binary);
        f << "date,region,cases\n";
        for (int d = 0; d < 20; ++d)
            for (const char* code : {"\"=1+2\"", "\"+1=2\""})
                f << (*siftwave::Date::fromIso("2026-03-01") + d).iso() << "," << code << ","
                  << 3 + d % 4 << "\n";
    }
    const CliRun r =
        run("figure " + drop + " --region =1+2 --region +1=2 --each --out " + path("fig.svg"));
    ASSERT_EQ(r.exitCode, 0) << r.out;
    EXPECT_TRUE(fs::exists(path("fig-_1_2.svg"))) << r.out;
    EXPECT_TRUE(fs::exists(path("fig-_1_2-2.svg"))) << r.out;
    EXPECT_EQ(r.out.find("wrote " + path("fig-_1_2.svg")),
              r.out.rfind("wrote " + path("fig-_1_2.svg")))
        << r.out;
}

TEST_F(CliFigure, WritesPdfAndSvgWithTheCaptionAsText) {
    const std::string ledger = writeLedger();
    const siftwave::Drop drop = siftwave::ingest::readDrop(kDrop).value();
    for (const char* name : {"fig.pdf", "fig.svg"}) {
        const std::string out = path(name);
        const CliRun r = run("figure " + kDrop + " --ledger " + ledger +
                             " --region 1301 --region 1304 --size slide --out " + out);
        ASSERT_EQ(r.exitCode, 0) << r.out;
        ASSERT_TRUE(fs::exists(out));
        std::string text;
        if (std::string(name).ends_with(".pdf")) {
            const CliRun pdftotext = runShell("pdftotext " + out + " - 2>&1");  // poppler-utils
            ASSERT_EQ(pdftotext.exitCode, 0) << pdftotext.out;
            text = pdftotext.out;
        } else {
            std::ifstream f(out);
            text.assign(std::istreambuf_iterator<char>(f), {});
        }
        EXPECT_NE(text.find(drop.source.sha256.substr(0, 12)), std::string::npos) << name;
        EXPECT_NE(text.find(m_headHash.substr(0, 12)), std::string::npos) << name;
        EXPECT_NE(text.find("not a forecast"), std::string::npos) << name;
    }
}

TEST_F(CliFigure, ReportWritesHtmlAndPdfListingTheLedger) {
    const std::string ledger = writeLedger();
    for (const char* name : {"brief.html", "brief.pdf"}) {
        const std::string out = path(name);
        const CliRun r = run("report " + kDrop + " --ledger " + ledger + " --regions " + kRegister +
                             " --previous " + kPrevious + " --out " + out + " --json");
        ASSERT_EQ(r.exitCode, 0) << r.out;
        const auto j = nlohmann::json::parse(r.out.substr(r.out.find('{')));
        EXPECT_EQ(j["ledger_entries"], 1);
        EXPECT_EQ(j["regions"], nlohmann::json::array({"1301"}));
        EXPECT_TRUE(j["chain_verified"].get<bool>());
        ASSERT_TRUE(fs::exists(out));
    }
}

TEST_F(CliFigure, BadInputAndWrongUsageGiveTheirExitCodes) {
    EXPECT_EQ(run("figure " + kDrop + " --region NOPE --out " + path("x.png")).exitCode, 1);
    EXPECT_EQ(run("figure " + kDrop + " --region 1301").exitCode, 2);
    EXPECT_EQ(run("figure " + kDrop + " --region 1301 --out " + path("x.gif")).exitCode, 2);
    EXPECT_EQ(run("figure " + kDrop + " --region 1301 --size 12 --out " + path("x.png")).exitCode,
              2);
    EXPECT_EQ(run("report " + kDrop + " --out " + path("x.pdf")).exitCode, 2);  // no --ledger
    EXPECT_FALSE(fs::exists(path("x.png")));
}

// Only figure and report load Qt: they run siftwave-cli-render (app/cli/CMakeLists.txt), and
// siftwave-cli itself is linked against no Qt library.
TEST_F(CliFigure, TheCliLinksNoQtLibraryAndFindsItsRendererBesideIt) {
    const CliRun libraries = runShell("ldd " + std::string(SIFTWAVE_CLI_PATH) + " 2>&1");
    ASSERT_EQ(libraries.exitCode, 0) << libraries.out;
    EXPECT_EQ(libraries.out.find("libQt"), std::string::npos) << libraries.out;
    const fs::path renderer = fs::path(SIFTWAVE_CLI_PATH).parent_path() / "siftwave-cli-render";
    ASSERT_TRUE(fs::exists(renderer));
    EXPECT_NE(runShell("ldd " + renderer.string() + " 2>&1").out.find("libQt6Widgets"),
              std::string::npos);
}

TEST_F(CliFigure, AMissingRendererIsNamedNotACrash) {
    const fs::path alone = path("alone");
    fs::create_directories(alone);
    fs::copy_file(SIFTWAVE_CLI_PATH, alone / "siftwave-cli", fs::copy_options::overwrite_existing);
    for (const char* command : {"figure", "report"}) {
        const CliRun r = runShell((alone / "siftwave-cli").string() + " " + command + " " + kDrop +
                                  " --region 1301 --out " + path("x.png") + " 2>&1");
        EXPECT_EQ(r.exitCode, 2) << r.out;
        EXPECT_NE(r.out.find("siftwave-cli-render, which was not found"), std::string::npos)
            << r.out;
    }
    EXPECT_FALSE(fs::exists(path("x.png")));
    EXPECT_EQ(runShell((alone / "siftwave-cli").string() + " inspect " + kDrop).exitCode, 0);
}

#else

TEST_F(CliFigure, WithoutQtFigureAndReportSaySoAndExitWithUsage) {
    for (const char* command : {"figure", "report"}) {
        const CliRun r =
            run(std::string(command) + " " + kDrop + " --region 1301 --out " + path("x.png"));
        EXPECT_EQ(r.exitCode, 2) << command;
        EXPECT_NE(r.out.find("built without Qt"), std::string::npos) << r.out;
    }
    EXPECT_FALSE(fs::exists(path("x.png")));
    EXPECT_EQ(run("inspect " + kDrop).exitCode, 0);  // the core-only commands still work
}

#endif

}  // namespace
