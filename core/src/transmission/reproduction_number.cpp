#include "siftwave/transmission/reproduction_number.h"

#include <boost/math/distributions/gamma.hpp>

#include <cmath>
#include <cstdio>

namespace siftwave::transmission {
namespace detail {

// The number of lags from 0 that hold 99% of the serial interval's weight.
std::size_t reachOf(std::span<const double> weights) {
    double total = 0.0;
    for (double w : weights)
        total += w;
    double cumulative = 0.0;
    for (std::size_t s = 0; s < weights.size(); ++s) {
        cumulative += weights[s];
        if (cumulative >= 0.99 * total)
            return s + 1;
    }
    return weights.size();
}

// Prefix sums of the counts (NaN as 0) and of the missing counts.
struct Prefix {
    std::vector<double> sum;
    std::vector<std::int32_t> missing;

    explicit Prefix(std::span<const double> counts)
        : sum(counts.size() + 1, 0.0), missing(counts.size() + 1, 0) {
        for (std::size_t i = 0; i < counts.size(); ++i) {
            const bool ok = std::isfinite(counts[i]);
            sum[i + 1] = sum[i] + (ok ? counts[i] : 0.0);
            missing[i + 1] = missing[i] + (ok ? 0 : 1);
        }
    }
};

std::string notFullReason(const CoriOptions& o, const TimeAxis& axis) {
    return "the " + std::to_string(o.window) + "-" + axis.unitName() +
           " window is not yet full (the first " + axis.unitName() + "'s cases count as imported)";
}

// The posterior for a window with these sums, and the CV rule.
void setPosterior(CoriEstimate& e, const CoriOptions& o) {
    const double a = (o.priorMean / o.priorSd) * (o.priorMean / o.priorSd);
    const double b = o.priorSd * o.priorSd / o.priorMean;
    e.shape = a + e.sumIncidence;
    e.scale = 1.0 / (1.0 / b + e.sumInfectiousness);
    e.mean = e.shape * e.scale;
    e.sd = std::sqrt(e.shape) * e.scale;
    e.cv = 1.0 / std::sqrt(e.shape);
    const boost::math::gamma_distribution<double> posterior(e.shape, e.scale);
    e.lower = boost::math::quantile(posterior, 0.025);
    e.upper = boost::math::quantile(posterior, 0.975);
    if (e.cv > o.maxCv) {
        char text[128];
        std::snprintf(text, sizeof text,
                      "too few cases in the window (%g): posterior CV %.2f is above %g",
                      e.sumIncidence, e.cv, o.maxCv);
        e.reason = text;
    }
}

}  // namespace detail

Status CoriOptions::validate() const {
    if (window < 1 || window > 1000)
        return makeError(ErrorCode::Usage, "the R_t window must be 1 to 1000 periods");
    if (!std::isfinite(priorMean) || !std::isfinite(priorSd) || priorMean <= 0.0 || priorSd <= 0.0)
        return makeError(ErrorCode::Usage, "the prior's mean and sd must be positive numbers");
    if (!(maxCv > 0.0))
        return makeError(ErrorCode::Usage, "the largest posterior CV must be positive");
    return Ok{};
}

std::vector<double> totalInfectiousness(std::span<const double> counts,
                                        std::span<const double> weights) {
    std::vector<double> lambda(counts.size(), 0.0);
    for (std::size_t t = 0; t < counts.size(); ++t) {
        const std::size_t reach = std::min(weights.size(), t + 1);
        double sum = 0.0;
        for (std::size_t s = 0; s < reach; ++s) {
            const double c = counts[t - s];
            sum += weights[s] * (std::isfinite(c) ? c : 0.0);
        }
        lambda[t] = sum;
    }
    return lambda;
}

std::vector<CoriEstimate> coriEstimates(std::span<const double> counts, const SerialInterval& si,
                                        const TimeAxis& axis, const CoriOptions& o) {
    const std::size_t n = counts.size();
    std::vector<CoriEstimate> out(n);
    const std::vector<double> lambda = totalInfectiousness(counts, si.weights);
    const detail::Prefix prefix(counts);
    std::vector<double> lambdaSum(n + 1, 0.0);
    for (std::size_t i = 0; i < n; ++i)
        lambdaSum[i + 1] = lambdaSum[i] + lambda[i];
    const std::size_t reach = detail::reachOf(si.weights);
    const std::size_t tau = static_cast<std::size_t>(o.window);
    for (std::size_t t = 0; t < n; ++t) {
        CoriEstimate& e = out[t];
        if (t < tau) {
            e.reason = detail::notFullReason(o, axis);
            continue;
        }
        const std::size_t first = t + 1 - tau;
        // Lambda of the window's first period reaches back reach - 1 periods (lags 1 .. reach-1).
        const std::size_t back = reach > 0 ? reach - 1 : 0;
        const std::size_t earliest = first > back ? first - back : 0;
        if (prefix.missing[t + 1] != prefix.missing[earliest]) {
            e.reason = "a count is missing in the window or within the serial interval's reach";
            continue;
        }
        e.sumIncidence = prefix.sum[t + 1] - prefix.sum[first];
        e.sumInfectiousness = lambdaSum[t + 1] - lambdaSum[first];
        if (!(e.sumInfectiousness > 0.0)) {
            e.reason =
                "no infectiousness in the window: no earlier cases within the serial "
                "interval's reach";
            continue;
        }
        detail::setPosterior(e, o);
    }
    return out;
}

}  // namespace siftwave::transmission
