#include "common.h"

#include "siftwave/json_text.h"

#include <cstdio>
#include <exception>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <new>
#include <string_view>

namespace siftwave::cli {

std::vector<FlagSpec> ingestFlagSpecs() {
    return {
        {"date-col", true, false, "NAME", "the column that holds the dates (default: detected)"},
        {"year-col", true, false, "NAME",
         "the column of years, when the dates are a year and a week number (default: detected "
         "when no column holds dates)"},
        {"week-col", true, false, "NAME",
         "the column of week numbers 1 to 53 that goes with the years (default: detected)"},
        {"region-col", true, false, "NAME",
         "the column that holds the region codes (default: detected)"},
        {"value-col", true, true, "NAME",
         "a column of counts; each becomes a measure (default: detected)"},
        {"measure-col", true, false, "NAME",
         "long layout: the column that names the measure of each row"},
        {"measure-name", true, false, "NAME",
         "wide layouts and case lists: the name of the one measure (default: cases)"},
        {"layout", true, false, "LAYOUT",
         "long, dates-down, dates-across or case-list (default: detected)"},
        {"case-list", false, false, "",
         "the file is a case list: one row per case with its dates (default: detected)"},
        {"event-col", true, false, "NAME",
         "case list: the event date (onset, sample, hospitalisation) it is counted by"},
        {"report-col", true, false, "NAME", "case list: the report date"},
        {"date-format", true, false, "FMT",
         "YYYY-MM-DD, YYYYMMDD, DD/MM/YYYY, MM/DD/YYYY or YYYY-Www (default: detected)"},
        {"cadence", true, false, "C",
         "daily or weekly (default: weekly when every date is 7 days apart on one weekday)"},
        {"week-start", true, false, "DAY",
         "weekly: monday (ISO 8601 weeks) or sunday (epidemiological weeks) (default: from the "
         "dates' weekday)"},
        {"week-date", true, false, "WHICH",
         "weekly: a date names the start or the end of its week (default: from the dates)"},
        {"delimiter", true, false, "C", "field delimiter: ',' ';' '|' or tab (default: detected)"},
        {"header", false, false, "", "the first line is a header (default: detected)"},
        {"no-header", false, false, "", "the first line is data"},
        {"sheet", true, false, "NAME|N",
         "a workbook (.xlsx, .ods): the sheet to read, by name or position from 1 (default: the "
         "first sheet whose first rows hold dates)"},
        {"from", true, false, "DATE",
         "read only the rows from this day on (YYYY-MM-DD; weekly data: the weeks that overlap "
         "it); the rows left out are counted"},
        {"to", true, false, "DATE",
         "read only the rows up to this day (YYYY-MM-DD; weekly data: the weeks that overlap it)"},
        {"only-regions", true, false, "CODES|@FILE",
         "read only these regions: codes separated by commas, or @FILE with one code per line "
         "(codes exactly as written)"},
        {"missing", true, true, "TOKEN",
         "a cell text meaning 'no value', in addition to the empty cell (e.g. --missing NA for "
         "values; never "
         "applied to region codes)"},
    };
}

namespace {

constexpr std::uintmax_t kMaxRegionListBytes = std::uintmax_t{16} << 20;

/// The codes of --only-regions: "A,B,C", or "@FILE" with one code per line (line ends and blank
/// lines aside, codes verbatim).
Result<std::vector<std::string>> regionCodesFrom(const std::string& value) {
    std::vector<std::string> codes;
    auto usage = [](std::string message) {
        return makeError(ErrorCode::Usage, std::move(message));
    };
    if (!value.starts_with('@')) {
        std::size_t start = 0;
        for (std::size_t comma = value.find(','); start <= value.size();
             comma = value.find(',', start)) {
            const std::size_t end = comma == std::string::npos ? value.size() : comma;
            if (end > start)
                codes.push_back(value.substr(start, end - start));
            start = end + 1;
        }
        if (codes.empty())
            return usage("--only-regions names no region code");
        return codes;
    }
    const std::string path = value.substr(1);
    std::error_code ec;
    if (!std::filesystem::is_regular_file(path, ec))
        return usage("--only-regions @" + path +
                     ": no such file (a file of region codes, one per "
                     "line)");
    if (std::filesystem::file_size(path, ec) > kMaxRegionListBytes)
        return usage("--only-regions @" + path +
                     ": the file is larger than 16 MB; a list of "
                     "region codes is far smaller");
    std::ifstream in(path, std::ios::binary);
    std::string line;
    while (std::getline(in, line)) {
        if (!line.empty() && line.back() == '\r')
            line.pop_back();
        if (!line.empty())
            codes.push_back(line);
    }
    if (!in.eof())
        return usage("--only-regions @" + path + ": the file cannot be read");
    if (codes.empty())
        return usage("--only-regions @" + path + " holds no region code");
    return codes;
}

/// --from and --to: ISO 8601 days.
Result<std::optional<Date>> dayFrom(const ParsedArgs& args, const std::string& flag) {
    const std::optional<std::string> text = args.optionalValue(flag);
    if (!text)
        return std::optional<Date>{};
    if (std::optional<Date> day = Date::fromIso(*text))
        return std::optional<Date>(*day);
    return makeError(ErrorCode::Usage,
                     "--" + flag + " takes a day as YYYY-MM-DD (ISO 8601), not '" + *text + "'");
}

/// --from, --to and --only-regions.
Status readNarrowing(const ParsedArgs& args, ReadNarrowing& narrowing) {
    Result<std::optional<Date>> from = dayFrom(args, "from");
    if (!from)
        return from.error();
    Result<std::optional<Date>> to = dayFrom(args, "to");
    if (!to)
        return to.error();
    narrowing.from = *from;
    narrowing.to = *to;
    if (std::optional<std::string> regions = args.optionalValue("only-regions")) {
        Result<std::vector<std::string>> codes = regionCodesFrom(*regions);
        if (!codes)
            return codes.error();
        narrowing.regions = std::move(*codes);
    }
    return Ok{};
}

}  // namespace

Result<ingest::IngestOptions> ingestOptionsFrom(const ParsedArgs& args) {
    ingest::IngestOptions o;
    auto usage = [](std::string message) {
        return makeError(ErrorCode::Usage, std::move(message));
    };
    o.dateColumn = args.value("date-col");
    o.yearColumn = args.value("year-col");
    o.weekColumn = args.value("week-col");
    o.regionColumn = args.value("region-col");
    o.valueColumns = args.values("value-col");
    o.measureColumn = args.value("measure-col");
    o.measureName = args.value("measure-name");
    o.dateFormat = args.value("date-format");
    if (auto layout = args.optionalValue("layout")) {
        o.layout = layoutFromName(*layout);
        if (!o.layout)
            return usage("unknown layout '" + *layout +
                         "'; use long, dates-down, dates-across or case-list");
    }
    if (args.has("case-list"))
        o.caseList = true;
    o.eventColumn = args.value("event-col");
    o.reportColumn = args.value("report-col");
    if (auto c = args.optionalValue("cadence")) {
        o.cadence = cadenceFromName(*c);
        if (!o.cadence)
            return usage("unknown cadence '" + *c + "'; use daily or weekly");
    }
    if (auto w = args.optionalValue("week-start")) {
        o.weekStart = weekStartFromName(*w);
        if (!o.weekStart)
            return usage("unknown week start '" + *w + "'; use monday or sunday");
    }
    if (auto w = args.optionalValue("week-date")) {
        o.weekDate = weekDateFromName(*w);
        if (!o.weekDate)
            return usage("unknown week date '" + *w + "'; use start or end");
    }
    if (auto d = args.optionalValue("delimiter")) {
        if (*d == "tab" || *d == "\\t" || *d == "\t")
            o.delimiter = '\t';
        else if (*d == "comma")
            o.delimiter = ',';
        else if (*d == "semicolon")
            o.delimiter = ';';
        else if (*d == "pipe")
            o.delimiter = '|';
        else if (d->size() == 1)
            o.delimiter = (*d)[0];
        else
            return usage("--delimiter takes one character (',' ';' '|') or 'tab', not '" + *d +
                         "'");
    }
    if (args.has("header") && args.has("no-header"))
        return usage("--header and --no-header contradict each other");
    if (args.has("header"))
        o.header = true;
    if (args.has("no-header"))
        o.header = false;
    o.sheet = args.value("sheet");
    for (const std::string& token : args.values("missing"))
        o.missingTokens.push_back(token);
    if (Status s = readNarrowing(args, o.narrowing); !s)
        return s.error();
    if (Status s = o.validate(); !s)
        return s.error();
    return o;
}

Result<Drop> loadDrop(const std::string& path, const ParsedArgs& args) {
    Result<ingest::IngestOptions> options = ingestOptionsFrom(args);
    if (!options)
        return options.error();
    return ingest::readDrop(path, *options);
}

std::vector<FlagSpec> registerFlagSpecs(const std::string& use) {
    return {{"regions", true, false, "REG",
             "region register (code,name,parent,population): " + use +
                 "; default: the register beside FILE (NAME_regions.csv, regions.csv), if any"},
            {"no-regions", false, false, "", "read no region register"}};
}

Result<std::optional<RegionRegister>> loadRegister(const ParsedArgs& args,
                                                   const std::string& dropPath) {
    std::optional<std::string> path = args.optionalValue("regions");
    if (!path && !args.has("no-regions")) {
        if (std::string beside = ingest::registerBeside(dropPath); !beside.empty())
            path = std::move(beside);
    }
    if (!path)
        return std::optional<RegionRegister>{};
    Result<RegionRegister> read = ingest::readRegister(*path);
    if (!read)
        return read.error();
    return std::optional<RegionRegister>(std::move(*read));
}

int runGuarded(const char* name, int (*run)(int, char**, int), int argc, char** argv) {
    try {
        return run(argc, argv, 2);
    } catch (const std::bad_alloc&) {
        std::fprintf(stderr, "siftwave-cli: out of memory while running '%s'\n", name);
    } catch (const std::exception& e) {
        std::fprintf(stderr, "siftwave-cli: '%s' stopped: %s\n", name, e.what());
    }
    return kExitBadInput;
}

nlohmann::json errorToJson(const Error& error) {
    nlohmann::json e = {{"code", errorCodeName(error.code)}, {"message", error.message}};
    e["file"] = error.file.empty() ? nlohmann::json(nullptr) : nlohmann::json(error.file);
    e["line"] = error.line > 0 ? nlohmann::json(error.line) : nlohmann::json(nullptr);
    e["column"] = error.column > 0 ? nlohmann::json(error.column) : nlohmann::json(nullptr);
    if (!error.region.empty())
        e["region"] = error.region;
    if (!error.date.empty())
        e["date"] = error.date;
    if (!error.cell.empty())
        e["cell"] = error.cell;  // a spreadsheet's cell: "data!C14"
    return e;
}

std::string terminalText(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    char escape[8];
    for (std::size_t i = 0; i < text.size(); ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        if (c < 0x20 || c == 0x7F) {
            std::snprintf(escape, sizeof escape, "\\x%02x", c);
            out += escape;
        } else if (c == 0xC2 && i + 1 < text.size() &&
                   static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
                   static_cast<unsigned char>(text[i + 1]) <= 0x9F) {
            std::snprintf(escape, sizeof escape, "\\u00%02x",
                          static_cast<unsigned char>(text[i + 1]));
            out += escape;
            ++i;
        } else {
            out += static_cast<char>(c);
        }
    }
    return out;
}

void printError(const Error& error, bool json) {
    if (json) {
        printJson({{"error", errorToJson(error)}});
        return;
    }
    std::fprintf(stderr, "siftwave-cli: %s\n", terminalText(error.describe()).c_str());
}

void printJson(const nlohmann::json& value) {
    std::cout << jsonText(value) << '\n';
    std::cout.flush();
}

void printJsonAt(const nlohmann::json& value, int depth) {
    std::cout << jsonText(value, depth);
}

int usageError(const std::string& message, bool json, const std::string& usage) {
    printError(makeError(ErrorCode::Usage, message), json);
    if (!json) {
        // The synopsis (the usage text up to its first blank line), not every option.
        const std::string synopsis = usage.substr(0, usage.find("\n\n"));
        std::fprintf(stderr, "%s\n(--help lists every option)\n", synopsis.c_str());
    }
    return kExitUsage;
}

CommandLine parseCommandLine(int argc, char** argv, int first, const std::vector<FlagSpec>& specs,
                             const std::string& usage) {
    CommandLine line;
    for (int i = first; i < argc; ++i) {
        const std::string_view a = argv[i];
        if (a == "--help" || a == "-h") {
            std::printf("%s", usage.c_str());
            return line;
        }
        if (a == "--json")
            line.json = true;
    }
    std::string parseError;
    line.args = parseArgs(argc, argv, first, specs, parseError);
    if (!line.args)
        line.exitCode = usageError(parseError, line.json, usage);
    return line;
}

CommandLine parseOneFileCommandLine(int argc, char** argv, int first,
                                    const std::vector<FlagSpec>& specs, const std::string& usage,
                                    const std::string& command) {
    CommandLine line = parseCommandLine(argc, argv, first, specs, usage);
    if (line.args && line.args->positional.size() != 1) {
        line.exitCode =
            usageError(line.args->positional.empty() ? command + " needs a FILE to read"
                                                     : command + " reads one FILE at a time",
                       line.json, usage);
        line.args.reset();
    }
    return line;
}

}  // namespace siftwave::cli
