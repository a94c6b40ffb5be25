#pragma once
// Reading a release history from the command line (scan --releases, nowcast --releases).

#include "args.h"

#include "siftwave/release_history.h"
#include "siftwave/result.h"

#include <string>
#include <vector>

namespace siftwave::cli {

/// The files a release history reads: each FILE, or each .csv file in a folder (hidden files and
/// region registers left out), a folder's files sorted by name.
std::vector<std::string> releaseFiles(const std::vector<std::string>& paths);

/// Reads every release with the same ingest flags into a history in order of the releases' as-of
/// dates (release_history.h). The first file that cannot be read is the error; NotFound when no
/// file was found.
Result<ReleaseHistory> loadReleaseHistory(const std::vector<std::string>& paths,
                                          const ParsedArgs& args);

}  // namespace siftwave::cli
