#include "siftwave/report/count_band.h"

#include <boost/math/distributions/negative_binomial.hpp>
#include <boost/math/distributions/poisson.hpp>

#include <algorithm>
#include <cmath>

namespace siftwave::report {
namespace {

constexpr double kLowerQ = 0.025;
constexpr double kUpperQ = 0.975;
constexpr double kZ975 = 1.959963984540054;  // standard normal 97.5% quantile

// The discrete quantile inf{k : F(k) >= q} (rounded up from Boost's real-valued one), so
// that each tail outside [low, high] holds at most 2.5%.
using RoundUp = boost::math::policies::policy<
    boost::math::policies::discrete_quantile<boost::math::policies::integer_round_up>>;

// Quantiles must not throw across the API: Boost.Math's default policy throws on a
// domain error, so the arguments are checked first and any failure gives NaN.
std::pair<double, double> poissonQuantiles(double mu) {
    if (!(mu > 0) || !std::isfinite(mu))
        return {0.0, 0.0};
    try {
        const boost::math::poisson_distribution<double, RoundUp> d(mu);
        return {boost::math::quantile(d, kLowerQ), boost::math::quantile(d, kUpperQ)};
    } catch (...) {
        return {std::nan(""), std::nan("")};
    }
}

std::pair<double, double> negbinQuantiles(double mu, double r) {
    if (!(mu > 0) || !std::isfinite(mu))
        return {0.0, 0.0};
    if (!(r > 0) || !std::isfinite(r))
        return poissonQuantiles(mu);
    try {
        const boost::math::negative_binomial_distribution<double, RoundUp> d(r, r / (r + mu));
        return {boost::math::quantile(d, kLowerQ), boost::math::quantile(d, kUpperQ)};
    } catch (...) {
        return {std::nan(""), std::nan("")};
    }
}

}  // namespace

CountBand countBand(const fit::FitResult& fit, std::span<const double> counts) {
    CountBand band;
    const std::size_t n = fit.fitted.size();
    band.low.assign(n, std::nan(""));
    band.high.assign(n, std::nan(""));

    if (fit.method == fit::FitMethod::LeastSquares) {
        double pearson = 0;
        int used = 0;
        for (std::size_t i = 0; i < n; ++i) {
            const std::size_t day = static_cast<std::size_t>(fit.first) + i;
            const double mu = fit.fitted[i];
            if (day >= counts.size() || std::isnan(counts[day]) || !(mu > 0))
                continue;
            pearson += (counts[day] - mu) * (counts[day] - mu) / std::max(mu, 1.0);
            ++used;
        }
        const int freedom = used - static_cast<int>(fit.parameters.size());
        band.dispersion = freedom > 0 ? pearson / freedom : 1.0;
        for (std::size_t i = 0; i < n; ++i) {
            const double mu = std::max(fit.fitted[i], 0.0);
            const double half = kZ975 * std::sqrt(band.dispersion * mu);
            band.low[i] = std::max(0.0, mu - half);
            band.high[i] = mu + half;
        }
        return band;
    }
    for (std::size_t i = 0; i < n; ++i) {
        const auto [low, high] = fit.method == fit::FitMethod::Poisson
                                     ? poissonQuantiles(fit.fitted[i])
                                     : negbinQuantiles(fit.fitted[i], fit.dispersion.value_or(0));
        band.low[i] = low;
        band.high[i] = high;
    }
    return band;
}

}  // namespace siftwave::report
