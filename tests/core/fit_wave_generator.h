#pragma once
// Generated waves for the fit tests: a known Gumbel wave, a weekday reporting effect and
// negative-binomial noise (gamma-Poisson mixture), seeded and reproducible.

#include "siftwave/fit/models.h"

#include <array>
#include <cmath>
#include <random>
#include <vector>

namespace siftwave::test {

struct GeneratedWave {
    double K = 20000, mu = 60, beta = 12;  // Gumbel truth, mu in days from day 0
    int days = 150;
    double size = 30;  // NB size r (Var = lambda + lambda^2 / r); <= 0: none
    std::array<double, 7> weekday{1, 1, 1, 1, 1, 1, 1};  // Monday..Sunday multipliers
    int firstWeekday = 0;                                // weekday of day 0 (0 = Monday)
};

/// The coverage tests' wave: a weekday effect (Monday high, weekend low) scaled to geometric
/// mean 1, as the fit's weekday factors are (K is then the weekday-free size), and NB size 20.
inline GeneratedWave weekdayWave() {
    GeneratedWave g;
    g.weekday = {1.25, 1.1, 1.0, 1.0, 0.95, 0.85, 0.85};
    double logSum = 0;
    for (double f : g.weekday)
        logSum += std::log(f);
    for (double& f : g.weekday)
        f /= std::exp(logSum / 7);
    g.size = 20;
    return g;
}

inline std::vector<double> expectedCounts(const GeneratedWave& g) {
    const auto& model = fit::waveModel(fit::ModelKind::Gumbel);
    const std::vector<double> p{g.K, g.mu, g.beta};
    std::vector<double> out(static_cast<std::size_t>(g.days));
    for (int i = 0; i < g.days; ++i) {
        out[static_cast<std::size_t>(i)] =
            model.incidenceAt(i, p) * g.weekday[static_cast<std::size_t>((g.firstWeekday + i) % 7)];
    }
    return out;
}

inline std::vector<double> generateCounts(const GeneratedWave& g, unsigned seed) {
    std::mt19937_64 rng(seed);
    std::vector<double> out = expectedCounts(g);
    for (double& v : out) {
        double lambda = v;
        if (g.size > 0 && lambda > 0) {
            std::gamma_distribution<double> gamma(g.size, lambda / g.size);
            lambda = gamma(rng);
        }
        std::poisson_distribution<long long> poisson(std::max(lambda, 1e-12));
        v = static_cast<double>(poisson(rng));
    }
    return out;
}

}  // namespace siftwave::test
