#pragma once
// Small robust statistics used by the detectors (namespace siftwave::scan::detail).
//
// Median and MAD: for values v_1..v_n, med = the middle value (mean of the two
// middle values for even n); MAD = med(|v_i - med|). Scaled by 1.4826 (= 1 /
// Phi^-1(3/4)) the MAD estimates the standard deviation of normal data
// (Hampel 1974, JASA 69:383; Rousseeuw and Croux 1993, JASA 88:1273).
//
// The Hampel identifier (Pearson 2002, IEEE Trans. Control Systems Technology
// 10:55, "Outliers in process modeling and identification"): with a moving
// window of half-width K, x_k is an outlier when |x_k - m_k| > t * S_k, where
// m_k is the median of x_{k-K}..x_{k+K} and S_k = 1.4826 * MAD of the same
// window. Pearson uses t = 3.

#include <cstddef>
#include <span>
#include <vector>

namespace siftwave::scan::detail {

inline constexpr double kMadToSigma = 1.4826;

/// Median of the values (reordered in place). NaN when empty.
double medianInPlace(std::span<double> values);

struct RobustLocationScale {
    double median = 0;
    double scale = 0;  // 1.4826 * MAD
};

/// Median and scaled MAD of the values (reordered in place).
RobustLocationScale robustLocationScale(std::span<double> values);

/// Indices flagged by the Hampel identifier with half-width `halfWidth` and
/// threshold `t` (window includes x_k, truncated at the ends of the series).
/// NaN values are skipped inside windows and never flagged.
std::vector<std::size_t> hampelOutliers(std::span<const double> series, int halfWidth, double t);

/// Chance that two independent Poisson(mu) draws are equal: sum_k p_k^2 =
/// exp(-2 mu) I_0(2 mu) (modified Bessel function of the first kind).
double poissonEqualChance(double mu);

/// Chance that `draws` independent negative-binomial draws of mean mu and overdispersion phi
/// (Var = mu + phi mu^2; Poisson when phi = 0) are all equal and non-zero: sum_{k >= 1} p_k^n,
/// p_k = Gamma(k + 1/phi) / (Gamma(1/phi) k!) (1 / (1 + phi mu))^(1/phi) (phi mu / (1 + phi
/// mu))^k (Hilbe, "Negative Binomial Regression", 2nd ed., ch. 5). 0 when mu <= 0.
double equalNonZeroRunChance(double mu, double phi, int draws);

}  // namespace siftwave::scan::detail
