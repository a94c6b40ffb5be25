#pragma once
// Fitting many regions at once on a pool of worker threads (one per core by default).
// Each region is fitted independently; a failure is reported for that region and never stops
// the others. Results come back in input order, so the output is the same for any thread count.

#include "siftwave/fit/fit.h"

#include <array>
#include <cstddef>
#include <functional>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::fit {

struct RegionSeries {
    std::string region;  // verbatim code
    Series series;       // the counts must outlive fitRegions()
    std::optional<double> population;
};

struct BatchOptions {
    FitOptions fit;   // the model choice too (FitOptions::modelChoice)
    int threads = 0;  // 0: std::thread::hardware_concurrency()

    Status validate() const;
};

struct RegionFit {
    std::string region;
    std::optional<FitResult> fit;                // empty when the region failed
    std::optional<Error> error;                  // why it failed
    std::vector<ModelComparisonRow> comparison;  // with ModelChoice::LowestAicc
};

/// A region's status (fit.h, FitStatus): its fit's; no_wave when the fit failed with not_found (no
/// wave detected, or none in the window); not_converged for any other failure.
FitStatus regionStatus(const RegionFit& r);
/// Why the status is not ok: the fit's status reasons, or the failure's message.
std::vector<std::string> regionStatusReasons(const RegionFit& r);

std::vector<RegionFit> fitRegions(std::span<const RegionSeries> regions,
                                  const BatchOptions& options);

/// Turns one finished region into its output text (a JSON object, a CSV row ...). Called on the
/// worker thread that fitted the region, so the formatting runs in parallel as the fits do; it
/// must not touch shared state.
using RegionFormatter = std::function<std::string(const RegionFit&)>;
/// Receives each region's text once, in input order (index 0, 1, 2 ...), as soon as it and every
/// region before it are finished. Calls never overlap (they hold the batch's writer lock), but
/// may come from any worker thread.
using RegionSink = std::function<void(std::size_t index, std::string_view text)>;

/// What a streamed batch leaves behind once every text has been written: the count per status
/// (indexed by FitStatus).
struct BatchTally {
    std::size_t regions = 0;
    std::array<int, 4> perStatus{};
};

/// fitRegions() without keeping the results: each region is fitted, formatted by `format` on the
/// same worker and handed to `sink` in input order; the fit is dropped as soon as its text is
/// made. The output is the same for any thread count; memory holds at most the texts that wait
/// for a slower region before them.
BatchTally fitRegionsStreamed(std::span<const RegionSeries> regions, const BatchOptions& options,
                              const RegionFormatter& format, const RegionSink& sink);

}  // namespace siftwave::fit
