// siftwave-cli transmission FILE [--ledger L] --region CODE [--measure NAME] [--window N]
//     [--si-mean D --si-sd D | --si-file F] [--prior-mean M --prior-sd S] [--weekday]
//     [--json|--csv]
#include "commands.h"
#include "common.h"
#include "series_input.h"
#include "transmission_flags.h"

#include "siftwave/transmission/transmission.h"
#include "siftwave/transmission/transmission_export.h"

#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

namespace siftwave::cli {
namespace {

std::vector<FlagSpec> commandFlagSpecs() {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"ledger", true, false, "L",
                     "estimate on the cleaned series: replay this ledger over the drop"});
    specs.push_back({"region", true, false, "CODE", "the region (code as written in the drop)"});
    specs.push_back({"measure", true, false, "NAME", "measure (default: the first)"});
    for (FlagSpec& spec : transmissionFlagSpecs("window"))
        specs.push_back(std::move(spec));
    specs.push_back({"json", false, false, "", "print JSON (an object with settings and rows)"});
    specs.push_back({"csv", false, false, "", "print CSV (RFC 4180), one row per period"});
    specs.push_back({"help", false, false, "", "show this help"});
    return specs;
}

std::string usageText(const std::vector<FlagSpec>& specs) {
    return std::string(
               "usage: siftwave-cli transmission FILE --region CODE [--ledger L] [options]\n"
               "           [--si-mean D --si-sd D | --si-file F] [--json|--csv]\n\n"
               "Estimates, for every day or week of one region's counts (cleaned with --ledger),\n"
               "the growth rate r per day with the doubling or halving time (Poisson regression\n"
               "over the window, quasi-Poisson when overdispersed) and the instantaneous\n"
               "reproduction number R_t by the method of Cori et al. (2013), with 95% intervals.\n"
               "Where a period has no estimate, `reason` says why (window not yet full, missing\n"
               "counts, posterior CV above 0.3, ...). R_t needs a serial interval; weekly counts\n"
               "are refused for R_t when most of it falls within one week.\n"
               "Exit codes: 0 estimated, 1 bad input, 2 wrong usage.\n\n") +
           transmission::caution + "\n\noptions:\n" + formatFlags(specs);
}

std::string fixed(double v, const char* format) {
    if (std::isinf(v))
        return "open";
    if (!std::isfinite(v))
        return "-";
    char text[32];
    std::snprintf(text, sizeof text, format, v);
    return text;
}

/// Why a row lacks an estimate, for each measure that has none ("r: ...; R: ..."). A refusal
/// of R_t for the whole series is printed once above the table, not on every row.
std::string rowReason(const transmission::TransmissionResult& result,
                      const transmission::GrowthEstimate& g, const transmission::CoriEstimate& c) {
    std::string reason;
    if (!g.ok() && !g.reason.empty())
        reason = "r: " + g.reason;
    if (!c.ok() && !c.reason.empty() && c.reason != result.refusal)
        reason += (reason.empty() ? "R: " : "; R: ") + c.reason;
    return reason;
}

void printText(const std::string& region, const transmission::TransmissionResult& result,
               const std::vector<double>& counts) {
    std::printf("%s: %s\n", terminalText(region).c_str(), result.settingsBrief().c_str());
    if (!result.refusal.empty())
        std::printf("R_t is not estimated for any period: %s\n", result.refusal.c_str());
    std::printf("%-12s %7s %8s %19s %18s %6s %15s  %s\n", "period", "count", "r/day", "95% CI",
                "doubling/halving", "R", "95% CI", "reason");
    for (const auto& row : result.rows) {
        const auto& g = row.growth;
        const auto& c = row.reproduction;
        const bool halving = std::isfinite(g.halvingDays.value);
        const transmission::Interval& t = halving ? g.halvingDays : g.doublingDays;
        const std::string time = std::isfinite(t.value)
                                     ? (halving ? "h " : "d ") + fixed(t.value, "%.1f") + " (" +
                                           fixed(t.lower, "%.1f") + ".." + fixed(t.upper, "%.1f") +
                                           ")"
                                     : "-";
        const bool hasR = c.ok() && c.hasPosterior();
        const std::string reason = rowReason(result, g, c);
        std::printf(
            "%-12s %7s %8s %19s %18s %6s %15s  %s\n", result.axis.periodName(row.period).c_str(),
            fixed(counts[static_cast<std::size_t>(row.period)], "%.0f").c_str(),
            fixed(g.r.value, "%.4f").c_str(),
            g.ok()
                ? ("[" + fixed(g.r.lower, "%.4f") + ", " + fixed(g.r.upper, "%.4f") + "]").c_str()
                : "-",
            time.c_str(), hasR ? fixed(c.mean, "%.2f").c_str() : "-",
            hasR ? ("[" + fixed(c.lower, "%.2f") + ", " + fixed(c.upper, "%.2f") + "]").c_str()
                 : "-",
            reason.c_str());
    }
    std::printf("\nCaution: %s\n", transmission::caution);
}

}  // namespace

int runTransmission(int argc, char** argv, int first) {
    const std::vector<FlagSpec> specs = commandFlagSpecs();
    const std::string usage = usageText(specs);
    CommandLine line = parseCommandLine(argc, argv, first, specs, usage);
    if (!line.args)
        return line.exitCode;
    const ParsedArgs& args = *line.args;
    const bool json = args.has("json"), csv = args.has("csv");
    if (json && csv)
        return usageError("--json and --csv exclude each other", json, usage);
    if (args.positional.size() != 1)
        return usageError("transmission needs exactly one FILE", json, usage);
    if (!args.has("region"))
        return usageError("transmission needs --region CODE", json, usage);
    transmission::TransmissionOptions options;
    auto job = prepareSeriesJob(args, false, [&](const Drop& drop) -> std::optional<Failure> {
        auto read = transmissionOptionsFrom(args, "window", drop.axis.cadence());
        if (!read) {
            const bool isUsage = read.error().code == ErrorCode::Usage;
            return Failure{read.error(), isUsage ? kExitUsage : kExitBadInput};
        }
        options = std::move(read.value());
        return std::nullopt;
    });
    if (auto* f = std::get_if<Failure>(&job)) {
        printError(f->error, json);
        return f->exitCode;
    }
    const SeriesJob& j = std::get<SeriesJob>(job);
    const std::vector<double> counts = regionCounts(j, j.indices[0]);
    const auto result = transmission::estimateTransmission(counts, j.drop.axis, options);
    const std::string& region = j.drop.regionCodes[j.indices[0]];
    const std::string& measure = j.drop.measures[j.measure];
    if (json) {
        printJson(transmission::transmissionToJson(region, measure, result));
    } else if (csv) {
        std::printf("%s\n", std::string(transmission::transmissionCsvHeader()).c_str());
        for (std::size_t i = 0; i < result.rows.size(); ++i)
            std::printf("%s\n", transmission::transmissionCsvRow(result, i).c_str());
        std::fprintf(stderr, "siftwave-cli: %s\n", transmission::caution);
    } else {
        printText(region, result, counts);
    }
    return kExitOk;
}

}  // namespace siftwave::cli
