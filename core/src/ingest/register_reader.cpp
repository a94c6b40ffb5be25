// readRegister: the region register CSV (code, name, parent, population).
#include "ingest/csv_scanner.h"
#include "ingest/input_source.h"
#include "ingest/number_parsing.h"
#include "ingest/role_detection.h"
#include "ingest/sniffing.h"
#include "siftwave/ingest/ingest.h"

#include <algorithm>
#include <cctype>
#include <optional>
#include <unordered_map>

namespace siftwave::ingest {
namespace {

Error registerError(const std::string& path, ErrorCode code, std::string message,
                    std::uint64_t line = 0, std::uint64_t column = 0) {
    Error e = makeError(code, std::move(message));
    e.file = path;
    e.line = line;
    e.column = column;
    return e;
}

Error scannerError(const std::string& path, const detail::CsvScanner& scanner) {
    return registerError(path, ErrorCode::Syntax, scanner.error().message, scanner.error().line,
                         scanner.error().column);
}

// The register's columns by header name (-1: absent); code and name are required.
struct RegisterColumns {
    int code = -1, name = -1, parent = -1, population = -1;
    std::size_t count = 0;  // fields in the header
};

Result<RegisterColumns> registerColumns(const std::string& path, const detail::CsvRecord& header) {
    RegisterColumns cols;
    cols.count = header.fields.size();
    for (std::size_t i = 0; i < cols.count; ++i) {
        const std::string n = detail::lowerTrimmed(header.fields[i].text);
        const int c = static_cast<int>(i);
        if (n == "code" && cols.code < 0)
            cols.code = c;
        else if (n == "name" && cols.name < 0)
            cols.name = c;
        else if (n == "parent" && cols.parent < 0)
            cols.parent = c;
        else if (n == "population" && cols.population < 0)
            cols.population = c;
    }
    if (cols.code < 0 || cols.name < 0) {
        return registerError(path, ErrorCode::Layout,
                             "a region register needs a header with the columns code and name "
                             "(and optionally parent and "
                             "population)",
                             1, 0);
    }
    return cols;
}

// A population cell: up to 12 digits; nullopt otherwise.
std::optional<std::int64_t> populationOf(std::string_view p) {
    std::int64_t v = 0;
    bool digits = p.size() <= 12;
    for (char c : p) {
        digits = digits && c >= '0' && c <= '9';
        if (digits)
            v = v * 10 + (c - '0');
    }
    if (!digits)
        return std::nullopt;
    return v;
}

// One data row as an entry: the right number of fields, a code, a whole population.
Result<RegionEntry> registerEntry(const std::string& path, const RegisterColumns& cols,
                                  const detail::CsvRecord& record) {
    const auto line = static_cast<std::uint32_t>(record.line);
    if (record.fields.size() != cols.count) {
        return registerError(path, ErrorCode::Syntax,
                             "this row has " + std::to_string(record.fields.size()) +
                                 " fields but the header has " + std::to_string(cols.count),
                             line, std::min(record.fields.size(), cols.count) + 1);
    }
    auto field = [&](int c) { return record.fields[static_cast<std::size_t>(c)].text; };
    RegionEntry e;
    e.code = std::string(field(cols.code));
    e.name = std::string(field(cols.name));
    e.line = line;
    if (e.code.empty())
        return registerError(path, ErrorCode::InvalidValue, "the region code is empty", line,
                             cols.code + 1);
    if (cols.parent >= 0)
        e.parent = std::string(field(cols.parent));
    if (cols.population >= 0) {
        const std::string_view p = field(cols.population);
        if (!p.empty()) {
            const std::optional<std::int64_t> v = populationOf(p);
            if (!v) {
                return registerError(
                    path, ErrorCode::InvalidValue,
                    "population '" + std::string(p) + "' is not a whole number of people", line,
                    cols.population + 1);
            }
            e.population = *v;
        }
    }
    return e;
}

}  // namespace

Result<RegionRegister> readRegister(const std::string& path) {
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
        return registerError(path, ErrorCode::Syntax, "the register file is empty");

    const char delimiter = detail::sniffDelimiter(
        bytes, start, std::min(bytes.size(), start + (std::size_t{64} << 10)));
    detail::CsvScanner scanner(bytes, delimiter, start);
    detail::CsvRecord record;
    if (!scanner.next(record)) {
        if (scanner.failed())
            return scannerError(path, scanner);
        return registerError(path, ErrorCode::Syntax, "the register file is empty");
    }
    const Result<RegisterColumns> cols = registerColumns(path, record);
    if (!cols)
        return cols.error();

    RegionRegister reg;
    reg.path = path;
    std::unordered_map<std::string, std::uint32_t> firstLine;
    while (scanner.next(record)) {
        if (record.isEmptyLine())
            continue;
        Result<RegionEntry> e = registerEntry(path, *cols, record);
        if (!e)
            return e.error();
        auto [it, added] = firstLine.emplace(e->code, e->line);
        if (!added) {
            return registerError(path, ErrorCode::InvalidValue,
                                 "region code '" + e->code + "' is listed twice (first on line " +
                                     std::to_string(it->second) + ")",
                                 e->line, cols->code + 1);
        }
        reg.entries.push_back(std::move(*e));
    }
    if (scanner.failed())
        return scannerError(path, scanner);
    reg.index();
    return reg;
}

}  // namespace siftwave::ingest
