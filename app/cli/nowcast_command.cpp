// siftwave-cli nowcast CASELIST --event-col C --report-col C --now DATE [--region-col C]
//                      [--region CODE] [--max-delay N] [--window N] [--json|--csv]
// siftwave-cli nowcast --releases FILE... [--region CODE] [--measure NAME] [--max-delay N]
//                      [--window N] [--json|--csv]
// The eventual count of each recent period, with its 95 % interval (core: nowcast/nowcast.h).
#include "commands.h"
#include "common.h"
#include "release_files.h"
#include "siftwave/csv_field.h"
#include "siftwave/nowcast/nowcast.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace siftwave::cli {
namespace {

nlohmann::json numberOrNull(double v) {
    return std::isnan(v) ? nlohmann::json(nullptr) : nlohmann::json(v);
}

nlohmann::json regionJson(const nowcast::NowcastResult& r) {
    nlohmann::json rows = nlohmann::json::array();
    for (const nowcast::NowcastRow& row : r.rows) {
        rows.push_back({{"date", row.date.iso()},
                        {"reported", row.reported},
                        {"nowcast", numberOrNull(row.nowcast)},
                        {"lo", numberOrNull(row.lo)},
                        {"hi", numberOrNull(row.hi)},
                        {"p_complete", numberOrNull(row.pComplete)},
                        {"share_reported", row.shareReported},
                        {"estimated", row.estimated}});
    }
    return {{"region", r.region},
            {"max_delay", r.maxDelay},
            {"window", r.window},
            {"delay_model", nowcast::delayModelName(r.delayModel)},
            {"trend_per_week", r.trendPerWeek},
            {"trend_z", r.trendZ},
            {"delay_share", r.delayShare},
            {"cases_left_out", r.casesLeftOut},
            {"summary", r.brief()},
            {"rows", rows}};
}

std::string number(double v) {
    if (std::isnan(v))
        return "";
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.6g", v);
    return buf;
}

void printCsv(const std::vector<nowcast::NowcastResult>& results) {
    std::printf("region,date,reported,nowcast,lo,hi,p_complete,share_reported,estimated\n");
    for (const nowcast::NowcastResult& r : results) {
        for (const nowcast::NowcastRow& row : r.rows) {
            std::printf("%s,%s,%s,%s,%s,%s,%s,%s,%s\n", csvField(r.region, true).c_str(),
                        row.date.iso().c_str(), number(row.reported).c_str(),
                        number(row.nowcast).c_str(), number(row.lo).c_str(), number(row.hi).c_str(),
                        number(row.pComplete).c_str(), number(row.shareReported).c_str(),
                        row.estimated ? "true" : "false");
        }
    }
}

void printText(const std::vector<nowcast::NowcastResult>& results) {
    for (const nowcast::NowcastResult& r : results) {
        const char* unit = r.cadence == Cadence::Weekly ? "weeks" : "days";
        std::printf("region %s, now %s: %s\n", terminalText(r.region).c_str(), r.now.iso().c_str(),
                    r.brief().c_str());
        std::printf("%-10s  %8s  %8s  %17s  %10s\n", "date", "reported", "nowcast", "95% interval",
                    "p_complete");
        const std::size_t shown = static_cast<std::size_t>(r.maxDelay) + 7;
        const std::size_t from = r.rows.size() > shown ? r.rows.size() - shown : 0;
        for (std::size_t i = from; i < r.rows.size(); ++i) {
            const nowcast::NowcastRow& row = r.rows[i];
            if (std::isnan(row.nowcast)) {
                std::printf("%-10s  %8.0f  %8s  %17s  %10s  under a tenth reported: not nowcast\n",
                            row.date.iso().c_str(), row.reported, "-", "-", "-");
                continue;
            }
            const std::string band = number(row.lo) + " - " + number(row.hi);
            std::printf("%-10s  %8.0f  %8.1f  %17s  %10.2f%s\n", row.date.iso().c_str(),
                        row.reported, row.nowcast, band.c_str(), row.pComplete,
                        row.estimated ? "  estimate" : "");
        }
        std::printf("(%zu earlier %s taken as complete; --json or --csv list every period)\n\n",
                    from, unit);
    }
    std::printf("Caution: %s\n", nowcast::kNowcastCaution);
}

std::string usageText(const std::vector<FlagSpec>& specs) {
    return "usage: siftwave-cli nowcast CASELIST --event-col C --report-col C --now DATE\n"
           "                            [--region-col C] [--region CODE] [--max-delay N] "
           "[--json|--csv]\n"
           "       siftwave-cli nowcast --releases FILE... [--region CODE] [--measure NAME]\n"
           "                            [--max-delay N] [--json|--csv]\n\n"
           "Estimates the eventual count of each recent period from the reports so far: a "
           "chain-ladder on\nthe reporting triangle (the reverse-time hazard of Kalbfleisch & "
           "Lawless 1991, Lawless 1994),\nwith a moving window (the delays constant over it, or "
           "drifting where the data show it:\n--delays), a negative-binomial 95% interval "
           "and the probability that the period\nis complete. From a case list (event and report "
           "dates) as of --now (default: its last report\ndate), or from successive releases of "
           "one series, one per period (files, or a folder of\n.csv files). "
           "One row per period: date, reported, nowcast, lo, hi, p_complete.\n" +
           std::string(nowcast::kNowcastCaution) +
           "\nExit codes: 0 done, 1 bad input, 2 wrong usage.\n\noptions:\n" + formatFlags(specs);
}

struct Job {
    std::optional<Drop> caseList;           // the case list, or ...
    std::optional<ReleaseHistory> history;  // ... the releases, oldest first
    nowcast::NowcastOptions options;
    int maxDelay = 0;
    std::optional<Date> now;
};

Result<int> wholeNumber(const ParsedArgs& args, const char* flag) {
    const std::string text = args.value(flag, "0");
    try {
        std::size_t used = 0;
        const int v = std::stoi(text, &used);
        if (used == text.size() && v >= 0)
            return v;
    } catch (const std::exception&) {
    }
    return makeError(ErrorCode::Usage, std::string("--") + flag +
                                           " takes a whole number of periods, not '" + text + "'");
}

Result<std::vector<nowcast::ReportingTriangle>> caseListTriangles(const Job& job,
                                                                  const ParsedArgs& args) {
    const Drop& drop = *job.caseList;
    std::vector<std::size_t> regions;
    if (args.has("region")) {
        const std::optional<std::size_t> r = drop.regionIndex(args.value("region"));
        if (!r)
            return makeError(ErrorCode::NotFound,
                             "no region '" + args.value("region") + "' in the case list");
        regions.push_back(*r);
    } else {
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r)
            regions.push_back(r);
    }
    const Date now = job.now ? *job.now : nowcast::lastReportDate(drop);
    std::vector<nowcast::ReportingTriangle> out;
    for (std::size_t r : regions) {
        Result<nowcast::ReportingTriangle> tri =
            nowcast::triangleFromCases(drop, r, now, job.maxDelay);
        if (!tri)
            return tri.error();
        out.push_back(std::move(*tri));
    }
    return out;
}

