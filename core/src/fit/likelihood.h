#pragma once
// Poisson and negative-binomial maximum likelihood for a wave model (internal).
//
// lambda_i = K f(t_i) exp(gamma_{weekday(i)}), sum of the 7 gammas = 0 (geometric mean of the
// weekday factors 1). For weekly counts lambda_i is the model's expected count of week i, the
// sum of K f over its seven days (WaveModel::countsOnPeriods), with no weekday factors. The mean
// parameters minimise the deviance sum d_i^2 with the deviance residuals d_i = sign(y - lambda)
// sqrt(unit deviance) (McCullagh & Nelder, "Generalized Linear Models", 2nd ed. 1989, sections 2.3
// and 11.3 for the negative binomial with size r):
//     Poisson  2 [y ln(y/lambda) - (y - lambda)]
//     NB       2 [y ln(y/lambda) - (y + r) ln((y + r)/(lambda + r))],   Var = lambda + lambda^2/r
// which at fixed r is maximum likelihood. r is found by golden-section search on the profile
// log-likelihood in ln r, alternating with the mean parameters. Standard errors come from the
// inverse observed information: minus the Hessian of the log-likelihood in all parameters
// (mean, weekday and ln r), by central differences of the analytic score.

#include "siftwave/date.h"
#include "siftwave/fit/fit.h"

#include <optional>
#include <span>
#include <string>
#include <vector>

namespace siftwave::fit::detail {

struct LikelihoodFit {
    bool ok = false;
    std::string message;
    std::vector<double> parameters;       // model parameters only
    std::vector<double> modelCovariance;  // np x np block of the inverse observed information
    std::vector<double> weekdayFactors;   // Monday..Sunday, when estimated
    std::optional<double> dispersion;     // r, negative binomial only
    SolverSummary summary;
    GoodnessOfFit goodness;  // aic/aicc filled by the caller
};

/// Fits periods first..last of `series` (period indices); the solves use `workspace`.
LikelihoodFit fitLikelihood(const WaveModel& model, const Series& series, int first, int last,
                            const std::vector<double>& start, const FitOptions& options,
                            SolverWorkspace& workspace);

}  // namespace siftwave::fit::detail
