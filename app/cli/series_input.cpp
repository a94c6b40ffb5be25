#include "series_input.h"

#include "common.h"

#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/nowcast_completion.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/series/daily.h"

namespace siftwave::cli {
namespace {

// The register (--regions, else the one beside the drop unless --no-regions) when asked for,
// and the measure (--measure, default the first) for the drop.
std::optional<Failure> readRegisterAndMeasure(const ParsedArgs& args, bool readRegister,
                                              const Drop& drop, std::optional<RegionRegister>& reg,
                                              std::size_t& measure) {
    if (readRegister) {
        Result<std::optional<RegionRegister>> registerRead = loadRegister(args, args.positional[0]);
        if (!registerRead)
            return Failure{registerRead.error()};
        reg = std::move(registerRead.value());
    }
    if (auto m = args.optionalValue("measure")) {
        auto idx = drop.measureIndex(*m);
        if (!idx) {
            Error e = makeError(ErrorCode::NotFound, "the drop has no measure '" + *m + "'");
            e.file = drop.source.path;
            return Failure{e};
        }
        measure = *idx;
    }
    if (drop.measures.empty() || drop.periods() == 0)
        return Failure{makeError(ErrorCode::NotFound, "the drop holds no counts to fit")};
    return std::nullopt;
}

// The regions: --region's, or every region of the drop.
Step<std::vector<std::size_t>> selectedRegions(const ParsedArgs& args, const Drop& drop) {
    std::vector<std::size_t> indices;
    if (auto code = args.optionalValue("region")) {
        auto idx = drop.regionIndex(*code);
        if (!idx) {
            Error e = makeError(ErrorCode::NotFound, "the drop has no region '" + *code + "'");
            e.file = drop.source.path;
            e.region = *code;
            return Failure{e};
        }
        indices.push_back(*idx);
    } else {
        for (std::size_t i = 0; i < drop.regionCodes.size(); ++i)
            indices.push_back(i);
    }
    return indices;
}

// With --ledger, the ledger and the cleaned series: the ledger replayed over the drop.
std::optional<Failure> readCleaned(const ParsedArgs& args, SeriesJob& job) {
    auto path = args.optionalValue("ledger");
    if (!path)
        return std::nullopt;
    auto ledger = ledger::readLedgerFile(*path);
    if (!ledger)
        return Failure{ledger.error()};
    auto replayed = ledger::replay(job.drop, *ledger);
    if (!replayed)
        return Failure{replayed.error()};
    job.ledger = std::move(ledger.value());
    job.cleaned = std::move(replayed.value());
    return std::nullopt;
}

}  // namespace

Step<SeriesJob> prepareSeriesJob(
    const ParsedArgs& args, bool readRegister,
    const std::function<std::optional<Failure>(const Drop&)>& checkCalendar) {
    Result<Drop> drop = loadDrop(args.positional[0], args);
    if (!drop) {
        const int code = drop.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
        return Failure{drop.error(), code};
    }
    SeriesJob job{std::move(drop.value()), {}, {}, {}, 0, {}};
    if (auto f = readRegisterAndMeasure(args, readRegister, job.drop, job.reg, job.measure))
        return *f;
    if (checkCalendar) {
        if (auto f = checkCalendar(job.drop))
            return *f;
    }
    auto indices = selectedRegions(args, job.drop);
    if (auto* f = std::get_if<Failure>(&indices))
        return *f;
    job.indices = std::move(std::get<0>(indices));
    if (auto f = readCleaned(args, job))
        return *f;
    return job;
}

std::vector<double> regionCounts(const SeriesJob& job, std::size_t region) {
    if (job.cleaned)
        return ledger::cleanedCounts(*job.cleaned, job.measure, region);
    return series::countsOf(job.drop, job.measure, region);
}

std::optional<std::string> nowcastCompletionNote(const SeriesJob& job, std::size_t region) {
    if (!job.cleaned)
        return std::nullopt;
    return ledger::nowcastCompletionNote(job.drop, job.ledger, *job.cleaned,
                                         job.drop.regionCodes[region],
                                         job.drop.measures[job.measure]);
}

}  // namespace siftwave::cli
