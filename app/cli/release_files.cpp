// Reading a release history from the command line (release_files.h).
#include "release_files.h"

#include "common.h"

#include <algorithm>
#include <filesystem>
#include <memory>

namespace siftwave::cli {

std::vector<std::string> releaseFiles(const std::vector<std::string>& paths) {
    std::vector<std::string> files;
    for (const std::string& p : paths) {
        std::error_code ec;
        if (!std::filesystem::is_directory(p, ec)) {
            files.push_back(p);
            continue;
        }
        std::vector<std::string> inFolder;
        for (const auto& entry : std::filesystem::directory_iterator(p, ec)) {
            const std::string name = entry.path().filename().string();
            if (entry.path().extension() == ".csv" && !name.starts_with(".") &&
                name.find("regions") == std::string::npos)
                inFolder.push_back(entry.path().string());
        }
        std::sort(inFolder.begin(), inFolder.end());
        files.insert(files.end(), inFolder.begin(), inFolder.end());
    }
    return files;
}

Result<ReleaseHistory> loadReleaseHistory(const std::vector<std::string>& paths,
                                          const ParsedArgs& args) {
    std::vector<std::shared_ptr<const Drop>> releases;
    for (const std::string& file : releaseFiles(paths)) {
        Result<Drop> drop = loadDrop(file, args);
        if (!drop)
            return drop.error();
        releases.push_back(std::make_shared<const Drop>(std::move(*drop)));
    }
    if (releases.empty())
        return makeError(ErrorCode::NotFound, "no release file was found");
    return ReleaseHistory::of(std::move(releases), ReleaseHistory::Order::ByAsOf);
}

}  // namespace siftwave::cli
