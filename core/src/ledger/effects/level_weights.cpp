#include "ledger/effects/level_weights.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>

namespace siftwave::ledger::detail {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

/// The region's cleaned values (NaN without one), and the weekday factor of each period.
struct Series {
    std::vector<double> value;
    std::array<double, 7> factor{1, 1, 1, 1, 1, 1, 1};
    int firstWeekday = 0;  // 0 = Monday, of period 0 (daily drops)

    double factorAt(std::int32_t d) const {
        return factor[static_cast<std::size_t>((firstWeekday + d) % 7)];
    }
};

/// Weekday factors by the ratio-to-moving-average method (as series/weekday.h: R. J. Hyndman &
/// G. Athanasopoulos, "Forecasting: Principles and Practice", 3rd ed., section 3.4), but only
/// on days whose whole centred week has values: series/smoothing.h renormalises a window over
/// the values it finds, and a week that lost its weekend to the window would make a weekday's
/// ratio look like a weekend's. All 1 when some weekday has no such day.
std::array<double, 7> completeWeekFactors(const std::vector<double>& x, int firstWeekday) {
    std::array<double, 7> sum{}, factor{1, 1, 1, 1, 1, 1, 1};
    std::array<int, 7> used{};
    double week = 0;
    int finite = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
        // The running sum of x[i - 6 .. i]: its centre is i - 3.
        week += std::isnan(x[i]) ? 0.0 : x[i];
        finite += !std::isnan(x[i]);
        if (i >= 7) {
            week -= std::isnan(x[i - 7]) ? 0.0 : x[i - 7];
            finite -= !std::isnan(x[i - 7]);
        }
        if (i < 6 || finite < 7 || !(week > 0))
            continue;
        const std::size_t c = i - 3;
        const auto w = static_cast<std::size_t>((firstWeekday + static_cast<int>(c)) % 7);
        sum[w] += x[c] / (week / 7.0);
        ++used[w];
    }
    double mean = 0;
    for (std::size_t w = 0; w < 7; ++w) {
        if (used[w] == 0)
            return {1, 1, 1, 1, 1, 1, 1};
        mean += sum[w] / used[w] / 7.0;
    }
    if (!(mean > 0))
        return factor;
    for (std::size_t w = 0; w < 7; ++w)
        factor[w] = sum[w] / used[w] / mean;
    return factor;
}

Series loadSeries(const Drop& drop, const Cleaned& cleaned, std::size_t m, std::size_t r,
                  DaySpan window, std::int32_t dumpDay) {
    Series s;
    s.value.assign(static_cast<std::size_t>(cleaned.days()), kNaN);
    for (std::int32_t d = 0; d < cleaned.days(); ++d) {
        const CleanedCell& c = cleaned.cell(m, r, d);
        if (c.hasValue())
            s.value[static_cast<std::size_t>(d)] = static_cast<double>(c.value);
    }
    if (drop.axis.weekly())
        return s;
    // The factors without the cells the decision is about: the dump would raise its
    // weekday's factor, the window's shortfall lower the others.
    std::vector<double> rest = s.value;
    for (std::int32_t d = window.first; d <= window.last; ++d)
        rest[static_cast<std::size_t>(d)] = kNaN;
    rest[static_cast<std::size_t>(dumpDay)] = kNaN;
    s.firstWeekday = drop.axis.first().isoWeekday() - 1;
    s.factor = completeWeekFactors(rest, s.firstWeekday);
    return s;
}

/// A side of the trend: the median of the weekday-adjusted values in [first, last] at the
/// mean index of those values; n = 0 when none has a value.
struct Side {
    double median = 0;
    double centre = 0;
    int n = 0;
};

Side side(const Series& s, std::int32_t first, std::int32_t last) {
    const auto n = static_cast<std::int32_t>(s.value.size());
    std::vector<double> y;
    double centre = 0;
    for (std::int32_t d = std::max(0, first); d <= std::min(n - 1, last); ++d) {
        const double v = s.value[static_cast<std::size_t>(d)];
        if (std::isnan(v))
            continue;
        y.push_back(v / s.factorAt(d));
        centre += d;
    }
    Side out;
    out.n = static_cast<int>(y.size());
    if (y.empty())
        return out;
    out.centre = centre / out.n;
    const auto mid = y.begin() + static_cast<std::ptrdiff_t>(y.size() / 2);
    std::nth_element(y.begin(), mid, y.end());
    out.median = *mid;
    if (y.size() % 2 == 0)
        out.median = 0.5 * (out.median + *std::max_element(y.begin(), mid));
    out.median = std::max(out.median, 0.0);
    return out;
}

/// Geometric interpolation between the sides (half a count added so that a zero side stays
/// finite); one side alone gives its level.
double trendAt(const Side& left, const Side& right, double d) {
    if (left.n == 0)
        return right.median;
    if (right.n == 0 || right.centre <= left.centre)
        return left.median;
    const double u = std::clamp((d - left.centre) / (right.centre - left.centre), 0.0, 1.0);
    const double a = std::log(left.median + 0.5), b = std::log(right.median + 0.5);
    return std::max(0.0, std::exp(a + u * (b - a)) - 0.5);
}

}  // namespace

std::vector<std::int64_t> levelWeights(const Drop& drop, const Cleaned& cleaned, std::size_t m,
                                       std::size_t r, DaySpan window, std::int32_t dumpDay,
                                       int width) {
    const Series s = loadSeries(drop, cleaned, m, r, window, dumpDay);
    const Side left = side(s, window.first - width, window.first - 1);
    const Side right = side(s, dumpDay + 1, dumpDay + width);
    std::vector<std::int64_t> weights;
    if (left.n == 0 && right.n == 0)  // no level: zero weights, which the caller refuses
        return std::vector<std::int64_t>(static_cast<std::size_t>(window.last - window.first + 1));
    for (std::int32_t d = window.first; d <= window.last; ++d) {
        const double e = trendAt(left, right, d) * s.factorAt(d);
        weights.push_back(std::isfinite(e) && e > 0 ? std::llround(e * 1e6) : 0);
    }
    return weights;
}

}  // namespace siftwave::ledger::detail
