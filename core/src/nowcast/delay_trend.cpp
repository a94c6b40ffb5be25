// Constant and trending reverse-time hazards (delay_trend.h; the maths in nowcast.h).
#include "nowcast/delay_trend.h"

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>

namespace siftwave::nowcast::detail {
namespace {

/// One binomial observation of the hazard of delay j: of `upTo` cases of a period within delay
/// j, `arrived` came at delay j; x = (t - now) / s.
struct HazardRow {
    int j;
    double x;
    double arrived;
    double upTo;
};

/// The window's rows of every delay (the last `window` periods whose two cells are known).
std::vector<HazardRow> hazardRows(const ReportingTriangle& tri, int window) {
    const double scale = tri.axis.weekly() ? 1.0 : 7.0;
    std::vector<HazardRow> rows;
    for (int j = 1; j <= tri.maxDelay; ++j) {
        int taken = 0;
        for (std::int32_t t = tri.nowPeriod - j; t >= 0 && taken < window; --t) {
            if (!tri.known(t, j) || !tri.known(t, j - 1))
                continue;
            ++taken;
            if (tri.at(t, j) > 0)
                rows.push_back({j, (t - tri.nowPeriod) / scale, tri.at(t, j) - tri.at(t, j - 1),
                                tri.at(t, j)});
        }
    }
    return rows;
}

/// The constant hazards g_j and the variances of log(1 - g_j) (the chain-ladder).
void constantHazards(const std::vector<HazardRow>& rows, int D, std::vector<double>& g,
                     std::vector<double>& logVar) {
    std::vector<double> arrived(static_cast<std::size_t>(D + 1), 0.0);
    std::vector<double> upTo(static_cast<std::size_t>(D + 1), 0.0);
    for (const HazardRow& r : rows) {
        arrived[static_cast<std::size_t>(r.j)] += r.arrived;
        upTo[static_cast<std::size_t>(r.j)] += r.upTo;
    }
    g.assign(static_cast<std::size_t>(D + 1), 0.0);
    logVar.assign(static_cast<std::size_t>(D + 1), 0.0);
    for (std::size_t j = 1; j <= static_cast<std::size_t>(D); ++j) {
        if (upTo[j] <= 0.0)
            continue;  // nothing seen at this delay: no late reports assumed
        g[j] = std::clamp(arrived[j] / upTo[j], 0.0, 1.0 - 1e-9);
        logVar[j] = g[j] / ((1.0 - g[j]) * upTo[j]);
    }
}

DelayShares sharesOfConstant(const std::vector<double>& g, const std::vector<double>& logVar,
                             int D) {
    DelayShares s;
    s.logF.assign(static_cast<std::size_t>(D + 1), 0.0);
    s.var.assign(static_cast<std::size_t>(D + 1), 0.0);
    for (int d = D - 1; d >= 0; --d) {
        const auto i = static_cast<std::size_t>(d), j = i + 1;
        s.logF[i] = s.logF[j] + std::log1p(-g[j]);
        s.var[i] = s.var[j] + logVar[j];
    }
    return s;
}

/// The trend's fit: a_j for the delays it covers (index into `delays`), b, and I^-1.
struct TrendFit {
    std::vector<int> delays;  // the j fitted (0 < arrivals < cases); others keep constant g_j
    Eigen::VectorXd beta;     // a_1 .. a_k, b
    Eigen::MatrixXd covariance;
};

double logistic(double eta) {
    return 1.0 / (1.0 + std::exp(-eta));
}

/// Newton's method on the binomial log-likelihood; false when it cannot be fitted.
bool fitTrend(const std::vector<HazardRow>& rows, const std::vector<double>& g, int D,
              TrendFit& fit) {
    std::vector<int> column(static_cast<std::size_t>(D + 1), -1);
    for (int j = 1; j <= D; ++j) {
        if (g[static_cast<std::size_t>(j)] > 0.0 && g[static_cast<std::size_t>(j)] < 1.0 - 1e-6) {
            column[static_cast<std::size_t>(j)] = static_cast<int>(fit.delays.size());
            fit.delays.push_back(j);
        }
    }
    const auto k = static_cast<Eigen::Index>(fit.delays.size());
    double xMin = 0.0, xMax = 0.0;
    for (const HazardRow& r : rows) {
        if (column[static_cast<std::size_t>(r.j)] >= 0) {
            xMin = std::min(xMin, r.x);
            xMax = std::max(xMax, r.x);
        }
    }
    if (k == 0 || xMax - xMin <= 0.0)
        return false;
    fit.beta = Eigen::VectorXd::Zero(k + 1);
    for (Eigen::Index c = 0; c < k; ++c) {
        const double gj = g[static_cast<std::size_t>(fit.delays[static_cast<std::size_t>(c)])];
        fit.beta(c) = std::log(gj / (1.0 - gj));
    }
    Eigen::MatrixXd info(k + 1, k + 1);
    for (int iteration = 0; iteration < 50; ++iteration) {
        Eigen::VectorXd score = Eigen::VectorXd::Zero(k + 1);
        info.setZero();
        for (const HazardRow& r : rows) {
            const int c = column[static_cast<std::size_t>(r.j)];
            if (c < 0)
                continue;
            const double p = logistic(fit.beta(c) + fit.beta(k) * r.x);
            const double w = r.upTo * p * (1.0 - p);
            const double residual = r.arrived - r.upTo * p;
            score(c) += residual;
            score(k) += residual * r.x;
            info(c, c) += w;
            info(c, k) += w * r.x;
            info(k, c) += w * r.x;
            info(k, k) += w * r.x * r.x;
        }
        const Eigen::LDLT<Eigen::MatrixXd> ldlt(info);
        if (ldlt.info() != Eigen::Success || !(ldlt.vectorD().array() > 1e-12).all())
            return false;
        const Eigen::VectorXd step = ldlt.solve(score);
        if (!step.allFinite())
            return false;
        fit.beta += step;
        if (step.cwiseAbs().maxCoeff() < 1e-9) {
            fit.covariance = ldlt.solve(Eigen::MatrixXd::Identity(k + 1, k + 1));
            return fit.covariance.allFinite() && fit.beta.allFinite();
        }
    }
    return false;
}

/// log F(d; now - d) and its variance from the trend (the delays it does not cover keep their
/// constant hazard and variance).
DelayShares sharesOfTrend(const TrendFit& fit, const std::vector<double>& g,
                          const std::vector<double>& logVar, int D, double scale) {
    DelayShares s;
    s.model = DelayModel::Trend;
    const auto k = static_cast<Eigen::Index>(fit.delays.size());
    s.trendPerWeek = fit.beta(k);
    s.trendZ = fit.beta(k) / std::sqrt(fit.covariance(k, k));
    s.logF.assign(static_cast<std::size_t>(D + 1), 0.0);
    s.var.assign(static_cast<std::size_t>(D + 1), 0.0);
    std::vector<int> column(static_cast<std::size_t>(D + 1), -1);
    for (Eigen::Index c = 0; c < k; ++c)
        column[static_cast<std::size_t>(fit.delays[static_cast<std::size_t>(c)])] =
            static_cast<int>(c);
    for (int d = 0; d < D; ++d) {
        const double x = -d / scale;  // the period now - d
        Eigen::VectorXd grad = Eigen::VectorXd::Zero(k + 1);
        double logF = 0.0, otherVar = 0.0;
        for (int j = d + 1; j <= D; ++j) {
            const int c = column[static_cast<std::size_t>(j)];
            if (c < 0) {
                logF += std::log1p(-g[static_cast<std::size_t>(j)]);
                otherVar += logVar[static_cast<std::size_t>(j)];
                continue;
            }
            const double gj = logistic(fit.beta(c) + fit.beta(k) * x);
            logF += std::log1p(-std::min(gj, 1.0 - 1e-9));
            grad(c) -= gj;
            grad(k) -= gj * x;
        }
        s.logF[static_cast<std::size_t>(d)] = logF;
        s.var[static_cast<std::size_t>(d)] = grad.dot(fit.covariance * grad) + otherVar;
    }
    return s;
}

}  // namespace

DelayShares delayShares(const ReportingTriangle& tri, int window, DelayModel model) {
    const int D = tri.maxDelay;
    const std::vector<HazardRow> rows = hazardRows(tri, window);
    std::vector<double> g, logVar;
    constantHazards(rows, D, g, logVar);
    if (model != DelayModel::Constant) {
        TrendFit fit;
        if (fitTrend(rows, g, D, fit)) {
            DelayShares trend = sharesOfTrend(fit, g, logVar, D, tri.axis.weekly() ? 1.0 : 7.0);
            if (model == DelayModel::Trend || std::abs(trend.trendZ) > 1.96)
                return trend;
            DelayShares constant = sharesOfConstant(g, logVar, D);
            constant.trendPerWeek = trend.trendPerWeek;
            constant.trendZ = trend.trendZ;
            return constant;
        }
    }
    return sharesOfConstant(g, logVar, D);
}

}  // namespace siftwave::nowcast::detail
