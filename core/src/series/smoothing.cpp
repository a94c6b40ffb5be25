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
void weightedAverage(std::span<const double> x, std::span<const double> weights, int offset,
                     EdgeRule edges, std::vector<double>& out) {
    const int n = static_cast<int>(x.size());
    const int len = static_cast<int>(weights.size());
    out.assign(x.size(), kNaN);
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
}

// The same for equal weights, with a running sum and count of the finite values: O(n) for any
// window. The sum is recomputed from scratch every 256 days so rounding cannot drift (for
// integer counts it is exact anyway). Between re-sums the window moves by one day: the day
// entering is added and then the day leaving removed, each only when it lies inside the series
// (a missing day adds 0, selected rather than branched on, since gaps are irregular).
void uniformAverage(std::span<const double> x, int len, int offset, EdgeRule edges,
                    std::vector<double>& out) {
    const int n = static_cast<int>(x.size());
    out.assign(x.size(), kNaN);
    const bool missingEdges = edges == EdgeRule::Missing;
    double sum = 0.0;
    int count = 0;
    for (int i = 0; i < n; ++i) {
        const int first = i - offset;  // the window covers x[first, first + len) within [0, n)
        const int end = first + len;
        if (i % 256 == 0) {
            sum = 0.0;
            count = 0;
            for (int j = std::max(0, first); j < std::min(n, end); ++j) {
                const double v = x[static_cast<std::size_t>(j)];
                const bool finite = std::isfinite(v);
                sum += finite ? v : 0.0;
                count += finite ? 1 : 0;
            }
        } else {
            if (end <= n) {  // end - 1 >= 0 always: offset < len
                const double v = x[static_cast<std::size_t>(end - 1)];
                const bool finite = std::isfinite(v);
                sum += finite ? v : 0.0;
                count += finite ? 1 : 0;
            }
            if (first >= 1) {
                const double v = x[static_cast<std::size_t>(first - 1)];
                const bool finite = std::isfinite(v);
                sum -= finite ? v : 0.0;
                count -= finite ? 1 : 0;
            }
        }
        if (missingEdges && (first < 0 || end > n))
            continue;
        if (count > 0)
            out[static_cast<std::size_t>(i)] = sum / count;
    }
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
    std::vector<double> out;
    uniformAverage(values, window, window - 1, edges, out);
    return out;
}

std::vector<double> centredMovingAverage(std::span<const double> values, int window,
                                         EdgeRule edges) {
    std::vector<double> out;
    centredMovingAverage(values, window, edges, out);
    return out;
}

void centredMovingAverage(std::span<const double> values, int window, EdgeRule edges,
                          std::vector<double>& out) {
    assert(window >= 1);
    if (window % 2 == 1) {
        uniformAverage(values, window, window / 2, edges, out);
        return;
    }
    // 2 x w: w + 1 taps, half weight at both ends.
    std::vector<double> weights(static_cast<std::size_t>(window) + 1, 1.0);
    weights.front() = 0.5;
    weights.back() = 0.5;
    weightedAverage(values, weights, window / 2, edges, out);
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

int plotSmoothingWindow(const TimeAxis& axis) {
    return axis.weekly() ? 3 : 7;
}

std::string plotSmoothingLabel(const TimeAxis& axis) {
    return std::to_string(plotSmoothingWindow(axis)) + "-" + axis.unitName() + " centred mean";
}

}  // namespace siftwave::series
