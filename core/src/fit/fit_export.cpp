#include "siftwave/fit/fit_export.h"

#include "siftwave/csv_field.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstdio>
#include <string>
#include <utility>
#include <vector>

namespace siftwave::fit {
namespace {

using nlohmann::json;

json number(double v) {
    return std::isfinite(v) ? json(v) : json(nullptr);
}

// A pair as a JSON array. Built element by element, as the objects below are: nlohmann's
// initializer lists copy every nested value (a third of fitToJson's cost in fit_bench).
json pair(json a, json b) {
    json out = json::array();
    out.push_back(std::move(a));
    out.push_back(std::move(b));
    return out;
}

json estimateJson(const Estimate& e) {
    json out = json::object();
    out["value"] = number(e.value);
    out["se"] = number(e.se);
    out["ci95"] = pair(number(e.lower), number(e.upper));
    return out;
}

json dateOrNull(const FitResult& f, double day) {
    return std::isfinite(day) ? json(f.dateOf(day).iso()) : json(nullptr);
}

json dateInterval(const FitResult& f, const Estimate& e) {
    return pair(dateOrNull(f, e.lower), dateOrNull(f, e.upper));
}

// One row per window period (day or week, named by its first day): the fitted count of the
// period and its pointwise 95% interval (delta method, fit.h step 5); lower/upper are null when
// the covariance is unavailable.
json curveJson(const FitResult& f) {
    json rows = json::array();
    const bool band = f.fittedLower.size() == f.fitted.size();
    for (std::size_t i = 0; i < f.fitted.size(); ++i) {
        rows.push_back({{"date", f.periodStart(f.first + static_cast<int>(i)).iso()},
                        {"fitted", number(f.fitted[i])},
                        {"lower", band ? number(f.fittedLower[i]) : json(nullptr)},
                        {"upper", band ? number(f.fittedUpper[i]) : json(nullptr)}});
    }
    return rows;
}

// The four models side by side (fit::compareModels): goodness of fit and peak, or the error.
json comparisonJson(std::span<const ModelComparisonRow> comparison) {
    json rows = json::array();
    for (const auto& row : comparison) {
        json r = {{"model", modelName(row.model)}};
        if (row.fit) {
            r["aic"] = number(row.fit->goodness.aic);
            r["aicc"] = number(row.fit->goodness.aicc);
            r["r2"] = number(row.fit->goodness.r2);
            r["rmse"] = number(row.fit->goodness.rmse);
            r["converged"] = row.fit->summary.converged();
            r["peak_date"] = dateOrNull(*row.fit, row.fit->derived.peakDay.value);
        } else {
            r["error"] = row.error;
        }
        rows.push_back(r);
    }
    return rows;
}

// RFC 4180 field, neutralised for spreadsheets (csv_field.h).
std::string textField(const std::string& text) {
    return csvField(text, true);
}

std::string csvNumber(double v) {
    if (!std::isfinite(v))
        return "";
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.10g", v);
    return buf;
}

constexpr std::string_view kCsvHeader =
    "region,model,method,window_first,window_last,peak_date,peak_incidence,incidence_unit,"
    "wave_size,fraction_observed,start_date,end_date,fastest_growth_date,doubling_time_days,"
    "peak_infectious_load,peak_infectious_load_per_100k,aic,aicc,r2,rmse,converged,parameters,"
    "error,status,status_reasons";

}  // namespace

json fitToJson(std::string_view region, const FitResult& f,
               std::span<const ModelComparisonRow> comparison, bool withCurve) {
    json j;
    j["region"] = region;
    j["status"] = fitStatusName(f.status);
    j["status_reasons"] = f.statusReasons;
    j["model"] = modelName(f.model);
    j["method"] = methodName(f.method);
    j["window"] = {{"first", f.windowFirst().iso()}, {"last", f.windowLast().iso()}};
    json params = json::object();
    for (const auto& p : f.parameters)
        params[p.name] = estimateJson(p.estimate);
    j["parameters"] = std::move(params);
    const auto& d = f.derived;
    j["peak_date"] = dateOrNull(f, d.peakDay.value);
    j["peak_incidence"] = number(d.peakIncidence.value);
    j["incidence_unit"] = f.incidenceUnit();  // peak_incidence and curve: cases per day or week
    j["wave_size"] = number(d.waveSize.value);
    j["fraction_observed"] = number(d.fractionObserved.value);
    j["start_date"] = dateOrNull(f, d.startDay.value);
    j["end_date"] = dateOrNull(f, d.endDay.value);
    j["fastest_growth_date"] = dateOrNull(f, d.fastestGrowthDay.value);
    // The doubling time to brief: the growth on the observed rise (log-linear Poisson); the
    // model's instantaneous one is kept beside it under its own name.
    j["doubling_time_days"] = number(d.observedDoublingTimeDays.value);
    j["doubling_time_rise"] = {
        {"first", f.periodStart(d.observedRiseFirst).iso()},
        {"last", f.periodStart(d.observedRiseLast).iso()},
        {"method", "log-linear Poisson regression (quasi-Poisson when overdispersed)"},
        {"note", d.observedDoublingNote.empty() ? json(nullptr) : json(d.observedDoublingNote)}};
    j["model_doubling_time_at_fastest_growth_days"] = number(d.doublingTimeDays.value);
    j["peak_infectious_load"] = number(d.peakInfectiousLoad.value);
    j["peak_infectious_load_per_100k"] =
        d.peakInfectiousLoadPer100k ? number(d.peakInfectiousLoadPer100k->value) : json(nullptr);
    j["log10_infectious_share"] =
        d.log10InfectiousShare ? number(d.log10InfectiousShare->value) : json(nullptr);
    j["aic"] = number(f.goodness.aic);
    j["aicc"] = number(f.goodness.aicc);
    j["r2"] = number(f.goodness.r2);
    j["rmse"] = number(f.goodness.rmse);
    // Uncertainty of the derived quantities (delta method): values in days from the window
    // start or in cases, dates for the date-valued ones.
    json& u = j["uncertainty"];
    u["peak_date_ci95"] = dateInterval(f, d.peakDay);
    u["peak_day"] = estimateJson(d.peakDay);
    u["peak_incidence"] = estimateJson(d.peakIncidence);
    u["wave_size"] = estimateJson(d.waveSize);
    u["fraction_observed"] = estimateJson(d.fractionObserved);
    u["start_date_ci95"] = dateInterval(f, d.startDay);
    u["end_date_ci95"] = dateInterval(f, d.endDay);
    u["doubling_time_days"] = estimateJson(d.observedDoublingTimeDays);
    u["model_doubling_time_at_fastest_growth_days"] = estimateJson(d.doublingTimeDays);
    u["peak_infectious_load"] = estimateJson(d.peakInfectiousLoad);
    if (!f.weekdayFactors.empty())
        j["weekday_factors"] = f.weekdayFactors;
    if (f.dispersion)
        j["dispersion"] = number(*f.dispersion);
    j["infectious_window_days"] = f.options.infectiousWindowDays;
    j["observations"] = f.goodness.observations;
    j["summary"] = {{"converged", f.summary.converged()},
                    {"termination", terminationName(f.summary.termination)},
                    {"iterations", f.summary.iterations},
                    {"message", f.summary.message},
                    {"notes", f.summary.notes},
                    {"brief", f.summary.brief()}};
    if (!comparison.empty())
        j["comparison"] = comparisonJson(comparison);
    if (withCurve)
        j["curve"] = curveJson(f);
    j["caution"] = caution;
    return j;
}

std::string_view fitCsvHeader() {
    return kCsvHeader;
}

std::string fitCsvRow(const RegionFit& r) {
    std::vector<std::string> c;
    c.push_back(textField(r.region));
    if (!r.fit) {
        for (int i = 0; i < 21; ++i)  // every column between the region and the error
            c.emplace_back();
        c.push_back(textField(r.error ? r.error->message : "failed"));
    } else {
        const auto& f = *r.fit;
        const auto& d = f.derived;
        auto date = [&](double day) {
            return std::isfinite(day) ? f.dateOf(day).iso() : std::string();
        };
        c.push_back(modelName(f.model));
        c.push_back(methodName(f.method));
        c.push_back(f.windowFirst().iso());
        c.push_back(f.windowLast().iso());
        c.push_back(date(d.peakDay.value));
        c.push_back(csvNumber(d.peakIncidence.value));
        c.push_back(f.incidenceUnit());
        c.push_back(csvNumber(d.waveSize.value));
        c.push_back(csvNumber(d.fractionObserved.value));
        c.push_back(date(d.startDay.value));
        c.push_back(date(d.endDay.value));
        c.push_back(date(d.fastestGrowthDay.value));
        c.push_back(csvNumber(d.observedDoublingTimeDays.value));
        c.push_back(csvNumber(d.peakInfectiousLoad.value));
        c.push_back(d.peakInfectiousLoadPer100k ? csvNumber(d.peakInfectiousLoadPer100k->value)
                                                : "");
        c.push_back(csvNumber(f.goodness.aic));
        c.push_back(csvNumber(f.goodness.aicc));
        c.push_back(csvNumber(f.goodness.r2));
        c.push_back(csvNumber(f.goodness.rmse));
        c.push_back(f.summary.converged() ? "true" : "false");
        std::string params;
        for (const auto& p : f.parameters) {
            params += (params.empty() ? "" : ";") + p.name + "=" + csvNumber(p.estimate.value);
        }
        c.push_back(textField(params));
        c.emplace_back();
    }
    c.push_back(fitStatusName(regionStatus(r)));
    std::string reasons;
    for (const auto& why : regionStatusReasons(r))
        reasons += (reasons.empty() ? "" : "; ") + why;
    c.push_back(textField(reasons));
    std::string line;
    for (std::size_t i = 0; i < c.size(); ++i)
        line += (i ? "," : "") + c[i];
    return line;
}

}  // namespace siftwave::fit
