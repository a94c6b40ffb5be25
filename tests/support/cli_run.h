#pragma once
// Running a shell command, or the built siftwave-cli, from an end-to-end test: its exit code,
// stdout and (runCli) stderr.
#include "support/temp_path.h"

#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>

namespace siftwave::testing {

struct CliRun {
    int exitCode = -1;
    std::string out;
};

/// Runs a shell command line: its exit code and what it printed on stdout (redirect stderr in
/// the command to keep it).
inline CliRun runShell(const std::string& cmd) {
    CliRun r;
    FILE* p = popen(cmd.c_str(), "r");
    if (!p)
        return r;
    std::array<char, 4096> buf{};
    std::size_t n;
    while ((n = fread(buf.data(), 1, buf.size(), p)) > 0)
        r.out.append(buf.data(), n);
    const int status = pclose(p);
    r.exitCode = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    return r;
}

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
    const CliRun run =
        runShell(std::string(SIFTWAVE_CLI_PATH) + " " + args + " 2>" + errPath.string());
    CliResult r{run.exitCode, run.out, slurpFile(errPath)};
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
