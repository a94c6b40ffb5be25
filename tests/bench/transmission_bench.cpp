// Transmission measures for one region over 1,000 days (issue 16: "instantaneous" for the
// workbench, which recomputes them on every ledger change): the growth rate r(t) with and
// without weekday terms, R_t by Cori et al. with a discretised gamma serial interval, and both
// together as the workbench and the CLI ask for them.
#include "siftwave/transmission/transmission.h"
#include "support/xorshift.h"

#include <benchmark/benchmark.h>

#include <cmath>

namespace {

using namespace siftwave;

// Two waves over 1,000 days with Poisson-like noise (seeded).
std::vector<double> thousandDays() {
    std::vector<double> y(1000);
    testing::Xorshift64 rng(20261205);
    for (std::size_t t = 0; t < y.size(); ++t) {
        const double d = static_cast<double>(t);
        const double mean = 20.0 + 400.0 * std::exp(-std::pow((d - 250.0) / 60.0, 2.0)) +
                            250.0 * std::exp(-std::pow((d - 700.0) / 80.0, 2.0));
        y[t] = std::round(mean + std::sqrt(mean) *
                                     (static_cast<double>(rng.below(2001)) / 1000.0 - 1.0) * 1.7);
    }
    return y;
}

const TimeAxis kAxis = TimeAxis::daily(*Date::fromIso("2024-01-01"), 1000);

transmission::TransmissionOptions options(bool weekday) {
    auto o = transmission::TransmissionOptions::forCadence(Cadence::Daily);
    o.serialInterval = transmission::discretisedGamma(4.7, 2.9).value();
    if (weekday) {
        o.setWindow(14);
        o.growth.weekdayTerms = true;
    }
    return o;
}

void BM_GrowthRate1000Days(benchmark::State& state) {
    const auto y = thousandDays();
    const auto o = options(state.range(0) != 0);
    for (auto _ : state)
        benchmark::DoNotOptimize(transmission::growthRates(y, kAxis, o.growth));
}
BENCHMARK(BM_GrowthRate1000Days)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond);

void BM_CoriR1000Days(benchmark::State& state) {
    const auto y = thousandDays();
    const auto o = options(false);
    for (auto _ : state)
        benchmark::DoNotOptimize(transmission::coriEstimates(y, *o.serialInterval, kAxis, o.cori));
}
BENCHMARK(BM_CoriR1000Days)->Unit(benchmark::kMillisecond);

void BM_Transmission1000Days(benchmark::State& state) {
    const auto y = thousandDays();
    const auto o = options(false);
    for (auto _ : state)
        benchmark::DoNotOptimize(transmission::estimateTransmission(y, kAxis, o));
}
BENCHMARK(BM_Transmission1000Days)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
