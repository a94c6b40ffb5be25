#include "siftwave/fit/models.h"

#include <boost/math/special_functions/erf.hpp>

#include <algorithm>
#include <array>
#include <cassert>
#if defined(__SSE2__)
#include <emmintrin.h>
#endif
#include <cmath>
#include <limits>
#include <numbers>

namespace siftwave::fit {
namespace {

struct Line {
    double slope = 0;
    double intercept = 0;
    double r2 = 0;
};

// Ordinary least-squares line through (x_i, y_i); nullopt with fewer than 3 points or no spread.
std::optional<Line> fitLine(const std::vector<double>& x, const std::vector<double>& y) {
    const std::size_t n = x.size();
    if (n < 3)
        return std::nullopt;
    double mx = 0, my = 0;
    for (std::size_t i = 0; i < n; ++i) {
        mx += x[i];
        my += y[i];
    }
    mx /= static_cast<double>(n);
    my /= static_cast<double>(n);
    double sxx = 0, sxy = 0;
    for (std::size_t i = 0; i < n; ++i) {
        sxx += (x[i] - mx) * (x[i] - mx);
        sxy += (x[i] - mx) * (y[i] - my);
    }
    if (!(sxx > 0))
        return std::nullopt;
    double syy = 0;
    for (std::size_t i = 0; i < n; ++i)
        syy += (y[i] - my) * (y[i] - my);
    Line line;
    line.slope = sxy / sxx;
    line.intercept = my - line.slope * mx;
    line.r2 = syy > 0 ? sxy * sxy / (sxx * syy) : 1.0;
    return line;
}

double standardNormalCdf(double w) {
    return 0.5 * std::erfc(-w / std::numbers::sqrt2);
}
double standardNormalQuantile(double q) {
    return -std::numbers::sqrt2 * boost::math::erfc_inv(2.0 * q);
}

// What the linearisations share: the observed points (in the workspace), a running cumulative
// and a first K.
struct GuessData {
    GuessWorkspace& w;  // t, y, cumulative: the points; xs, ys, g: scratch of the steps below
    double total = 0;
    double peakT = 0;
    double peakY = 0;
    double cumulativeAtPeak = 0;
};

// False when the points cannot start a fit. The workspace's vectors are filled afresh and keep
// their storage (a batch fit guesses thousands of starts with one workspace).
bool prepareGuess(std::span<const double> t, std::span<const double> y, GuessData& d) {
    GuessWorkspace& w = d.w;
    w.t.clear();
    w.y.clear();
    w.cumulative.clear();
    d.total = d.peakT = d.peakY = d.cumulativeAtPeak = 0;
    double running = 0;
    for (std::size_t i = 0; i < t.size() && i < y.size(); ++i) {
        if (!std::isfinite(y[i]) || !std::isfinite(t[i]))
            continue;
        const double v = std::max(0.0, y[i]);
        w.t.push_back(t[i]);
        w.y.push_back(v);
        w.cumulative.push_back(running + 0.5 * v);  // C at the middle of day i
        running += v;
        if (v > d.peakY) {
            d.peakY = v;
            d.peakT = t[i];
            d.cumulativeAtPeak = w.cumulative.back();
        }
    }
    d.total = running;
    if (w.t.size() < 3 || !(d.total > 0) || !(d.peakY > 0))
        return false;
    // The guess describes the main wave only: stop where the curve, after its peak, has fallen
    // below 2% of the peak, so that a later small rise inside the window does not inflate K.
    std::size_t end = w.t.size();
    bool pastPeak = false;
    for (std::size_t i = 0; i < w.t.size(); ++i) {
        if (w.t[i] >= d.peakT)
            pastPeak = true;
        if (pastPeak && w.y[i] < 0.02 * d.peakY) {
            end = i + 1;
            break;
        }
    }
    if (end < w.t.size() && end >= 3) {
        w.t.resize(end);
        w.y.resize(end);
        w.cumulative.resize(end);
        d.total = w.cumulative.back() + 0.5 * w.y.back();
    }
    return true;
}

// Best K for fixed shape: minimises sum (y - K g)^2, g = unit-size incidence.
double bestSize(const WaveModel& model, const GuessData& d, std::vector<double> p) {
    p[0] = 1.0;
    const std::vector<double>& t = d.w.t;
    std::vector<double>& g = d.w.g;
    g.resize(t.size());
    bool consecutive = true;  // days t0, t0 + 1, ...: the cheaper day-grid evaluation
    for (std::size_t i = 1; i < t.size() && consecutive; ++i)
        consecutive = t[i] == t[0] + static_cast<double>(i);
    if (consecutive && !t.empty()) {
        model.incidenceOnDays(t[0], p, g);
    } else {
        model.incidence(t, p, g);
    }
    double gy = 0, gg = 0;
    for (std::size_t i = 0; i < g.size(); ++i) {
        gy += g[i] * d.w.y[i];
        gg += g[i] * g[i];
    }
    return gg > 0 && gy > 0 ? gy / gg : d.total;
}

// Points (t, transform(C/K)) for 0.02 < C/K < 0.98, fitted by a line.
template <class Transform>
std::optional<Line> linearisedAt(const GuessData& d, double size, Transform transform,
                                 bool logTime) {
    // In the workspace: the start of a batch fit draws several lines per region.
    std::vector<double>& xs = d.w.xs;
    std::vector<double>& ys = d.w.ys;
    xs.clear();
    ys.clear();
    // The days with 0.02 < C/K < 0.98: one run, the cumulative being nondecreasing.
    const auto begin = d.w.cumulative.begin(), end = d.w.cumulative.end();
    const auto lo = std::partition_point(begin, end, [&](double c) { return c / size <= 0.02; });
    const auto hi = std::partition_point(lo, end, [&](double c) { return c / size < 0.98; });
    const std::size_t first = static_cast<std::size_t>(lo - begin);
    const std::size_t inRange = static_cast<std::size_t>(hi - lo);
    // A line needs few points: 16 to 31 (every k-th day of a long rise).
    const std::size_t stride = std::max<std::size_t>(1, inRange / 16);
    xs.reserve(inRange / stride + 1);
    ys.reserve(inRange / stride + 1);
    for (std::size_t i = first; i < first + inRange; i += stride) {
        xs.push_back(logTime ? std::log(d.w.t[i] + 1.0) : d.w.t[i]);
        ys.push_back(transform(d.w.cumulative[i] / size));
    }
    auto line = fitLine(xs, ys);
    if (!line || !(line->slope > 0))
        return std::nullopt;
    return line;
}

// The linearisation needs K, which the window may not show in full: try final sizes from
// "the window holds the whole wave" to "the peak is at the share the model puts there" and
// keep the one whose transformed cumulative is the straightest line (largest R^2).
template <class Transform>
std::optional<Line> linearised(const GuessData& d, double shareAtPeak, Transform transform,
                               bool logTime) {
    const double candidates[] = {d.total * 1.005,
                                 d.total * 1.03,
                                 d.total * 1.1,
                                 d.total * 1.3,
                                 d.total * 1.8,
                                 d.total * 3.0,
                                 d.cumulativeAtPeak / shareAtPeak};
    std::optional<Line> best;
    for (double size : candidates) {
        if (!(size > d.total))
            continue;
        auto line = linearisedAt(d, size, transform, logTime);
        if (line && (!best || line->r2 > best->r2))
            best = line;
    }
    return best;
}

double firstSize(const GuessData& d, double shareAtPeak) {
    return std::max(d.total * 1.02, d.cumulativeAtPeak / shareAtPeak);
}

// The start of the Gumbel and the logistic, location-scale curves whose linearisation is
// transform(C / K) = (t - mu) / scale: K from the share of the final size at the peak, the scale
// from the peak height (the density at the mode is peakDensity / scale, 1/e for the Gumbel and
// 1/4 for the logistic), then the line, and K refitted for that shape.
template <class Transform>
std::optional<std::vector<double>> locationScaleGuess(const WaveModel& model,
                                                      std::span<const double> t,
                                                      std::span<const double> y, double shareAtPeak,
                                                      double peakDensity, Transform transform,
                                                      GuessWorkspace& workspace) {
    GuessData guess{workspace};
    if (!prepareGuess(t, y, guess))
        return std::nullopt;
    const GuessData* d = &guess;
    const double size = firstSize(*d, shareAtPeak);
    std::vector<double> p{size, d->peakT, std::max(1.0, size * peakDensity / d->peakY)};
    if (auto line = linearised(*d, shareAtPeak, transform, false)) {
        p[2] = 1.0 / line->slope;
        p[1] = -line->intercept * p[2];
    }
    p[2] = std::max(p[2], 0.5);
    p[0] = bestSize(model, *d, p);
    return p;
}

// The first three Jacobian columns, shared by the four models: each has a size K, a location mu
// and a scale (beta, s, sigma) entering through z = (x - mu) / scale with K f = K phi(z) / scale
// (x = t, or ln tau for the log-normal, whose 1/tau does not depend on the parameters). With
// g = d ln phi / dz, the chain rule gives
//     d(K f)/dK = f,   d(K f)/dmu = -K f g / scale,   d(K f)/dscale = -K f (1 + z g) / scale.
// `value` is K f; a day where it underflows to 0 gets a zero row.
inline void locationScaleRow(double* row, double value, double invK, double z, double g,
                             double invScale) {
    if (value == 0.0) {
        row[0] = row[1] = row[2] = 0.0;
        return;
    }
    row[0] = value * invK;
    row[1] = -value * g * invScale;
    row[2] = -value * (1.0 + z * g) * invScale;
}

// exp(-u) for u >= 0. Far into a Gumbel wave's right tail (t > mu + 6.9 beta, often half of a
// window that runs on to the next trough) u < 1e-3, where the Taylor series to u^5 is exact to
// rounding: its truncation error is below u^6 / 720 < 1.4e-21 while exp(-u) > 0.999, and a few
// multiplications cost a fraction of the library call.
inline double expOfMinus(double u) {
    if (u < 1e-3)
        return 1.0 - u * (1.0 - u * (0.5 - u * (1.0 / 6.0 - u * (1.0 / 24.0 - u * (1.0 / 120.0)))));
    return std::exp(-u);
}

// The Gumbel wave on days first..n-1 of the grid t0, t0 + 1, ... that lie far in its right tail
// (z > ln 1000, so u = exp(-z) < 1e-3 and exp(-u) is expOfMinus's Taylor series): K f and the
// Jacobian row of locationScaleRow (g = u - 1; f is never 0 here unless it underflows, and then
// the row is 0 all the same, z and g being finite). Two days at a time in the lanes of an SSE2
// register, u by the recurrence u <- u e^(-2 / beta) in each lane, taken afresh from exp every
// 32 days. Often over half of a window's days are here (a window runs on to the next trough).
void gumbelRightTail(double t0, std::size_t first, double mu, double invBeta, double invK,
                     double scale, std::span<double> out, std::span<double> jac) {
    const std::size_t n = out.size();
    const bool withJacobian = !jac.empty();
    std::size_t i = first;
#if defined(__SSE2__)
    const __m128d one = _mm_set1_pd(1.0), step2 = _mm_set1_pd(std::exp(-2.0 * invBeta));
    const __m128d vMu = _mm_set1_pd(mu), vInvBeta = _mm_set1_pd(invBeta),
                  vMinusInvBeta = _mm_set1_pd(-invBeta), vInvK = _mm_set1_pd(invK),
                  vScale = _mm_set1_pd(scale);
    __m128d us = _mm_setzero_pd();  // u of days i and i + 1
    for (; i + 1 < n; i += 2) {
        const double t = t0 + static_cast<double>(i);
        const __m128d z = _mm_mul_pd(_mm_sub_pd(_mm_set_pd(t + 1.0, t), vMu), vInvBeta);
        if ((i - first) % 32 == 0) {
            alignas(16) double zs[2];
            _mm_store_pd(zs, z);
            us = _mm_set_pd(std::exp(-zs[1]), std::exp(-zs[0]));
        } else {
            us = _mm_mul_pd(us, step2);
        }
        // exp(-u) = 1 - u (1 - u (1/2 - u (1/6 - u (1/24 - u / 120)))), as expOfMinus.
        __m128d e = _mm_sub_pd(_mm_set1_pd(1.0 / 24.0), _mm_mul_pd(us, _mm_set1_pd(1.0 / 120.0)));
        e = _mm_sub_pd(_mm_set1_pd(1.0 / 6.0), _mm_mul_pd(us, e));
        e = _mm_sub_pd(_mm_set1_pd(0.5), _mm_mul_pd(us, e));
        e = _mm_sub_pd(one, _mm_mul_pd(us, e));
        e = _mm_sub_pd(one, _mm_mul_pd(us, e));
        const __m128d f = _mm_mul_pd(_mm_mul_pd(vScale, us), e);
        _mm_storeu_pd(&out[i], f);
        if (withJacobian) {
            const __m128d g = _mm_sub_pd(us, one);
            const __m128d dK = _mm_mul_pd(f, vInvK);
            const __m128d dMu = _mm_mul_pd(_mm_mul_pd(f, g), vMinusInvBeta);
            const __m128d dScale =
                _mm_mul_pd(_mm_mul_pd(f, _mm_add_pd(one, _mm_mul_pd(z, g))), vMinusInvBeta);
            // Rows of days i and i + 1: dK dMu dScale | dK dMu dScale.
            _mm_storeu_pd(&jac[3 * i], _mm_unpacklo_pd(dK, dMu));
            _mm_storeu_pd(&jac[3 * i + 2], _mm_shuffle_pd(dScale, dK, 2));
            _mm_storeu_pd(&jac[3 * i + 4], _mm_unpackhi_pd(dMu, dScale));
        }
    }
#endif
    for (; i < n; ++i) {  // the last odd day (every day without SSE2)
        const double z = (t0 + static_cast<double>(i) - mu) * invBeta;
        const double u = std::exp(-z);
        const double f = scale * u * expOfMinus(u);
        out[i] = f;
        if (withJacobian)
            locationScaleRow(&jac[3 * i], f, invK, z, u - 1.0, invBeta);
    }
}

constexpr const char* kGumbelNames[] = {"K", "mu", "beta"};
constexpr const char* kLogisticNames[] = {"K", "mu", "s"};
constexpr const char* kRichardsNames[] = {"K", "mu", "s", "a"};
constexpr const char* kLogNormalNames[] = {"K", "mu", "sigma"};

class GumbelModel final : public WaveModel {
public:
    ModelKind kind() const override { return ModelKind::Gumbel; }
    std::span<const char* const> names() const override { return kGumbelNames; }
    bool valid(std::span<const double> p) const override {
        return p.size() == 3 && std::isfinite(p[0]) && std::isfinite(p[1]) && p[0] > 0 &&
               p[2] > 1e-6 && std::isfinite(p[2]);
    }
    void incidence(std::span<const double> t, std::span<const double> p, std::span<double> out,
                   std::span<double> jac) const override {
        const double K = p[0], mu = p[1], beta = p[2];
        const double invBeta = 1.0 / beta, invK = 1.0 / K;
        for (std::size_t i = 0; i < t.size(); ++i) {
            const double z = (t[i] - mu) / beta;
            const double u = std::exp(-z);
            const double f = std::isfinite(u) ? K / beta * u * std::exp(-u) : 0.0;
            out[i] = f;
            if (!jac.empty())
                locationScaleRow(&jac[3 * i], f, invK, z, u - 1.0, invBeta);  // g = u - 1
        }
    }
    void incidenceOnDays(double t0, std::span<const double> p, std::span<double> out,
                         std::span<double> jac) const override {
        const double K = p[0], mu = p[1], beta = p[2];
        const double invBeta = 1.0 / beta, invK = 1.0 / K, scale = K / beta;
        const double step = std::exp(-invBeta);
        // From day `tail` on, z > ln 1000: the right tail, two days at a time.
        const double firstTail = std::ceil(mu + beta * std::log(1000.0) - t0);
        const std::size_t n = out.size();
        const std::size_t tail = !(firstTail > 0.0) ? 0
                                 : firstTail >= static_cast<double>(n)
                                     ? n
                                     : static_cast<std::size_t>(firstTail);
        gumbelRightTail(t0, tail, mu, invBeta, invK, scale, out, jac);
        double u = 0;
        for (std::size_t i = 0; i < tail; ++i) {
            const double t = t0 + static_cast<double>(i);
            const double z = (t - mu) * invBeta;
            u = (i % 32 == 0) ? std::exp(-z) : u * step;
            const double f = std::isfinite(u) ? scale * u * expOfMinus(u) : 0.0;
            out[i] = f;
            if (!jac.empty())
                locationScaleRow(&jac[3 * i], f, invK, z, u - 1.0, invBeta);
        }
    }
    double fastestGrowthTime(std::span<const double> p) const override {
        return p[1] - p[2] * std::log((3.0 + std::sqrt(5.0)) / 2.0);
    }
    double cumulative(double t, std::span<const double> p) const override {
        return p[0] * std::exp(-std::exp(-(t - p[1]) / p[2]));
    }
    double quantileTime(double q, std::span<const double> p) const override {
        return p[1] - p[2] * std::log(-std::log(q));
    }
    double peakTime(std::span<const double> p) const override { return p[1]; }
    std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                    std::span<const double> y,
                                                    GuessWorkspace& workspace) const override {
        return locationScaleGuess(
            *this, t, y, std::exp(-1.0), std::exp(-1.0),
            [](double q) { return -std::log(-std::log(q)); }, workspace);
    }
};

class LogisticModel final : public WaveModel {
public:
    ModelKind kind() const override { return ModelKind::Logistic; }
    std::span<const char* const> names() const override { return kLogisticNames; }
    bool valid(std::span<const double> p) const override {
        return p.size() == 3 && std::isfinite(p[0]) && std::isfinite(p[1]) && p[0] > 0 &&
               p[2] > 1e-6 && std::isfinite(p[2]);
    }
    void incidence(std::span<const double> t, std::span<const double> p, std::span<double> out,
                   std::span<double> jac) const override {
        const double K = p[0], mu = p[1], s = p[2];
        for (std::size_t i = 0; i < t.size(); ++i) {
            const double z = (t[i] - mu) / s;
            // F and 1 - F without cancellation on either side of mu.
            const double e = std::exp(-std::abs(z));
            const double F = z >= 0 ? 1.0 / (1.0 + e) : e / (1.0 + e);
            const double G = z >= 0 ? e / (1.0 + e) : 1.0 / (1.0 + e);  // 1 - F
            const double f = K / s * F * G;
            out[i] = f;
            if (!jac.empty())
                locationScaleRow(&jac[3 * i], f, 1.0 / K, z, G - F, 1.0 / s);  // g = G - F
        }
    }
    double fastestGrowthTime(std::span<const double> p) const override {
        return p[1] - p[2] * std::log(2.0 + std::sqrt(3.0));
    }
    double cumulative(double t, std::span<const double> p) const override {
        return p[0] / (1.0 + std::exp(-(t - p[1]) / p[2]));
    }
    double quantileTime(double q, std::span<const double> p) const override {
        return p[1] + p[2] * std::log(q / (1.0 - q));
    }
    double peakTime(std::span<const double> p) const override { return p[1]; }
    std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                    std::span<const double> y,
                                                    GuessWorkspace& workspace) const override {
        return locationScaleGuess(
            *this, t, y, 0.5, 0.25, [](double q) { return std::log(q / (1.0 - q)); }, workspace);
    }
};

