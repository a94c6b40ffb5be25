#pragma once
// The delta-method interval of the fitted incidence (internal to core/src/fit; the maths is in
// the header comment of siftwave/fit/fit.h, step 5).

#include "siftwave/fit/fit.h"

#include <span>

namespace siftwave::fit::detail {

/// The two-sided quantile of the parameter intervals at confidence `level`: Student t with
/// `dof` degrees of freedom for least squares (dof > 0), the standard normal otherwise.
double intervalQuantile(FitMethod method, int dof, double level = 0.95);

/// True when `covariance` is a p x p matrix of finite numbers.
bool covarianceUsable(std::span<const double> covariance, int p);

/// lower/upper_i = max(0, value_i - q s_i), value_i + q s_i with s_i^2 = g_i^T Cov g_i, g_i row i
/// of `jacobian` (row-major, value.size() x p). `covariance` must be usable.
void deltaMethodBand(std::span<const double> value, std::span<const double> jacobian,
                     std::span<const double> covariance, int p, double q, std::span<double> lower,
                     std::span<double> upper);

}  // namespace siftwave::fit::detail
