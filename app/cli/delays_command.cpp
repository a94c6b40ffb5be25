// siftwave-cli delays CASELIST [ingest flags] [--region CODE] [--by month|window]
// [--window-days N] [--step-days N] [--json|--csv]: the reporting-delay distribution.
#include "commands.h"
#include "common.h"
#include "siftwave/nowcast/delays.h"

#include <cmath>
#include <cstdio>

namespace siftwave::cli {
namespace {

nlohmann::json summaryJson(const nowcast::DelaySummary& s) {
    return {{"cases", s.cases},   {"mean", s.mean}, {"q05", s.q05}, {"q25", s.q25},
            {"median", s.median}, {"q75", s.q75},   {"q95", s.q95}, {"max", s.max}};
}

nlohmann::json delaysJson(const nowcast::DelayReport& r) {
    nlohmann::json groups = nlohmann::json::array();
    for (const nowcast::DelayGroup& g : r.groups) {
        nlohmann::json j = summaryJson(g.summary);
        j["first"] = g.first.iso();
        j["last"] = g.last.iso();
        j["truncated"] = g.truncated;
        groups.push_back(std::move(j));
    }
    return {{"region", r.region.empty() ? nlohmann::json(nullptr) : nlohmann::json(r.region)},
            {"unit", "days"},
            {"overall", summaryJson(r.overall)},
            {"histogram", r.histogram},
            {"groups", groups},
            {"last_report", r.lastReport.iso()},
            {"cases_left_out", r.casesLeftOut},
            {"quantiles", "Hyndman & Fan (1996) type 7"}};
}

std::string number(double v) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.4g", v);
    return buf;
}

void printCsv(const nowcast::DelayReport& r) {
    std::printf("first,last,cases,mean,q05,q25,median,q75,q95,max,truncated\n");
    for (const nowcast::DelayGroup& g : r.groups) {
        const nowcast::DelaySummary& s = g.summary;
        std::printf("%s,%s,%zu,%s,%s,%s,%s,%s,%s,%d,%s\n", g.first.iso().c_str(),
                    g.last.iso().c_str(), s.cases, number(s.mean).c_str(), number(s.q05).c_str(),
                    number(s.q25).c_str(), number(s.median).c_str(), number(s.q75).c_str(),
                    number(s.q95).c_str(), s.max, g.truncated ? "true" : "false");
    }
}

void printText(const nowcast::DelayReport& r) {
    const nowcast::DelaySummary& s = r.overall;
    std::printf("reporting delay (report date - event date), days%s%s\n",
                r.region.empty() ? "" : ", region ", terminalText(r.region).c_str());
    std::printf("cases     %zu (%zu left out: no report date, or reported before the event)\n",
                s.cases, r.casesLeftOut);
    std::printf("quantiles 5%% %s, 25%% %s, median %s, 75%% %s, 95%% %s; mean %s, max %d\n",
                number(s.q05).c_str(), number(s.q25).c_str(), number(s.median).c_str(),
                number(s.q75).c_str(), number(s.q95).c_str(), number(s.mean).c_str(), s.max);
    std::size_t top = 1;
    for (std::size_t n : r.histogram)
        top = std::max(top, n);
    std::printf("\ndelay  cases\n");
    for (std::size_t d = 0; d < r.histogram.size(); ++d) {
        const auto bar = static_cast<std::size_t>(
            std::lround(50.0 * static_cast<double>(r.histogram[d]) / static_cast<double>(top)));
        std::printf("%5zu  %5zu %s\n", d, r.histogram[d], std::string(bar, '#').c_str());
    }
    std::printf("\nby event date      cases  median  q95\n");
    for (const nowcast::DelayGroup& g : r.groups) {
        std::printf("%s..%s %5zu  %6s  %4s%s\n", g.first.iso().c_str(), g.last.iso().c_str() + 5,
                    g.summary.cases, g.summary.cases ? number(g.summary.median).c_str() : "-",
                    g.summary.cases ? number(g.summary.q95).c_str() : "-",
                    g.truncated ? "  (recent: long delays not seen yet)" : "");
    }
}

std::string usageText(const std::vector<FlagSpec>& specs) {
    return "usage: siftwave-cli delays CASELIST [ingest flags] [--region CODE] [--by "
           "month|window]\n"
           "                           [--window-days N] [--step-days N] [--json|--csv]\n\n"
           "The reporting delay of a case list (one row per case): report date minus event date, "
           "in days;\nits quantiles, histogram, and how it changes by the event's month or in a "
           "moving window.\nRecent groups are marked: their long delays cannot have been seen "
           "yet. Exit codes: 0 done,\n1 the file cannot be read or has no delays, 2 wrong "
           "usage.\n\noptions:\n" +
           formatFlags(specs);
}

Result<nowcast::DelayOptions> delayOptions(const ParsedArgs& args) {
    nowcast::DelayOptions o;
    const std::string by = args.value("by", "month");
    if (by == "window")
        o.grouping = nowcast::DelayOptions::Grouping::MovingWindow;
    else if (by != "month")
        return makeError(ErrorCode::Usage, "--by takes month or window, not '" + by + "'");
    try {
        o.windowDays = std::stoi(args.value("window-days", "28"));
        o.stepDays = std::stoi(args.value("step-days", "7"));
    } catch (const std::exception&) {
        return makeError(ErrorCode::Usage, "--window-days and --step-days take whole numbers");
    }
    if (Status s = o.validate(); !s)
        return s.error();
    return o;
}

}  // namespace

int runDelays(int argc, char** argv, int first) {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"region", true, false, "CODE", "one region (default: every case)"});
    specs.push_back({"by", true, false, "HOW", "month (default) or window (moving)"});
    specs.push_back({"window-days", true, false, "N", "moving window length (default 28)"});
    specs.push_back({"step-days", true, false, "N", "moving window step (default 7)"});
    specs.push_back({"json", false, false, "", "print JSON instead of text"});
    specs.push_back({"csv", false, false, "", "print the groups as CSV"});
    specs.push_back({"help", false, false, "", "show this help"});
    const std::string usage = usageText(specs);
    CommandLine line = parseOneFileCommandLine(argc, argv, first, specs, usage, "delays");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs& args = *line.args;
    Result<nowcast::DelayOptions> options = delayOptions(args);
    if (!options)
        return usageError(options.error().message, line.json, usage);
    Result<Drop> drop = loadDrop(args.positional[0], args);
    if (!drop) {
        printError(drop.error(), line.json);
        return drop.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    std::optional<std::size_t> region;
    if (args.has("region")) {
        region = drop->regionIndex(args.value("region"));
        if (!region) {
            printError(makeError(ErrorCode::NotFound,
                                 "no region '" + args.value("region") + "' in the case list"),
                       line.json);
            return kExitBadInput;
        }
    }
    Result<nowcast::DelayReport> report = nowcast::delayDistribution(*drop, region, *options);
    if (!report) {
        Error e = report.error();
        e.file = args.positional[0];
        printError(e, line.json);
        return kExitBadInput;
    }
    if (line.json)
        printJson(delaysJson(*report));
    else if (args.has("csv"))
        printCsv(*report);
    else
        printText(*report);
    return kExitOk;
}

}  // namespace siftwave::cli
