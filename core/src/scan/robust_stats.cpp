#include "scan/robust_stats.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace siftwave::scan::detail {

double medianInPlace(std::span<double> values) {
    const std::size_t n = values.size();
    if (n == 0)
        return std::numeric_limits<double>::quiet_NaN();
    const std::size_t mid = n / 2;
    std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(mid),
                     values.end());
    const double upper = values[mid];
    if (n % 2 == 1)
        return upper;
    const double lower =
        *std::max_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(mid));
    return 0.5 * (lower + upper);
}

RobustLocationScale robustLocationScale(std::span<double> values) {
    RobustLocationScale out;
    out.median = medianInPlace(values);
    for (double& v : values)
        v = std::fabs(v - out.median);
    out.scale = kMadToSigma * medianInPlace(values);
    return out;
}

std::vector<std::size_t> hampelOutliers(std::span<const double> series, int halfWidth, double t) {
    std::vector<std::size_t> flagged;
    std::vector<double> window;
    const auto n = static_cast<std::ptrdiff_t>(series.size());
    for (std::ptrdiff_t k = 0; k < n; ++k) {
        if (std::isnan(series[static_cast<std::size_t>(k)]))
            continue;
        window.clear();
        for (std::ptrdiff_t j = std::max<std::ptrdiff_t>(0, k - halfWidth);
             j <= std::min<std::ptrdiff_t>(n - 1, k + halfWidth); ++j) {
            const double v = series[static_cast<std::size_t>(j)];
            if (!std::isnan(v))
                window.push_back(v);
        }
        const RobustLocationScale ls = robustLocationScale(window);
        if (std::fabs(series[static_cast<std::size_t>(k)] - ls.median) > t * ls.scale) {
            flagged.push_back(static_cast<std::size_t>(k));
        }
    }
    return flagged;
}

double poissonEqualChance(double mu) {
    if (!(mu > 0))
        return 1.0;
    // Sum p_k^2 directly around the mode; terms beyond 12 sd are negligible.
    const double sd = std::sqrt(mu);
    const double lo = std::max(0.0, std::floor(mu - 12 * sd - 5));
    const double hi = std::ceil(mu + 12 * sd + 5);
    double sum = 0;
    for (double k = lo; k <= hi; k += 1.0) {
        const double logp = -mu + k * std::log(mu) - std::lgamma(k + 1);
        sum += std::exp(2 * logp);
    }
    return std::min(1.0, sum);
}

double equalNonZeroRunChance(double mu, double phi, int draws) {
    if (!(mu > 0))
        return 0.0;
    const bool poisson = !(phi > 1e-9);
    const double r = poisson ? 0.0 : 1.0 / phi;
    const double sd = std::sqrt(mu + (poisson ? 0.0 : phi * mu * mu));
    const double hi = std::ceil(mu + 12 * sd + 5);
    const auto logPmf = [&](double k) {
        if (poisson)
            return -mu + k * std::log(mu) - std::lgamma(k + 1);
        return std::lgamma(k + r) - std::lgamma(r) - std::lgamma(k + 1) - r * std::log1p(phi * mu) +
               k * (std::log(phi * mu) - std::log1p(phi * mu));
    };
    double sum = 0;
    for (double k = std::max(1.0, std::floor(mu - 12 * sd - 5)); k <= hi; k += 1.0)
        sum += std::exp(draws * logPmf(k));
    return std::min(1.0, sum);
}

}  // namespace siftwave::scan::detail
