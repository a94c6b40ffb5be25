#pragma once
// Smoothing a daily series: trailing and centred moving averages, and a
// multiplicative weekday adjustment.
//
// Moving averages. With window w and values x_0 .. x_{n-1}:
//   trailing:  s_i = (1/w) * sum_{j=0}^{w-1} x_{i-j}
//   centred, w odd  (w = 2h + 1):  s_i = (1/w) * sum_{j=-h}^{h} x_{i+j}
//   centred, w even (w = 2h):      the "2 x w" average, weights 1/(2w) on x_{i-h} and x_{i+h}
//                                  and 1/w on the 2h - 1 values between
// (Hyndman & Athanasopoulos, "Forecasting: Principles and Practice", 3rd ed.,
// section 3.3 "Moving averages", including the centred 2 x m average of an even order).
//
// A trailing average lags a curve by (w - 1) / 2 days: the peak of a trailing
// 7-day average falls 3 days after the peak of the curve it smooths. Anything
// that reports dates (peaks, quantiles) must use the centred average, or shift
// the trailing one back by trailingLagDays(w).
//
// Missing values are NaN in the input. Each output value is the weighted mean
// of the finite inputs its window covers (weights renormalised over what is
// there); where the window covers no finite value the output is NaN. Near the
// ends of the series the window is incomplete: with EdgeRule::Partial (the
// default) the mean is taken over the part that exists, with EdgeRule::Missing
// the output there is NaN.

#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <span>
#include <string>
#include <vector>

namespace siftwave::series {

enum class EdgeRule {
    Partial,  // average what the window covers near the ends (default)
    Missing,  // NaN wherever the window reaches past either end
};

struct MovingAverageOptions {
    int window = 7;  // days; >= 1 (1 returns the input unchanged)
    EdgeRule edges = EdgeRule::Partial;

    /// Usage error when window < 1 or window > 365.
    Status validate() const;
};

/// Trailing moving average; the result has the input's length. Lags by trailingLagDays(window).
std::vector<double> trailingMovingAverage(std::span<const double> values, int window = 7,
                                          EdgeRule edges = EdgeRule::Partial);

/// Centred moving average (2 x w for even w); the result has the input's length. No lag.
std::vector<double> centredMovingAverage(std::span<const double> values, int window = 7,
                                         EdgeRule edges = EdgeRule::Partial);
/// The same into `out` (resized to the input's length, its storage reused: for loops over
/// many series). `out` must not be the storage of `values`.
void centredMovingAverage(std::span<const double> values, int window, EdgeRule edges,
                          std::vector<double>& out);

/// The same with an options struct (asserts options.validate()).
std::vector<double> trailingMovingAverage(std::span<const double> values,
                                          const MovingAverageOptions& options);
std::vector<double> centredMovingAverage(std::span<const double> values,
                                         const MovingAverageOptions& options);

/// Days by which a trailing average of this window lags the curve: (window - 1) / 2.
inline double trailingLagDays(int window) {
    return (window - 1) / 2.0;
}

/// The centred mean a plot draws over its counts, in periods: 7 for daily data (a whole week,
/// so the weekday effect cancels) and 3 for weekly data (a week either side: enough to see the
/// trend without flattening a short wave). Common practice, no source.
int plotSmoothingWindow(const TimeAxis& axis);
/// "7-day centred mean" or "3-week centred mean".
std::string plotSmoothingLabel(const TimeAxis& axis);

}  // namespace siftwave::series