class RichardsModel final : public WaveModel {
public:
    ModelKind kind() const override { return ModelKind::Richards; }
    std::span<const char* const> names() const override { return kRichardsNames; }
    bool valid(std::span<const double> p) const override {
        return p.size() == 4 && std::isfinite(p[0]) && std::isfinite(p[1]) && p[0] > 0 &&
               p[2] > 1e-6 && std::isfinite(p[2]) && p[3] > 1e-4 && p[3] < 1e3;
    }
    void incidence(std::span<const double> t, std::span<const double> p, std::span<double> out,
                   std::span<double> jac) const override {
        const double K = p[0], mu = p[1], s = p[2], a = p[3];
        for (std::size_t i = 0; i < t.size(); ++i) {
            const double z = (t[i] - mu) / s;
            const double v = a * std::exp(-z);
            double f = 0.0, dlnfdz = 0.0, dlnfda = 0.0;
            if (std::isfinite(v)) {
                const double l1p = std::log1p(v);
                f = K * std::exp(std::log(v) - (1.0 / a + 1.0) * l1p) / (a * s);
                dlnfdz = -1.0 + (1.0 / a + 1.0) * v / (1.0 + v);
                dlnfda = l1p / (a * a) - (1.0 + a) * v / (a * a * (1.0 + v));
            }
            out[i] = f;
            if (!jac.empty()) {
                double* row = &jac[4 * i];
                locationScaleRow(row, f, 1.0 / K, z, dlnfdz, 1.0 / s);
                row[3] = f == 0.0 ? 0.0 : f * dlnfda;
            }
        }
    }
    double cumulative(double t, std::span<const double> p) const override {
        const double v = p[3] * std::exp(-(t - p[1]) / p[2]);
        return p[0] * std::exp(-std::log1p(v) / p[3]);
    }
    double quantileTime(double q, std::span<const double> p) const override {
        const double a = p[3];
        return p[1] - p[2] * std::log(std::expm1(-a * std::log(q)) / a);
    }
    double peakTime(std::span<const double> p) const override { return p[1]; }
    std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                    std::span<const double> y,
                                                    GuessWorkspace& workspace) const override {
        auto logistic = waveModel(ModelKind::Logistic).initialGuess(t, y, workspace);
        if (!logistic)
            return std::nullopt;
        return std::vector<double>{(*logistic)[0], (*logistic)[1], (*logistic)[2], 1.0};
    }
};

