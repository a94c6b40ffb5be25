#include "siftwave/transmission/transmission_export.h"

#include "siftwave/csv_field.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstdio>

namespace siftwave::transmission {
namespace detail {

using nlohmann::json;

json number(double v) {
    return std::isfinite(v) ? json(v) : json(nullptr);
}

// The columns of a row, in CSV order, as (name, value) pairs: numbers (NaN: none), or text.
struct Cell {
    const char* name;
    double number = kNaN;
    std::string text;
    bool isText = false;
    bool isBool = false;
};

std::vector<Cell> rowCells(const TransmissionResult& result, std::size_t i) {
    const TransmissionRow& row = result.rows[i];
    const GrowthEstimate& g = row.growth;
    const CoriEstimate& c = row.reproduction;
    const bool hasR = c.ok() && c.hasPosterior();
    auto r = [&](double v) { return hasR ? v : kNaN; };
    auto num = [](const char* name, double v) { return Cell{name, v, {}, false, false}; };
    auto txt = [](const char* name, std::string v) {
        return Cell{name, kNaN, std::move(v), true, false};
    };
    const double quasi = g.ok() ? (g.quasiPoisson ? 1.0 : 0.0) : kNaN;
    return {
        txt("date", result.axis.periodStart(row.period).iso()),
        txt("period", result.axis.periodName(row.period)),
        num("r", g.r.value),
        num("r_lo", g.r.lower),
        num("r_hi", g.r.upper),
        num("r_se", g.se),
        num("dispersion", g.dispersion),
        Cell{"quasi_poisson", quasi, {}, false, true},
        num("doubling_time_days", g.doublingDays.value),
        num("doubling_time_lo", g.doublingDays.lower),
        num("doubling_time_hi", g.doublingDays.upper),
        num("halving_time_days", g.halvingDays.value),
        num("halving_time_lo", g.halvingDays.lower),
        num("halving_time_hi", g.halvingDays.upper),
        txt("r_reason", g.reason),
        num("R", r(c.mean)),
        num("R_lo", r(c.lower)),
        num("R_hi", r(c.upper)),
        num("R_cv", c.cv),
        txt("reason", c.reason),
    };
}

json cellJson(const Cell& cell) {
    if (cell.isText)
        return cell.text.empty() ? json(nullptr) : json(cell.text);
    if (cell.isBool)
        return std::isfinite(cell.number) ? json(cell.number != 0.0) : json(nullptr);
    return number(cell.number);
}

std::string cellCsv(const Cell& cell) {
    if (cell.isText)
        return csvField(cell.text, true);
    if (cell.isBool)
        return std::isfinite(cell.number) ? (cell.number != 0.0 ? "true" : "false") : "";
    if (std::isinf(cell.number))
        return cell.number > 0 ? "inf" : "-inf";
    if (!std::isfinite(cell.number))
        return {};
    char text[32];
    std::snprintf(text, sizeof text, "%.10g", cell.number);
    return text;
}

json settingsJson(const TransmissionResult& result) {
    const TransmissionOptions& o = result.options;
    json si = nullptr;
    if (o.serialInterval) {
        json weights = json::array();
        for (double w : result.serialIntervalUsed.weights)
            weights.push_back(w);
        si = {{"description", o.serialInterval->description},
              {"mean_days", number(o.serialInterval->meanDays())},
              {"sd_days", number(o.serialInterval->sdDays())},
              {"weights_per_period", weights}};
    }
    return {{"window", o.cori.window},
            {"window_unit", result.axis.unitName()},
            {"window_ends_on_the_period", true},
            {"prior_mean", o.cori.priorMean},
            {"prior_sd", o.cori.priorSd},
            {"max_posterior_cv", o.cori.maxCv},
            {"min_cases_for_r", o.growth.minCases},
            {"weekday_terms", o.growth.weekdayTerms},
            {"serial_interval", si},
            {"brief", result.settingsBrief()}};
}

}  // namespace detail

nlohmann::json transmissionToJson(std::string_view region, std::string_view measure,
                                  const TransmissionResult& result) {
    using detail::json;
    json rows = json::array();
    for (std::size_t i = 0; i < result.rows.size(); ++i) {
        json row = json::object();
        for (const detail::Cell& cell : detail::rowCells(result, i))
            row[cell.name] = detail::cellJson(cell);
        rows.push_back(std::move(row));
    }
    return {{"region", region},
            {"measure", measure},
            {"cadence", cadenceName(result.axis.cadence())},
            {"settings", detail::settingsJson(result)},
            {"refusal", result.refusal.empty() ? json(nullptr) : json(result.refusal)},
            {"caution", caution},
            {"rows", std::move(rows)}};
}

std::string_view transmissionCsvHeader() {
    return "date,period,r,r_lo,r_hi,r_se,dispersion,quasi_poisson,doubling_time_days,"
           "doubling_time_lo,doubling_time_hi,halving_time_days,halving_time_lo,halving_time_hi,"
           "r_reason,R,R_lo,R_hi,R_cv,reason";
}

std::string transmissionCsvRow(const TransmissionResult& result, std::size_t i) {
    std::string line;
    bool first = true;
    for (const detail::Cell& cell : detail::rowCells(result, i)) {
        if (!first)
            line += ',';
        first = false;
        line += detail::cellCsv(cell);
    }
    return line;
}

}  // namespace siftwave::transmission
