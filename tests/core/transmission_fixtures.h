#pragma once
// Reading the committed EpiEstim fixtures (tests/data/real, made by
// tools/fixtures/make_real_fixtures.R; see tests/data/real/SOURCES.md): plain comma-separated
// tables with a header line and no quoting.

#include <gtest/gtest.h>

#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace siftwave::testing {

/// The table's columns by header name; the first column of the file may hold dates, which are
/// kept as text in `text`.
struct FixtureTable {
    std::map<std::string, std::vector<double>> numbers;
    std::map<std::string, std::vector<std::string>> text;
    std::size_t rows = 0;
};

inline FixtureTable readFixture(const std::string& name) {
    FixtureTable table;
    std::ifstream in(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/" + name);
    EXPECT_TRUE(in) << name;
    std::string line;
    std::getline(in, line);
    std::vector<std::string> header;
    std::stringstream hs(line);
    for (std::string field; std::getline(hs, field, ',');)
        header.push_back(field);
    while (std::getline(in, line)) {
        if (line.empty())
            continue;
        std::stringstream ls(line);
        std::size_t col = 0;
        for (std::string field; std::getline(ls, field, ','); ++col) {
            table.text[header.at(col)].push_back(field);
            table.numbers[header.at(col)].push_back(std::strtod(field.c_str(), nullptr));
        }
        ++table.rows;
    }
    return table;
}

}  // namespace siftwave::testing
