// siftwave-cli transmission FILE [--ledger L] --region CODE [--measure NAME] [--window N]
//     [--si-mean D --si-sd D | --si-file F] [--prior-mean M --prior-sd S] [--weekday]
//     [--json|--csv]
#include "commands.h"
#include "common.h"
#include "series_input.h"

#include "siftwave/transmission/transmission.h"
#include "siftwave/transmission/transmission_export.h"

#include <charconv>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

namespace siftwave::cli {
namespace {

std::vector<FlagSpec> transmissionFlagSpecs() {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"ledger", true, false, "L",
                     "estimate on the cleaned series: replay this ledger over the drop"});
    specs.push_back({"region", true, false, "CODE", "the region (code as written in the drop)"});
    specs.push_back({"measure", true, false, "NAME", "measure (default: the first)"});
    specs.push_back({"window", true, false, "N",
                     "periods in the window ending on each period (default 7 days, 4 weeks)"});
    specs.push_back({"si-mean", true, false, "D", "serial interval mean in days (with --si-sd)"});
    specs.push_back({"si-sd", true, false, "D", "serial interval sd in days (with --si-mean)"});
    specs.push_back(
        {"si-file", true, false, "F",
         "serial interval as a CSV file 'day,weight' (days 0, 1, ...; day 0 weighs 0)"});
    specs.push_back({"prior-mean", true, false, "M", "gamma prior mean of R (default 5)"});
    specs.push_back({"prior-sd", true, false, "S", "gamma prior sd of R (default 5)"});
    specs.push_back({"weekday", false, false, "",
                     "daily counts: weekday terms in the growth regression (window >= 14)"});
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

// A flag's number; nullopt when absent; a usage message when it is not a number.
std::optional<std::string> readNumber(const ParsedArgs& args, const char* name, double& out,
                                      bool& given) {
    given = false;
    auto text = args.optionalValue(name);
    if (!text)
        return std::nullopt;
    const char* end = text->data() + text->size();
    auto [p, ec] = std::from_chars(text->data(), end, out);
    if (ec != std::errc() || p != end || !std::isfinite(out))
        return "--" + std::string(name) + " wants a number, not '" + *text + "'";
    given = true;
    return std::nullopt;
}

// The window, the prior and the weekday switch on the options for the drop's cadence.
std::optional<std::string> readEstimateFlags(const ParsedArgs& args,
                                             transmission::TransmissionOptions& o) {
    bool given = false;
    double value = 0.0;
    if (auto m = readNumber(args, "window", value, given))
        return m;
    if (given) {
        if (value != std::floor(value) || value < 3 || value > 1000)
            return std::string("--window wants a whole number of periods from 3 to 1000");
        o.setWindow(static_cast<int>(value));
    }
    if (auto m = readNumber(args, "prior-mean", o.cori.priorMean, given))
        return m;
    if (auto m = readNumber(args, "prior-sd", o.cori.priorSd, given))
        return m;
    o.growth.weekdayTerms = args.has("weekday");
    return std::nullopt;
}

// The serial interval: --si-mean with --si-sd, or --si-file, or none.
Step<std::optional<transmission::SerialInterval>> readSerialInterval(const ParsedArgs& args) {
    auto usage = [](std::string m) {
        return Failure{makeError(ErrorCode::Usage, std::move(m)), kExitUsage};
    };
    double mean = 0.0, sd = 0.0;
    bool hasMean = false, hasSd = false;
    if (auto m = readNumber(args, "si-mean", mean, hasMean))
        return usage(*m);
    if (auto m = readNumber(args, "si-sd", sd, hasSd))
        return usage(*m);
    const auto file = args.optionalValue("si-file");
    if (file && (hasMean || hasSd))
        return usage("give either --si-mean and --si-sd or --si-file, not both");
    if (hasMean != hasSd)
        return usage("--si-mean and --si-sd go together");
    if (file) {
        auto si = transmission::readSerialIntervalFile(*file);
        if (!si)
            return Failure{si.error()};
        return std::optional<transmission::SerialInterval>(std::move(si.value()));
    }
    if (!hasMean)
        return std::optional<transmission::SerialInterval>();
    auto si = transmission::discretisedGamma(mean, sd);
    if (!si)
        return Failure{si.error(), kExitUsage};
    return std::optional<transmission::SerialInterval>(std::move(si.value()));
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

void printText(const std::string& region, const transmission::TransmissionResult& result,
               const std::vector<double>& counts) {
    std::printf("%s: %s\n", terminalText(region).c_str(), result.settingsBrief().c_str());
    if (!result.refusal.empty())
        std::printf("R_t: %s\n", result.refusal.c_str());
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
        const std::string reason = !c.ok() ? c.reason : g.reason;
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
    const std::vector<FlagSpec> specs = transmissionFlagSpecs();
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
    auto si = readSerialInterval(args);
    if (auto* f = std::get_if<Failure>(&si)) {
        printError(f->error, json);
        return f->exitCode;
    }
    transmission::TransmissionOptions options;
    auto job = prepareSeriesJob(args, false, [&](const Drop& drop) -> std::optional<Failure> {
        options = transmission::TransmissionOptions::forCadence(drop.axis.cadence());
        if (auto m = readEstimateFlags(args, options))
            return Failure{makeError(ErrorCode::Usage, *m), kExitUsage};
        if (auto s = options.validate(drop.axis.cadence()); !s)
            return Failure{s.error(), kExitUsage};
        return std::nullopt;
    });
    if (auto* f = std::get_if<Failure>(&job)) {
        printError(f->error, json);
        return f->exitCode;
    }
    const SeriesJob& j = std::get<SeriesJob>(job);
    options.serialInterval = std::get<0>(std::move(si));
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
