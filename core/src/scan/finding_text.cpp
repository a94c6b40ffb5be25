// One-line descriptions of findings, from their evidence.
#include "siftwave/scan/finding.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstdio>

namespace siftwave::scan {
namespace {

std::string number(const nlohmann::json& v) {
    if (v.is_number_integer())
        return std::to_string(v.get<long long>());
    if (v.is_number()) {
        const double d = v.get<double>();
        char text[32];
        if (std::fabs(d - std::round(d)) < 1e-9 && std::fabs(d) < 1e15) {
            std::snprintf(text, sizeof text, "%.0f", d);
        } else {
            std::snprintf(text, sizeof text, "%.3g", d);
        }
        return text;
    }
    if (v.is_string())
        return v.get<std::string>();
    if (v.is_boolean())
        return v.get<bool>() ? "yes" : "no";
    return "?";
}

std::string get(const nlohmann::json& e, const char* key) {
    auto it = e.find(key);
    return it == e.end() ? std::string("?") : number(*it);
}

/// A count of periods: `periodsKey`, or for evidence without it the daily `daysKey`.
std::string periods(const nlohmann::json& e, const char* periodsKey, const char* daysKey) {
    return e.contains(periodsKey) ? get(e, periodsKey) : get(e, daysKey);
}

}  // namespace

std::string describeFinding(const Finding& f) {
    const nlohmann::json& e = f.evidence.json();
    const bool weekly = f.cadence == Cadence::Weekly;
    const std::string unit = weekly ? "week" : "day";
    const std::string units = weekly ? "weeks" : "days";
    switch (f.kind) {
        case FindingKind::MissingDates:
            if (e.value("probably_true_zeros", false)) {
                return periods(e, "periods", "days") + " " + unit +
                       "(s) with no row amid low counts (about " + get(e, "level_nearby") + " a " +
                       unit + " nearby): probably true zeros";
            }
            return periods(e, "periods", "days") + " " + unit +
                   "(s) with no value inside the reporting span";
        case FindingKind::DuplicateRow:
            return get(e, "occurrences") + " rows for one " + unit + "; values " +
                   (e.value("values_agree", false) ? "agree" : "differ");
        case FindingKind::NegativeCount:
            return "negative count " + get(e, "value") + " (earlier " +
                   periods(e, "earlier_periods", "earlier_days") + " " + units + " sum to " +
                   get(e, "earlier_days_sum") + ")";
        case FindingKind::BacklogDump:
            return "observed " + get(e, "observed") + " where about " + get(e, "expected") +
                   " was expected (excess " + get(e, "excess") + ", z " + get(e, "z") + ")" +
                   (e.contains("after_gap")
                        ? ", after a gap of " + periods(e["after_gap"], "periods", "days") + " " +
                              unit + "(s)"
                        : "");
        case FindingKind::ReportingGap:
            return periods(e, "periods", "days") + " zero " + unit + "(s) where about " +
                   get(e, "level_around") + " a " + unit + " is usual" +
                   (e.value("catch_up", false) ? ", then a catch-up" : "");
        case FindingKind::StaleValues:
            return "the value " + get(e, "value") + " repeated on " +
                   periods(e, "periods", "days") + " " + units;
        case FindingKind::CodeCollision:
            return "other tools may read this code as " + get(e, "read_as") + " (" +
                   get(e, "reason") + ")";
        case FindingKind::CodeVariant:
            return "probably the same region as " + get(e, "canonical");
        case FindingKind::UnknownCode:
            return "not in the region register" +
                   (e.contains("similar") ? "; similar to " + get(e, "similar") : std::string());
        case FindingKind::WeekdayEffect:
            return "weekly reporting pattern: peak " + get(e, "peak") + ", trough " +
                   get(e, "trough") + ", strength " + get(e, "strength");
        case FindingKind::CumulativeDecrease:
            return "cumulative count falls from " + get(e, "before") + " to " + get(e, "lowest");
        case FindingKind::HierarchyMismatch:
            return "differs from the sum of its children on " +
                   periods(e, "periods_mismatched", "days_mismatched") + " of " +
                   periods(e, "periods_compared", "days_compared") + " " + units;
        case FindingKind::Revision: {
            const std::string change = e.value("change", "");
            if (change == "values_revised") {
                return get(e, "changed") + " value(s) changed, " + get(e, "appeared") +
                       " appeared, " + get(e, "vanished") + " vanished; net " +
                       get(e, "net_change");
            }
            return change;
        }
    }
    return {};
}

}  // namespace siftwave::scan
