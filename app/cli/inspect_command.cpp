// siftwave-cli inspect FILE [ingest flags] [--json]: what was read, and how.
#include "commands.h"
#include "common.h"

#include <algorithm>
#include <cstdio>
#include <set>

namespace siftwave::cli {
namespace {

std::string delimiterText(char d) {
    if (d == '\t')
        return "\t";
    return std::string(1, d);
}

std::string delimiterLabel(char d) {
    switch (d) {
        case ',':
            return "comma (,)";
        case ';':
            return "semicolon (;)";
        case '\t':
            return "tab";
        case '|':
            return "pipe (|)";
    }
    return std::string("'") + d + "'";
}

std::size_t duplicateRowCount(const Drop& drop) {
    std::set<std::uint32_t> lines;
    for (const DuplicateRow& d : drop.duplicates)
        lines.insert(d.cell.line);
    return lines.size();
}

/// A case list's columns, its cases and its problems by kind (name -> count).
nlohmann::json caseListJson(const CaseList& list) {
    auto column = [](const std::string& name) {
        return name.empty() ? nlohmann::json(nullptr) : nlohmann::json(name);
    };
    nlohmann::json problems = nlohmann::json::object();
    for (const CaseProblem& p : list.problems)
        problems[caseProblemName(p.kind)] = problems.value(caseProblemName(p.kind), 0) + 1;
    return {{"event_column", list.eventColumn},
            {"report_column", column(list.reportColumn)},
            {"region_column", column(list.regionColumn)},
            {"cases", list.cases.size()},
            {"problems", problems}};
}

/// A narrowed read for the audit trail: what was asked and what it left out; null for a read of
/// the whole file.
nlohmann::json narrowedReadJson(const Provenance& p) {
    if (!p.narrowing.active())
        return nullptr;
    const ReadNarrowing& n = p.narrowing;
    const LeftOut& out = p.leftOut;
    return {{"from", n.from ? nlohmann::json(n.from->iso()) : nlohmann::json(nullptr)},
            {"to", n.to ? nlohmann::json(n.to->iso()) : nlohmann::json(nullptr)},
            {"regions", n.regions},
            {"options", n.asOptions()},
            {"rows_left_out", out.rows()},
            {"rows_outside_dates", out.rowsOutsideDates},
            {"rows_of_other_regions", out.rowsOfOtherRegions},
            {"date_columns_left_out", out.dateColumns},
            {"region_columns_left_out", out.regionColumns},
            {"regions_not_found", out.regionsNotFound},
            {"note", narrowingNote(p)}};
}

nlohmann::json inspectJson(const Drop& drop) {
    const Provenance& p = drop.source;
    const CellCounts counts = drop.countCells();
    nlohmann::json j;
    j["source"] = {
        {"path", p.path},
        {"bytes", p.bytes},
        {"sha256", p.sha256},
        {"delimiter", delimiterText(p.dialect.delimiter)},
        {"header", p.dialect.header},
        {"bom", p.dialect.bom},
        {"line_endings", p.dialect.crlf ? "crlf" : "lf"},
        {"decimal_separator", std::string(1, p.dialect.decimalSeparator)},
        {"thousands_separator", p.dialect.thousandsSeparator
                                    ? nlohmann::json(std::string(1, p.dialect.thousandsSeparator))
                                    : nlohmann::json(nullptr)},
    };
    if (!p.format.empty()) {
        // A spreadsheet: the sheet read instead of a text dialect.
        nlohmann::json& source = j["source"];
        for (const char* key : {"delimiter", "header", "bom", "line_endings", "decimal_separator",
                                "thousands_separator"})
            source.erase(key);
        source["format"] = p.format;
        source["sheet"] = p.sheet;
        source["sheets"] = p.sheets;
        source["dated_sheets"] = p.datedSheets;
        source["first_column"] = columnLetters(p.firstColumn);
    }
    j["layout"] = layoutName(p.layout);
    j["columns"] = {
        {"date", p.columns.date.empty() ? nlohmann::json(nullptr) : nlohmann::json(p.columns.date)},
        {"year", p.columns.year.empty() ? nlohmann::json(nullptr) : nlohmann::json(p.columns.year)},
        {"week", p.columns.week.empty() ? nlohmann::json(nullptr) : nlohmann::json(p.columns.week)},
        {"region",
         p.columns.region.empty() ? nlohmann::json(nullptr) : nlohmann::json(p.columns.region)},
        {"values", p.columns.values},
        {"measure",
         p.columns.measure.empty() ? nlohmann::json(nullptr) : nlohmann::json(p.columns.measure)},
    };
    j["date_format"] = p.dateFormat;
    j["rows"] = drop.rows;
    j["narrowed_read"] = narrowedReadJson(p);
    j["regions"] = drop.regionCodes.size();
    j["region_codes"] = drop.regionCodes;
    j["measures"] = drop.measures;
    // The calendar: first_date and last_date are the first days of the first and last periods.
    const TimeAxis& axis = drop.axis;
    j["cadence"] = cadenceName(axis.cadence());
    j["week_start"] =
        axis.weekly() ? nlohmann::json(weekStartName(axis.weekStart())) : nlohmann::json(nullptr);
    j["week_date"] =
        axis.weekly() ? nlohmann::json(weekDateName(axis.weekDate())) : nlohmann::json(nullptr);
    j["periods"] = axis.periods();
    j["first_date"] = axis.empty() ? nlohmann::json(nullptr) : nlohmann::json(axis.first().iso());
    j["last_date"] =
        axis.empty() ? nlohmann::json(nullptr) : nlohmann::json(axis.lastStart().iso());
    j["days"] = axis.spanDays();
    j["cells"] = {{"reported", counts.reported},
                  {"absent", counts.absent},
                  {"blank", counts.blank},
                  {"unparsable", counts.unparsable}};
    j["duplicates"] = duplicateRowCount(drop);
    nlohmann::json warnings = nlohmann::json::array();
    for (const Warning& w : drop.warnings) {
        warnings.push_back(
            {{"message", w.message},
             {"line", w.line > 0 ? nlohmann::json(w.line) : nlohmann::json(nullptr)},
             {"place", w.line > 0 ? nlohmann::json(sourcePlace(p, w.line, w.column))
                                  : nlohmann::json(nullptr)},
             {"column", w.column > 0 ? nlohmann::json(w.column) : nlohmann::json(nullptr)}});
    }
    j["warnings"] = warnings;
    if (drop.caseList)
        j["case_list"] = caseListJson(*drop.caseList);
    return j;
}

void printDialect(const Dialect& d) {
    std::printf("dialect     %s delimited, %s, %s line endings%s, decimal '%c'",
                delimiterLabel(d.delimiter).c_str(), d.header ? "header row" : "no header row",
                d.crlf ? "CRLF" : "LF", d.bom ? ", UTF-8 byte-order mark" : "", d.decimalSeparator);
    if (d.thousandsSeparator)
        std::printf(", thousands '%c'", d.thousandsSeparator);
    std::printf("\n");
}

/// A spreadsheet: its format, the sheet read, and every sheet.
void printSheets(const Provenance& p) {
    const auto at = std::find(p.sheets.begin(), p.sheets.end(), p.sheet);
    std::string all;
    for (std::size_t i = 0; i < p.sheets.size(); ++i)
        all += (i ? ", " : "") + p.sheets[i];
    std::printf("format      %s workbook\n", p.format.c_str());
    std::printf("sheet       %s (sheet %zu of %zu: %s); the table starts in column %s\n",
                terminalText(p.sheet).c_str(), static_cast<std::size_t>(at - p.sheets.begin()) + 1,
                p.sheets.size(), terminalText(all).c_str(), columnLetters(p.firstColumn).c_str());
    std::string others;  // the other tables worth choosing
    for (const std::string& name : p.datedSheets)
        if (name != p.sheet)
            others += (others.empty() ? "" : ", ") + name;
    if (!others.empty())
        std::printf("            dates also on: %s (choose with --sheet)\n",
                    terminalText(others).c_str());
}

void printText(const Drop& drop) {
    const Provenance& p = drop.source;
    const CellCounts counts = drop.countCells();
    std::printf("file        %s\n", terminalText(p.path).c_str());
    std::printf("bytes       %llu\n", static_cast<unsigned long long>(p.bytes));
    std::printf("sha256      %s\n", p.sha256.c_str());
    if (p.format.empty())
        printDialect(p.dialect);
    else
        printSheets(p);
    std::printf("layout      %s\n", layoutName(p.layout));
    if (!p.columns.date.empty())
        std::printf("date column %s (%s)\n", terminalText(p.columns.date).c_str(),
                    p.dateFormat.c_str());
    else
        std::printf("dates       in the header (%s)\n", p.dateFormat.c_str());
    if (!p.columns.region.empty())
        std::printf("region col  %s\n", terminalText(p.columns.region).c_str());
    if (!p.columns.measure.empty())
        std::printf("measure col %s\n", terminalText(p.columns.measure).c_str());
    std::string values;
    for (std::size_t i = 0; i < p.columns.values.size(); ++i) {
        if (i == 8) {
            values += ", ... (" + std::to_string(p.columns.values.size()) + " in all)";
            break;
        }
        values += (i ? ", " : "") + p.columns.values[i];
    }
    if (drop.caseList) {
        const CaseList& list = *drop.caseList;
        std::printf("report col  %s\n",
                    list.reportColumn.empty() ? "(none)" : terminalText(list.reportColumn).c_str());
        std::printf("cases       %zu counted by %s, %zu rows with a date problem\n",
                    list.cases.size(), terminalText(list.eventColumn).c_str(),
                    list.problems.size());
    } else {
        std::printf("value cols  %s\n", terminalText(values).c_str());
    }
    std::printf("rows        %zu\n", drop.rows);
    if (const std::string note = narrowingNote(drop.source); !note.empty())
        std::printf("read        %s\n", terminalText(note).c_str());
    std::string codes;
    for (std::size_t i = 0; i < drop.regionCodes.size(); ++i) {
        if (i == 12) {
            codes += ", ...";
            break;
        }
        codes += (i ? ", " : "") + drop.regionCodes[i];
    }
    std::printf("regions     %zu: %s\n", drop.regionCodes.size(), terminalText(codes).c_str());
    std::string measures;
    for (std::size_t i = 0; i < drop.measures.size(); ++i)
        measures += (i ? ", " : "") + drop.measures[i];
    std::printf("measures    %s\n", terminalText(measures).c_str());
    if (!drop.axis.empty())
        std::printf("calendar    %s\n", drop.axis.describe().c_str());
    std::printf("cells       %zu reported, %zu absent, %zu blank, %zu unparsable\n",
                counts.reported, counts.absent, counts.blank, counts.unparsable);
    std::printf("duplicates  %zu rows\n", duplicateRowCount(drop));
    std::printf("warnings    %zu\n", drop.warnings.size());
    for (const Warning& w : drop.warnings) {
        std::string where;
        if (w.line > 0)
            where = sourcePlace(p, w.line, w.column) + ": ";
        std::printf("  - %s%s\n", where.c_str(), terminalText(w.message).c_str());
    }
}

std::string usageText(const std::vector<FlagSpec>& specs) {
    return "usage: siftwave-cli inspect FILE [ingest flags] [--json]\n\n"
           "Reads a data drop (CSV, .xlsx or .ods) and reports what was read: the dialect or the\n"
           "sheet (and every sheet of a workbook), the layout, the "
           "columns\n"
           "used, the regions (codes exactly as written), the calendar, the cells by state, "
           "duplicate\n"
           "rows and warnings. Exit codes: 0 read, 1 the file cannot be read as a drop, 2 wrong "
           "usage.\n\n"
           "options:\n" +
           formatFlags(specs);
}

}  // namespace

int runInspect(int argc, char** argv, int first) {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"json", false, false, "", "print JSON instead of text"});
    specs.push_back({"help", false, false, "", "show this help"});
    const std::string usage = usageText(specs);
    CommandLine line = parseOneFileCommandLine(argc, argv, first, specs, usage, "inspect");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs* args = &*line.args;
    const bool json = line.json;
    Result<ingest::IngestOptions> options = ingestOptionsFrom(*args);
    if (!options) {
        printError(options.error(), json);
        return kExitUsage;
    }
    Result<Drop> drop = ingest::readDrop(args->positional[0], *options);
    if (!drop) {
        printError(drop.error(), json);
        return drop.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    if (json)
        printJson(inspectJson(*drop));
    else
        printText(*drop);
    return kExitOk;
}

}  // namespace siftwave::cli
