#pragma once
// Reader for the NIST StRD nonlinear regression files (tests/data/reference/nist-strd/*.dat).
//
// Format (NIST Statistical Reference Datasets, nonlinear regression,
// https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml): a header that gives the line
// ranges "Certified Values (lines A to B)" and "Data (lines C to D)" and the difficulty
// ("Lower|Average|Higher Level of Difficulty"); in the certified block one line per parameter
// "bK = start1 start2 value standard-deviation", then "Residual Sum of Squares:",
// "Residual Standard Deviation:", "Degrees of Freedom:", "Number of Observations:"; in the data
// block one row per observation "y x1 [x2]". Lines end in CR LF (kept byte for byte).

#include "siftwave/fit/double_double.h"

#include <cstdlib>
#include <fstream>
#include <optional>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

namespace siftwave::test {

struct NistDataset {
    std::string name;
    std::string difficulty;  // "Lower", "Average" or "Higher"
    std::vector<double> start1, start2, certified, certifiedSd;
    double residualSumOfSquares = 0;
    double residualSd = 0;
    int degreesOfFreedom = 0;
    int observations = 0;
    std::vector<double> y;
    std::vector<std::vector<double>> x;  // x[k][i]: predictor k of observation i
    // The same data to double-double precision (the decimal text, not its rounding to double).
    std::vector<fit::DoubleDouble> yExact;
    std::vector<std::vector<fit::DoubleDouble>> xExact;
};

/// Parses one file; nullopt with `error` set when the file does not follow the format.
inline std::optional<NistDataset> readNistDataset(const std::string& path, std::string& error) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        error = "cannot open " + path;
        return std::nullopt;
    }
    std::vector<std::string> lines;
    for (std::string line; std::getline(in, line);) {
        if (!line.empty() && line.back() == '\r')
            line.pop_back();
        lines.push_back(line);
    }
    NistDataset d;
    const auto slash = path.find_last_of('/');
    d.name = path.substr(slash == std::string::npos ? 0 : slash + 1);
    d.name = d.name.substr(0, d.name.find('.'));

    const std::regex certRange(R"(Certified Values\s*\(lines\s+(\d+)\s+to\s+(\d+)\))");
    const std::regex dataRange(R"(Data\s*\(lines\s+(\d+)\s+to\s+(\d+)\))");
    const std::regex difficulty(R"((Lower|Average|Higher) Level of Difficulty)");
    const std::regex parameter(R"(^\s*b(\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$)");
    int certFirst = 0, certLast = 0, dataFirst = 0, dataLast = 0;
    for (const auto& line : lines) {
        std::smatch m;
        if (certFirst == 0 && std::regex_search(line, m, certRange)) {
            certFirst = std::stoi(m[1]);
            certLast = std::stoi(m[2]);
        } else if (dataFirst == 0 && std::regex_search(line, m, dataRange)) {
            dataFirst = std::stoi(m[1]);
            dataLast = std::stoi(m[2]);
        } else if (d.difficulty.empty() && std::regex_search(line, m, difficulty)) {
            d.difficulty = m[1];
        }
    }
    if (certFirst == 0 || dataFirst == 0 || d.difficulty.empty() ||
        dataLast > static_cast<int>(lines.size()) || certLast > static_cast<int>(lines.size())) {
        error = path + ": header without the certified/data line ranges or the difficulty";
        return std::nullopt;
    }
    auto labelled = [&](const std::string& label) -> std::optional<double> {
        for (int i = certFirst - 1; i < certLast; ++i) {
            const auto pos = lines[static_cast<std::size_t>(i)].find(label);
            if (pos != std::string::npos) {
                return std::strtod(lines[static_cast<std::size_t>(i)].c_str() + pos + label.size(),
                                   nullptr);
            }
        }
        return std::nullopt;
    };
    for (int i = certFirst - 1; i < certLast; ++i) {
        std::smatch m;
        const std::string& line = lines[static_cast<std::size_t>(i)];
        if (!std::regex_match(line, m, parameter))
            continue;
        if (std::stoi(m[1]) != static_cast<int>(d.certified.size()) + 1) {
            error = path + ": parameters out of order on line " + std::to_string(i + 1);
            return std::nullopt;
        }
        d.start1.push_back(std::strtod(m[2].str().c_str(), nullptr));
        d.start2.push_back(std::strtod(m[3].str().c_str(), nullptr));
        d.certified.push_back(std::strtod(m[4].str().c_str(), nullptr));
        d.certifiedSd.push_back(std::strtod(m[5].str().c_str(), nullptr));
    }
    const auto rss = labelled("Residual Sum of Squares:");
    const auto rsd = labelled("Residual Standard Deviation:");
    const auto dof = labelled("Degrees of Freedom:");
    const auto nobs = labelled("Number of Observations:");
    if (d.certified.empty() || !rss || !rsd || !dof || !nobs) {
        error = path + ": incomplete certified block";
        return std::nullopt;
    }
    d.residualSumOfSquares = *rss;
    d.residualSd = *rsd;
    d.degreesOfFreedom = static_cast<int>(*dof);
    d.observations = static_cast<int>(*nobs);
    for (int i = dataFirst - 1; i < dataLast; ++i) {
        std::istringstream row(lines[static_cast<std::size_t>(i)]);
        std::vector<double> values;
        std::vector<fit::DoubleDouble> exact;
        for (std::string token; row >> token;) {
            const auto v = fit::parseDoubleDouble(token);
            if (!v) {
                error = path + ": data line " + std::to_string(i + 1) + ": not a number: " + token;
                return std::nullopt;
            }
            exact.push_back(*v);
            values.push_back(std::strtod(token.c_str(), nullptr));
        }
        if (values.size() < 2) {
            error = path + ": data line " + std::to_string(i + 1) + " has fewer than two numbers";
            return std::nullopt;
        }
        if (d.x.empty()) {
            d.x.resize(values.size() - 1);
            d.xExact.resize(values.size() - 1);
        }
        if (values.size() - 1 != d.x.size()) {
            error = path + ": data line " + std::to_string(i + 1) + " has a different column count";
            return std::nullopt;
        }
        d.y.push_back(values[0]);
        d.yExact.push_back(exact[0]);
        for (std::size_t k = 1; k < values.size(); ++k) {
            d.x[k - 1].push_back(values[k]);
            d.xExact[k - 1].push_back(exact[k]);
        }
    }
    if (static_cast<int>(d.y.size()) != d.observations) {
        error = path + ": " + std::to_string(d.y.size()) + " data rows, header says " +
                std::to_string(d.observations);
        return std::nullopt;
    }
    return d;
}

}  // namespace siftwave::test
