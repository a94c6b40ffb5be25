// The chain-ladder nowcast with its negative-binomial mixture interval (nowcast.h).
#include "siftwave/nowcast/nowcast.h"

#include "nowcast/delay_trend.h"

#include <boost/math/distributions/normal.hpp>

#include <algorithm>
#include <cmath>

namespace siftwave::nowcast {

const char* const kNowcastCaution =
    "A nowcast estimates reports still to come for periods already past, assuming the "
    "reporting delays seen so far continue; it is not a forecast of new infections. Defer to "
    "the responsible public-health authority.";

const char* delayModelName(DelayModel model) {
    switch (model) {
        case DelayModel::Constant:
            return "constant";
        case DelayModel::Trend:
            return "trend";
        case DelayModel::Auto:
            return "auto";
    }
    return "auto";
}

std::optional<DelayModel> delayModelFromName(std::string_view name) {
    for (DelayModel m : {DelayModel::Constant, DelayModel::Trend, DelayModel::Auto})
        if (name == delayModelName(m))
            return m;
    return std::nullopt;
}

Status NowcastOptions::validate() const {
    if (windowPeriods < 0)
        return makeError(ErrorCode::Usage, "the window must be 0 (default) or more periods");
    if (!(level > 0.0 && level < 1.0))
        return makeError(ErrorCode::Usage, "the interval level must lie between 0 and 1");
    if (strata < 1 || strata > 1000)
        return makeError(ErrorCode::Usage, "strata must be 1 to 1000");
    if (!(minShareReported > 0.0 && minShareReported < 1.0))
        return makeError(ErrorCode::Usage, "the minimum share reported must lie in (0, 1)");
    return Ok{};
}

int NowcastOptions::window(const TimeAxis& axis) const {
    if (windowPeriods > 0)
        return windowPeriods;
    return axis.weekly() ? 6 : 21;
}

namespace {

struct Interval {
    double lo = 0, hi = 0, pComplete = 1;
};

/// Y ~ NB(r, F) mixed over F = exp(logF + sd z_k), as in the header; returns R + quantiles.
Interval predictiveInterval(double R, double logF, double sd, const NowcastOptions& o) {
    const boost::math::normal standard;
    const int K = o.strata;
    std::vector<double> F(static_cast<std::size_t>(K));
    for (int k = 0; k < K; ++k) {
        const double z = K == 1 ? 0.0 : boost::math::quantile(standard, (k + 0.5) / K);
        F[static_cast<std::size_t>(k)] = std::min(1.0, std::exp(logF + sd * z));
    }
    const double r = R + 0.5;
    double mean = 0.0, secondMoment = 0.0, p0 = 0.0;
    for (double f : F) {
        const double m = r * (1.0 - f) / f;
        mean += m / K;
        secondMoment += (r * (1.0 - f) / (f * f) + m * m) / K;
        p0 += std::exp(r * std::log(f)) / K;
    }
    const double lowP = (1.0 - o.level) / 2.0;
    const double highP = 1.0 - lowP;
    Interval out;
    out.pComplete = p0;
    if (mean > 300.0) {
        const double sdY = std::sqrt(std::max(0.0, secondMoment - mean * mean));
        const double z = boost::math::quantile(standard, highP);
        out.lo = R + std::max(0.0, std::floor(mean - z * sdY));
        out.hi = R + std::ceil(mean + z * sdY);
        return out;
    }
    // The mixture's cdf, term by term: pmf(y + 1) = pmf(y) (y + r) / (y + 1) (1 - F).
    std::vector<double> pmf(F.size());
    for (std::size_t k = 0; k < F.size(); ++k)
        pmf[k] = std::exp(r * std::log(F[k]));
    double cdf = 0.0;
    bool lowFound = false;
    for (int y = 0; y < 100000; ++y) {
        double p = 0.0;
        for (std::size_t k = 0; k < F.size(); ++k) {
            p += pmf[k] / K;
            pmf[k] *= (y + r) / (y + 1.0) * (1.0 - F[k]);
        }
        cdf += p;
        if (!lowFound && cdf >= lowP) {
            out.lo = R + y;
            lowFound = true;
        }
        if (cdf >= highP) {
            out.hi = R + y;
            return out;
        }
    }
    out.hi = std::numeric_limits<double>::quiet_NaN();  // not reached: mean <= 300
    return out;
}

}  // namespace

Result<NowcastResult> nowcast(const ReportingTriangle& tri, const NowcastOptions& options) {
    return nowcast(tri, tri, options);
}

Result<ReportingTriangle> pooledTriangle(const std::vector<ReportingTriangle>& triangles) {
    if (triangles.empty())
        return makeError(ErrorCode::Usage, "no triangle to pool");
    ReportingTriangle pooled = triangles.front();
    pooled.region = "(pooled)";
    for (std::size_t k = 1; k < triangles.size(); ++k) {
        const ReportingTriangle& t = triangles[k];
        if (!(t.axis == pooled.axis) || t.maxDelay != pooled.maxDelay)
            return makeError(ErrorCode::Usage,
                             "triangles of different calendars or maximum delays cannot be pooled");
        for (std::size_t i = 0; i < pooled.cumulative.size(); ++i)
            pooled.cumulative[i] += t.cumulative[i];  // NaN stays NaN
        pooled.casesLeftOut += t.casesLeftOut;
    }
    return pooled;
}

Result<NowcastResult> nowcast(const ReportingTriangle& tri, const ReportingTriangle& delaysFrom,
                              const NowcastOptions& options) {
    if (Status s = options.validate(); !s)
        return s.error();
    if (!(delaysFrom.axis == tri.axis) || delaysFrom.maxDelay != tri.maxDelay)
        return makeError(ErrorCode::Usage,
                         "the delays must come from a triangle of the same calendar and maximum "
                         "delay");
    const int D = tri.maxDelay;
    NowcastResult out;
    out.region = tri.region;
    out.now = tri.now;
    out.cadence = tri.axis.cadence();
    out.maxDelay = D;
    out.window = options.window(tri.axis);
    out.level = options.level;
    out.casesLeftOut = tri.casesLeftOut;
    // log F(d) and its variance for the period d periods before now (delay_trend.h).
    const detail::DelayShares shares =
        detail::delayShares(delaysFrom, out.window, options.delayModel);
    const std::vector<double>& logF = shares.logF;
    const std::vector<double>& var = shares.var;
    out.delayModel = shares.model;
    out.trendPerWeek = shares.trendPerWeek;
    out.trendZ = shares.trendZ;
    for (double l : logF)
        out.delayShare.push_back(std::exp(l));
    out.rows.reserve(static_cast<std::size_t>(tri.periods()));
    for (std::int32_t t = 0; t < tri.periods(); ++t) {
        NowcastRow row;
        row.date = tri.axis.periodStart(t);
        row.reported = std::max(0.0, tri.reported(t));
        row.nowcast = row.lo = row.hi = row.reported;
        const int d = tri.elapsed(t);
        if (d < D) {
            const auto i = static_cast<std::size_t>(d);
            row.estimated = true;
            row.shareReported = out.delayShare[i];
            if (row.shareReported < options.minShareReported) {
                row.nowcast = row.lo = row.hi = std::numeric_limits<double>::quiet_NaN();
                row.pComplete = std::numeric_limits<double>::quiet_NaN();
            } else {
                row.nowcast = row.reported / row.shareReported;
                const Interval iv =
                    predictiveInterval(row.reported, logF[i], std::sqrt(var[i]), options);
                row.lo = iv.lo;
                row.hi = iv.hi;
                row.pComplete = iv.pComplete;
            }
        }
        out.rows.push_back(row);
    }
    return out;
}

std::string NowcastResult::brief() const {
    const char* unit = cadence == Cadence::Weekly ? " weeks" : " days";
    std::size_t open = 0;
    for (const NowcastRow& r : rows)
        open += r.estimated && !(r.pComplete >= 0.95) ? 1 : 0;
    const std::string delays = delayModel == DelayModel::Trend
                                   ? ", delays with a trend (logit hazard " +
                                         std::to_string(trendPerWeek).substr(0, 6) + " per " +
                                         (cadence == Cadence::Weekly ? "week" : "7 days") + ")"
                                   : std::string(", delays constant over the window");
    return "chain-ladder (reverse-time hazard, Lawless 1994), max delay " +
           std::to_string(maxDelay) + unit + ", window " + std::to_string(window) + unit + delays +
           "; " + std::to_string(open) + " period(s) likely to grow (P(complete) < 0.95)";
}

}  // namespace siftwave::nowcast
