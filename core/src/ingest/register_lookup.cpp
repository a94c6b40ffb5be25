// registerBeside: the region register in a drop's folder (see siftwave/ingest/ingest.h).
#include "siftwave/ingest/ingest.h"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <system_error>
#include <vector>

namespace siftwave::ingest {
namespace {

namespace fs = std::filesystem;

std::string lowerCase(std::string text) {
    for (char& c : text)
        c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return text;
}

/// "*regions*.csv" or "*register*.csv", letter case aside.
bool looksLikeARegister(const std::string& fileName) {
    const std::string name = lowerCase(fileName);
    if (name.size() < 4 || !name.ends_with(".csv"))
        return false;
    const std::string_view stem = std::string_view(name).substr(0, name.size() - 4);
    return stem.find("regions") != std::string_view::npos ||
           stem.find("register") != std::string_view::npos;
}

/// The visible files of `folder` that look like a register, by name.
std::vector<std::string> registerLikeFiles(const fs::path& folder) {
    std::vector<std::string> out;
    std::error_code ec;
    for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
        const std::string name = it->path().filename().string();
        std::error_code fileEc;
        if (!name.starts_with('.') && it->is_regular_file(fileEc) && looksLikeARegister(name))
            out.push_back(name);
    }
    std::sort(out.begin(), out.end());
    return out;
}

}  // namespace

std::string registerBeside(const std::string& dropPath) {
    std::error_code ec;
    const fs::path drop = fs::absolute(fs::path(dropPath), ec);
    if (ec)
        return {};
    const fs::path folder = drop.parent_path();
    auto usable = [&](const fs::path& path) {
        std::error_code e;
        return fs::is_regular_file(path, e) && !fs::equivalent(path, drop, e);
    };
    // "<scenario>_current.csv" -> "<scenario>_regions.csv", then "regions.csv".
    const std::string base = drop.stem().string();
    if (const std::size_t underscore = base.rfind('_');
        underscore != std::string::npos && underscore > 0) {
        const fs::path sibling = folder / (base.substr(0, underscore) + "_regions.csv");
        if (usable(sibling))
            return sibling.string();
    }
    if (const fs::path regions = folder / "regions.csv"; usable(regions))
        return regions.string();
    const std::vector<std::string> candidates = registerLikeFiles(folder);
    if (candidates.size() == 1 && usable(folder / candidates.front()))
        return (folder / candidates.front()).string();
    return {};
}

}  // namespace siftwave::ingest
