#include "support/restoration_eval.h"

#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/backlog.h"
#include "siftwave/scan/scan.h"
#include "siftwave/scan/suggested_decision.h"

#include <nlohmann/json.hpp>
#include "support/synthetic_drop.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <random>
#include <set>
#include <utility>

namespace siftwave::testing {
namespace {

constexpr int kDays = 240;
constexpr int kBefore = 14;  // days before the fault that the comparison covers

struct Fault {
    std::size_t region = 0;
    bool backlog = true;
    int days = 0;
    double share = 1;
    std::int32_t dump = 0;  // the day the held counts are reported on
};

// A dump day whose fault window lies in an active stretch (mean >= 8 a day on average),
// with room for the 14 days before and 14 after.
std::int32_t pickDumpDay(const SyntheticDrop& s, std::size_t r, int faultDays,
                         std::mt19937_64& rng) {
    std::vector<std::int32_t> candidates;
    for (std::int32_t t = faultDays + kBefore + 1; t < kDays - 15; ++t) {
        double sum = 0;
        for (std::int32_t d = t - faultDays; d < t; ++d)
            sum += s.mean[r * kDays + static_cast<std::size_t>(d)];
        if (sum / faultDays >= 8)
            candidates.push_back(t);
    }
    if (candidates.empty())
        return -1;
    std::uniform_int_distribution<std::size_t> pick(0, candidates.size() - 1);
    return candidates[pick(rng)];
}

std::vector<Fault> plantFaults(SyntheticDrop& s, int regions, std::mt19937_64& rng) {
    std::vector<Fault> faults;
    for (std::size_t r = 0; r < static_cast<std::size_t>(regions); ++r) {
        Fault f;
        f.region = r;
        f.backlog = r % 3 != 2;  // two backlogs for every gap
        f.days = f.backlog ? std::uniform_int_distribution<int>(7, 28)(rng)
                           : std::uniform_int_distribution<int>(3, 7)(rng);
        f.share = f.backlog ? std::uniform_real_distribution<double>(0.3, 0.6)(rng) : 1.0;
        f.dump = pickDumpDay(s, r, f.days, rng);
        if (f.dump < 0)
            continue;
        if (f.backlog)
            plantBacklogDump(s, r, f.dump, f.days, f.share);
        else
            plantReportingGap(s, r, f.dump - f.days, f.days);
        faults.push_back(f);
    }
    return faults;
}

bool isFound(const std::vector<scan::Finding>& findings, const Drop& drop, const Fault& f) {
    const std::string& code = drop.regionCodes[f.region];
    for (const scan::Finding& x : findings) {
        if (!x.region || *x.region != code || !x.first || !x.last)
            continue;
        const bool dump =
            x.kind == scan::FindingKind::BacklogDump && drop.periodOf(*x.first) == f.dump;
        const bool gap = x.kind == scan::FindingKind::ReportingGap &&
                         drop.periodOf(*x.first) <= f.dump - 1 &&
                         drop.periodOf(*x.last) >= f.dump - f.days;
        if (dump || gap)
            return true;
    }
    return false;
}

// Applies every redistribution suggested (one per region and dump day: a backlog_dump's
// first, then a reporting_gap's for the same day), through draftEntry and applyEntry.
void applySuggestions(const Drop& drop, const std::vector<scan::Finding>& findings,
                      ledger::Cleaned& cleaned, std::vector<RestoredRegion>& out,
                      std::size_t offset) {
    ledger::Ledger ledger;
    std::set<std::pair<std::string, std::int32_t>> done;
    for (const scan::FindingKind kind :
         {scan::FindingKind::BacklogDump, scan::FindingKind::ReportingGap}) {
        for (const scan::Finding& f : findings) {
            if (f.kind != kind || !f.suggestion ||
                f.suggestion->kind != ledger::DecisionKind::Redistribute)
                continue;
            Result<ledger::Decision> d = scan::suggestedDecision(f, drop.measures[0]);
            if (!d || !d->date ||
                !done.insert({d->region, drop.periodOf(*d->date).value_or(-1)}).second)
                continue;
            ledger::EntryMeta meta{"evaluation", "2026-12-01T00:00:00Z", "scan suggestion"};
            Result<ledger::LedgerEntry> entry = ledger::draftEntry(drop, ledger, cleaned, *d, meta);
            RestoredRegion* row = nullptr;
            for (std::size_t i = offset; i < out.size(); ++i)
                if (out[i].region == d->region)
                    row = &out[i];
            if (!entry || !ledger::applyEntry(drop, cleaned, *entry)) {
                if (row) {
                    ++row->refused;
                    row->refusal = entry ? "apply" : entry.error().describe();
                }
                continue;
            }
            ledger.entries.push_back(std::move(*entry));
            if (row) {
                ++row->applied;
                row->moved += d->excess;
                row->windowPeriods =
                    *drop.periodOf(d->window->last) - *drop.periodOf(d->window->first) + 1;
            }
        }
    }
}

void measure(const std::vector<std::int32_t>& truth, const SyntheticDrop& s,
             const ledger::Cleaned& cleaned, const Fault& f, RestoredRegion& row) {
    const std::int32_t first = std::max(0, f.dump - f.days - kBefore);
    for (std::int32_t t = first; t <= f.dump; ++t) {
        const double tv = truth[f.region * kDays + static_cast<std::size_t>(t)];
        const double rv = s.drop.tables[0].at(f.region, static_cast<std::size_t>(t)).value;
        const ledger::CleanedCell& c = cleaned.cell(0, f.region, t);
        const double cv = c.hasValue() ? static_cast<double>(c.value) : 0.0;
        row.errorBefore += std::fabs(rv - tv);
        row.errorAfter += std::fabs(cv - tv);
        row.trueMax = std::max(row.trueMax, tv);
        row.cleanedMax = std::max(row.cleanedMax, cv);
    }
    row.removed = row.errorBefore > 0 ? 1.0 - row.errorAfter / row.errorBefore : 1.0;
}

void print(const SyntheticDrop& s, const std::vector<std::int32_t>& truth,
           const scan::ScanReport& report, const std::string& region) {
    const std::optional<std::size_t> r = s.drop.regionIndex(region);
    if (!r)
        return;
    for (const scan::Finding& f : report.findings)
        if (f.region && *f.region == region)
            std::printf("%s\n", scan::findingToJson(f).dump().c_str());
    for (std::int32_t t = 0; t < kDays; ++t)
        std::printf("%d:%d/%d ", t, s.drop.tables[0].at(*r, static_cast<std::size_t>(t)).value,
                    truth[*r * kDays + static_cast<std::size_t>(t)]);
    std::printf("\n");
}

double median(std::vector<double> v) {
    if (v.empty())
        return 0;
    std::sort(v.begin(), v.end());
    const std::size_t n = v.size();
    return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

}  // namespace

RestorationSummary evaluateRestoration(const std::vector<std::uint64_t>& seeds, int regions,
                                       const scan::ScanOptions& options,
                                       const std::string& printRegion) {
    RestorationSummary sum;
    for (const std::uint64_t seed : seeds) {
        SyntheticOptions o;
        o.seed = seed;
        o.regions = regions;
        o.days = kDays;
        o.minPeak = 30;
        o.maxPeak = 400;
        SyntheticDrop s = makeSyntheticDrop(o);
        s.drop.source.sha256 = std::string(64, 'a');  // the ledger binds entries to a file hash
        std::vector<std::int32_t> truth;
        for (std::size_t r = 0; r < static_cast<std::size_t>(regions); ++r)
            for (std::int32_t t = 0; t < kDays; ++t)
                truth.push_back(s.drop.tables[0].at(r, static_cast<std::size_t>(t)).value);
        std::mt19937_64 rng(seed * 7919 + 17);
        const std::vector<Fault> faults = plantFaults(s, regions, rng);
        const Result<scan::ScanReport> report = scanDrop(s.drop, options);
        if (!report)
            continue;
        const std::size_t offset = sum.regions.size();
        for (const Fault& f : faults) {
            RestoredRegion row;
            row.seed = seed;
            row.region = s.drop.regionCodes[f.region];
            row.kind = f.backlog ? "backlog" : "gap";
            row.faultDays = f.days;
            row.share = f.share;
            row.dumpDay = f.dump;
            row.found = isFound(report->findings, s.drop, f);
            if (!row.found) {
                const auto e = scan::estimateBacklog(s.drop, s.drop.measures[0], row.region,
                                                     s.drop.periodStart(f.dump), options);
                if (e) {
                    row.why = "z " + std::to_string(e->z) + " expected " +
                              std::to_string(e->expected) + " excess " + std::to_string(e->excess) +
                              (e->sustained ? " sustained" : "");
                } else {
                    row.why = e.error().describe();
                }
            }
            for (const PlantedProblem& p : s.planted)
                if (p.region == f.region && p.kind == "backlog_dump")
                    row.planted = p.amount;
            sum.regions.push_back(row);
        }
        if (!printRegion.empty())
            print(s, truth, *report, printRegion);
        ledger::Cleaned cleaned(s.drop);
        applySuggestions(s.drop, report->findings, cleaned, sum.regions, offset);
        for (std::size_t i = 0; i < faults.size(); ++i)
            measure(truth, s, cleaned, faults[i], sum.regions[offset + i]);
    }
    std::vector<double> removed;
    sum.worst = 1;
    for (const RestoredRegion& r : sum.regions) {
        removed.push_back(r.removed);
        sum.worst = std::min(sum.worst, r.removed);
        sum.spikes += r.cleanedMax > 1.5 * r.trueMax;
        sum.found += r.found;
    }
    sum.median = median(removed);
    return sum;
}

}  // namespace siftwave::testing
