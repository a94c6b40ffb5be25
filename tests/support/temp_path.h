#pragma once
// Scratch files for tests. CTest runs the test cases of one executable as separate
// processes in parallel (gtest_discover_tests + ctest -j), so a fixed name in the
// shared temporary folder would be written by two cases at once. Each test process
// gets its own folder instead.

#include <unistd.h>

#include <filesystem>
#include <string>
#include <string_view>

namespace siftwave::testing {

inline std::filesystem::path testTempPath(std::string_view name) {
    static const std::filesystem::path dir = [] {
        std::filesystem::path d = std::filesystem::temp_directory_path() /
                                  ("siftwave-test-" + std::to_string(::getpid()));
        std::filesystem::create_directories(d);
        return d;
    }();
    return dir / std::string(name);
}

}  // namespace siftwave::testing
