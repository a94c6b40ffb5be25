#pragma once
// The reverse-time hazards of a reporting triangle, constant over the window or with a
// logit-linear trend in event time (nowcast.h, "Delays that change over time"), as what the
// nowcast needs: log F(d) and its delta-method variance for the period d periods before now.

#include "siftwave/nowcast/nowcast.h"

#include <vector>

namespace siftwave::nowcast::detail {

struct DelayShares {
    std::vector<double> logF;  // d = 0 .. D: log F(d) for the period now - d
    std::vector<double> var;   // its delta-method variance
    DelayModel model = DelayModel::Constant;
    double trendPerWeek = 0;  // b per 7 days (daily) or per week (weekly)
    double trendZ = 0;        // b / se(b); 0 when no trend was fitted
};

/// The shares from `tri`'s last `window` known rows per delay; `model` Auto fits the trend and
/// keeps it where its Wald test rejects b = 0 at 5 %. A trend that cannot be fitted (too few
/// rows, no delay with both arrivals and non-arrivals, no convergence) falls back to constant.
DelayShares delayShares(const ReportingTriangle& tri, int window, DelayModel model);

}  // namespace siftwave::nowcast::detail
