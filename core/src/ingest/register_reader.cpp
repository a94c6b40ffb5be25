// readRegister: the region register CSV (code, name, parent, population).
#include "ingest/csv_scanner.h"
#include "ingest/input_source.h"
#include "ingest/number_parsing.h"
#include "ingest/role_detection.h"
#include "ingest/sniffing.h"
#include "siftwave/ingest/ingest.h"

#include <algorithm>
#include <cctype>
#include <unordered_map>

namespace siftwave::ingest {
Result<RegionRegister> readRegister(const std::string& path) {
    auto fail = [&](ErrorCode code, std::string message, std::uint64_t line = 0,
                    std::uint64_t column = 0) {
        Error e = makeError(code, std::move(message));
        e.file = path;
        e.line = line;
        e.column = column;
        return e;
    };
    detail::InputFile file;
    if (Status s = file.open(path); !s)
        return s.error();
    const std::string_view bytes = file.bytes();
    detail::InputChecker checker(bytes, path);
    if (Status s = checker.checkAll(); !s)
        return s.error();
    std::size_t start = 0;
    if (bytes.substr(0, 3) == "\xEF\xBB\xBF")
        start = 3;
    if (bytes.size() <= start)
        return fail(ErrorCode::Syntax, "the register file is empty");

    const char delimiter = detail::sniffDelimiter(
        bytes, start, std::min(bytes.size(), start + (std::size_t{64} << 10)));
    detail::CsvScanner scanner(bytes, delimiter, start);
    detail::CsvRecord record;
    if (!scanner.next(record)) {
        if (scanner.failed())
            return fail(ErrorCode::Syntax, scanner.error().message, scanner.error().line,
                        scanner.error().column);
        return fail(ErrorCode::Syntax, "the register file is empty");
    }
    int codeCol = -1, nameCol = -1, parentCol = -1, populationCol = -1;
    const std::size_t columns = record.fields.size();
    for (std::size_t i = 0; i < columns; ++i) {
        const std::string n = detail::lowerTrimmed(record.fields[i].text);
        const int c = static_cast<int>(i);
        if (n == "code" && codeCol < 0)
            codeCol = c;
        else if (n == "name" && nameCol < 0)
            nameCol = c;
        else if (n == "parent" && parentCol < 0)
            parentCol = c;
        else if (n == "population" && populationCol < 0)
            populationCol = c;
    }
    if (codeCol < 0 || nameCol < 0) {
        return fail(ErrorCode::Layout,
                    "a region register needs a header with the columns code and name (and "
                    "optionally parent and "
                    "population)",
                    1, 0);
    }

    RegionRegister reg;
    reg.path = path;
    std::unordered_map<std::string, std::uint32_t> firstLine;
    while (scanner.next(record)) {
        if (record.isEmptyLine())
            continue;
        const auto line = static_cast<std::uint32_t>(record.line);
        if (record.fields.size() != columns) {
            return fail(ErrorCode::Syntax,
                        "this row has " + std::to_string(record.fields.size()) +
                            " fields but the header has " + std::to_string(columns),
                        line, std::min(record.fields.size(), columns) + 1);
        }
        RegionEntry e;
        e.code = std::string(record.fields[static_cast<std::size_t>(codeCol)].text);
        e.name = std::string(record.fields[static_cast<std::size_t>(nameCol)].text);
        e.line = line;
        if (e.code.empty())
            return fail(ErrorCode::InvalidValue, "the region code is empty", line, codeCol + 1);
        if (parentCol >= 0)
            e.parent = std::string(record.fields[static_cast<std::size_t>(parentCol)].text);
        if (populationCol >= 0) {
            const std::string_view p = record.fields[static_cast<std::size_t>(populationCol)].text;
            if (!p.empty()) {
                std::int64_t v = 0;
                bool digits = p.size() <= 12;
                for (char c : p) {
                    digits = digits && c >= '0' && c <= '9';
                    if (digits)
                        v = v * 10 + (c - '0');
                }
                if (!digits) {
                    return fail(
                        ErrorCode::InvalidValue,
                        "population '" + std::string(p) + "' is not a whole number of people", line,
                        populationCol + 1);
                }
                e.population = v;
            }
        }
        auto [it, added] = firstLine.emplace(e.code, line);
        if (!added) {
            return fail(ErrorCode::InvalidValue,
                        "region code '" + e.code + "' is listed twice (first on line " +
                            std::to_string(it->second) + ")",
                        line, codeCol + 1);
        }
        reg.entries.push_back(std::move(e));
    }
    if (scanner.failed()) {
        return fail(ErrorCode::Syntax, scanner.error().message, scanner.error().line,
                    scanner.error().column);
    }
    reg.index();
    return reg;
}

}  // namespace siftwave::ingest
