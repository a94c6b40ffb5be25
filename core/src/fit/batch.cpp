#include "siftwave/fit/batch.h"

#include <atomic>
#include <exception>
#include <thread>

namespace siftwave::fit {
namespace {

RegionFit fitOne(const RegionSeries& region, const BatchOptions& options, FitWorkspace& workspace) {
    RegionFit out;
    out.region = region.region;
    try {
        // The model choice is the fit's own (FitOptions::modelChoice); with the lowest AICc the
        // comparison it was chosen from comes back too.
        ComparedFit r =
            fitWithComparison(region.series, options.fit, region.population,
                              options.fit.modelChoice == ModelChoice::LowestAicc, workspace);
        if (r.fit)
            out.fit = std::move(r.fit.value());
        else
            out.error = r.fit.error();
        out.comparison = std::move(r.comparison);
    } catch (const std::exception& e) {  // e.g. std::bad_alloc: this region only
        out.error = makeError(ErrorCode::Numerical, std::string("fit aborted: ") + e.what());
    }
    if (out.error)
        out.error->region = region.region;
    return out;
}

}  // namespace

Status BatchOptions::validate() const {
    if (threads < 0)
        return makeError(ErrorCode::Usage, "threads must be 0 (one per core) or more");
    return fit.validate();
}

std::vector<RegionFit> fitRegions(std::span<const RegionSeries> regions,
                                  const BatchOptions& options) {
    std::vector<RegionFit> results(regions.size());
    if (auto s = options.validate(); !s) {
        for (std::size_t i = 0; i < regions.size(); ++i) {
            results[i].region = regions[i].region;
            results[i].error = s.error();
        }
        return results;
    }
    unsigned threads = options.threads > 0 ? static_cast<unsigned>(options.threads)
                                           : std::max(1u, std::thread::hardware_concurrency());
    threads = std::min<unsigned>(threads,
                                 static_cast<unsigned>(std::max<std::size_t>(regions.size(), 1)));
    std::atomic<std::size_t> next{0};
    // One workspace per worker, reused for each of its regions.
    auto work = [&]() {
        FitWorkspace workspace;
        for (std::size_t i = next.fetch_add(1); i < regions.size(); i = next.fetch_add(1)) {
            results[i] = fitOne(regions[i], options, workspace);
        }
    };
    if (threads <= 1) {
        work();
        return results;
    }
    std::vector<std::thread> pool;
    for (unsigned t = 0; t < threads; ++t)
        pool.emplace_back(work);
    for (auto& th : pool)
        th.join();
    return results;
}

FitStatus regionStatus(const RegionFit& r) {
    if (r.fit)
        return r.fit->status;
    return r.error && r.error->code == ErrorCode::NotFound ? FitStatus::NoWave
                                                           : FitStatus::NotConverged;
}

std::vector<std::string> regionStatusReasons(const RegionFit& r) {
    if (r.fit)
        return r.fit->statusReasons;
    return {r.error ? r.error->message : std::string("the fit failed")};
}

}  // namespace siftwave::fit
