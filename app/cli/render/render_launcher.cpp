// With Qt, `figure` and `report` run in siftwave-cli-render, a program of their own that links the
// widgets (see app/cli/CMakeLists.txt): siftwave-cli replaces itself with it (execv), so the
// arguments, the standard streams and the exit code are the command's own, and no other command
// loads a Qt library.
#include "../args.h"
#include "../commands.h"

#include <unistd.h>

#include <cerrno>
#include <climits>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <string>
#include <vector>

#ifndef SIFTWAVE_CLI_RENDER_NAME
#error "SIFTWAVE_CLI_RENDER_NAME names the renderer's executable (app/cli/CMakeLists.txt)"
#endif
#ifndef SIFTWAVE_CLI_RENDER_INSTALL_DIR
#error "SIFTWAVE_CLI_RENDER_INSTALL_DIR is its installed folder relative to siftwave-cli's"
#endif

namespace siftwave::cli {
namespace {

namespace fs = std::filesystem;

/// The folder of the running siftwave-cli (empty when the system does not say).
fs::path executableFolder() {
    std::error_code ec;
    const fs::path self = fs::read_symlink("/proc/self/exe", ec);
    return ec ? fs::path() : self.parent_path();
}

/// Where the renderer may be: beside siftwave-cli (the build tree), then where install() puts it.
std::vector<fs::path> rendererCandidates() {
    const fs::path folder = executableFolder();
    if (folder.empty())
        return {};
    return {
        folder / SIFTWAVE_CLI_RENDER_NAME,
        (folder / SIFTWAVE_CLI_RENDER_INSTALL_DIR / SIFTWAVE_CLI_RENDER_NAME).lexically_normal()};
}

int runRenderer(const char* name, char** argv) {
    const std::vector<fs::path> candidates = rendererCandidates();
    for (const fs::path& path : candidates) {
        if (::access(path.c_str(), X_OK) == 0) {
            ::execv(path.c_str(), argv);  // returns only on failure
            std::fprintf(stderr, "siftwave-cli %s: cannot start %s: %s\n", name, path.c_str(),
                         std::strerror(errno));
            return kExitBadInput;
        }
    }
    std::string looked;
    for (const fs::path& path : candidates)
        looked += (looked.empty() ? "" : " or ") + path.string();
    std::fprintf(stderr,
                 "siftwave-cli %s: figures and reports are drawn by %s, which was not found "
                 "(looked for %s). Build it with siftwave-cli (-DSIFTWAVE_WITH_QT=ON builds the "
                 "target %s) and install both.\n",
                 name, SIFTWAVE_CLI_RENDER_NAME, looked.empty() ? "nothing" : looked.c_str(),
                 SIFTWAVE_CLI_RENDER_NAME);
    return kExitUsage;
}

}  // namespace

int runFigure(int, char** argv, int) {
    return runRenderer("figure", argv);
}

int runReport(int, char** argv, int) {
    return runRenderer("report", argv);
}

}  // namespace siftwave::cli