class LogNormalModel final : public WaveModel {
public:
    ModelKind kind() const override { return ModelKind::LogNormal; }
    std::span<const char* const> names() const override { return kLogNormalNames; }
    bool valid(std::span<const double> p) const override {
        return p.size() == 3 && std::isfinite(p[0]) && std::isfinite(p[1]) && p[0] > 0 &&
               p[2] > 1e-4 && std::isfinite(p[2]);
    }
    void incidence(std::span<const double> t, std::span<const double> p, std::span<double> out,
                   std::span<double> jac) const override {
        const double K = p[0], mu = p[1], sigma = p[2];
        const double norm = 1.0 / (sigma * std::sqrt(2.0 * std::numbers::pi));
        for (std::size_t i = 0; i < t.size(); ++i) {
            const double tau = t[i] + 1.0;
            double f = 0.0, w = 0.0;
            if (tau > 0) {
                w = (std::log(tau) - mu) / sigma;
                f = K * norm / tau * std::exp(-0.5 * w * w);
            }
            out[i] = f;
            if (!jac.empty())
                locationScaleRow(&jac[3 * i], f, 1.0 / K, w, -w, 1.0 / sigma);  // g = -w
        }
    }
    double cumulative(double t, std::span<const double> p) const override {
        const double tau = t + 1.0;
        if (tau <= 0)
            return 0.0;
        return p[0] * standardNormalCdf((std::log(tau) - p[1]) / p[2]);
    }
    double quantileTime(double q, std::span<const double> p) const override {
        return std::exp(p[1] + p[2] * standardNormalQuantile(q)) - 1.0;
    }
    double peakTime(std::span<const double> p) const override {
        return std::exp(p[1] - p[2] * p[2]) - 1.0;
    }
    std::optional<std::vector<double>> initialGuess(std::span<const double> t,
                                                    std::span<const double> y,
                                                    GuessWorkspace& workspace) const override {
        GuessData guess{workspace};
        if (!prepareGuess(t, y, guess))
            return std::nullopt;
        const GuessData* d = &guess;
        const double size = firstSize(*d, 0.45);
        std::vector<double> p{size, std::log(std::max(d->peakT, 0.0) + 2.0), 0.5};
        if (auto line = linearised(*d, 0.45, standardNormalQuantile, true)) {
            p[2] = 1.0 / line->slope;
            p[1] = -line->intercept * p[2];
        }
        p[2] = std::clamp(p[2], 0.02, 5.0);
        p[0] = bestSize(*this, *d, p);
        return p;
    }
};

}  // namespace

