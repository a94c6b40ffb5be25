#pragma once
// The serial interval: the time from a case's symptom onset to the onset of the cases it
// infects, as a discrete distribution over whole periods (days, or weeks for weekly counts).
//
// Three sources:
//   - discretisedGamma(mean, sd): the discretisation of Cori et al. (2013, American Journal of
//     Epidemiology 178:1505, Web Appendix 11), as in EpiEstim's discr_si: the serial interval
//     is 1 + a gamma variable with shape a = ((mean-1)/sd)^2 and scale b = sd^2/(mean-1), and the
//     weight of day k is the gamma's mass spread by a triangular kernel of width one day around
//     k (F is the gamma CDF with scale b, F1 the same with shape a+1):
//       w_k = k F_a(k) + (k-2) F_a(k-2) - 2 (k-1) F_a(k-1)
//             + a b (2 F_{a+1}(k-1) - F_{a+1}(k-2) - F_{a+1}(k)),   clipped at 0.
//     w_0 = 0 (no one infects on the day of their own onset), the distribution keeps the mean
//     (`mean` exactly), and its sd is slightly above `sd`. Needs mean > 1 and sd > 0.
//     Checked against tests/data/real/epiestim_discr_si_2.6_1.5.csv.
//   - readSerialIntervalFile(path): a CSV with the header `day,weight` and one row per day
//     (0, 1, 2, ...; days left out have weight 0). The weights must be finite and >= 0, day 0
//     must weigh 0, and they must sum to 1 within 0.01 (they are used as written, as EpiEstim
//     does with its si_distr).
//   - toWeeks(daily): for weekly counts. A pair of onsets d days apart, the first on any of the
//     seven days of its week with equal chance, falls k = floor((u + d) / 7) weeks apart:
//       W_k = sum_d w_d * #{u in 0..6 : floor((u + d) / 7) = k} / 7.
//     W_0 (transmission within one week) is in general far from 0; see transmission.h for how
//     it is used and when weekly counts are refused.

#include "siftwave/result.h"

#include <string>
#include <vector>

namespace siftwave::transmission {

struct SerialInterval {
    /// weights[k]: probability that the interval is k periods; sums to 1 (within 0.01).
    std::vector<double> weights;
    /// Days per period of `weights`: 1, or 7 after toWeeks().
    int periodDays = 1;
    /// One line for people: "gamma, mean 2.6 d, sd 1.5 d (discretised, Cori et al. 2013)" or
    /// "from si.csv (12 days)".
    std::string description;

    /// The distribution's mean and sd in days.
    double meanDays() const;
    double sdDays() const;
};

/// The discretised gamma of Cori et al. (2013) over days 0..K, K the first day at which the
/// cumulative weight reaches 1 - 1e-12 (at most 10,000 days). Usage error unless mean > 1 and
/// sd > 0 (both finite).
Result<SerialInterval> discretisedGamma(double meanDays, double sdDays);

/// Reads a `day,weight` file (format above). Errors name the file, line and column.
Result<SerialInterval> readSerialIntervalFile(const std::string& path);

/// The same rules on text already read (`name` is used in messages as the file name).
Result<SerialInterval> parseSerialInterval(const std::string& text, const std::string& name);

/// A daily serial interval as whole-week lags (formula above).
SerialInterval toWeeks(const SerialInterval& daily);

}  // namespace siftwave::transmission
