#include "scan/scan_input.h"

#include "scan/robust_stats.h"

#include <algorithm>
#include <numeric>

namespace siftwave::scan::detail {

double WeekdayFactors::strength() const {
    const auto [lo, hi] = std::minmax_element(factor.begin(), factor.end());
    if (!(*lo > 0))
        return 0.0;
    return *hi / *lo - 1.0;
}

std::vector<double> seriesValues(std::span<const Cell> cells) {
    std::vector<double> values(cells.size());
    for (std::size_t i = 0; i < cells.size(); ++i) {
        values[i] = cells[i].reported() ? static_cast<double>(cells[i].value) : kNaN;
    }
    return values;
}

double levelAround(std::span<const double> values, std::int32_t first, std::int32_t last,
                   int window) {
    std::vector<double> around;
    const auto n = static_cast<std::int32_t>(values.size());
    for (std::int32_t t = std::max(0, first - window); t < first; ++t) {
        if (!std::isnan(values[static_cast<std::size_t>(t)]))
            around.push_back(values[static_cast<std::size_t>(t)]);
    }
    for (std::int32_t t = last + 1; t <= std::min(n - 1, last + window); ++t) {
        if (!std::isnan(values[static_cast<std::size_t>(t)]))
            around.push_back(values[static_cast<std::size_t>(t)]);
    }
    return medianInPlace(around);
}

WeekdayFactors estimateWeekdayFactors(const Drop& drop, std::size_t measure, int firstWeekday,
                                      std::span<const std::size_t> regions, double minLevel,
                                      int minWeeks) {
    WeekdayFactors out;
    std::array<std::vector<double>, 7> ratios;
    const std::size_t regionCount = regions.empty() ? drop.regionCodes.size() : regions.size();
    const std::int32_t days = drop.periods();
    // Pooled over a large drop, every k-th region suffices (about 350,000 days in all);
    // the median of that many ratios moves by well under 0.01.
    constexpr std::size_t kMaxDays = 350000;
    const std::size_t perRegion = static_cast<std::size_t>(std::max(1, days));
    const std::size_t regionStride =
        regions.empty() ? std::max<std::size_t>(1, regionCount * perRegion / kMaxDays) : 1;
    for (std::size_t w = 0; w < 7; ++w) {
        ratios[w].reserve(regionCount / regionStride * perRegion / 7 + 1);
    }
    for (std::size_t k = 0; k < regionCount; k += regionStride) {
        const std::size_t r = regions.empty() ? k : regions[k];
        const std::span<const Cell> cells = drop.series(measure, r);
        // Sliding 7-day sum over fully reported, non-negative windows.
        double sum = 0;
        int valid = 0;  // reported non-negative cells in the current window
        for (std::int32_t t = 0; t < days; ++t) {
            const Cell& in = cells[static_cast<std::size_t>(t)];
            if (in.reported() && in.value >= 0) {
                sum += in.value;
                ++valid;
            }
            if (t >= 7) {
                const Cell& outCell = cells[static_cast<std::size_t>(t - 7)];
                if (outCell.reported() && outCell.value >= 0) {
                    sum -= outCell.value;
                    --valid;
                }
            }
            if (t < 6 || valid != 7)
                continue;
            const double mean = sum / 7.0;
            if (mean < minLevel)
                continue;
            const std::int32_t centre = t - 3;
            const double x = cells[static_cast<std::size_t>(centre)].value;
            ratios[static_cast<std::size_t>((firstWeekday + centre) % 7)].push_back(x / mean);
        }
    }
    for (std::size_t w = 0; w < 7; ++w) {
        out.daysUsed[w] = ratios[w].size();
        if (ratios[w].size() < static_cast<std::size_t>(std::max(1, minWeeks)))
            return out;
    }
    double total = 0;
    for (std::size_t w = 0; w < 7; ++w) {
        out.factor[w] = medianInPlace(ratios[w]);
        total += out.factor[w];
    }
    if (!(total > 0)) {
        out.factor.fill(1.0);
        return out;
    }
    for (double& f : out.factor)
        f = std::max(1e-3, f * 7.0 / total);
    out.estimated = true;
    return out;
}

int overdispersionWidth(const TimeAxis& axis) {
    return axis.weekly() ? 5 : 7;
}

double estimateOverdispersion(const Drop& drop, std::size_t measure, int firstWeekday,
                              const WeekdayFactors& factors) {
    constexpr double kMinLevel = 10;
    constexpr std::size_t kMaxSamples = 20000;
    const auto width = static_cast<std::size_t>(overdispersionWidth(drop.axis));
    const std::size_t half = width / 2;
    const double residualShare = static_cast<double>(width - 1) / static_cast<double>(width);
    const std::size_t regions = drop.regionCodes.size();
    const auto days = static_cast<std::size_t>(std::max(0, drop.periods()));
    if (days < width)
        return 0;
    const std::size_t candidates = regions * (days - (width - 1));
    const std::size_t stride = std::max<std::size_t>(1, candidates / kMaxSamples);
    std::vector<double> level, residual;
    std::size_t k = 0;
    for (std::size_t r = 0; r < regions; ++r) {
        const std::span<const Cell> cells = drop.series(measure, r);
        for (std::size_t t = half; t + half < days; ++t, ++k) {
            if (k % stride != 0)
                continue;
            double sum = 0;
            bool full = true;
            double y[7];
            for (std::size_t j = 0; j < width; ++j) {
                const Cell& c = cells[t - half + j];
                if (!c.reported() || c.value < 0) {
                    full = false;
                    break;
                }
                y[j] = c.value /
                       factors.factor[(static_cast<std::size_t>(firstWeekday) + t - half + j) % 7];
                sum += y[j];
            }
            if (!full)
                continue;
            const double a = sum / static_cast<double>(width);
            if (a < kMinLevel)
                continue;
            level.push_back(a);
            residual.push_back(std::fabs(y[half] - a));
        }
    }
    if (level.size() < 50)
        return 0;
    std::vector<double> z(level.size());
    auto medianZ = [&](double phi) {
        for (std::size_t i = 0; i < level.size(); ++i) {
            z[i] = residual[i] / std::sqrt(residualShare * (level[i] + phi * level[i] * level[i]));
        }
        return medianInPlace(z);
    };
    double lo = 0, hi = 2;
    if (medianZ(lo) <= 0.6745)
        return 0;
    for (int i = 0; i < 40; ++i) {
        const double mid = 0.5 * (lo + hi);
        (medianZ(mid) > 0.6745 ? lo : hi) = mid;
    }
    return 0.5 * (lo + hi);
}

namespace {

void classifyCumulative(const Drop& drop, const CumulativeDecreaseOptions& options,
                        MeasureFacts& facts) {
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        const std::span<const Cell> cells = drop.series(facts.index, r);
        const Cell* previous = nullptr;
        for (const Cell& c : cells) {
            if (!c.reported())
                continue;
            if (previous != nullptr) {
                if (c.value > previous->value)
                    ++facts.rises;
                if (c.value < previous->value)
                    ++facts.falls;
            }
            previous = &c;
        }
    }
    const std::size_t changes = facts.rises + facts.falls;
    facts.cumulative =
        changes >= static_cast<std::size_t>(std::max(1, options.minChanges)) &&
        static_cast<double>(facts.rises) >= options.minRisingShare * static_cast<double>(changes);
}

}  // namespace

