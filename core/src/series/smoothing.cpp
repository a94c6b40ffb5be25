#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <string>

namespace siftwave::series {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// s_i = sum_k w_k x_{i + k - offset} over finite, in-range x, renormalised by the weights used.
std::vector<double> weightedAverage(std::span<const double> x, std::span<const double> weights,
                                    int offset, EdgeRule edges) {
    const int n = static_cast<int>(x.size());
    const int len = static_cast<int>(weights.size());
    std::vector<double> out(x.size(), kNaN);
    for (int i = 0; i < n; ++i) {
        const int first = i - offset;
        const int last = first + len - 1;
        if (edges == EdgeRule::Missing && (first < 0 || last >= n))
            continue;
        double sum = 0.0;
        double weight = 0.0;
        for (int k = std::max(0, -first); k < len && first + k < n; ++k) {
            const double v = x[static_cast<std::size_t>(first + k)];
            if (!std::isfinite(v))
                continue;
            sum += weights[static_cast<std::size_t>(k)] * v;
            weight += weights[static_cast<std::size_t>(k)];
        }
        if (weight > 0.0)
            out[static_cast<std::size_t>(i)] = sum / weight;
    }
    return out;
}

// The same for equal weights, with a running sum and count of the finite values: O(n) for any
// window. The sum is recomputed from scratch every 256 days so rounding cannot drift (for
// integer counts it is exact anyway).
std::vector<double> uniformAverage(std::span<const double> x, int len, int offset, EdgeRule edges) {
    const int n = static_cast<int>(x.size());
    std::vector<double> out(x.size(), kNaN);
    double sum = 0.0;
    int count = 0;
    int lo = 0, hi = 0;  // the running sum covers x[lo, hi)
    for (int i = 0; i < n; ++i) {
        const int first = std::max(0, i - offset);
        const int end = std::min(n, i - offset + len);
        if (i % 256 == 0) {
            sum = 0.0;
            count = 0;
            lo = hi = first;
        }
        for (; hi < end; ++hi) {
            const double v = x[static_cast<std::size_t>(hi)];
            if (std::isfinite(v)) {
                sum += v;
                ++count;
            }
        }
        for (; lo < first; ++lo) {
            const double v = x[static_cast<std::size_t>(lo)];
            if (std::isfinite(v)) {
                sum -= v;
                --count;
            }
        }
        if (edges == EdgeRule::Missing && (i - offset < 0 || i - offset + len > n))
            continue;
        if (count > 0)
            out[static_cast<std::size_t>(i)] = sum / count;
    }
    return out;
}

}  // namespace

Status MovingAverageOptions::validate() const {
    if (window < 1 || window > 365) {
        return makeError(
            ErrorCode::Usage,
            "the smoothing window must be between 1 and 365 days, not " + std::to_string(window));
    }
    return Ok{};
}

std::vector<double> trailingMovingAverage(std::span<const double> values, int window,
                                          EdgeRule edges) {
    assert(window >= 1);
    return uniformAverage(values, window, window - 1, edges);
}

std::vector<double> centredMovingAverage(std::span<const double> values, int window,
                                         EdgeRule edges) {
    assert(window >= 1);
    if (window % 2 == 1)
        return uniformAverage(values, window, window / 2, edges);
    // 2 x w: w + 1 taps, half weight at both ends.
    std::vector<double> weights(static_cast<std::size_t>(window) + 1, 1.0);
    weights.front() = 0.5;
    weights.back() = 0.5;
    return weightedAverage(values, weights, window / 2, edges);
}

std::vector<double> trailingMovingAverage(std::span<const double> values,
                                          const MovingAverageOptions& options) {
    assert(options.validate().ok());
    return trailingMovingAverage(values, options.window, options.edges);
}

std::vector<double> centredMovingAverage(std::span<const double> values,
                                         const MovingAverageOptions& options) {
    assert(options.validate().ok());
    return centredMovingAverage(values, options.window, options.edges);
}

}  // namespace siftwave::series