Result<std::vector<nowcast::ReportingTriangle>> releaseTriangles(const Job& job,
                                                                 const ParsedArgs& args) {
    const Drop& latest = job.history->latest();
    const std::string measure = args.value("measure", latest.measures.front());
    std::vector<std::string> regions;
    if (args.has("region")) {
        if (!latest.regionIndex(args.value("region"))) {
            Error e = makeError(ErrorCode::NotFound,
                                "no region '" + args.value("region") + "' in the latest release");
            e.file = latest.source.path;
            return e;
        }
        regions.push_back(args.value("region"));
    } else {
        regions = latest.regionCodes;
    }
    std::vector<nowcast::ReportingTriangle> out;
    for (const std::string& code : regions) {
        Result<nowcast::ReportingTriangle> tri =
            nowcast::triangleFromReleases(*job.history, code, measure, job.maxDelay);
        if (!tri)
            return tri.error();
        out.push_back(std::move(*tri));
    }
    return out;
}

/// The flags into a Job and the files read; an exit code on failure.
std::optional<int> prepare(const ParsedArgs& args, bool json, const std::string& usage, Job& job) {
    const bool releases = args.has("releases");
    if (args.positional.empty())
        return usageError(releases ? "--releases needs the release FILEs (or a folder)"
                                   : "nowcast needs a CASELIST (or --releases FILE...)",
                          json, usage);
    if (!releases && args.positional.size() > 1)
        return usageError("nowcast reads one case list; for several releases use --releases", json,
                          usage);
    Result<int> maxDelay = wholeNumber(args, "max-delay");
    Result<int> window = wholeNumber(args, "window");
    if (!maxDelay || !window)
        return usageError((!maxDelay ? maxDelay : window).error().message, json, usage);
    job.maxDelay = *maxDelay;
    job.options.windowPeriods = *window;
    if (args.has("delays")) {
        const std::optional<nowcast::DelayModel> model =
            nowcast::delayModelFromName(args.value("delays"));
        if (!model)
            return usageError(
                "--delays is constant, trend or auto, not '" + args.value("delays") + "'", json,
                usage);
        job.options.delayModel = *model;
    }
    if (args.has("now")) {
        job.now = Date::fromIso(args.value("now"));
        if (!job.now)
            return usageError("--now takes a date YYYY-MM-DD, not '" + args.value("now") + "'",
                              json, usage);
        if (releases)
            return usageError(
                "--now applies to a case list; a release history is as of its "
                "latest release",
                json, usage);
    }
    if (releases) {
        Result<ReleaseHistory> history = loadReleaseHistory(args.positional, args);
        if (!history) {
            printError(history.error(), json);
            return history.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
        }
        job.history = std::move(*history);
        return std::nullopt;
    }
    Result<Drop> drop = loadDrop(args.positional.front(), args);
    if (!drop) {
        printError(drop.error(), json);
        return drop.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    job.caseList = std::move(*drop);
    return std::nullopt;
}

std::vector<FlagSpec> nowcastFlags() {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"now", true, false, "DATE",
                     "case list: the date to nowcast at, counting the cases reported by then "
                     "(default: the last report date)"});
    specs.push_back({"releases", false, false, "",
                     "the FILEs are successive releases of one series (or folders of them)"});
    specs.push_back({"region", true, false, "CODE", "one region (default: every region)"});
    specs.push_back({"measure", true, false, "NAME", "releases: the measure (default: the first)"});
    specs.push_back({"max-delay", true, false, "N",
                     "the maximum delay in periods (default: case list, 99% of the delays seen; "
                     "releases, their number less one, at most 28 days or 8 weeks)"});
    specs.push_back({"window", true, false, "N",
                     "periods of the moving window that estimates the delays (default 21 days or "
                     "6 weeks)"});
    specs.push_back({"delays", true, false, "MODEL",
                     "constant (one delay distribution over the window), trend (its hazards "
                     "drift in time, after Hohle & an der Heiden 2014) or auto (default: the "
                     "trend where its Wald test rejects no drift at 5%)"});
    specs.push_back({"pool-delays", false, false, "",
                     "estimate the delays from every region together (small regions borrow "
                     "them); default: each region its own"});
    specs.push_back({"json", false, false, "", "print JSON instead of text"});
    specs.push_back({"csv", false, false, "", "print CSV: one row per region and period"});
    specs.push_back({"help", false, false, "", "show this help"});
    return specs;
}

}  // namespace

