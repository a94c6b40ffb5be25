#include "siftwave/scan/decision_check.h"

#include "siftwave/fit/fit.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/scan.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <optional>
#include <set>
#include <utility>

namespace siftwave::scan {
namespace {

/// A cleaned cell as the scan reads a drop's cell: a value where the cleaned cell counts,
/// the raw state's meaning elsewhere (blank and unparsable stay so; excluded and merged
/// cells are no longer there).
Cell asScanCell(const ledger::CleanedCell& cleaned, std::uint32_t line) {
    Cell cell;
    cell.line = line;
    switch (cleaned.state) {
        case ledger::CleanedState::Reported:
        case ledger::CleanedState::Filled: {
            constexpr std::int64_t lo = std::numeric_limits<std::int32_t>::min();
            constexpr std::int64_t hi = std::numeric_limits<std::int32_t>::max();
            cell.value = static_cast<std::int32_t>(std::clamp(cleaned.value, lo, hi));
            cell.state = CellState::Reported;
            break;
        }
        case ledger::CleanedState::Blank:
            cell.state = CellState::Blank;
            break;
        case ledger::CleanedState::Unparsable:
            cell.state = CellState::Unparsable;
            break;
        case ledger::CleanedState::Absent:
        case ledger::CleanedState::Excluded:
        case ledger::CleanedState::Merged:
            cell.state = CellState::Absent;
            cell.line = 0;
            break;
    }
    return cell;
}

/// The drop's measures `measures` (indices into drop.measures), every region, with the cleaned
/// values: what a scan after replay reads.
Drop cleanedDrop(const Drop& drop, const ledger::Cleaned& cleaned,
                 const std::vector<std::size_t>& measures) {
    Drop out;
    out.source = drop.source;
    out.regionCodes = drop.regionCodes;
    out.axis = drop.axis;
    out.rows = drop.rows;
    out.indexRegions();
    const std::size_t periods = static_cast<std::size_t>(drop.periods());
    for (std::size_t m : measures) {
        out.measures.push_back(drop.measures[m]);
        CellTable table(drop.regionCodes.size(), periods);
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            const std::span<const Cell> raw = drop.series(m, r);
            const std::span<const ledger::CleanedCell> now = cleaned.series(m, r);
            std::span<Cell> cells = table.series(r);
            for (std::size_t d = 0; d < periods; ++d)
                cells[d] = asScanCell(now[d], raw[d].line);
        }
        out.tables.push_back(std::move(table));
    }
    return out;
}

/// The measures an effect changes, as indices into drop.measures.
std::vector<std::size_t> changedMeasures(const Drop& drop, const ledger::Effect& effect) {
    std::set<std::size_t> measures;
    for (const ledger::CellChange& c : effect.cells) {
        if (const auto m = drop.measureIndex(c.measure))
            measures.insert(*m);
    }
    return {measures.begin(), measures.end()};
}

/// `before` with the effect's cells set to their after values.
Drop applyEffect(Drop before, const ledger::Effect& effect) {
    for (const ledger::CellChange& c : effect.cells) {
        const auto m = before.measureIndex(c.measure);
        const auto r = before.regionIndex(c.region);
        const auto p = before.periodOf(c.date);
        if (!m || !r || !p)
            continue;
        Cell& cell = before.tables[*m].at(*r, static_cast<std::size_t>(*p));
        cell = asScanCell(c.after, cell.line);
    }
    return before;
}

/// Only the detectors that read values: a decision changes values, not codes or rows.
ScanOptions valueDetectorsOnly(ScanOptions options) {
    options.duplicateRow.enabled = false;
    options.codeCollision.enabled = false;
    options.codeVariant.enabled = false;
    options.unknownCode.enabled = false;
    options.weekdayEffect.enabled = false;
    options.hierarchyMismatch.enabled = false;
    options.revision.enabled = false;
    options.caseDates.enabled = false;
    return options;
}

using SeriesKey = std::pair<std::string, std::string>;  // measure, region

std::set<SeriesKey> changedSeries(const ledger::Effect& effect) {
    std::set<SeriesKey> keys;
    for (const ledger::CellChange& c : effect.cells) {
        if (!(c.before == c.after))
            keys.emplace(c.measure, c.region);
    }
    return keys;
}

bool inSeries(const Finding& f, const std::set<SeriesKey>& series) {
    if (!f.region)
        return false;
    for (const SeriesKey& key : series) {
        if (key.second == *f.region && (!f.measure || key.first == *f.measure))
            return true;
    }
    return false;
}

bool overlaps(const Finding& a, const Finding& b) {
    if (!a.first || !a.last || !b.first || !b.last)
        return true;  // region-wide: the same kind there already covers it
    return *a.first <= *b.last && *b.first <= *a.last;
}

/// Findings of `after` in the changed series that no finding of `before` accounts for.
std::vector<Finding> newFindingsOf(const ScanReport& before, ScanReport after,
                                   const std::set<SeriesKey>& series) {
    std::vector<Finding> out;
    for (Finding& f : after.findings) {
        if (!inSeries(f, series))
            continue;
        const bool known =
            std::any_of(before.findings.begin(), before.findings.end(), [&](const Finding& b) {
                return b.kind == f.kind && b.region == f.region && b.measure == f.measure &&
                       overlaps(b, f);
            });
        if (!known)
            out.push_back(std::move(f));
    }
    return out;
}

const fit::Wave* largestOf(const std::vector<fit::Wave>& waves) {
    const auto it = std::max_element(
        waves.begin(), waves.end(),
        [](const fit::Wave& a, const fit::Wave& b) { return a.peakValue < b.peakValue; });
    return it == waves.end() ? nullptr : &*it;
}

/// One series as doubles, NaN where not reported.
std::vector<double> countsOf(std::span<const Cell> cells) {
    std::vector<double> out(cells.size(), std::numeric_limits<double>::quiet_NaN());
    for (std::size_t i = 0; i < cells.size(); ++i) {
        if (cells[i].reported())
            out[i] = cells[i].value;
    }
    return out;
}

/// The series before and after, and the reference a new wave is judged against: the before
/// series with only the decision's decreases applied (the counts taken off a dump, but not
/// yet put anywhere), i.e. what the reported counts show apart from the counts moved.
struct SeriesPair {
    std::vector<double> after;
    std::vector<double> reference;
    std::optional<std::pair<int, int>> raised;  // first and last period the decision raises
};

SeriesPair seriesPair(const Drop& before, const Drop& after, std::size_t m, std::size_t r) {
    SeriesPair pair{countsOf(after.series(m, r)), countsOf(before.series(m, r)), std::nullopt};
    for (std::size_t i = 0; i < pair.after.size(); ++i) {
        const double a = std::isnan(pair.reference[i]) ? 0.0 : pair.reference[i];
        const double b = std::isnan(pair.after[i]) ? 0.0 : pair.after[i];
        if (b < a) {
            pair.reference[i] = pair.after[i];
        } else if (b > a) {
            const int p = static_cast<int>(i);
            pair.raised = pair.raised ? std::pair{pair.raised->first, p} : std::pair{p, p};
        }
    }
    return pair;
}

/// Waves of the after series that peak inside the periods the decision raises, where the
/// reference (seriesPair) has no wave peaking: a peak built from moved counts alone. A dump
/// itself reads as a wave in the reported counts, and its smoothed peak can fall a few
/// periods into the window the counts go to; the reference, without the dump, does not have it.
void addNewWaves(const Drop& before, const Drop& after, const SeriesKey& key,
                 std::vector<NewWave>& out) {
    const auto m = before.measureIndex(key.first);
    const auto r = before.regionIndex(key.second);
    if (!m || !r)
        return;
    const SeriesPair pair = seriesPair(before, after, *m, *r);
    if (!pair.raised)
        return;
    const auto inRaised = [&](int p) { return pair.raised->first <= p && p <= pair.raised->second; };
    const fit::WaveDetectionOptions detection =
        fit::FitOptions::forCadence(before.axis.cadence()).detection;
    const std::vector<fit::Wave> was = fit::detectWaves(pair.reference, detection);
    if (std::any_of(was.begin(), was.end(), [&](const fit::Wave& b) { return inRaised(b.peak); }))
        return;
    const std::vector<fit::Wave> will = fit::detectWaves(pair.after, detection);
    const fit::Wave* largest = largestOf(will);
    for (const fit::Wave& w : will) {
        if (!inRaised(w.peak))
            continue;
        out.push_back({key.second, key.first, before.periodStart(w.first),
                       before.periodStart(w.peak), before.periodStart(w.last), w.peakValue,
                       &w == largest});
    }
}

}  // namespace

