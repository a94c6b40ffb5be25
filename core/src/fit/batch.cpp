#include "siftwave/fit/batch.h"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
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

unsigned workerCount(const BatchOptions& options, std::size_t regions) {
    const unsigned threads = options.threads > 0
                                 ? static_cast<unsigned>(options.threads)
                                 : std::max(1u, std::thread::hardware_concurrency());
    return std::min<unsigned>(threads, static_cast<unsigned>(std::max<std::size_t>(regions, 1)));
}

// Runs job(i, workspace) for every i < n on `threads` workers that take the next index as they
// finish (regions differ widely in cost), one workspace per worker reused for each of its
// regions. An exception that escapes a job stops the others taking new regions and is rethrown
// here once every worker has finished.
template <class Job>
void runOnWorkers(std::size_t n, unsigned threads, Job&& job) {
    std::atomic<std::size_t> next{0};
    std::atomic<bool> stop{false};
    std::exception_ptr failure;
    std::mutex failureMutex;
    auto work = [&]() {
        try {
            FitWorkspace workspace;
            for (std::size_t i = next.fetch_add(1); i < n && !stop; i = next.fetch_add(1))
                job(i, workspace);
        } catch (...) {
            const std::lock_guard lock(failureMutex);
            if (!failure)
                failure = std::current_exception();
            stop = true;
        }
    };
    if (threads <= 1) {
        work();
    } else {
        std::vector<std::thread> pool;
        for (unsigned t = 0; t < threads; ++t)
            pool.emplace_back(work);
        for (auto& th : pool)
            th.join();
    }
    if (failure)
        std::rethrow_exception(failure);
}

// The texts of the regions finished ahead of a slower one before them; whoever completes the
// run from the next index to write hands it to the sink, in order, under the lock.
class OrderedWriter {
public:
    OrderedWriter(std::size_t n, const RegionSink& sink) : pending_(n), ready_(n, 0), sink_(sink) {}

    void deliver(std::size_t index, std::string text, FitStatus status) {
        const std::lock_guard lock(mutex_);
        pending_[index] = std::move(text);
        ready_[index] = 1;
        ++tally_.perStatus[static_cast<std::size_t>(status)];
        for (; next_ < pending_.size() && ready_[next_]; ++next_) {
            sink_(next_, pending_[next_]);
            std::string().swap(pending_[next_]);  // its memory goes now, not at the end
        }
    }

    BatchTally tally() const {
        BatchTally t = tally_;
        t.regions = next_;
        return t;
    }

private:
    std::mutex mutex_;
    std::vector<std::string> pending_;
    std::vector<char> ready_;
    std::size_t next_ = 0;
    BatchTally tally_;
    const RegionSink& sink_;
};

// Every region carries the options' error (nothing is fitted).
std::vector<RegionFit> invalidOptions(std::span<const RegionSeries> regions, const Error& error) {
    std::vector<RegionFit> results(regions.size());
    for (std::size_t i = 0; i < regions.size(); ++i) {
        results[i].region = regions[i].region;
        results[i].error = error;
    }
    return results;
}

}  // namespace

Status BatchOptions::validate() const {
    if (threads < 0)
        return makeError(ErrorCode::Usage, "threads must be 0 (one per core) or more");
    return fit.validate();
}

std::vector<RegionFit> fitRegions(std::span<const RegionSeries> regions,
                                  const BatchOptions& options) {
    if (auto s = options.validate(); !s)
        return invalidOptions(regions, s.error());
    std::vector<RegionFit> results(regions.size());
    runOnWorkers(regions.size(), workerCount(options, regions.size()),
                 [&](std::size_t i, FitWorkspace& workspace) {
                     results[i] = fitOne(regions[i], options, workspace);
                 });
    return results;
}

BatchTally fitRegionsStreamed(std::span<const RegionSeries> regions, const BatchOptions& options,
                              const RegionFormatter& format, const RegionSink& sink) {
    OrderedWriter writer(regions.size(), sink);
    if (auto s = options.validate(); !s) {
        const auto failed = invalidOptions(regions, s.error());
        for (std::size_t i = 0; i < failed.size(); ++i)
            writer.deliver(i, format(failed[i]), regionStatus(failed[i]));
        return writer.tally();
    }
    runOnWorkers(regions.size(), workerCount(options, regions.size()),
                 [&](std::size_t i, FitWorkspace& workspace) {
                     const RegionFit r = fitOne(regions[i], options, workspace);
                     writer.deliver(i, format(r), regionStatus(r));
                 });
    return writer.tally();
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
