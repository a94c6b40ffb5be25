// weekday_effect: a weekly reporting pattern, one finding per measure. Daily
// data only: a weekly drop counts every weekday once in each period, so it has
// no weekday effect to find (and the scan estimates no factors for it).
//
// The factors are those the backlog baseline uses: pooled over all regions by
// ratio to a centred 7-day moving average (scan_input.h), scaled to mean 1.
// Strength = highest factor / lowest factor - 1; reported when at least
// min_strength. The evidence also gives each region's own strength (the same
// method on that region alone) for the regions with enough data, strongest
// first (at most 10 listed), and how many regions share the pooled peak day.

#include "scan/scan_input.h"

#include <algorithm>
#include <cmath>

namespace siftwave::scan::detail {
namespace {
constexpr const char* kWeekdays[7] = {"monday", "tuesday",  "wednesday", "thursday",
                                      "friday", "saturday", "sunday"};
double round3(double v) {
    return std::round(v * 1000) / 1000;
}
}  // namespace

void findWeekdayEffects(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const WeekdayEffectOptions& o = in.options.weekdayEffect;
    if (in.weekly())
        return;
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        const MeasureFacts& facts = in.measures[m];
        if (facts.cumulative || !facts.weekday.estimated)
            continue;
        const double strength = facts.weekday.strength();
        if (strength < o.minStrength)
            continue;
        const auto peak = static_cast<std::size_t>(
            std::max_element(facts.weekday.factor.begin(), facts.weekday.factor.end()) -
            facts.weekday.factor.begin());
        const auto trough = static_cast<std::size_t>(
            std::min_element(facts.weekday.factor.begin(), facts.weekday.factor.end()) -
            facts.weekday.factor.begin());

        struct RegionStrength {
            std::size_t region;
            double strength;
        };
        std::vector<RegionStrength> regional;
        std::size_t samePeak = 0;
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            const std::size_t one[] = {r};
            const WeekdayFactors own =
                estimateWeekdayFactors(drop, m, in.firstWeekday, one, o.minLevel, o.minWeeks);
            if (!own.estimated)
                continue;
            regional.push_back({r, own.strength()});
            const auto ownPeak = static_cast<std::size_t>(
                std::max_element(own.factor.begin(), own.factor.end()) - own.factor.begin());
            samePeak += ownPeak == peak;
        }
        std::stable_sort(regional.begin(), regional.end(),
                         [](const RegionStrength& a, const RegionStrength& b) {
                             return a.strength > b.strength;
                         });

        Finding f = makeFinding(in, FindingKind::WeekdayEffect, Severity::Info, std::nullopt, m);
        f.first = drop.axis.first();
        f.last = drop.axis.lastStart();
        nlohmann::json factors = nlohmann::json::object();
        nlohmann::json used = nlohmann::json::object();
        for (std::size_t w = 0; w < 7; ++w) {
            factors[kWeekdays[w]] = round3(facts.weekday.factor[w]);
            used[kWeekdays[w]] = facts.weekday.daysUsed[w];
        }
        nlohmann::json strongest = nlohmann::json::array();
        for (std::size_t i = 0; i < std::min<std::size_t>(10, regional.size()); ++i) {
            strongest.push_back({{"region", drop.regionCodes[regional[i].region]},
                                 {"strength", round3(regional[i].strength)}});
        }
        f.impact = strength;
        f.evidence = {{"factors", factors},
                      {"strength", round3(strength)},
                      {"peak", kWeekdays[peak]},
                      {"trough", kWeekdays[trough]},
                      {"days_used", used},
                      {"regions_estimated", regional.size()},
                      {"regions_with_same_peak", samePeak},
                      {"strongest_regions", strongest}};
        suggestAccept(f,
                      "a reporting rhythm, not a change in incidence: read trends "
                      "from a centred 7-day moving average");
        out.push_back(std::move(f));
    }
}

}  // namespace siftwave::scan::detail