const char* modelName(ModelKind kind) {
    switch (kind) {
        case ModelKind::Gumbel:
            return "gumbel";
        case ModelKind::Logistic:
            return "logistic";
        case ModelKind::Richards:
            return "richards";
        case ModelKind::LogNormal:
            return "lognormal";
    }
    return "unknown";
}

std::optional<ModelKind> modelFromName(std::string_view name) {
    for (ModelKind k : kAllModels) {
        if (name == modelName(k))
            return k;
    }
    return std::nullopt;
}

double WaveModel::incidenceAt(double t, std::span<const double> p) const {
    double out = 0;
    incidence(std::span<const double>(&t, 1), p, std::span<double>(&out, 1));
    return out;
}

void WaveModel::incidenceOnDays(double t0, std::span<const double> p, std::span<double> out,
                                std::span<double> jacobian) const {
    // The day grid in blocks on the stack: no scratch to keep, whatever the length.
    constexpr std::size_t kBlock = 256;
    std::array<double, kBlock> days;
    const std::size_t np = static_cast<std::size_t>(parameterCount());
    for (std::size_t from = 0; from < out.size(); from += kBlock) {
        const std::size_t count = std::min(kBlock, out.size() - from);
        for (std::size_t i = 0; i < count; ++i)
            days[i] = t0 + static_cast<double>(from + i);
        incidence(std::span<const double>(days.data(), count), p, out.subspan(from, count),
                  jacobian.empty() ? jacobian : jacobian.subspan(from * np, count * np));
    }
}