Result<DecisionCheck> checkDecision(const Drop& drop, const ledger::Cleaned& cleaned,
                                    const ledger::Decision& decision, const ScanOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    Result<ledger::Effect> effect = ledger::previewDecision(drop, cleaned, decision);
    if (!effect)
        return effect.error();
    DecisionCheck check;
    const std::set<SeriesKey> series = changedSeries(*effect);
    if (series.empty())
        return check;

    const Drop before = cleanedDrop(drop, cleaned, changedMeasures(drop, *effect));
    const Drop after = applyEffect(before, *effect);
    const ScanOptions values = valueDetectorsOnly(options);
    Result<ScanReport> was = scanDrop(before, values);
    if (!was)
        return was.error();
    Result<ScanReport> will = scanDrop(after, values);
    if (!will)
        return will.error();
    check.newFindings = newFindingsOf(*was, std::move(*will), series);
    for (const SeriesKey& key : series)
        addNewWaves(before, after, key, check.newWaves);
    return check;
}

std::vector<std::string> describeDecisionCheck(const DecisionCheck& check, Cadence cadence) {
    std::vector<std::string> lines;
    for (const Finding& f : check.newFindings) {
        std::string line = "new " + std::string(findingKindName(f.kind)) + " (" +
                           severityName(f.severity) + ") in " + f.region.value_or("") + " " +
                           f.measure.value_or("every measure");
        if (f.first)
            line += (f.first == f.last ? " on " : " from ") + f.first->iso();
        if (f.last && f.last != f.first)
            line += " to " + f.last->iso();
        const std::string why = describeFinding(f);
        if (!why.empty())
            line += ": " + why;
        lines.push_back(std::move(line));
    }
    const char* unit = cadence == Cadence::Weekly ? "a week" : "a day";
    for (const NewWave& w : check.newWaves) {
        char value[32];
        std::snprintf(value, sizeof value, "%.0f", w.peakValue);
        std::string line = "new wave in " + w.region + " " + w.measure + " from " + w.first.iso() +
                           ", peaking " + w.peak.iso() + " at about " + value + " " + unit +
                           " (smoothed), where the counts before the decision had none";
        if (w.largest)
            line += "; it would become the largest wave, the one a fit describes by default";
        lines.push_back(std::move(line));
    }
    return lines;
}

nlohmann::json decisionCheckToJson(const DecisionCheck& check) {
    nlohmann::json findings = nlohmann::json::array();
    for (const Finding& f : check.newFindings)
        findings.push_back(findingToJson(f));
    nlohmann::json waves = nlohmann::json::array();
    for (const NewWave& w : check.newWaves) {
        waves.push_back({{"region", w.region},
                         {"measure", w.measure},
                         {"first", w.first.iso()},
                         {"peak", w.peak.iso()},
                         {"last", w.last.iso()},
                         {"peak_value", std::isfinite(w.peakValue) ? w.peakValue : 0.0},
                         {"largest", w.largest}});
    }
    return {{"clean", check.clean()}, {"new_findings", findings}, {"new_waves", waves}};
}

}  // namespace siftwave::scan
