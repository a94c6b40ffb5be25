#pragma once
// Weekday adjustment: one multiplicative factor per weekday, divided out.
//
// Ratio-to-moving-average method (the classical multiplicative decomposition with period 7):
// each day's count is divided by the centred 7-day average around it (trend), the ratios are
// averaged per weekday, and the seven averages are scaled so that their arithmetic mean is 1.
// Source: R. J. Hyndman & G. Athanasopoulos, "Forecasting: Principles and Practice", 3rd ed.,
// section 3.4 "Classical decomposition" (multiplicative case, with m = 7). Days whose average
// is missing or not positive, or whose count is missing, are left out of the estimate.
// (The Poisson/negative-binomial fits estimate weekday factors jointly with the curve instead;
// see fit/fit.h.)

#include "siftwave/date.h"
#include "siftwave/result.h"

#include <array>
#include <span>
#include <vector>

namespace siftwave::series {

struct WeekdayFactors {
    std::array<double, 7> factor{1, 1, 1, 1, 1, 1, 1};  // Monday .. Sunday, arithmetic mean 1
    std::array<int, 7> daysUsed{};                      // ratios averaged per weekday
};

/// Estimates the factors of counts[i] on day firstDay + i (NaN = missing). NotFound when some
/// weekday has no usable day (needs at least one full week inside the series).
Result<WeekdayFactors> estimateWeekdayFactors(std::span<const double> counts, Date firstDay);

/// counts[i] / factor[weekday of day i]; NaN stays NaN.
std::vector<double> removeWeekdayEffect(std::span<const double> counts, Date firstDay,
                                        const WeekdayFactors& factors);

}  // namespace siftwave::series
