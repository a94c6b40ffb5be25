#pragma once
// What the commands that work on counts per region share (fit, transmission): the drop, the
// region register, the measure, the regions the flags name and, with --ledger, the cleaned
// series (the ledger replayed over the drop). One path, so every command reads the counts the
// way the fit does.

#include "args.h"

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"

#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <variant>
#include <vector>

namespace siftwave::cli {

/// A step's failure: the error to print and the exit code to return.
struct Failure {
    Error error;
    int exitCode = kExitBadInput;
};

template <class T>
using Step = std::variant<T, Failure>;

/// The drop and what the flags select in it.
struct SeriesJob {
    Drop drop;
    std::optional<RegionRegister> reg;       // with readRegister (see prepareSeriesJob)
    ledger::Ledger ledger;                   // with --ledger (else empty)
    std::optional<ledger::Cleaned> cleaned;  // with --ledger
    std::size_t measure = 0;                 // --measure, default the first
    std::vector<std::size_t> indices;        // --region's, or every region
};

/// Reads FILE (args.positional[0]) with the ingest flags, the register when `readRegister`
/// (--regions, else the one beside FILE unless --no-regions), the measure, runs `checkCalendar`
/// on the drop (a command's own rules for its cadence; may be empty), picks the regions and
/// replays --ledger.
Step<SeriesJob> prepareSeriesJob(
    const ParsedArgs& args, bool readRegister,
    const std::function<std::optional<Failure>(const Drop&)>& checkCalendar);

/// One region's counts per period: the cleaned values where a ledger was replayed, else the
/// reported ones; NaN where a cell holds no value.
std::vector<double> regionCounts(const SeriesJob& job, std::size_t region);

/// With --ledger, the sentence saying that the region's cleaned series is nowcast-completed by
/// an entry in effect (ledger/nowcast_completion.h); nullopt otherwise.
std::optional<std::string> nowcastCompletionNote(const SeriesJob& job, std::size_t region);

}  // namespace siftwave::cli
