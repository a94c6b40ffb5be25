#pragma once
// Running the built siftwave-cli from an end-to-end test: its exit code, stdout and stderr.
#include "support/temp_path.h"

#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>

namespace siftwave::testing {

struct CliResult {
    int exitCode = -1;
    std::string out;
    std::string err;
};

inline std::string slurpFile(const std::filesystem::path& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

/// Runs `siftwave-cli ARGS` (a shell command line; quote paths with spaces yourself).
inline CliResult runCli(const std::string& args) {
    const std::filesystem::path errPath = testTempPath("siftwave_cli_run.err");
    const std::string cmd = std::string(SIFTWAVE_CLI_PATH) + " " + args + " 2>" + errPath.string();
    CliResult r;
    FILE* p = popen(cmd.c_str(), "r");
    if (!p)
        return r;
    std::array<char, 4096> buf{};
    std::size_t n;
    while ((n = fread(buf.data(), 1, buf.size(), p)) > 0)
        r.out.append(buf.data(), n);
    const int status = pclose(p);
    r.exitCode = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    r.err = slurpFile(errPath);
    std::filesystem::remove(errPath);
    return r;
}

/// Writes `text` to a file of the test's scratch folder; returns its path.
inline std::string writeTempFile(const std::string& name, const std::string& text) {
    const std::filesystem::path path = testTempPath(name);
    std::ofstream out(path, std::ios::binary);
    out << text;
    return path.string();
}

}  // namespace siftwave::testing
