#pragma once
// Running a shell command (the built siftwave-cli) from an end-to-end test: its exit code and
// what it printed on stdout (redirect stderr in the command to keep it).

#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <string>

namespace siftwave::testing {

struct CliRun {
    int exitCode = -1;
    std::string out;
};

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

}  // namespace siftwave::testing
