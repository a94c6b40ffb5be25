// siftwave-cli scan FILE [--previous FILE] [--regions FILE | --no-regions] [--set NAME=VALUE]...
// [ingest flags] [--json]: every finding of the anomaly scan, ranked for review.
// siftwave-cli scan --releases FILE... (or a folder) [...]: the latest release scanned, with the
// revisions between every two successive releases (--previous is the history of two).
#include "commands.h"
#include "common.h"
#include "release_files.h"

#include "siftwave/scan/scan.h"

#include <algorithm>
#include <cstdio>
#include <iostream>
#include <map>
#include <memory>
#include <string>

namespace siftwave::cli {
namespace {

std::string usageText(const std::vector<FlagSpec>& specs) {
    std::string text =
        "usage: siftwave-cli scan FILE [--previous FILE] [--regions FILE | --no-regions] "
        "[--set NAME=VALUE]... [ingest flags] [--json]\n"
        "       siftwave-cli scan --releases FILE... [same options but --previous]\n\n"
        "Scans a data drop for missing periods, duplicate rows, negative counts, backlog "
        "dumps,\nreporting gaps, stale values, code problems, weekday effects (daily data), "
        "cumulative\ndecreases, hierarchy mismatches and (with --previous) revisions. "
        "Findings are ranked: the\nones that would change a briefing come first. The "
        "previous drop is read with the same\ningest flags. A weekly drop is scanned in "
        "weeks: settings that count periods have a\n_days value for daily data and a "
        "_weeks value for weekly data, and dates are the first\ndays of periods. Exit "
        "codes: 0 scanned (with or without findings), 1 an input cannot\nbe read, 2 wrong "
        "usage.\n\n"
        "--releases reads successive releases of one series (files, or a folder of .csv files),\n"
        "puts them in order of their last date, scans the latest as above (its revisions are\n"
        "against the release before it, as --previous would give) and adds the revisions\n"
        "between every two successive releases.\n\n"
        "options:\n" +
        formatFlags(specs) + "\nscan settings for --set (default in brackets):\n";
    for (const scan::OptionDescription& d : scan::describeScanOptions()) {
        std::string name = d.name;
        name.resize(std::max<std::size_t>(name.size(), 38), ' ');
        text += "  " + name + " " + d.help + " [" + d.defaultValue + "]\n";
    }
    return text;
}

std::string dates(const scan::Finding& f) {
    if (!f.first)
        return "-";
    if (*f.first == *f.last)
        return f.first->iso();
    return f.first->iso() + ".." + f.last->iso();
}

/// The text of printJson(scan::scanReportToJson(report)), written one finding at a time: the
/// JSON of thousands of findings is never held whole (issue 14: the scan's memory stays a small
/// multiple of the drop's).
void printScanJson(const scan::ScanReport& report) {
    std::cout << "{\n  \"findings\": ";
    if (report.findings.empty()) {
        std::cout << "[]";
    } else {
        std::cout << "[\n";
        for (std::size_t i = 0; i < report.findings.size(); ++i) {
            std::cout << "    ";
            printJsonAt(scan::findingToJson(report.findings[i]), 2);
            std::cout << (i + 1 < report.findings.size() ? ",\n" : "\n");
        }
        std::cout << "  ]";
    }
    std::cout << ",\n  \"summary\": ";
    printJsonAt(scan::scanSummaryToJson(report), 1);
    std::cout << "\n}\n";
    std::cout.flush();
}

void printTable(const scan::ScanReport& report, const Drop& drop) {
    std::printf("%s: %zu finding(s)", terminalText(drop.source.path).c_str(),
                report.findings.size());
    std::string sep = " (";
    for (const char* s : {"critical", "warning", "info"}) {
        const std::size_t n = report.bySeverity.at(s);
        if (n == 0)
            continue;
        std::printf("%s%zu %s", sep.c_str(), n, s);
        sep = ", ";
    }
    std::printf("%s\n", sep == " (" ? "" : ")");
    if (drop.axis.weekly()) {
        std::printf("%s; dates are the first days of weeks\n", drop.axis.describe().c_str());
    }
    if (report.findings.empty())
        return;
    std::printf("\n%4s  %-8s  %-19s  %-10s  %-8s  %-22s  %s\n", "rank", "severity", "kind",
                "region", "measure", "dates", "what");
    for (const scan::Finding& f : report.findings) {
        std::printf(
            "%4d  %-8s  %-19s  %-10s  %-8s  %-22s  %s\n", f.rank, scan::severityName(f.severity),
            scan::findingKindName(f.kind),
            f.region ? (f.region->empty() ? "\"\"" : terminalText(*f.region).c_str()) : "(all)",
            f.measure ? terminalText(*f.measure).c_str() : "(all)", dates(f).c_str(),
            terminalText(scan::describeFinding(f)).c_str());
    }
    if (report.revisions.compared) {
        const scan::RevisionSummary& r = report.revisions;
        std::printf(
            "\nrevisions: %zu of %zu compared cells changed, %zu appeared, %zu vanished, in %zu "
            "region(s); net change %.0f, absolute %.0f (%.2f %% of the previous total)\n",
            r.cellsChanged, r.cellsCompared, r.cellsAppeared, r.cellsVanished, r.regionsRevised,
            r.netChange, r.absoluteChange,
            r.previousTotal > 0 ? 100.0 * r.absoluteChange / r.previousTotal : 0.0);
    }
}

std::string severityCounts(const std::map<std::string, std::size_t>& bySeverity) {
    std::string text;
    for (const char* s : {"critical", "warning", "info"}) {
        const auto it = bySeverity.find(s);
        if (it == bySeverity.end() || it->second == 0)
            continue;
        text += (text.empty() ? "" : ", ") + std::to_string(it->second) + " " + s;
    }
    return text.empty() ? "none" : text;
}

/// The revisions between successive releases of a history (scan --releases), one line a pair.
void printReleaseRevisions(const scan::ScanReport& report) {
    const std::vector<scan::ReleaseRevisions>& pairs = report.releaseRevisions;
    if (pairs.empty())
        return;
    std::printf(
        "\nrevisions between successive releases (%zu releases, the last line is the "
        "latest's, listed above):\n",
        pairs.size() + 1);
    std::printf("%-10s  %7s  %8s  %8s  %7s  %8s  %8s  %9s  %-22s  %s\n", "as of", "changed",
                "appeared", "vanished", "regions", "net", "absolute", "% of prev", "findings",
                "release");
    std::printf("%-10s  %-75s  %s\n", pairs.front().previousAsOf.iso().c_str(), "(first release)",
                terminalText(pairs.front().previousFile).c_str());
    for (const scan::ReleaseRevisions& p : pairs) {
        const scan::RevisionSummary& r = p.summary;
        std::printf("%-10s  %7zu  %8zu  %8zu  %7zu  %+8.0f  %8.0f  %9.2f  %-22s  %s\n",
                    p.currentAsOf.iso().c_str(), r.cellsChanged, r.cellsAppeared, r.cellsVanished,
                    r.regionsRevised, r.netChange, r.absoluteChange,
                    r.previousTotal > 0 ? 100.0 * r.absoluteChange / r.previousTotal : 0.0,
                    severityCounts(p.bySeverity).c_str(), terminalText(p.currentFile).c_str());
    }
}

/// The releases the scan reads: FILE alone, FILE after --previous P (the history of two, in
/// that order), or every --releases FILE in order of their as-of dates. Printed on failure.
Result<ReleaseHistory> loadScanHistory(const ParsedArgs& args, bool json) {
    Result<ReleaseHistory> history = [&]() -> Result<ReleaseHistory> {
        if (args.has("releases")) {
            if (args.has("previous"))
                return makeError(ErrorCode::Usage,
                                 "--previous and --releases both give the releases to compare; "
                                 "give one");
            Result<ReleaseHistory> h = loadReleaseHistory(args.positional, args);
            if (h && h->size() < 2)
                return makeError(ErrorCode::Usage,
                                 "--releases needs at least two releases to compare; one was "
                                 "found (" +
                                     h->latest().source.path + ")");
            return h;
        }
        // The drop first, then the previous release (an error names the drop's file first).
        std::vector<std::string> files{args.positional[0]};
        if (auto path = args.optionalValue("previous"))
            files.push_back(*path);
        std::vector<std::shared_ptr<const Drop>> drops;
        for (const std::string& file : files) {
            Result<Drop> d = loadDrop(file, args);
            if (!d)
                return d.error();
            drops.insert(drops.begin(), std::make_shared<const Drop>(std::move(*d)));
        }
        return ReleaseHistory::of(std::move(drops), ReleaseHistory::Order::AsGiven);
    }();
    if (!history)
        printError(history.error(), json);
    return history;
}

}  // namespace

int runScan(int argc, char** argv, int first) {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"previous", true, false, "FILE", "the previous release, to find revisions"});
    specs.push_back({"releases", false, false, "",
                     "the FILEs are successive releases of one series (or folders of them): "
                     "scan the latest, with the revisions between each two"});
    for (FlagSpec& spec : registerFlagSpecs("unknown codes, hierarchy"))
        specs.push_back(std::move(spec));
    specs.push_back({"set", true, true, "NAME=VALUE",
                     "change a scan setting, e.g. backlog_dump.min_excess=50"});
    specs.push_back({"json", false, false, "", "print JSON instead of a table"});
    specs.push_back({"help", false, false, "", "show this help and the scan settings"});
    const std::string usage = usageText(specs);
    const bool releases = std::any_of(argv + first, argv + argc, [](const char* a) {
        return std::string_view(a) == "--releases";
    });
    CommandLine line = releases ? parseCommandLine(argc, argv, first, specs, usage)
                                : parseOneFileCommandLine(argc, argv, first, specs, usage, "scan");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs* args = &*line.args;
    const bool json = line.json;
    scan::ScanOptions options;
    for (const std::string& setting : args->values("set")) {
        const std::size_t eq = setting.find('=');
        if (eq == std::string::npos) {
            printError(makeError(ErrorCode::Usage,
                                 "--set takes NAME=VALUE, e.g. backlog_dump.min_excess=50, not '" +
                                     setting + "'"),
                       json);
            return kExitUsage;
        }
        if (Status s = options.set(setting.substr(0, eq), setting.substr(eq + 1)); !s) {
            printError(s.error(), json);
            return kExitUsage;
        }
    }
    if (Result<ingest::IngestOptions> o = ingestOptionsFrom(*args); !o) {
        printError(o.error(), json);
        return kExitUsage;
    }

    Result<ReleaseHistory> history = loadScanHistory(*args, json);
    if (!history)
        return history.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    const Drop& drop = history->latest();
    scan::ScanContext context;
    if (history->size() > 1)
        context.history = &*history;
    Result<std::optional<RegionRegister>> regions = loadRegister(*args, drop.source.path);
    if (!regions) {
        printError(regions.error(), json);
        return kExitBadInput;
    }
    if (*regions)
        context.regions = &**regions;

    Result<scan::ScanReport> report = scan::scanDrop(drop, options, context);
    if (!report) {
        printError(report.error(), json);
        return report.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    if (json) {
        printScanJson(*report);
    } else {
        printTable(*report, drop);
        printReleaseRevisions(*report);
    }
    return kExitOk;
}

}  // namespace siftwave::cli
