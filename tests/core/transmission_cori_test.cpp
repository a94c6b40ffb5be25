// R_t by the method of Cori et al. (2013, Am J Epidemiol 178:1505): by hand, on generated
// exponential growth against Wallinga & Lipsitch (2007), and against EpiEstim's estimate_R.
#include "siftwave/transmission/reproduction_number.h"
#include "siftwave/transmission/transmission.h"

#include "transmission_fixtures.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

namespace siftwave::transmission {
namespace {

TimeAxis dailyAxis(std::size_t n) {
    return TimeAxis::daily(*Date::fromIso("2026-03-02"), static_cast<std::int32_t>(n));
}

// Hand computation from Cori et al. (2013), equation (1): posterior Gamma(a + sum I,
// 1 / (1/b + sum Lambda)) with Lambda_t = sum_s I_{t-s} w_s; prior mean 5, sd 5 gives a = 1,
// b = 5. I = 4, 6, 10, 8, 12; w = 0, 0.5, 0.3, 0.2; tau = 2.
//   Lambda_1 = 0.5*4 = 2, Lambda_2 = 0.5*6 + 0.3*4 = 4.2, Lambda_3 = 0.5*10 + 0.3*6 + 0.2*4 = 7.6,
//   Lambda_4 = 0.5*8 + 0.3*10 + 0.2*6 = 8.2.
//   t=2: shape 1+16 = 17, rate 0.2+6.2 = 6.4;  t=3: 19, 12;  t=4: 21, 16.
TEST(TransmissionCori, PosteriorMatchesTheHandComputationOfThePaperFormulas) {
    const std::vector<double> counts{4, 6, 10, 8, 12};
    SerialInterval si;
    si.weights = {0.0, 0.5, 0.3, 0.2};
    CoriOptions o;
    o.window = 2;
    const auto lambda = totalInfectiousness(counts, si.weights);
    EXPECT_DOUBLE_EQ(lambda[1], 2.0);
    EXPECT_DOUBLE_EQ(lambda[2], 4.2);
    EXPECT_DOUBLE_EQ(lambda[3], 7.6);
    EXPECT_DOUBLE_EQ(lambda[4], 8.2);
    const auto est = coriEstimates(counts, si, dailyAxis(counts.size()), o);
    EXPECT_FALSE(est[0].ok());
    EXPECT_FALSE(est[1].ok());
    EXPECT_NE(est[1].reason.find("not yet full"), std::string::npos);
    const double shape[] = {17, 19, 21}, rate[] = {6.4, 12, 16};
    for (int k = 0; k < 3; ++k) {
        const CoriEstimate& e = est[static_cast<std::size_t>(k + 2)];
        ASSERT_TRUE(e.ok()) << e.reason;
        EXPECT_NEAR(e.shape, shape[k], 1e-12);
        EXPECT_NEAR(e.mean, shape[k] / rate[k], 1e-12);
        EXPECT_NEAR(e.sd, std::sqrt(shape[k]) / rate[k], 1e-12);
        EXPECT_NEAR(e.cv, 1.0 / std::sqrt(shape[k]), 1e-12);
        EXPECT_LT(e.lower, e.mean);
        EXPECT_GT(e.upper, e.mean);
    }
}

// The CV rule (Cori et al. 2013 recommend a posterior CV below 0.3): with the default prior
// (shape 1) a window of 10 cases gives CV 1/sqrt(11) = 0.3015 (withheld), 11 cases 0.2887.
TEST(TransmissionCori, AWindowWithTooFewCasesGivesItsCvAsTheReason) {
    SerialInterval si;
    si.weights = {0.0, 1.0};
    const std::vector<double> few{5, 1, 1, 1, 1, 1, 1, 4};     // window of 7 ending on day 7: 10
    const std::vector<double> enough{5, 1, 1, 1, 1, 1, 1, 5};  // 11
    const auto a = coriEstimates(few, si, dailyAxis(few.size()), CoriOptions{});
    const auto b = coriEstimates(enough, si, dailyAxis(enough.size()), CoriOptions{});
    EXPECT_FALSE(a[7].ok());
    EXPECT_TRUE(a[7].hasPosterior());
    EXPECT_NE(a[7].reason.find("CV 0.30 is above 0.3"), std::string::npos) << a[7].reason;
    EXPECT_TRUE(b[7].ok()) << b[7].reason;
}

TEST(TransmissionCori, MissingCountsAndNoInfectiousnessAreReasonsNotBlanks) {
    SerialInterval si;
    si.weights = {0.0, 0.6, 0.4};
    std::vector<double> counts(20, 20.0);
    counts[10] = std::nan("");
    const auto est = coriEstimates(counts, si, dailyAxis(counts.size()), CoriOptions{});
    EXPECT_TRUE(est[9].ok());
    for (std::size_t t = 10; t <= 18; ++t)  // the window (7) and the reach (2) hold day 10
        EXPECT_NE(est[t].reason.find("missing"), std::string::npos) << t;
    EXPECT_TRUE(est[19].ok()) << est[19].reason;
    const std::vector<double> zeros(12, 0.0);
    const auto none = coriEstimates(zeros, si, dailyAxis(zeros.size()), CoriOptions{});
    EXPECT_NE(none[10].reason.find("no infectiousness"), std::string::npos);
    EXPECT_TRUE(coriEstimates({}, si, dailyAxis(0), CoriOptions{}).empty());
}

// Wallinga & Lipsitch (2007, Proc. R. Soc. B 274:599), equation (3.6): for a gamma generation
// interval with shape k and scale theta, exponential growth at rate r gives R = (1 + r theta)^k.
// Generated counts: round(50 exp(r t)), 60 days (r < 0: from 20,000 down). The serial interval
// is the discretised gamma of the same mean and sd (Cori et al. 2013); tolerance 3%, and the
// growth rate within 0.005 of r, as issue 16 asks.
struct WlCase {
    double r, k, theta;
};

class TransmissionWallingaLipsitch : public ::testing::TestWithParam<WlCase> {};

TEST_P(TransmissionWallingaLipsitch, EstimatedRMatchesTheirFormulaOnExponentialGrowth) {
    const WlCase c = GetParam();
    const std::size_t n = 60;
    std::vector<double> counts(n);
    const double start = c.r > 0 ? 50.0 : 20000.0;
    for (std::size_t t = 0; t < n; ++t)
        counts[t] = std::round(start * std::exp(c.r * static_cast<double>(t)));
    TransmissionOptions o;
    o.serialInterval = discretisedGamma(c.k * c.theta, std::sqrt(c.k) * c.theta).value();
    const auto result = estimateTransmission(counts, dailyAxis(n), o);
    const double expected = std::pow(1.0 + c.r * c.theta, c.k);
    // Past the serial interval's start-up (the first days have no infectors in the data).
    for (std::size_t t = 40; t < n; ++t) {
        const auto& row = result.rows[t];
        ASSERT_TRUE(row.reproduction.ok()) << row.reproduction.reason;
        EXPECT_NEAR(row.reproduction.mean / expected, 1.0, 0.03) << "t " << t;
        ASSERT_TRUE(row.growth.ok()) << row.growth.reason;
        EXPECT_NEAR(row.growth.r.value, c.r, 0.005) << "t " << t;
    }
}

INSTANTIATE_TEST_SUITE_P(GammaGenerationIntervals, TransmissionWallingaLipsitch,
                         ::testing::Values(WlCase{0.1, 4.0, 1.25}, WlCase{0.05, 2.0, 3.0},
                                           WlCase{-0.05, 4.0, 1.25}, WlCase{0.2, 9.0, 0.5}));

// Reference: EpiEstim::estimate_R (r-cran-epiestim 2.2-4) on its bundled data, committed by
// tools/fixtures/make_real_fixtures.R (tests/data/real/SOURCES.md): 7-day windows ending on each
// day, prior mean 5, sd 5. Issue 16 asks posterior means within 0.5%; the same closed form in
// double precision agrees to about 1e-12, so the check is tight (1e-9) and the largest relative
// difference is printed.
struct EpiEstimCase {
    const char* incidence;
    const char* reference;
    const char* si;  // nullptr: the parametric serial interval, mean 2.6, sd 1.5
};

class TransmissionEpiEstim : public ::testing::TestWithParam<EpiEstimCase> {};

TEST_P(TransmissionEpiEstim, PosteriorMeanSdAndQuantilesMatchEstimateR) {
    const EpiEstimCase c = GetParam();
    const auto incidence = testing::readFixture(c.incidence);
    const auto reference = testing::readFixture(c.reference);
    const std::vector<double>& counts = incidence.numbers.at("cases");
    SerialInterval si;
    if (c.si) {
        auto read = readSerialIntervalFile(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/" + c.si);
        ASSERT_TRUE(read.ok()) << read.error().describe();
        si = read.value();
    } else {
        si = discretisedGamma(2.6, 1.5).value();
    }
    const auto est = coriEstimates(counts, si, dailyAxis(counts.size()), CoriOptions{});
    double worst = 0.0;
    for (std::size_t row = 0; row < reference.rows; ++row) {
        const auto t = static_cast<std::size_t>(reference.numbers.at("t_end")[row]) - 1;
        const CoriEstimate& e = est.at(t);
        ASSERT_TRUE(e.hasPosterior()) << "day " << t + 1 << ": " << e.reason;
        const double columns[4][2] = {{e.mean, reference.numbers.at("mean_r")[row]},
                                      {e.sd, reference.numbers.at("std_r")[row]},
                                      {e.lower, reference.numbers.at("quantile_0_025_r")[row]},
                                      {e.upper, reference.numbers.at("quantile_0_975_r")[row]}};
        for (const auto& pair : columns) {
            const double rel = std::abs(pair[0] / pair[1] - 1.0);
            worst = std::max(worst, rel);
            EXPECT_LT(rel, 1e-9) << "day " << t + 1 << ": " << pair[0] << " vs " << pair[1];
        }
    }
    // Days before the first full window (day 8, the first day's cases imported) have none, as
    // EpiEstim's default windows start at day 2.
    for (std::size_t t = 0; t < 7; ++t)
        EXPECT_FALSE(est[t].hasPosterior()) << t;
    std::printf("[ epiestim ] %s: largest relative difference %.3g over %zu windows\n", c.reference,
                worst, reference.rows);
}

INSTANTIATE_TEST_SUITE_P(
    BundledData, TransmissionEpiEstim,
    ::testing::Values(EpiEstimCase{"epiestim_Flu2009_incidence.csv",
                                   "epiestim_Flu2009_cori_reference.csv",
                                   "epiestim_Flu2009_si.csv"},
                      EpiEstimCase{"epiestim_Flu2009_incidence.csv",
                                   "epiestim_Flu2009_cori_parametric_reference.csv", nullptr},
                      EpiEstimCase{"epiestim_SARS2003_incidence.csv",
                                   "epiestim_SARS2003_cori_reference.csv",
                                   "epiestim_SARS2003_si.csv"}));

}  // namespace
}  // namespace siftwave::transmission
