// Robust statistics behind the detectors, checked against published
// definitions and a general-purpose reference library (Boost.Math).

#include "scan/robust_stats.h"

#include <gtest/gtest.h>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/special_functions/bessel.hpp>

#include <cmath>
#include <vector>

namespace siftwave::scan::detail {
namespace {

// The MAD-to-sigma constant is 1 / Phi^-1(3/4) (Hampel 1974, JASA 69:383;
// Rousseeuw and Croux 1993, JASA 88:1273). Boost.Math gives Phi^-1.
TEST(RobustStats, MadConstantIsTheReciprocalOfTheNormalUpperQuartile) {
    const boost::math::normal standard;
    const double reference = 1.0 / boost::math::quantile(standard, 0.75);
    EXPECT_NEAR(kMadToSigma, reference, 1e-4);  // 1.482602..., rounded to 4 decimals
}

TEST(RobustStats, MedianOfOddAndEvenCounts) {
    std::vector<double> odd{5, 1, 3};
    EXPECT_DOUBLE_EQ(medianInPlace(odd), 3);
    std::vector<double> even{4, 1, 3, 2};
    EXPECT_DOUBLE_EQ(medianInPlace(even), 2.5);
    std::vector<double> none;
    EXPECT_TRUE(std::isnan(medianInPlace(none)));
}

// Hampel identifier as defined by Pearson (2002, IEEE Trans. Control Systems
// Technology 10:55): x_k is an outlier when |x_k - m_k| > t * 1.4826 * MAD_k over
// the window of half-width K, t = 3. Worked by hand here (no published table):
//   series 10 12 11 13 50 12 11 10 12, K = 2
//   k = 4: window 11 13 50 12 11 -> median 12, |dev| 1 1 38 0 1 -> MAD 1,
//          S = 1.4826, |50 - 12| = 38 > 4.4478: outlier
//   k = 3: window 12 11 13 50 12 -> median 12, MAD 1, |13 - 12| = 1: not
//   k = 5: window 13 50 12 11 10 -> median 12, MAD 1, |12 - 12| = 0: not
//   k = 0: window 10 12 11 -> median 11, MAD 1, |10 - 11| = 1: not
TEST(RobustStats, HampelIdentifierFlagsOnlyTheSpikeOfAHandWorkedSeries) {
    const std::vector<double> series{10, 12, 11, 13, 50, 12, 11, 10, 12};
    const std::vector<std::size_t> flagged = hampelOutliers(series, 2, 3.0);
    ASSERT_EQ(flagged.size(), 1u);
    EXPECT_EQ(flagged[0], 4u);
    std::vector<double> window{11, 13, 50, 12, 11};
    const RobustLocationScale ls = robustLocationScale(window);
    EXPECT_DOUBLE_EQ(ls.median, 12);
    EXPECT_DOUBLE_EQ(ls.scale, 1.4826);
}

// With missing values the windows shrink. By hand: k = 7 has window {12, 10, 12}
// -> median 12, |dev| 0 2 0 -> MAD 0, so any deviation is "outlying": the known
// weakness of the MAD when most of a window is one value (which is why the
// backlog baseline never lets its scale fall below the count noise).
TEST(RobustStats, HampelIdentifierSkipsMissingValuesAndShowsTheZeroMadWeakness) {
    const double nan = std::nan("");
    const std::vector<double> series{10, nan, 11, 13, 50, 12, nan, 10, 12};
    const std::vector<std::size_t> flagged = hampelOutliers(series, 2, 3.0);
    ASSERT_EQ(flagged.size(), 2u);
    EXPECT_EQ(flagged[0], 4u);
    EXPECT_EQ(flagged[1], 7u);
}

// sum_k Poisson(k; mu)^2 = exp(-2 mu) I_0(2 mu); Boost.Math's cyl_bessel_i gives I_0.
TEST(RobustStats, PoissonEqualChanceMatchesTheBesselFormula) {
    for (double mu : {0.5, 1.0, 5.0, 39.0, 250.0}) {
        const double reference = std::exp(-2 * mu) * boost::math::cyl_bessel_i(0, 2 * mu);
        EXPECT_NEAR(poissonEqualChance(mu), reference, 1e-9 + 1e-6 * reference) << mu;
    }
}

// sum_{k >= 1} p_k^n under Poisson and negative-binomial noise, against SciPy 1.10.1 (Debian
// python3-scipy): with k = numpy.arange(1, 3000), r = 1 / phi,
// (scipy.stats.nbinom.pmf(k, r, r / (r + mu)) ** n).sum(), or scipy.stats.poisson.pmf for phi 0
// (values computed once by hand and written here; the test does not run Python).
TEST(RobustStats, EqualNonZeroRunChanceMatchesScipy) {
    struct Case {
        double mu, phi;
        int draws;
        double reference;
    };
    for (const Case& c :
         {Case{3, 0, 7, 6.221452791721804e-05}, Case{1, 0, 11, 1.6709855963620623e-05},
          Case{44, 0, 5, 5.877984669600368e-06}, Case{15, 0.04, 5, 2.1172414752273487e-05},
          Case{166.5, 0.04, 3, 7.436425811913745e-05}, Case{325.5, 0.04, 4, 1.0807020288290363e-07},
          Case{0.5, 0.5, 3, 0.01723892686360137}}) {
        EXPECT_NEAR(equalNonZeroRunChance(c.mu, c.phi, c.draws), c.reference, 1e-6 * c.reference)
            << c.mu << " " << c.phi << " " << c.draws;
    }
    EXPECT_EQ(equalNonZeroRunChance(0, 0.04, 3), 0.0);
}

}  // namespace
}  // namespace siftwave::scan::detail
