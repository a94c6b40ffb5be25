#pragma once
// What `figure` and `report` share: the drop, its ledger replayed, the region
// register, the fit options from the flags, and the Qt application these two
// commands need (they draw with the workbench's plot code; every other
// subcommand stays core-only). Compiled only with SIFTWAVE_WITH_QT.

#include "../args.h"

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"
#include "siftwave/transmission/transmission.h"

#include <memory>
#include <optional>
#include <string>
#include <vector>

class QApplication;

namespace siftwave::cli {

struct BriefingInputs {
    Drop drop;
    ledger::Ledger ledger;  // empty without --ledger
    ledger::Cleaned cleaned;
    std::optional<RegionRegister> regions;  // --regions, or the one beside the drop
};

/// --ledger, --regions, --measure, --fit, --method, --window and the transmission flags shared
/// by both commands.
std::vector<FlagSpec> briefingFlagSpecs(bool fitFlags);

/// Reads FILE, the ledger (required when `ledgerRequired`) and the register, and replays.
Result<BriefingInputs> loadBriefingInputs(const std::string& path, const ParsedArgs& args,
                                          bool ledgerRequired);

/// The previous release named by --previous, read with the same ingest flags; nullopt without it.
Result<std::optional<Drop>> loadPreviousRelease(const ParsedArgs& args);

/// The fit options the flags ask for; nullopt when no fit is wanted (no --fit, or
/// --no-fit when `fitByDefault`).
Result<std::optional<fit::FitOptions>> fitOptionsFrom(const ParsedArgs& args, const Drop& drop,
                                                      bool fitByDefault);

/// What `figure` and `report` read before they draw: the inputs, the fit options and the
/// previous release.
struct BriefingSources {
    BriefingInputs inputs;
    std::optional<fit::FitOptions> fit;  // nullopt: no fit
    std::optional<Drop> previous;        // with --previous
    /// The transmission panel (--transmission, or any transmission flag); nullopt: none.
    std::optional<transmission::TransmissionOptions> transmission;
    bool transmissionGrowthRate = false;  // --transmission r
};

/// The transmission panel the flags ask for (--transmission R|r, --si-mean/--si-sd or
/// --si-file, --prior-mean, --prior-sd, --weekday, --transmission-window); nullopt when none.
Result<std::optional<transmission::TransmissionOptions>> transmissionPanelFrom(
    const ParsedArgs& args, const Drop& drop, bool& growthRate);

/// Reads FILE (the one positional argument) and what the flags add to it; on failure prints the
/// error as `command` does ("siftwave-cli COMMAND: ..." or JSON) and sets `exitCode`.
std::optional<BriefingSources> loadBriefingSources(const ParsedArgs& args, const char* command,
                                                   bool ledgerRequired, bool fitByDefault,
                                                   int& exitCode);

/// A QApplication for drawing without a screen: sets QT_QPA_PLATFORM=offscreen when unset.
std::unique_ptr<QApplication> startOffscreenApplication();

}  // namespace siftwave::cli