std::optional<std::vector<double>> WaveModel::initialGuess(std::span<const double> t,
                                                           std::span<const double> y) const {
    GuessWorkspace workspace;
    return initialGuess(t, y, workspace);
}

void WaveModel::countsOnPeriods(double t0, int periodDays, std::span<const double> p,
                                std::span<double> out, std::span<double> jacobian) const {
    if (periodDays == 1) {
        incidenceOnDays(t0, p, out, jacobian);
        return;
    }
    // One period at a time on its own day grid, summed day by day in time order: the days'
    // values and rows fit on the stack (at most 7 days of at most 4 parameters).
    constexpr std::size_t kMaxDays = 7, kMaxParameters = 4;
    const std::size_t days = static_cast<std::size_t>(periodDays);
    const std::size_t np = static_cast<std::size_t>(parameterCount());
    assert(periodDays >= 1 && days <= kMaxDays && np <= kMaxParameters);
    assert(jacobian.empty() || jacobian.size() >= out.size() * np);
    std::array<double, kMaxDays> f{};
    std::array<double, kMaxDays * kMaxParameters> jf{};
    const bool withJacobian = !jacobian.empty();
    for (std::size_t i = 0; i < out.size(); ++i) {
        const double first = t0 + static_cast<double>(i * days);
        incidenceOnDays(
            first, p, std::span<double>(f.data(), days),
            withJacobian ? std::span<double>(jf.data(), days * np) : std::span<double>{});
        double sum = 0;
        for (std::size_t k = 0; k < days; ++k)
            sum += f[k];
        out[i] = sum;
        if (!withJacobian)
            continue;
        for (std::size_t j = 0; j < np; ++j) {
            double column = 0;
            for (std::size_t k = 0; k < days; ++k)
                column += jf[k * np + j];
            jacobian[i * np + j] = column;
        }
    }
}