ScanInput prepareScanInput(const Drop& drop, const ScanOptions& options,
                           const ScanContext& context) {
    ScanInput in{drop, options, context, 0, {}};
    if (drop.periods() > 0 && !drop.axis.weekly())
        in.firstWeekday = drop.axis.first().isoWeekday() - 1;
    in.measures.resize(drop.measures.size());
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        MeasureFacts& facts = in.measures[m];
        facts.index = m;
        classifyCumulative(drop, options.cumulativeDecrease, facts);
        facts.regionTotals.assign(drop.regionCodes.size(), 0.0);
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            double total = 0;
            for (const Cell& c : drop.series(m, r)) {
                if (c.reported())
                    total += c.value;
            }
            facts.regionTotals[r] = total;
        }
        if (!facts.cumulative) {
            // Weekday factors only for daily data: a week holds every weekday once.
            if (!drop.axis.weekly()) {
                facts.weekday = estimateWeekdayFactors(drop, m, in.firstWeekday, {},
                                                       options.weekdayEffect.minLevel,
                                                       options.weekdayEffect.minWeeks);
            }
            facts.overdispersion = estimateOverdispersion(drop, m, in.firstWeekday, facts.weekday);
        }
    }
    return in;
}

Finding makeFinding(const ScanInput& in, FindingKind kind, Severity severity,
                    std::optional<std::size_t> region, std::optional<std::size_t> measure) {
    Finding f;
    f.kind = kind;
    f.severity = severity;
    f.cadence = in.drop.axis.cadence();
    if (region)
        f.region = in.drop.regionCodes[*region];
    if (measure)
        f.measure = in.drop.measures[*measure];
    return f;
}

ledger::Decision suggestionFor(const Finding& f, ledger::DecisionKind kind) {
    ledger::Decision d;
    d.kind = kind;
    d.region = f.region.value_or(std::string());
    d.measure = f.measure.value_or(std::string());
    return d;
}

ledger::Decision mergeSuggestion(const Finding& f, const std::string& variant,
                                 const std::string& into) {
    ledger::Decision d = suggestionFor(f, ledger::DecisionKind::MergeCodes);
    d.region.clear();
    d.variant = variant;
    d.into = into;
    return d;
}

void suggestAccept(Finding& f, std::string note) {
    ledger::Decision d = suggestionFor(f, ledger::DecisionKind::Accept);
    if (f.first && f.last)
        d.window = ledger::DayRange{*f.first, *f.last};
    f.suggestion = std::move(d);
    f.suggestionNotes.note = std::move(note);
}

}  // namespace siftwave::scan::detail
