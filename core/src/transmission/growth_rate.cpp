#include "siftwave/transmission/growth_rate.h"

#include "fit/curve_band.h"

#include <Eigen/Dense>

#include <cmath>
#include <cstdio>

namespace siftwave::transmission {
namespace detail {

constexpr int kMaxIterations = 50;
constexpr double kMaxAbsRate = 3.0;  // per day: beyond it the window's counts sit at one end

// The scratch of one window's regression, sized once per series.
struct GlmWorkspace {
    Eigen::MatrixXd x;  // n x p design
    Eigen::VectorXd y, mu, z, w, beta, step;
    Eigen::MatrixXd info;  // p x p: X^T W X
    Eigen::LDLT<Eigen::MatrixXd> ldlt;
};

// The design of the window that starts at period `first`: intercept, day offset, and with
// weekday terms one indicator per weekday but the first period's.
void fillDesign(const TimeAxis& axis, std::int32_t first, int n, bool weekdays, GlmWorkspace& ws) {
    const int p = weekdays ? 8 : 2;
    ws.x.setZero(n, p);
    const int refWeekday = axis.periodStart(first).isoWeekday();
    for (int i = 0; i < n; ++i) {
        const Date day = axis.periodStart(first + i);
        ws.x(i, 0) = 1.0;
        ws.x(i, 1) = static_cast<double>(day - axis.periodStart(first));
        if (weekdays) {
            const int wd = day.isoWeekday();
            if (wd != refWeekday) {
                // columns 2..7 for the six other weekdays, in weekday order after the reference
                ws.x(i, 2 + (wd - refWeekday + 7) % 7 - 1) = 1.0;
            }
        }
    }
}

// IRLS for the Poisson log-linear model from the least-squares line of log(y + 0.5).
// False when it does not converge or the information matrix is singular.
bool fitPoissonGlm(GlmWorkspace& ws) {
    const Eigen::VectorXd logy = (ws.y.array() + 0.5).log().matrix();
    ws.beta = (ws.x.transpose() * ws.x).ldlt().solve(ws.x.transpose() * logy);
    for (int it = 0; it < kMaxIterations; ++it) {
        ws.mu = (ws.x * ws.beta).array().exp().matrix();
        ws.z = (ws.x * ws.beta).array() + (ws.y - ws.mu).array() / ws.mu.array();
        ws.w = ws.mu;
        ws.info.noalias() = ws.x.transpose() * ws.w.asDiagonal() * ws.x;
        ws.ldlt.compute(ws.info);
        if (ws.ldlt.info() != Eigen::Success || !ws.ldlt.isPositive())
            return false;
        ws.step = ws.ldlt.solve(ws.x.transpose() * ws.w.asDiagonal() * ws.z) - ws.beta;
        ws.beta += ws.step;
        if (!ws.beta.allFinite() || std::abs(ws.beta(1)) > kMaxAbsRate)
            return false;
        if (ws.step.cwiseAbs().maxCoeff() < 1e-11 * (1.0 + ws.beta.cwiseAbs().maxCoeff())) {
            ws.mu = (ws.x * ws.beta).array().exp().matrix();
            ws.info.noalias() = ws.x.transpose() * ws.mu.asDiagonal() * ws.x;
            ws.ldlt.compute(ws.info);
            return ws.ldlt.info() == Eigen::Success && ws.ldlt.isPositive();
        }
    }
    return false;
}

// Doubling time while r > 0, halving time while r < 0, each with its (possibly open) interval.
void addDoublingOrHalving(GrowthEstimate& e) {
    const double ln2 = std::log(2.0);
    const double inf = std::numeric_limits<double>::infinity();
    if (e.r.value > 0.0) {
        e.doublingDays = {ln2 / e.r.value, ln2 / e.r.upper,
                          e.r.lower > 0.0 ? ln2 / e.r.lower : inf};
    } else if (e.r.value < 0.0) {
        e.halvingDays = {ln2 / -e.r.value, ln2 / -e.r.lower,
                         e.r.upper < 0.0 ? ln2 / -e.r.upper : inf};
    }
}

// The reason the window ending on t gives no estimate, or empty.
std::string windowReason(std::span<const double> counts, std::int32_t t, const GrowthOptions& o,
                         const TimeAxis& axis) {
    if (t + 1 < o.window) {
        return "the " + std::to_string(o.window) + "-" + axis.unitName() +
               " window is not yet full";
    }
    double total = 0.0;
    for (std::int32_t i = t - o.window + 1; i <= t; ++i) {
        if (!std::isfinite(counts[static_cast<std::size_t>(i)]))
            return std::string("a count in the window is missing (") + axis.periodName(i) + ")";
        total += counts[static_cast<std::size_t>(i)];
    }
    if (total < o.minCases) {
        char text[96];
        std::snprintf(text, sizeof text, "fewer than %g cases in the window (%g)", o.minCases,
                      total);
        return text;
    }
    return {};
}

GrowthEstimate estimateAt(std::span<const double> counts, std::int32_t t, const TimeAxis& axis,
                          const GrowthOptions& o, GlmWorkspace& ws) {
    GrowthEstimate e;
    e.reason = windowReason(counts, t, o, axis);
    if (!e.ok())
        return e;
    const int n = o.window;
    const std::int32_t first = t - n + 1;
    fillDesign(axis, first, n, o.weekdayTerms, ws);
    ws.y = Eigen::Map<const Eigen::VectorXd>(counts.data() + first, n);
    if (!fitPoissonGlm(ws)) {
        e.reason = "the regression does not converge: the window's counts sit at one end";
        return e;
    }
    const int p = static_cast<int>(ws.x.cols());
    const int dof = n - p;
    const Eigen::VectorXd pearson = (ws.y - ws.mu).array() / ws.mu.array().sqrt();
    e.dispersion = dof > 0 ? pearson.squaredNorm() / dof : kNaN;
    e.quasiPoisson = dof > 0 && e.dispersion > 1.0;
    const Eigen::MatrixXd cov = ws.ldlt.solve(Eigen::MatrixXd::Identity(p, p));
    const double poissonSe = std::sqrt(cov(1, 1));
    e.se = e.quasiPoisson ? poissonSe * std::sqrt(e.dispersion) : poissonSe;
    const double q = e.quasiPoisson
                         ? fit::detail::intervalQuantile(fit::FitMethod::LeastSquares, dof)
                         : fit::detail::intervalQuantile(fit::FitMethod::Poisson, 0);
    const double r = ws.beta(1);
    e.r = {r, r - q * e.se, r + q * e.se};
    addDoublingOrHalving(e);
    return e;
}

}  // namespace detail

Status GrowthOptions::validate(Cadence cadence) const {
    if (window < 3 || window > 1000)
        return makeError(ErrorCode::Usage, "the growth-rate window must be 3 to 1000 periods");
    if (weekdayTerms && cadence == Cadence::Weekly) {
        return makeError(
            ErrorCode::Usage,
            "weekday terms need daily counts: a weekly count holds every weekday once");
    }
    if (weekdayTerms && window < 14) {
        return makeError(ErrorCode::Usage,
                         "weekday terms need a window of at least 14 days (each weekday twice)");
    }
    if (!std::isfinite(minCases) || minCases < 0.0)
        return makeError(ErrorCode::Usage, "the minimum number of cases must be >= 0");
    return Ok{};
}

std::vector<GrowthEstimate> growthRates(std::span<const double> counts, const TimeAxis& axis,
                                        const GrowthOptions& options) {
    std::vector<GrowthEstimate> out(counts.size());
    detail::GlmWorkspace ws;
    for (std::size_t t = 0; t < counts.size(); ++t)
        out[t] = detail::estimateAt(counts, static_cast<std::int32_t>(t), axis, options, ws);
    return out;
}

GrowthEstimate growthRateAt(std::span<const double> counts, const TimeAxis& axis, std::int32_t t,
                            const GrowthOptions& options) {
    detail::GlmWorkspace ws;
    return detail::estimateAt(counts, t, axis, options, ws);
}

}  // namespace siftwave::transmission
