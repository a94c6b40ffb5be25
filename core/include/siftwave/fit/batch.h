#pragma once
// Fitting many regions at once on a pool of worker threads (one per core by default).
// Each region is fitted independently; a failure is reported for that region and never stops
// the others. Results come back in input order, so the output is the same for any thread count.

#include "siftwave/fit/fit.h"

#include <optional>
#include <span>
#include <string>
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

}  // namespace siftwave::fit
