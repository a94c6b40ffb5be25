#include "briefing_inputs.h"

#include "../common.h"
#include "../transmission_flags.h"

#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/replay.h"

#include <QApplication>

#include <cstdio>
#include <cstdlib>

namespace siftwave::cli {

std::vector<FlagSpec> briefingFlagSpecs(bool fitFlags) {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back({"ledger", true, false, "LEDGER", "the ledger whose decisions are shown"});
    for (FlagSpec& spec : registerFlagSpecs("region names and populations"))
        specs.push_back(std::move(spec));
    specs.push_back({"measure", true, false, "NAME", "measure to draw (default: the first)"});
    if (fitFlags)
        specs.push_back({"fit", true, false, "MODEL",
                         "fit the cleaned series: gumbel, logistic, richards or lognormal"});
    specs.push_back(
        {"method", true, false, "METHOD", "fit method: lsq (default), poisson, negbin"});
    specs.push_back(
        {"window", true, false, "FIRST:LAST", "fit window (default: the largest wave)"});
    specs.push_back({"count-range", false, false, "",
                     "also draw the 95% range of daily counts around the fit (dotted)"});
    specs.push_back({"transmission", true, false, "R|r",
                     "a panel under the plot: R_t (R, needs a serial interval) or the growth "
                     "rate (r); also given by any of the flags below"});
    for (FlagSpec& spec : transmissionFlagSpecs("transmission-window"))
        specs.push_back(std::move(spec));
    specs.push_back({"help", false, false, "", "show this help"});
    return specs;
}

Result<std::optional<Drop>> loadPreviousRelease(const ParsedArgs& args) {
    const std::optional<std::string> path = args.optionalValue("previous");
    if (!path)
        return std::optional<Drop>{};
    Result<Drop> read = loadDrop(*path, args);
    if (!read)
        return read.error();
    return std::optional<Drop>(std::move(read.value()));
}

Result<BriefingInputs> loadBriefingInputs(const std::string& path, const ParsedArgs& args,
                                          bool ledgerRequired) {
    auto drop = loadDrop(path, args);
    if (!drop)
        return drop.error();
    BriefingInputs in;
    in.drop = std::move(drop.value());
    if (auto ledgerPath = args.optionalValue("ledger")) {
        auto ledger = ledger::readLedgerFile(*ledgerPath);
        if (!ledger)
            return ledger.error();
        in.ledger = std::move(ledger.value());
    } else if (ledgerRequired) {
        return makeError(ErrorCode::Usage, "--ledger LEDGER is required");
    }
    auto cleaned = ledger::replay(in.drop, in.ledger);
    if (!cleaned)
        return cleaned.error();
    in.cleaned = std::move(cleaned.value());
    Result<std::optional<RegionRegister>> regions = loadRegister(args, path);
    if (!regions)
        return regions.error();
    in.regions = std::move(*regions);
    return in;
}

Result<std::optional<fit::FitOptions>> fitOptionsFrom(const ParsedArgs& args, const Drop& drop,
                                                      bool fitByDefault) {
    const bool asked = args.has("fit") || (fitByDefault && !args.has("no-fit"));
    if (!asked && (args.has("method") || args.has("window")))
        return makeError(ErrorCode::Usage, "--method and --window need --fit MODEL");
    fit::FitOptions options = fit::FitOptions::forCadence(drop.axis.cadence());
    if (args.has("fit")) {
        const auto model = fit::modelFromName(args.value("fit"));
        if (!model)
            return makeError(ErrorCode::Usage,
                             "--fit takes gumbel, logistic, richards or "
                             "lognormal, not '" +
                                 args.value("fit") + "'");
        options.model = *model;
    }
    if (auto method = args.optionalValue("method")) {
        const auto m = fit::methodFromName(*method);
        if (!m)
            return makeError(ErrorCode::Usage,
                             "--method takes lsq, poisson or negbin, not '" + *method + "'");
        options.method = *m;
    }
    if (auto window = args.optionalValue("window"); window && *window != "auto") {
        const auto range = ledger::DayRange::fromIso(*window);
        if (!range)
            return makeError(ErrorCode::Usage,
                             "--window takes FIRST:LAST (ISO 8601 dates), not '" + *window + "'");
        const auto first = drop.periodOf(range->first);
        const auto last = drop.periodOf(range->last);
        if (!first || !last)
            return makeError(ErrorCode::Usage, "--window " + *window + " is outside the drop's " +
                                                   drop.axis.first().iso() + " to " +
                                                   drop.axis.lastStart().iso());
        options.window = std::make_pair(static_cast<int>(*first), static_cast<int>(*last));
    }
    if (Status s = options.validate(); !s)
        return s.error();
    if (!asked)
        return std::optional<fit::FitOptions>{};
    return std::optional<fit::FitOptions>{options};
}

Result<std::optional<transmission::TransmissionOptions>> transmissionPanelFrom(
    const ParsedArgs& args, const Drop& drop, bool& growthRate) {
    const std::optional<std::string> which = args.optionalValue("transmission");
    if (which && *which != "R" && *which != "r")
        return makeError(ErrorCode::Usage, "--transmission takes R or r, not '" + *which + "'");
    growthRate = which && *which == "r";
    if (!which && !hasTransmissionFlags(args, "transmission-window"))
        return std::optional<transmission::TransmissionOptions>{};
    auto options = transmissionOptionsFrom(args, "transmission-window", drop.axis.cadence());
    if (!options)
        return options.error();
    return std::optional<transmission::TransmissionOptions>(std::move(options.value()));
}

std::optional<BriefingSources> loadBriefingSources(const ParsedArgs& args, const char* command,
                                                   bool ledgerRequired, bool fitByDefault,
                                                   int& exitCode) {
    const bool json = args.has("json");
    auto inputs = loadBriefingInputs(args.positional[0], args, ledgerRequired);
    if (!inputs) {
        printError(inputs.error(), json);
        exitCode = inputs.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
        return std::nullopt;
    }
    auto fitOptions = fitOptionsFrom(args, inputs->drop, fitByDefault);
    if (!fitOptions) {
        std::fprintf(stderr, "siftwave-cli %s: %s\n", command,
                     terminalText(fitOptions.error().message).c_str());
        exitCode = kExitUsage;
        return std::nullopt;
    }
    Result<std::optional<Drop>> previous = loadPreviousRelease(args);
    if (!previous) {
        printError(previous.error(), json);
        exitCode = kExitBadInput;
        return std::nullopt;
    }
    bool growthRate = false;
    auto panel = transmissionPanelFrom(args, inputs->drop, growthRate);
    if (!panel) {
        printError(panel.error(), json);
        exitCode = panel.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
        return std::nullopt;
    }
    return BriefingSources{std::move(*inputs), std::move(*fitOptions), std::move(*previous),
                           std::move(*panel), growthRate};
}

std::unique_ptr<QApplication> startOffscreenApplication() {
    if (std::getenv("QT_QPA_PLATFORM") == nullptr)
        setenv("QT_QPA_PLATFORM", "offscreen", 1);
    static int argc = 1;
    static char name[] = "siftwave-cli";
    static char* argv[] = {name, nullptr};
    return std::make_unique<QApplication>(argc, argv);
}

}  // namespace siftwave::cli
