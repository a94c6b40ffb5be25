#include "scan/backlog_estimate.h"

#include "scan/robust_stats.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace siftwave::scan::detail {
namespace {
constexpr int kMinNeighbours = 4;
// The neighbours' own spread may raise the scale up to this multiple of the modelled noise.
constexpr double kMaxScaleRatio = 1.5;
// The chosen window is offered as the deficit when its shortfall below the trend is at least
// this many noise sds; weaker than that, nothing points to a window (our choice: measured
// with tests/bench/scan_restore_bench, 1 sd gave a higher median restoration than 2 or 2.5).
constexpr double kDeficitSds = 1.0;
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

BacklogSeries::Side BacklogSeries::side(std::int32_t first, std::int32_t last) {
    const auto n = static_cast<std::int32_t>(m_x.size());
    m_scratch.clear();
    double centre = 0;
    for (std::int32_t j = std::max(0, first); j <= std::min(n - 1, last); ++j) {
        const double y = m_y[static_cast<std::size_t>(j)];
        if (std::isnan(y))
            continue;
        m_scratch.push_back(y);
        centre += j;
    }
    Side s;
    s.n = static_cast<int>(m_scratch.size());
    if (s.n == 0)
        return s;
    s.centre = centre / s.n;
    const RobustLocationScale ls = robustLocationScale(m_scratch);
    s.median = std::max(ls.median, 0.0);
    s.scale = ls.scale;
    return s;
}

double BacklogSeries::trendAt(const Side& left, const Side& right, double j) {
    if (left.n == 0)
        return right.median;
    if (right.n == 0 || right.centre <= left.centre)
        return left.median;
    const double u = std::clamp((j - left.centre) / (right.centre - left.centre), 0.0, 1.0);
    return left.median + u * (right.median - left.median);
}

// Over a long window an epidemic grows or declines geometrically: interpolate the
// logarithm (half a count added so that a zero side stays finite).
double BacklogSeries::growthAt(const Side& left, const Side& right, double j) {
    if (left.n == 0 || right.n == 0 || right.centre <= left.centre)
        return trendAt(left, right, j);
    const double u = std::clamp((j - left.centre) / (right.centre - left.centre), 0.0, 1.0);
    const double a = std::log(left.median + 0.5), b = std::log(right.median + 0.5);
    return std::max(0.0, std::exp(a + u * (b - a)) - 0.5);
}

double BacklogSeries::noiseSd(double mean) const {
    const double m = std::max(mean, 1.0);
    return std::sqrt(m + m_overdispersion * m * m);
}

// Each window length L = 1 .. max_gap: the trend (geometric) from the `window` periods
// before t - L to those after t, the window's reports scaled up by the excess in
// proportion to them, and the mean squared deviation of that restoration from the trend,
// in noise sds. The smallest wins: too short a window is restored too high, too long a
// one too high in its first periods, which were not short. Returns the shortfall below
// the trend over the winning window (a period without a value falls short by all its
// expected count) and its noise sd.
BacklogSeries::Deficit BacklogSeries::deficitBefore(std::int32_t t, const Side& right,
                                                    double excess) {
    Deficit best;
    double bestCost = std::numeric_limits<double>::infinity();
    for (int L = 1; L <= m_maxGap && t - L - 1 >= 0; ++L) {
        const Side before = side(t - L - m_window, t - L - 1);
        if (before.n < 2)
            break;
        double reported = 0;
        for (std::int32_t j = t - L; j < t; ++j) {
            const double x = m_x[static_cast<std::size_t>(j)];
            reported += std::isnan(x) ? 0.0 : x;
        }
        if (reported <= 0)
            continue;
        // The window restored by the excess in proportion to its reports, against the
        // trend from the periods before it to those after t: the mean squared deviation in
        // noise sds. Too short a window is restored too high; too long, its first periods.
        const double k = 1.0 + std::max(excess, 0.0) / reported;
        double sum = 0, var = 0, cost = 0;
        for (std::int32_t j = t - L; j < t; ++j) {
            const double e = growthAt(before, right, j) * factorAt(j);
            const double x = m_x[static_cast<std::size_t>(j)];
            const double xv = std::isnan(x) ? 0.0 : x;
            const double sd = noiseSd(e);
            sum += e - xv;
            var += sd * sd;
            cost += (xv * k - e) * (xv * k - e) / (sd * sd);
        }
        cost /= L;
        if (cost < bestCost) {
            bestCost = cost;
            best = Deficit{L, sum, std::sqrt(var), before};
        }
    }
    return best;
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

    // The right side skips a gap just after t and the catch-up that ends it: the periods
    // of a later outage say nothing about the level at t.
    std::int32_t gapAfter = t + 1;
    while (gapAfter < n && gapAfter - t <= m_maxGap) {
        const double y = m_y[static_cast<std::size_t>(gapAfter)];
        if (!(std::isnan(y) || y <= 0 || y <= m_options.gapLowFraction * level))
            break;
        ++gapAfter;
    }
    const std::int32_t rightStart = gapAfter - (t + 1) >= m_gapMin ? gapAfter + 1 : t + 1;
    const Side right = side(rightStart, rightStart + w - 1);
    const Side adjacent = side(leftEnd - w, leftEnd - 1);
    Side left = adjacent;
    if (left.n + right.n < kMinNeighbours)
        return std::nullopt;

    BacklogEstimate e;
    e.neighbours = left.n + right.n;
    e.day = Date{t};
    e.observed = static_cast<std::int64_t>(x);
    const double f = factorAt(t);
    if (gap) {
        e.gapFirst = Date{gapStart};
        e.gapLast = Date{t - 1};
        e.windowFirst = Date{gapStart};
        e.windowLast = Date{t - 1};
        e.window = WindowBasis::Gap;
    } else if (!(x >= m_options.minExcess)) {
        e.windowFirst = Date{std::max(0, t - m_redistribute)};
        e.windowLast = Date{std::max(0, t - 1)};
    } else {
        // A deficit before t chooses the window and moves the left side of the trend
        // before it; without one, the longest plausible window.
        const Deficit d = deficitBefore(t, right, x - trendAt(left, right, t) * f);
        const bool found = d.periods > 0 && d.sum >= kDeficitSds * d.sd;
        if (found) {
            left = d.left;
            e.deficit = d.sum;
            e.window = WindowBasis::Deficit;
        } else {
            e.window = WindowBasis::Longest;
        }
        const int periods = found ? d.periods : std::min(m_maxGap, t);
        e.windowFirst = Date{std::max(0, t - periods)};
        e.windowLast = Date{std::max(0, t - 1)};
    }
    const double m = trendAt(left, right, t);
    e.levelBefore = left.median * f;
    e.levelAfter = right.median * f;
    e.expected = m * f;
    const double modelled = noiseSd(m);
    // The spread of the neighbours pooled, as the Hampel identifier has it (the
    // sides' own spreads alone gave false alarms on clean generated drops).
    m_scratch.clear();
    for (std::int32_t j = std::max(0, leftEnd - w); j < leftEnd; ++j)
        if (!std::isnan(m_y[static_cast<std::size_t>(j)]))
            m_scratch.push_back(m_y[static_cast<std::size_t>(j)]);
    for (std::int32_t j = rightStart; j <= std::min(n - 1, rightStart + w - 1); ++j)
        if (!std::isnan(m_y[static_cast<std::size_t>(j)]))
            m_scratch.push_back(m_y[static_cast<std::size_t>(j)]);
    const double spread = robustLocationScale(m_scratch).scale;
    e.scale = f * std::max(modelled, std::min(spread, kMaxScaleRatio * modelled));
    e.z = (x - e.expected) / e.scale;
    e.excess = std::max<std::int64_t>(0, std::llround(x - e.expected));
    // Growth: the periods after t keep at least a third of its rise over the periods
    // just before, or before the deficit when there is one (a dump is an excess the next
    // periods do not sustain; after a dump the level returns to where it was before the
    // deficit, while growth keeps rising above it).
    const double y = x / f;
    const Side& base = e.window == WindowBasis::Deficit ? left : adjacent;
    e.sustained = !gap && right.n >= 3 && base.n >= 2 &&
                  right.median - base.median >= (y - base.median) / 3.0;
    // ... unless the period stands out from the periods after it too: a dump at a wave's
    // take-off, where the next periods rise but stay far below it (gap_threshold modelled
    // noise sds above the right side's level; tests/bench/scan_restore_bench, 40 seeds: 2
    // more faults found and 2 fewer spikes, the same for bars of 2 to 4 sds, no new alarm on
    // clean drops or the EpiEstim curves).
    if (e.sustained && (y - right.median) / noiseSd(right.median) >= m_options.gapThreshold)
        e.sustained = false;
    const double ratio = gap ? 1.0 + (m_options.minRatio - 1.0) / 2.0 : m_options.minRatio;
    // A deficit before the period is evidence too, weaker than a gap: the threshold halfway.
    const double threshold = gap ? m_options.gapThreshold
                                 : (e.window == WindowBasis::Deficit
                                        ? 0.5 * (m_options.threshold + m_options.gapThreshold)
                                        : m_options.threshold);
    e.flagged = e.z >= threshold && static_cast<double>(e.excess) >= m_options.minExcess &&
                x >= ratio * e.expected && t > 0 && !e.sustained;
    return e;
}

}  // namespace siftwave::scan::detail
