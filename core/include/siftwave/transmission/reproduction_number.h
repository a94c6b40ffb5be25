#pragma once
// The instantaneous reproduction number R_t by the method of Cori, Ferguson, Fraser and
// Cauchemez (2013, "A new framework and software to estimate time-varying reproduction numbers
// during epidemics", American Journal of Epidemiology 178:1505-1512).
//
// Model. Incidence I_t is Poisson with mean R_t Lambda_t, where the total infectiousness
//     Lambda_t = sum_{s >= 0} w_s I_{t-s}
// is the earlier incidence weighted by the serial interval w (w_0 = 0 for daily counts, so the
// sum starts at s = 1 as in the paper; for weekly counts see transmission.h). R is taken as
// constant over the window of tau periods ending on t, with a gamma prior of shape a and scale
// b (a = (m/s)^2, b = s^2/m for prior mean m and sd s; default m = 5, s = 5 as in the paper).
// The posterior is gamma (the paper's equation (1)):
//     R_t | I ~ Gamma(shape a + sum_{k=t-tau+1}^{t} I_k,  scale 1 / (1/b + sum_{k} Lambda_k)).
// Reported: its mean (shape x scale), sd, coefficient of variation 1/sqrt(shape), and the 2.5%
// and 97.5% quantiles (Boost.Math's gamma quantile).
//
// The first period's cases count as imported (they have no infectors in the data), as EpiEstim
// does: a window may start at the second period at the earliest, so the first estimate is for
// period tau (0-based).
//
// No estimate (`reason`, a sentence), in this order:
//   - the window is not yet full (t < tau);
//   - a count is missing in the window or within the serial interval's reach before it (the lags
//     that hold 99% of its weight);
//   - no infectiousness in the window (sum Lambda = 0: no earlier cases within reach);
//   - the posterior coefficient of variation is above `maxCv` (default 0.3, the threshold Cori et
//     al. 2013 recommend, reached with the default prior when the window holds 11 cases or
//     more: 1/sqrt(1 + 11) = 0.289). The posterior is still given (with its CV) so the reason can
//     be checked; front ends show no R for such a row.

#include "siftwave/result.h"
#include "siftwave/time_axis.h"
#include "siftwave/transmission/growth_rate.h"
#include "siftwave/transmission/serial_interval.h"

#include <cmath>
#include <span>
#include <string>
#include <vector>

namespace siftwave::transmission {

struct CoriOptions {
    int window = 7;          // tau, periods in the window ending on t (default 7)
    double priorMean = 5.0;  // gamma prior mean (Cori et al. 2013)
    double priorSd = 5.0;    // gamma prior sd (Cori et al. 2013)
    double maxCv = 0.3;      // no estimate above this posterior CV (Cori et al. 2013)

    Status validate() const;
};

struct CoriEstimate {
    double mean = kNaN, sd = kNaN, lower = kNaN, upper = kNaN, cv = kNaN;  // the posterior
    double shape = kNaN, scale = kNaN;                                     // of the posterior
    double sumIncidence = kNaN;       // sum of I over the window
    double sumInfectiousness = kNaN;  // sum of Lambda over the window
    std::string reason;               // why there is no estimate; empty when there is one

    bool ok() const { return reason.empty(); }
    bool hasPosterior() const { return std::isfinite(mean); }
};

/// Lambda_t for every period (NaN counts taken as 0; see coriEstimates for how they are refused).
std::vector<double> totalInfectiousness(std::span<const double> counts,
                                        std::span<const double> weights);

/// One estimate per period of `counts`; `si.weights` is per period of `axis` (periods are only
/// named through `axis`). The options must be valid.
std::vector<CoriEstimate> coriEstimates(std::span<const double> counts, const SerialInterval& si,
                                        const TimeAxis& axis, const CoriOptions& options);

}  // namespace siftwave::transmission
