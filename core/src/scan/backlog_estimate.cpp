#include "scan/backlog_estimate.h"

#include "scan/robust_stats.h"

#include <algorithm>
#include <cmath>

namespace siftwave::scan::detail {
namespace {
constexpr int kMinNeighbours = 4;
// The neighbours' own spread may raise the scale up to this multiple of the modelled noise.
constexpr double kMaxScaleRatio = 1.5;
}  // namespace

void BacklogSeries::load(std::span<const Cell> cells) {
    const std::size_t n = cells.size();
    m_x.resize(n);
    m_y.resize(n);
    for (std::size_t t = 0; t < n; ++t) {
        const Cell& c = cells[t];
        m_x[t] = c.reported() ? static_cast<double>(c.value) : kNaN;
        m_y[t] = m_x[t] / factorAt(static_cast<std::int32_t>(t));
    }
}

bool BacklogSeries::mightBeFlagged(std::int32_t t) const {
    const double x = m_x[static_cast<std::size_t>(t)];
    if (!(x >= m_options.minExcess) || x <= 0)
        return false;  // NaN fails too
    // A gap may be behind: leave it to the full estimate.
    if (t > 0) {
        const double before = m_y[static_cast<std::size_t>(t) - 1];
        if (std::isnan(before) || before <= 0.5 * m_y[static_cast<std::size_t>(t)])
            return true;
    }
    // Without a gap the median of the neighbours must be <= y_t / min_ratio.
    const double bound = m_y[static_cast<std::size_t>(t)] / m_options.minRatio;
    const auto n = static_cast<std::int32_t>(m_x.size());
    int reported = 0, small = 0;
    const int w = m_window;
    for (std::int32_t j = std::max(0, t - w); j <= std::min(n - 1, t + w); ++j) {
        if (j == t)
            continue;
        const double y = m_y[static_cast<std::size_t>(j)];
        if (std::isnan(y))
            continue;
        ++reported;
        small += y <= bound;
    }
    return 2 * small >= reported;
}

std::optional<BacklogEstimate> BacklogSeries::estimate(std::int32_t t) {
    const auto n = static_cast<std::int32_t>(m_x.size());
    const double x = m_x[static_cast<std::size_t>(t)];
    if (std::isnan(x))
        return std::nullopt;
    const int w = m_window;

    // The level the gap test compares with: non-zero neighbours in [t - 2w, t + w].
    m_scratch.clear();
    for (std::int32_t j = std::max(0, t - 2 * w); j <= std::min(n - 1, t + w); ++j) {
        const double y = m_y[static_cast<std::size_t>(j)];
        if (j != t && y > 0)
            m_scratch.push_back(y);
    }
    const double level = m_scratch.empty() ? 0.0 : medianInPlace(m_scratch);

    // The gap just before t: no value, zero, or low.
    std::int32_t gapStart = t;
    while (gapStart - 1 >= 0 && t - (gapStart - 1) <= m_maxGap) {
        const double y = m_y[static_cast<std::size_t>(gapStart) - 1];
        const bool gapDay = std::isnan(y) || y <= 0 || y <= m_options.gapLowFraction * level;
        if (!gapDay)
            break;
        --gapStart;
    }
    // A gap that reaches the start of the series is its beginning, not a gap.
    const bool gap = t - gapStart >= m_gapMin && gapStart > 0;
    const std::int32_t leftEnd = gap ? gapStart : t;  // exclusive

    m_scratch.clear();
    for (std::int32_t j = std::max(0, leftEnd - w); j < leftEnd; ++j) {
        const double y = m_y[static_cast<std::size_t>(j)];
        if (!std::isnan(y))
            m_scratch.push_back(y);
    }
    for (std::int32_t j = t + 1; j <= std::min(n - 1, t + w); ++j) {
        const double y = m_y[static_cast<std::size_t>(j)];
        if (!std::isnan(y))
            m_scratch.push_back(y);
    }
    if (static_cast<int>(m_scratch.size()) < kMinNeighbours)
        return std::nullopt;

    BacklogEstimate e;
    e.neighbours = static_cast<int>(m_scratch.size());
    const RobustLocationScale ls = robustLocationScale(m_scratch);
    const double f = factorAt(t);
    const double m = std::max(ls.median, 0.0);
    e.day = Date{t};
    e.observed = static_cast<std::int64_t>(x);
    e.expected = m * f;
    const double noise = std::max(m, 1.0);
    const double modelled = std::sqrt(noise + m_overdispersion * noise * noise);
    e.scale = f * std::max(modelled, std::min(ls.scale, kMaxScaleRatio * modelled));
    e.z = (x - e.expected) / e.scale;
    e.excess = std::max<std::int64_t>(0, std::llround(x - e.expected));
    if (gap) {
        e.gapFirst = Date{gapStart};
        e.gapLast = Date{t - 1};
        e.windowFirst = Date{gapStart};
        e.windowLast = Date{t - 1};
    } else {
        e.windowFirst = Date{std::max(0, t - m_redistribute)};
        e.windowLast = Date{std::max(0, t - 1)};
    }
    const double ratio = gap ? 1.0 + (m_options.minRatio - 1.0) / 2.0 : m_options.minRatio;
    e.flagged = e.z >= (gap ? m_options.gapThreshold : m_options.threshold) &&
                static_cast<double>(e.excess) >= m_options.minExcess && x >= ratio * e.expected &&
                t > 0;
    return e;
}

}  // namespace siftwave::scan::detail
