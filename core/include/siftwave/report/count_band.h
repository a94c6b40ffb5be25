#pragma once
// The optional range of daily counts drawn (dotted) around a fitted curve in
// figures (FigureRequest::countRange): where the daily reported counts would
// fall, 95% of the time, if the fitted incidence were their mean.
//
// It describes the day-to-day noise of reporting around the curve, not the
// uncertainty of the curve itself: that is the shaded band, the curve's
// pointwise confidence band (fit::curveBand, delta method). Per fit method:
//
//   poisson  the 2.5% and 97.5% quantiles of Poisson(mu_t);
//   negbin   the same quantiles of the negative binomial with size r (the
//            fit's dispersion) and mean mu_t, i.e. success probability
//            p = r / (r + mu_t), variance mu_t + mu_t^2 / r;
//   lsq      a quasi-Poisson band mu_t +- 1.96 sqrt(phi mu_t), clamped at 0, with
//            the dispersion phi = sum (y_t - mu_t)^2 / max(mu_t, 1) / (n - p)
//            estimated from the raw counts y_t of the window (Pearson's statistic
//            over its degrees of freedom; the floor of 1 keeps the far tails of
//            a curve, where mu_t is nearly 0, from dominating it: our choice).
//
// Sources: P. McCullagh & J. A. Nelder, "Generalized Linear Models", 2nd ed.
// (1989), section 4.5 (Pearson's estimate of the dispersion) and 6.2 (the
// negative binomial variance function); quantiles of the Poisson and negative
// binomial distributions from Boost.Math, as whole counts inf{k : F(k) >= q}, so each
// tail outside the band holds at most 2.5%.

#include "siftwave/fit/fit.h"

#include <span>
#include <vector>

namespace siftwave::report {

struct CountBand {
    std::vector<double> low;  // per window day (FitResult::fitted's length)
    std::vector<double> high;
    double dispersion = 1.0;  // phi of the lsq band (1 for the likelihood methods)
};

/// The band for each window day. `counts` is the whole series the fit was made on
/// (day 0 = FitResult::seriesFirstDay); NaN days are skipped in the dispersion.
CountBand countBand(const fit::FitResult& fit, std::span<const double> counts);

}  // namespace siftwave::report
