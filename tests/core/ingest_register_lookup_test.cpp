// registerBeside: the region register that goes with a drop, found in the drop's folder.
#include "siftwave/ingest/ingest.h"

#include "support/temp_path.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <initializer_list>
#include <string>

namespace siftwave::ingest {
namespace {

namespace fs = std::filesystem;

/// A fresh folder holding empty files of the given names.
fs::path folderWith(const std::string& name, std::initializer_list<const char*> files) {
    const fs::path dir = siftwave::testing::testTempPath(name);
    fs::remove_all(dir);
    fs::create_directories(dir);
    for (const char* f : files)
        std::ofstream(dir / f) << "code,name,parent,population\n";
    return dir;
}

TEST(IngestRegisterLookup, TakesTheScenariosOwnRegisterBeforeAnyOther) {
    const fs::path dir = folderWith(
        "lookup-scenario", {"quenmara_current.csv", "quenmara_regions.csv", "regions.csv"});
    EXPECT_EQ(registerBeside((dir / "quenmara_current.csv").string()),
              (dir / "quenmara_regions.csv").string());
}

TEST(IngestRegisterLookup, FallsBackToRegionsCsv) {
    const fs::path dir = folderWith("lookup-plain", {"cases.csv", "regions.csv", "x_register.csv"});
    EXPECT_EQ(registerBeside((dir / "cases.csv").string()), (dir / "regions.csv").string());
}

TEST(IngestRegisterLookup, TakesTheOneFileNamedLikeARegisterWhateverItsCase) {
    const fs::path dir = folderWith("lookup-one", {"cases.csv", "District_Register.CSV"});
    EXPECT_EQ(registerBeside((dir / "cases.csv").string()),
              (dir / "District_Register.CSV").string());
}

TEST(IngestRegisterLookup, FindsNoneWhenSeveralFilesCouldBeTheRegister) {
    const fs::path dir =
        folderWith("lookup-two", {"cases.csv", "old_regions_2025.csv", "register_2026.csv"});
    EXPECT_EQ(registerBeside((dir / "cases.csv").string()), "");
}

TEST(IngestRegisterLookup, NeverTakesTheDropItselfNorAHiddenFile) {
    const fs::path dir = folderWith("lookup-self", {"regions_weekly.csv", ".regions.csv"});
    EXPECT_EQ(registerBeside((dir / "regions_weekly.csv").string()), "");
    const fs::path same = folderWith("lookup-self-regions", {"regions.csv"});
    EXPECT_EQ(registerBeside((same / "regions.csv").string()), "");
}

TEST(IngestRegisterLookup, FindsNoneInAFolderWithoutARegister) {
    const fs::path dir = folderWith("lookup-none", {"a_current.csv", "a_previous.csv"});
    EXPECT_EQ(registerBeside((dir / "a_current.csv").string()), "");
}

TEST(IngestRegisterLookup, FindsTheSamplesRegisterForTheSampleDrop) {
    const fs::path samples = SIFTWAVE_SAMPLES_DIR;
    EXPECT_EQ(fs::path(registerBeside((samples / "quenmara_current.csv").string())).filename(),
              "quenmara_regions.csv");
}

}  // namespace
}  // namespace siftwave::ingest
