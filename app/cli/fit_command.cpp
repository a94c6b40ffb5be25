// siftwave-cli fit FILE [--regions REG] (--region CODE | --all) [--measure NAME]
//     [--model gumbel|logistic|richards|lognormal|best] [--method lsq|poisson|negbin]
//     [--window FIRST:LAST|auto] [--wave largest|latest|N] [--json [--curve]|--csv]
#include "commands.h"
#include "common.h"
#include "series_input.h"

#include "siftwave/fit/batch.h"
#include "siftwave/fit/fit_export.h"
#include "siftwave/json_text.h"
#include "siftwave/nowcast/nowcast.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdarg>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <string>
#include <unordered_map>
#include <variant>
#include <vector>

namespace siftwave::cli {
namespace {

// printf at the end of `out`.
[[gnu::format(printf, 2, 3)]] void appendf(std::string& out, const char* format, ...) {
    char buffer[512];
    std::va_list args;
    va_start(args, format);
    const int n = std::vsnprintf(buffer, sizeof buffer, format, args);
    va_end(args);
    if (n < 0)
        return;
    if (static_cast<std::size_t>(n) < sizeof buffer) {
        out.append(buffer, static_cast<std::size_t>(n));
        return;
    }
    const std::size_t old = out.size();
    out.resize(old + static_cast<std::size_t>(n) + 1);
    va_start(args, format);
    std::vsnprintf(out.data() + old, static_cast<std::size_t>(n) + 1, format, args);
    va_end(args);
    out.resize(old + static_cast<std::size_t>(n));
}

// The status line of a region (issue 15): its name and, when not ok, the reasons.
void appendStatus(std::string& out, const fit::RegionFit& r) {
    const fit::FitStatus status = fit::regionStatus(r);
    appendf(out, "  status          %s\n", fit::fitStatusName(status));
    if (status == fit::FitStatus::Ok)
        return;
    for (const auto& why : fit::regionStatusReasons(r))
        appendf(out, "    - %s\n", terminalText(why).c_str());
    appendf(out, "    try %s\n", fit::fitStatusAdvice(status));
}

// One region as text (made on the worker that fitted it with --all).
std::string regionText(const fit::RegionFit& r, const TimeAxis& axis) {
    std::string out;
    if (!r.fit) {
        appendf(out, "%s: fit failed: %s\n", terminalText(r.region).c_str(),
                terminalText(r.error ? r.error->message : std::string()).c_str());
        appendStatus(out, r);
        return out;
    }
    const auto& f = *r.fit;
    const auto& d = f.derived;
    auto date = [&](double day) {
        return std::isfinite(day) ? f.dateOf(day).iso() : std::string("-");
    };
    if (axis.weekly()) {
        appendf(out, "%s: %s by %s, window %s .. %s (%d weeks, %s to %s)\n",
                terminalText(r.region).c_str(), fit::modelName(f.model), fit::methodName(f.method),
                axis.periodName(f.first).c_str(), axis.periodName(f.last).c_str(),
                f.last - f.first + 1, axis.periodStart(f.first).iso().c_str(),
                axis.periodEnd(f.last).iso().c_str());
    } else {
        appendf(out, "%s: %s by %s, window %s .. %s (%d days)\n", terminalText(r.region).c_str(),
                fit::modelName(f.model), fit::methodName(f.method), f.windowFirst().iso().c_str(),
                f.windowLast().iso().c_str(), f.last - f.first + 1);
    }
    for (const auto& p : f.parameters) {
        appendf(out, "  %-6s %12.4g  se %10.3g  95%% [%.4g, %.4g]\n", p.name.c_str(),
                p.estimate.value, p.estimate.se, p.estimate.lower, p.estimate.upper);
    }
    appendf(out, "  peak            %s (95%% %s .. %s), %.1f cases/%s\n",
            date(d.peakDay.value).c_str(), date(d.peakDay.lower).c_str(),
            date(d.peakDay.upper).c_str(), d.peakIncidence.value, f.incidenceUnit());
    appendf(out, "  wave size K     %.0f (95%% %.0f .. %.0f), %.1f%% observed\n", d.waveSize.value,
            d.waveSize.lower, d.waveSize.upper, 100.0 * d.fractionObserved.value);
    appendf(out, "  start .. end    %s .. %s\n", date(d.startDay.value).c_str(),
            date(d.endDay.value).c_str());
    appendf(out, "  fastest growth  %s\n", date(d.fastestGrowthDay.value).c_str());
    if (std::isfinite(d.observedDoublingTimeDays.value)) {
        appendf(out,
                "  doubling time   %.1f days (95%% %.1f .. %.1f) on the observed rise %s .. %s "
                "(log-linear Poisson)\n",
                d.observedDoublingTimeDays.value, d.observedDoublingTimeDays.lower,
                d.observedDoublingTimeDays.upper, f.periodStart(d.observedRiseFirst).iso().c_str(),
                f.periodStart(d.observedRiseLast).iso().c_str());
    } else {
        appendf(out, "  doubling time   - (%s)\n", d.observedDoublingNote.c_str());
    }
    appendf(out, "  model's instantaneous doubling time at its fastest growth (%s) %.1f days\n",
            date(d.fastestGrowthDay.value).c_str(), d.doublingTimeDays.value);
    appendf(out, "  infectious load %.0f (%d-day window)", d.peakInfectiousLoad.value,
            f.options.infectiousWindowDays);
    if (d.peakInfectiousLoadPer100k) {
        appendf(out, ", %.1f per 100,000, log10 share %.2f", d.peakInfectiousLoadPer100k->value,
                d.log10InfectiousShare->value);
    }
    appendf(out, "\n  fit             R2 %.4f, RMSE %.3g, AIC %.1f, AICc %.1f; %s\n", f.goodness.r2,
            f.goodness.rmse, f.goodness.aic, f.goodness.aicc, f.summary.brief().c_str());
    appendStatus(out, r);
    for (const auto& row : r.comparison) {
        if (row.fit) {
            appendf(out, "    %-10s AICc %10.1f  R2 %.4f%s\n", fit::modelName(row.model),
                    row.fit->goodness.aicc, row.fit->goodness.r2,
                    row.fit->summary.converged() ? "" : "  (not converged)");
        } else {
            appendf(out, "    %-10s failed: %s\n", fit::modelName(row.model), row.error.c_str());
        }
    }
    return out;
}

Result<std::pair<int, int>> parseWindow(const std::string& text, const Drop& drop) {
    const auto colon = text.find(':');
    auto bad = [&]() {
        return makeError(
            ErrorCode::Usage,
            "--window wants FIRST:LAST as ISO dates (YYYY-MM-DD:YYYY-MM-DD) or auto, not '" + text +
                "'");
    };
    if (colon == std::string::npos)
        return bad();
    auto a = Date::fromIso(text.substr(0, colon));
    auto b = Date::fromIso(text.substr(colon + 1));
    if (!a || !b || *b < *a)
        return bad();
    auto ia = drop.periodOf(*a), ib = drop.periodOf(*b);
    if (!ia || !ib) {
        return makeError(ErrorCode::Usage,
                         "--window " + text + " lies outside the drop's calendar " +
                             drop.axis.first().iso() + " .. " + drop.axis.lastStart().iso());
    }
    return std::pair{*ia, *ib};
}

void printUsage(std::FILE* to, const std::vector<FlagSpec>& specs) {
    std::fprintf(to,
                 "usage: siftwave-cli fit FILE (--region CODE | --all) [options] [--json|--csv]\n\n"
                 "Fits a wave model to each region's daily or weekly counts and reports the peak,\n"
                 "the wave size, how much of it is observed, start and end, growth, and the peak\n"
                 "infectious load, with 95%% intervals. Dates and durations are in days; the peak\n"
                 "incidence is per day or per week as the drop's counts are (incidence_unit).\n"
                 "Every fit has a status: ok, not_converged, implausible (the reasons say which\n"
                 "check failed) or no_wave.\n"
                 "Exit codes: 0 fitted with status ok (with --all, every region's status is in\n"
                 "the output), 1 bad input, or the region's status is not ok (the reasons and\n"
                 "what to try on stderr), 2 wrong usage.\n\n"
                 "%s\n\noptions:\n%s",
                 fit::caution, formatFlags(specs).c_str());
}

std::vector<FlagSpec> fitFlagSpecs() {
    std::vector<FlagSpec> specs = ingestFlagSpecs();
    specs.push_back(
        {"ledger", true, false, "L", "fit the cleaned series: replay this ledger over the drop"});
    for (FlagSpec& spec : registerFlagSpecs("populations for per-100k figures"))
        specs.push_back(std::move(spec));
    specs.push_back(
        {"region", true, false, "CODE", "fit this region (code as written in the drop)"});
    specs.push_back({"all", false, false, "", "fit every region (in parallel)"});
    specs.push_back({"measure", true, false, "NAME", "measure to fit (default: the first)"});
    specs.push_back(
        {"model", true, false, "NAME", "gumbel (default), logistic, richards, lognormal, best"});
    specs.push_back({"method", true, false, "NAME",
                     "lsq (default; daily counts: 7-day centred average, weekly: the weekly "
                     "counts), poisson, negbin"});
    specs.push_back(
        {"window", true, false, "FIRST:LAST", "fit window as ISO dates, or auto (default)"});
    specs.push_back({"wave", true, false, "WHICH",
                     "automatic window: largest (default), latest or N (1-based)"});
    specs.push_back(
        {"weekday", false, false, "", "poisson/negbin on daily counts: estimate weekday factors"});
    specs.push_back({"json", false, false, "", "print JSON"});
    specs.push_back({"curve", false, false, "",
                     "with --json: add \"curve\", the fitted count per window day or week with "
                     "its pointwise 95% interval"});
    specs.push_back({"csv", false, false, "", "print CSV (RFC 4180), one row per region"});
    specs.push_back({"help", false, false, "", "show this help"});
    return specs;
}

// The model, method, weekday and wave flags; a usage message when a value is unknown.
std::optional<std::string> readModelFlags(const ParsedArgs& args, fit::FitOptions& o) {
    if (auto m = args.optionalValue("model")) {
        if (*m == "best") {
            o.modelChoice = fit::ModelChoice::LowestAicc;
        } else if (auto k = fit::modelFromName(*m)) {
            o.model = *k;
        } else {
            return "unknown --model '" + *m + "' (gumbel, logistic, richards, lognormal, best)";
        }
    }
    if (auto m = args.optionalValue("method")) {
        auto k = fit::methodFromName(*m);
        if (!k)
            return "unknown --method '" + *m + "' (lsq, poisson, negbin)";
        o.method = *k;
    }
    o.weekdayFactors = args.has("weekday");
    if (auto w = args.optionalValue("wave")) {
        if (*w == "largest") {
            o.wave = fit::WaveChoice::Largest;
        } else if (*w == "latest") {
            o.wave = fit::WaveChoice::Latest;
        } else {
            char* end = nullptr;
            const long n = std::strtol(w->c_str(), &end, 10);
            if (w->empty() || *end != '\0' || n < 1)
                return std::string("--wave wants largest, latest or a number from 1");
            o.wave = fit::WaveChoice::Index;
            o.waveIndex = static_cast<int>(n - 1);
        }
    }
    return std::nullopt;
}

// What the drop's calendar asks of the options: the weekly smoothing and wave-detection
// thresholds (fit.h, waves.h), no weekday factors on weekly counts, and the window's dates as
// periods.
std::optional<Failure> fitToCalendar(const ParsedArgs& args, const Drop& drop, fit::FitOptions& o) {
    if (drop.axis.weekly()) {
        if (o.weekdayFactors) {
            return Failure{makeError(ErrorCode::Usage,
                                     "--weekday needs daily counts: a weekly count holds every "
                                     "weekday once"),
                           kExitUsage};
        }
        const fit::FitOptions weekly = fit::FitOptions::forCadence(Cadence::Weekly);
        o.smoothingWindow = weekly.smoothingWindow;
        o.detection = weekly.detection;
    }
    if (auto w = args.optionalValue("window"); w && *w != "auto") {
        auto win = parseWindow(*w, drop);
        if (!win)
            return Failure{win.error(), kExitUsage};
        o.window = *win;
    }
    return std::nullopt;
}

// Each region's counts (cleaned where a ledger was replayed; NaN where there is no value), with
// its population from the register. `counts` holds the values the series point into.
std::vector<fit::RegionSeries> regionSeries(const SeriesJob& job,
                                            std::vector<std::vector<double>>& counts) {
    counts.assign(job.indices.size(), {});
    std::vector<fit::RegionSeries> regions(job.indices.size());
    for (std::size_t k = 0; k < job.indices.size(); ++k) {
        counts[k] = regionCounts(job, job.indices[k]);
        const std::string& code = job.drop.regionCodes[job.indices[k]];
        std::optional<double> population;
        if (job.reg) {
            if (const RegionEntry* e = job.reg->find(code); e && e->population) {
                population = static_cast<double>(*e->population);
            }
        }
        regions[k] = {
            code, {job.drop.axis.first(), counts[k], job.drop.axis.periodDays()}, population};
    }
    return regions;
}

enum class OutputFormat { Text, Json, Csv };

// Per region code, the note saying its series is nowcast-completed by a ledger entry
// (nowcast_completion.h); regions without one are absent.
using CompletionNotes = std::unordered_map<std::string, std::string>;

CompletionNotes completionNotes(const SeriesJob& job) {
    CompletionNotes notes;
    for (std::size_t r : job.indices) {
        if (std::optional<std::string> note = nowcastCompletionNote(job, r))
            notes.emplace(job.drop.regionCodes[r], std::move(*note));
    }
    return notes;
}

const std::string* noteOf(const CompletionNotes& notes, const std::string& region) {
    const auto it = notes.find(region);
    return it == notes.end() ? nullptr : &it->second;
}

// One region's JSON object: its fit, or its status and error; with "nowcast_completed" (the
// note) and the nowcast's caution when its series was completed.
nlohmann::json regionJson(const fit::RegionFit& r, const std::string* note, bool withCurve) {
    if (!r.fit)
        return {{"region", r.region},
                {"status", fit::fitStatusName(fit::regionStatus(r))},
                {"status_reasons", fit::regionStatusReasons(r)},
                {"error", errorToJson(*r.error)}};
    nlohmann::json j = fit::fitToJson(r.region, *r.fit, r.comparison, withCurve);
    if (note) {
        j["nowcast_completed"] = *note;
        j["caution"] = std::string(fit::caution) + " " + nowcast::kNowcastCaution;
    }
    return j;
}

// The text block of one region, with the note of a nowcast-completed series.
std::string regionTextWithNote(const fit::RegionFit& r, const std::string* note,
                               const TimeAxis& axis) {
    std::string text = regionText(r, axis);
    if (note)
        text += "  note            " + *note + "\n";
    return text;
}

// One region's output with --all, made on the worker that fitted it: a JSON array element
// (indented as the element of an array printed whole), a CSV row or the text block.
std::string formatRegion(const fit::RegionFit& r, const std::string* note, OutputFormat format,
                         bool withCurve, const TimeAxis& axis) {
    if (format == OutputFormat::Csv)
        return fit::fitCsvRow(r) + "\n";
    if (format == OutputFormat::Text)
        return regionTextWithNote(r, note, axis);
    // An element of the array printed whole: its lines after the first one level deeper.
    std::string out = "  ";
    out.reserve(4096);
    appendJsonText(out, regionJson(r, note, withCurve), 1);
    return out;
}

// CSV keeps its columns: the notes of nowcast-completed series go to stderr, with the caution.
void printCsvNotes(const CompletionNotes& notes) {
    for (const auto& [region, note] : notes)
        std::fprintf(stderr, "siftwave-cli: %s: %s\n", terminalText(region).c_str(), note.c_str());
}

// One region (--region): its JSON, CSV row or text, with the caution (and the nowcast's when
// its series was completed).
void printOne(const fit::RegionFit& r, const CompletionNotes& notes, OutputFormat format,
              bool withCurve, const TimeAxis& axis) {
    const std::string* note = noteOf(notes, r.region);
    if (format == OutputFormat::Json) {
        printJson(regionJson(r, note, withCurve));
    } else if (format == OutputFormat::Csv) {
        std::printf("%s\n%s\n", std::string(fit::fitCsvHeader()).c_str(),
                    fit::fitCsvRow(r).c_str());
        printCsvNotes(notes);
        std::fprintf(stderr, "siftwave-cli: %s\n", fit::caution);
        if (note)
            std::fprintf(stderr, "siftwave-cli: %s\n", nowcast::kNowcastCaution);
    } else {
        std::fputs(regionTextWithNote(r, note, axis).c_str(), stdout);
        std::printf("\nCaution: %s\n", fit::caution);
        if (note)
            std::printf("Caution: %s\n", nowcast::kNowcastCaution);
    }
}

// Every region (--all), fitted in parallel, each written as soon as it and those before it are
// done (issue 15: no document of every region is built); a JSON array, CSV rows or text blocks
// with the count per status, and the caution.
void fitAndPrintAll(std::span<const fit::RegionSeries> regions, const fit::BatchOptions& batch,
                    const CompletionNotes& notes, OutputFormat format, bool withCurve,
                    const TimeAxis& axis) {
    if (format == OutputFormat::Json)
        std::fputs("[\n", stdout);
    else if (format == OutputFormat::Csv)
        std::printf("%s\n", std::string(fit::fitCsvHeader()).c_str());
    const fit::BatchTally tally = fit::fitRegionsStreamed(
        regions, batch,
        [&](const fit::RegionFit& r) {
            return formatRegion(r, noteOf(notes, r.region), format, withCurve, axis);
        },
        [&](std::size_t index, std::string_view text) {
            if (format == OutputFormat::Json && index > 0)
                std::fputs(",\n", stdout);
            std::fwrite(text.data(), 1, text.size(), stdout);
        });
    if (format == OutputFormat::Json) {
        std::fputs(tally.regions > 0 ? "\n]\n" : "]\n", stdout);
    } else if (format == OutputFormat::Csv) {
        printCsvNotes(notes);
        std::fprintf(stderr, "siftwave-cli: %s\n", fit::caution);
        if (!notes.empty())
            std::fprintf(stderr, "siftwave-cli: %s\n", nowcast::kNowcastCaution);
    } else {
        const auto& n = tally.perStatus;
        std::printf("\n%zu regions: %d ok, %d not_converged, %d implausible, %d no_wave\n",
                    tally.regions, n[0], n[1], n[2], n[3]);
        std::printf("\nCaution: %s\n", fit::caution);
        if (!notes.empty())
            std::printf("Caution: %s\n", nowcast::kNowcastCaution);
    }
    std::fflush(stdout);
}

// Reads the drop, the register, the ledger and the regions the flags name, and fits the
// options to the drop's calendar.
Step<SeriesJob> prepareJob(const ParsedArgs& args, fit::FitOptions& o) {
    return prepareSeriesJob(args, true,
                            [&](const Drop& drop) { return fitToCalendar(args, drop, o); });
}

}  // namespace

int runFit(int argc, char** argv, int first) {
    const std::vector<FlagSpec> specs = fitFlagSpecs();
    bool wantsJson = false;
    for (int i = first; i < argc; ++i) {
        const std::string a = argv[i];
        if (a == "--help" || a == "-h") {
            printUsage(stdout, specs);
            return kExitOk;
        }
        if (a == "--json")
            wantsJson = true;
    }
    std::string parseError;
    std::optional<ParsedArgs> args = parseArgs(argc, argv, first, specs, parseError);
    auto usage = [&](const std::string& message) {
        printError(makeError(ErrorCode::Usage, message), wantsJson);
        if (!wantsJson)
            printUsage(stderr, specs);
        return kExitUsage;
    };
    if (!args)
        return usage(parseError);
    const bool json = args->has("json");
    const bool csv = args->has("csv");
    if (json && csv)
        return usage("--json and --csv exclude each other");
    const bool withCurve = args->has("curve");
    if (withCurve && !json)
        return usage("--curve needs --json");
    if (args->positional.size() != 1)
        return usage("fit needs exactly one FILE");
    if (args->has("region") == args->has("all"))
        return usage("give either --region CODE or --all");

    fit::BatchOptions batch;
    if (auto message = readModelFlags(*args, batch.fit))
        return usage(*message);
    if (auto s = batch.validate(); !s) {
        printError(s.error(), json);
        return kExitUsage;
    }
    auto job = prepareJob(*args, batch.fit);
    if (auto* f = std::get_if<Failure>(&job)) {
        printError(f->error, json);
        return f->exitCode;
    }
    const SeriesJob& j = std::get<SeriesJob>(job);
    std::vector<std::vector<double>> counts;
    const auto regions = regionSeries(j, counts);
    const OutputFormat format =
        json ? OutputFormat::Json : (csv ? OutputFormat::Csv : OutputFormat::Text);
    if (args->has("all")) {
        fitAndPrintAll(regions, batch, completionNotes(j), format, withCurve, j.drop.axis);
        return kExitOk;
    }
    const auto results = fit::fitRegions(regions, batch);
    const fit::FitStatus status = fit::regionStatus(results[0]);
    if (!results[0].fit) {
        printError(*results[0].error, json);
        std::fprintf(stderr, "siftwave-cli: status %s; try %s\n", fit::fitStatusName(status),
                     fit::fitStatusAdvice(status));
        return kExitBadInput;
    }
    printOne(results[0], completionNotes(j), format, withCurve, j.drop.axis);
    // One region: anything but ok exits 1, with the reasons and what to try (issue 15).
    if (status != fit::FitStatus::Ok) {
        std::string reasons;
        for (const auto& why : fit::regionStatusReasons(results[0]))
            reasons += (reasons.empty() ? "" : "; ") + why;
        std::fprintf(stderr, "siftwave-cli: the fit is %s: %s; try %s\n",
                     fit::fitStatusName(status), terminalText(reasons).c_str(),
                     fit::fitStatusAdvice(status));
        return kExitBadInput;
    }
    return kExitOk;
}

}  // namespace siftwave::cli