double WaveModel::fastestGrowthTime(std::span<const double> p) const {
    // The fastest growth is where f' peaks, the inflection point on the rise: f'' > 0 before it
    // and < 0 after, up to the peak. Bisection on the sign of f'' (a central difference)
    // locates it far more finely than a search on the values of f' could, whose maximum is flat:
    // there a change of t by d moves f' only by d^2, and the location is lost to rounding at
    // about sqrt(machine epsilon) of the wave's width, enough to disturb the delta method.
    // NaN when the rise cannot be bracketed (the early quantile overflows).
    const double peak = peakTime(p);
    const double early = std::min(quantileTime(1e-6, p), peak - 1e-3);
    const double rise = peak - quantileTime(0.025, p);  // the scale of the rising side
    if (!std::isfinite(early) || !std::isfinite(peak) || !(rise > 0))
        return std::numeric_limits<double>::quiet_NaN();
    // f'' up to a positive factor by the five-point central difference, whose error is of order
    // h^4: with h = 2e-3 of the rise, the root's bias and its rounding noise both stay near
    // 1e-10 of the rise.
    const double h = 2e-3 * rise;
    auto curvature = [&](double t) {
        return -incidenceAt(t + 2 * h, p) + 16.0 * incidenceAt(t + h, p) -
               30.0 * incidenceAt(t, p) + 16.0 * incidenceAt(t - h, p) - incidenceAt(t - 2 * h, p);
    };
    double a = early, b = peak;
    // f' already falls at the 1e-6 quantile: its largest value on the rise is there.
    if (!(curvature(a) > 0))
        return a;
    for (int k = 0; k < 200 && b - a > 1e-12 * (rise + std::abs(peak)); ++k) {
        const double mid = 0.5 * (a + b);
        if (curvature(mid) > 0)
            a = mid;
        else
            b = mid;
    }
    return 0.5 * (a + b);
}

const WaveModel& waveModel(ModelKind kind) {
    static const GumbelModel gumbel;
    static const LogisticModel logistic;
    static const RichardsModel richards;
    static const LogNormalModel lognormal;
    switch (kind) {
        case ModelKind::Gumbel:
            return gumbel;
        case ModelKind::Logistic:
            return logistic;
        case ModelKind::Richards:
            return richards;
        case ModelKind::LogNormal:
            return lognormal;
    }
    assert(false);
    return gumbel;
}

}  // namespace siftwave::fit
