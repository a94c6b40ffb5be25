#include "siftwave/series/weekday.h"

#include "siftwave/series/smoothing.h"

#include <cmath>
#include <string>

namespace siftwave::series {

Result<WeekdayFactors> estimateWeekdayFactors(std::span<const double> counts, Date firstDay) {
    const std::vector<double> trend = centredMovingAverage(counts, 7, EdgeRule::Missing);
    std::array<double, 7> sum{};
    WeekdayFactors out;
    for (std::size_t i = 0; i < counts.size(); ++i) {
        const double x = counts[i], m = trend[i];
        if (!std::isfinite(x) || !std::isfinite(m) || !(m > 0))
            continue;
        const int d = (firstDay + static_cast<int>(i)).isoWeekday() - 1;
        sum[static_cast<std::size_t>(d)] += x / m;
        ++out.daysUsed[static_cast<std::size_t>(d)];
    }
    double mean = 0;
    for (std::size_t d = 0; d < 7; ++d) {
        if (out.daysUsed[d] == 0) {
            return makeError(ErrorCode::NotFound,
                             "weekday factors need every weekday with a count and a positive "
                             "7-day average; weekday " +
                                 std::to_string(d + 1) + " has none");
        }
        out.factor[d] = sum[d] / out.daysUsed[d];
        mean += out.factor[d] / 7.0;
    }
    if (!(mean > 0))
        return makeError(ErrorCode::Numerical, "weekday ratios average to zero");
    for (double& f : out.factor)
        f /= mean;
    return out;
}

std::vector<double> removeWeekdayEffect(std::span<const double> counts, Date firstDay,
                                        const WeekdayFactors& factors) {
    std::vector<double> out(counts.begin(), counts.end());
    for (std::size_t i = 0; i < out.size(); ++i) {
        const int d = (firstDay + static_cast<int>(i)).isoWeekday() - 1;
        out[i] /= factors.factor[static_cast<std::size_t>(d)];
    }
    return out;
}

}  // namespace siftwave::series