int runNowcast(int argc, char** argv, int first) {
    const std::vector<FlagSpec> specs = nowcastFlags();
    const std::string usage = usageText(specs);
    CommandLine line = parseCommandLine(argc, argv, first, specs, usage);
    if (!line.args)
        return line.exitCode;
    const ParsedArgs& args = *line.args;
    Job job;
    if (std::optional<int> code = prepare(args, line.json, usage, job))
        return *code;
    Result<std::vector<nowcast::ReportingTriangle>> triangles =
        args.has("releases") ? releaseTriangles(job, args) : caseListTriangles(job, args);
    if (!triangles) {
        printError(triangles.error(), line.json);
        return triangles.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    // --pool-delays: every region's delays estimated from the regions' triangles summed.
    std::optional<nowcast::ReportingTriangle> pooled;
    if (args.has("pool-delays")) {
        Result<nowcast::ReportingTriangle> sum = nowcast::pooledTriangle(*triangles);
        if (!sum) {
            printError(sum.error(), line.json);
            return kExitBadInput;
        }
        pooled = std::move(*sum);
    }
    std::vector<nowcast::NowcastResult> results;
    for (const nowcast::ReportingTriangle& tri : *triangles) {
        Result<nowcast::NowcastResult> r =
            nowcast::nowcast(tri, pooled ? *pooled : tri, job.options);
        if (!r) {
            printError(r.error(), line.json);
            return kExitUsage;
        }
        results.push_back(std::move(*r));
    }
    if (line.json) {
        nlohmann::json regions = nlohmann::json::array();
        for (const nowcast::NowcastResult& r : results)
            regions.push_back(regionJson(r));
        printJson({{"method",
                    "chain-ladder on the reporting triangle (reverse-time hazard, "
                    "Kalbfleisch & Lawless 1991, Lawless 1994), negative-binomial "
                    "predictive interval"},
                   {"source", args.has("releases") ? "releases" : "case_list"},
                   {"now", results.empty() ? nlohmann::json(nullptr)
                                           : nlohmann::json(results.front().now.iso())},
                   {"level", job.options.level},
                   {"delays_from", pooled ? "pooled" : "region"},
                   {"caution", nowcast::kNowcastCaution},
                   {"regions", regions}});
    } else if (args.has("csv")) {
        printCsv(results);
    } else {
        printText(results);
    }
    return kExitOk;
}

}  // namespace siftwave::cli
