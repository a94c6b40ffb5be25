// siftwave-cli report FILE --ledger L [--regions REG] [--region CODE ...] [--previous FILE]
//     [--measure NAME] [--fit MODEL | --no-fit] [--method M] --out brief.pdf|brief.html [--json]
// The briefing report: per region the annotated figure and the fit table, the findings,
// every ledger entry and the audit reconciliation.
#include "../commands.h"
#include "../common.h"
#include "briefing_inputs.h"

#include "siftwave/ingest/ingest.h"
#include "siftwave/report/briefing.h"
#include "widgets/export/report_writer.h"

#include <QApplication>

#include <cstdio>

namespace siftwave::cli {
namespace {

std::vector<FlagSpec> reportFlags() {
    std::vector<FlagSpec> specs = briefingFlagSpecs(true);
    specs.push_back({"region", true, true, "CODE",
                     "region to include (repeatable; default: those the ledger touched)"});
    specs.push_back({"previous", true, false, "FILE", "the previous release (revisions)"});
    specs.push_back({"no-fit", false, false, "", "leave the fits out (default: gumbel, lsq)"});
    specs.push_back({"out", true, false, "BRIEF", "output file: .pdf or .html"});
    specs.push_back({"title", true, false, "TEXT", "report title"});
    specs.push_back({"json", false, false, "", "print a summary of what was written as JSON"});
    return specs;
}

int usageError(const std::string& message) {
    std::fprintf(stderr, "siftwave-cli report: %s\n", terminalText(message).c_str());
    return kExitUsage;
}

}  // namespace

int runReport(int argc, char** argv, int first) {
    const std::vector<FlagSpec> specs = reportFlags();
    std::string error;
    auto args = parseArgs(argc, argv, first, specs, error);
    if (!args)
        return usageError(error);
    if (args->has("help")) {
        std::printf(
            "usage: siftwave-cli report FILE --ledger L [--regions REG] [--previous FILE]\n"
            "           --out brief.pdf|brief.html\n\n"
            "Per region the annotated figure and the fit table, a findings summary, every\n"
            "ledger entry and the audit reconciliation (raw total, cleaned total, the\n"
            "entries that explain the difference).\n\n%s",
            formatFlags(specs).c_str());
        return kExitOk;
    }
    const bool json = args->has("json");
    if (args->positional.size() != 1)
        return usageError("expects one data file (FILE)");
    if (!args->has("ledger"))
        return usageError("--ledger LEDGER is required");
    if (!args->has("out"))
        return usageError("--out brief.pdf|brief.html is required");
    const QString out = QString::fromStdString(args->value("out"));
    if (!widgets::reportFileFormatFromPath(out))
        return usageError("--out must end in .pdf or .html");
    if (args->has("fit") && args->has("no-fit"))
        return usageError("--fit and --no-fit contradict each other");

    int exitCode = kExitOk;
    const std::optional<BriefingSources> sources =
        loadBriefingSources(*args, "report", true, true, exitCode);
    if (!sources)
        return exitCode;
    const BriefingInputs* inputs = &sources->inputs;

    report::BriefingRequest request;
    request.regions = args->values("region");
    request.measure = args->value("measure");
    request.fitRegions = sources->fit.has_value();
    if (sources->fit)
        request.fit = *sources->fit;
    request.regionRegister = inputs->regions ? &*inputs->regions : nullptr;
    request.previous = sources->previous ? &*sources->previous : nullptr;
    request.title = args->value("title");
    request.countRange = args->has("count-range");
    request.transmission = sources->transmission;
    request.transmissionGrowthRate = sources->transmissionGrowthRate;
    auto briefing = report::buildBriefing(inputs->drop, inputs->ledger, inputs->cleaned, request);
    if (!briefing) {
        printError(briefing.error(), json);
        return briefing.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }

    const auto app = startOffscreenApplication();
    if (Status s = widgets::writeBriefingReport(out, *briefing); !s) {
        printError(s.error(), json);
        return kExitBadInput;
    }
    if (json) {
        nlohmann::json regions = nlohmann::json::array();
        for (const auto& f : briefing->figures)
            regions.push_back(f.regionCode);
        printJson({{"report", out.toStdString()},
                   {"regions", regions},
                   {"ledger_entries", briefing->ledger.size()},
                   {"findings", briefing->findings.total},
                   {"chain_verified", briefing->chainVerified}});
    } else {
        std::printf("wrote %s (%zu regions, %zu ledger entries)\n",
                    terminalText(out.toStdString()).c_str(), briefing->figures.size(),
                    briefing->ledger.size());
    }
    return kExitOk;
}

}  // namespace siftwave::cli
