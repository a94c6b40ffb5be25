#include "fit/curve_band.h"

#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/students_t.hpp>

#include <algorithm>
#include <array>
#include <atomic>
#include <cmath>
#include <string>
#include <vector>

namespace siftwave::fit {
namespace detail {

constexpr int kCachedDof = 4096;  // 95% Student-t quantiles kept for 1..4095 degrees of freedom

double intervalQuantile(FitMethod method, int dof, double level) {
    const double tail = 0.5 + 0.5 * level;
    if (method == FitMethod::LeastSquares && dof > 0) {
        if (level == 0.95 && dof < kCachedDof) {
            // A memo by degrees of freedom (the quantile is costly to compute), shared by every
            // thread: each entry is computed where it is first needed, and two threads that race
            // on it store the same value, so relaxed atomics suffice and no fit holds state.
            static std::array<std::atomic<double>, kCachedDof> cache{};
            std::atomic<double>& entry = cache[static_cast<std::size_t>(dof)];
            double q = entry.load(std::memory_order_relaxed);
            if (q == 0.0) {
                q = boost::math::quantile(boost::math::students_t(static_cast<double>(dof)), tail);
                entry.store(q, std::memory_order_relaxed);
            }
            return q;
        }
        return boost::math::quantile(boost::math::students_t(static_cast<double>(dof)), tail);
    }
    return boost::math::quantile(boost::math::normal(), tail);
}

bool covarianceUsable(std::span<const double> covariance, int p) {
    return p > 0 && covariance.size() == static_cast<std::size_t>(p * p) &&
           std::all_of(covariance.begin(), covariance.end(),
                       [](double v) { return std::isfinite(v); });
}

namespace {

// The loop of deltaMethodBand with the parameter count known at compile time (0: at run time),
// so that the small quadratic form unrolls.
template <std::size_t N>
void bandRows(std::span<const double> value, std::span<const double> jacobian,
              std::span<const double> covariance, std::size_t np, double q, std::span<double> lower,
              std::span<double> upper) {
    const std::size_t p = N > 0 ? N : np;
    // With N fixed, a local copy of the covariance stays in registers (the output spans could
    // alias it, so it would otherwise be reloaded on every day).
    std::array<double, (N > 0 ? N * N : 1)> local{};
    const double* cov = covariance.data();
    if constexpr (N > 0) {
        std::copy_n(covariance.begin(), N * N, local.begin());
        cov = local.data();
    }
    for (std::size_t i = 0; i < value.size(); ++i) {
        const double* g = &jacobian[i * p];
        double var = 0;
        for (std::size_t a = 0; a < p; ++a) {
            double row = 0;
            for (std::size_t b = 0; b < p; ++b)
                row += cov[a * p + b] * g[b];
            var += g[a] * row;
        }
        const double half = q * std::sqrt(std::max(var, 0.0));  // >= 0 up to rounding
        lower[i] = std::max(0.0, value[i] - half);
        upper[i] = value[i] + half;
    }
}

}  // namespace

void deltaMethodBand(std::span<const double> value, std::span<const double> jacobian,
                     std::span<const double> covariance, int p, double q, std::span<double> lower,
                     std::span<double> upper) {
    const std::size_t np = static_cast<std::size_t>(p);
    switch (np) {
        case 3:
            return bandRows<3>(value, jacobian, covariance, np, q, lower, upper);
        case 4:
            return bandRows<4>(value, jacobian, covariance, np, q, lower, upper);
        default:
            return bandRows<0>(value, jacobian, covariance, np, q, lower, upper);
    }
}

}  // namespace detail

Result<CurveBand> curveBand(const FitResult& fit, int firstDay, int lastDay, double level) {
    if (!(level > 0 && level < 1))
        return makeError(ErrorCode::Usage, "the band's confidence level must lie in (0, 1)");
    if (lastDay < firstDay)
        return makeError(ErrorCode::Usage, "the band's last day lies before its first day");
    if (static_cast<long long>(lastDay) - firstDay >= 100000)
        return makeError(ErrorCode::Usage, "the band spans more than 100,000 periods");
    const WaveModel& model = waveModel(fit.model);
    const int np = model.parameterCount();
    const std::vector<double> p = fit.parameterValues();
    if (static_cast<int>(p.size()) != np || !model.valid(p))
        return makeError(ErrorCode::Usage, "the fit has no valid parameters to draw a band from");
    if (fit.periodDays != 1 && fit.periodDays != 7)
        return makeError(ErrorCode::Usage, "the fit's period must be 1 or 7 days");

    const std::size_t days = static_cast<std::size_t>(lastDay - firstDay) + 1;  // periods
    CurveBand band;
    band.first = firstDay;
    band.fitted.resize(days);
    const bool usable = detail::covarianceUsable(fit.covariance, np);
    std::vector<double> jacobian(usable ? days * static_cast<std::size_t>(np) : 0);
    if (fit.periodDays == 1) {
        std::vector<double> t(days);
        for (std::size_t i = 0; i < days; ++i)
            t[i] = static_cast<double>(firstDay - fit.first) + static_cast<double>(i);
        model.incidence(t, p, band.fitted, jacobian);
    } else {
        // Each week's expected count, the model's time in days from the window's first day.
        const double t0 = static_cast<double>(firstDay - fit.first) * fit.periodDays;
        model.countsOnPeriods(t0, fit.periodDays, p, band.fitted, jacobian);
    }
    if (!usable)
        return band;
    const int dof = fit.goodness.observations - np;
    const double q = detail::intervalQuantile(fit.method, dof, level);
    band.lower.resize(days);
    band.upper.resize(days);
    detail::deltaMethodBand(band.fitted, jacobian, fit.covariance, np, q, band.lower, band.upper);
    return band;
}

}  // namespace siftwave::fit
