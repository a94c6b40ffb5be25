// siftwave-cli: read, scan, decide, fit and export from the command line.
#include "args.h"
#include "commands.h"
#include "common.h"

#include <cstdio>
#include <cstring>
#include <string>

namespace {

struct Command {
    const char* name;
    const char* summary;
    int (*run)(int, char**, int);
};

constexpr Command kCommands[] = {
    {"inspect", "read a data drop and report what was read", siftwave::cli::runInspect},
    {"scan", "find what is wrong with a drop, ranked for review", siftwave::cli::runScan},
    {"decide", "record a cleaning decision, with its reason, in a ledger",
     siftwave::cli::runDecide},
    {"apply", "replay a ledger on a drop and write the cleaned data", siftwave::cli::runApply},
    {"ledger", "verify a ledger or write its audit report", siftwave::cli::runLedger},
    {"signing-key", "make or show your key for signing ledger entries",
     siftwave::cli::runSigningKey},
    {"fit", "fit wave curves to one region or all, with 95% intervals", siftwave::cli::runFit},
    {"transmission", "growth rate, doubling time and R_t per period, with 95% intervals",
     siftwave::cli::runTransmission},
    {"figure", "draw an annotated briefing figure (PNG, SVG, PDF; needs Qt)",
     siftwave::cli::runFigure},
    {"report", "write the briefing report (PDF, HTML; needs Qt)", siftwave::cli::runReport},
};

void printUsage(std::FILE* to) {
    std::fprintf(to, "usage: siftwave-cli COMMAND [ARGS] [--json]\n\ncommands:\n");
    for (const Command& c : kCommands)
        std::fprintf(to, "  %-12s %s\n", c.name, c.summary);
    std::fprintf(to, "\nRun 'siftwave-cli COMMAND --help' for the options of one command.\n");
}

}  // namespace

int main(int argc, char** argv) {
    if (argc < 2) {
        printUsage(stderr);
        return siftwave::cli::kExitUsage;
    }
    const std::string name = argv[1];
    if (name == "--help" || name == "-h" || name == "help") {
        printUsage(stdout);
        return siftwave::cli::kExitOk;
    }
    if (name == "--version") {
        std::printf("siftwave-cli 0.1.0\n");
        return siftwave::cli::kExitOk;
    }
    for (const Command& c : kCommands) {
        if (name == c.name)
            return siftwave::cli::runGuarded(c.name, c.run, argc, argv);
    }
    std::fprintf(stderr, "siftwave-cli: unknown command '%s'\n\n", name.c_str());
    printUsage(stderr);
    return siftwave::cli::kExitUsage;
}
