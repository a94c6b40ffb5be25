#pragma once
// The project file: which drop, which previous drop, which register and which
// ledger belong together, and how the workbench showed them. JSON, written
// atomically (temporary file in the same folder, flush, fsync, rename).
//
//   {"format": "siftwave-project", "version": 1,
//    "drop": {"path", "sha256", "sheet"}, "previous_drop": {"path", "sha256"},
//    "register": {"path"}, "ledger": {"path", "entries", "head_hash"},
//    "view": {...}, "fit": {...},
//    "release_history": [{"path", "sha256"}, ...]}   (only when the drop has one)
//
// The release history is the earlier releases of the drop's series that give its nowcast
// (nowcast/triangle.h); each is pinned by its SHA-256 like the drop.
//
// Paths are stored as given (relative paths are relative to the project
// file's folder; resolveProjectPath() does that). The ledger's entry count and
// head hash pin its end: a ledger shortened behind the project's back is
// noticed by checkLedgerHead().

#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ledger {

struct ProjectViewSettings {
    std::string region;                // selected region code ("" = none)
    std::string measure;               // shown measure ("" = the first)
    std::string secondMeasure;         // "" = none
    std::optional<Date> visibleFirst;  // unset = the whole calendar
    std::optional<Date> visibleLast;
};

struct ProjectFitSettings {
    std::string model = "gumbel";     // gumbel | logistic | richards | lognormal | best
    std::string method = "lsq";       // lsq | poisson | negbin
    std::optional<Date> windowFirst;  // unset = automatic window
    std::optional<Date> windowLast;
    int smoothingDays = 7;  // centred moving-average width
};

/// One earlier release of a release history.
struct ProjectRelease {
    std::string path;
    std::string sha256;
    friend bool operator==(const ProjectRelease&, const ProjectRelease&) = default;
};

struct ProjectFile {
    std::string dropPath;
    std::string dropSha256;
    /// A workbook drop: the sheet read (one file, several tables: the project reopens this one);
    /// "" for a CSV drop. Written only when set.
    std::string dropSheet;
    std::string previousDropPath;  // "" = none
    std::string previousDropSha256;
    std::string registerPath;  // "" = none
    std::string ledgerPath;
    std::uint64_t ledgerEntries = 0;  // entries the ledger had when saved
    std::string ledgerHeadHash;       // hash of its last entry (64 zeros when empty)
    ProjectViewSettings view;
    ProjectFitSettings fit;
    std::vector<ProjectRelease> releaseHistory;  // earlier releases (empty: none)
    std::map<std::string, std::string> extra;    // further settings, kept verbatim

    /// Usage errors: empty drop or ledger path, a hash that is not 64 hex digits.
    Status validate() const;
};

Status writeProjectFile(const std::string& path, const ProjectFile& project);
Result<ProjectFile> readProjectFile(const std::string& path);
/// Parses project file bytes; `path` names the file in messages.
Result<ProjectFile> parseProjectFile(std::string_view bytes, const std::string& path);

/// `relative` resolved against the folder of `projectPath` (absolute paths unchanged).
std::string resolveProjectPath(const std::string& projectPath, const std::string& relative);

/// Integrity error when `ledger` is shorter than the project recorded, or its
/// entry at that position has another hash (entries appended since are fine).
Status checkLedgerHead(const ProjectFile& project, const Ledger& ledger);

}  // namespace siftwave::ledger
