// The serial interval: the discretisation of Cori et al. (2013), files, and whole weeks.
#include "siftwave/transmission/serial_interval.h"

#include "support/temp_path.h"
#include "transmission_fixtures.h"

#include <gtest/gtest.h>

#include <cmath>
#include <fstream>

namespace siftwave::transmission {
namespace {

// Reference: EpiEstim's discr_si(0:30, 2.6, 1.5) (r-cran-epiestim 2.2-4), committed as
// tests/data/real/epiestim_discr_si_2.6_1.5.csv by tools/fixtures/make_real_fixtures.R. The
// formula is Cori et al. (2013, Am J Epidemiol 178:1505), Web Appendix 11.
TEST(TransmissionSerialInterval, DiscretisedGammaMatchesEpiEstimDiscrSi) {
    const auto table = testing::readFixture("epiestim_discr_si_2.6_1.5.csv");
    ASSERT_EQ(table.rows, 31u);
    auto si = discretisedGamma(2.6, 1.5);
    ASSERT_TRUE(si.ok());
    double maxDiff = 0.0;
    for (std::size_t k = 0; k < table.rows; ++k) {
        const double ref = table.numbers.at("weight")[k];
        const double ours = k < si->weights.size() ? si->weights[k] : 0.0;
        maxDiff = std::max(maxDiff, std::abs(ours - ref));
    }
    EXPECT_LT(maxDiff, 1e-12);
    // SOURCES.md: the discretised distribution's own mean is 2.599999979 (EpiEstim's SI.Moments).
    EXPECT_NEAR(si->meanDays(), 2.6, 1e-6);
    EXPECT_EQ(si->weights[0], 0.0);
}

TEST(TransmissionSerialInterval, DiscretisedGammaRefusesAMeanOfOneDayOrLess) {
    EXPECT_FALSE(discretisedGamma(1.0, 1.0).ok());
    EXPECT_FALSE(discretisedGamma(3.0, 0.0).ok());
    EXPECT_FALSE(discretisedGamma(std::nan(""), 1.0).ok());
}

TEST(TransmissionSerialInterval, FileOfEpiEstimFlu2009IsReadAsWritten) {
    auto si = readSerialIntervalFile(std::string(SIFTWAVE_TEST_DATA_DIR) +
                                     "/real/epiestim_Flu2009_si.csv");
    ASSERT_TRUE(si.ok()) << si.error().describe();
    ASSERT_EQ(si->weights.size(), 12u);
    EXPECT_DOUBLE_EQ(si->weights[2], 0.359);
}

Error parseError(const std::string& text) {
    auto si = parseSerialInterval(text, "si.csv");
    EXPECT_FALSE(si.ok());
    return si.ok() ? Error{} : si.error();
}

TEST(TransmissionSerialInterval, MalformedFilesAreRefusedWithFileLineAndColumn) {
    Error e = parseError("day,weight\n0,0\n1,0.5\n2,abc\n");
    EXPECT_EQ(e.file, "si.csv");
    EXPECT_EQ(e.line, 4u);
    EXPECT_EQ(e.column, 3u);
    e = parseError("day,weight\n0,0\nx,1\n");
    EXPECT_EQ(e.line, 3u);
    EXPECT_EQ(e.column, 1u);
    e = parseError("lag;prob\n0;0\n");
    EXPECT_EQ(e.line, 1u);
    e = parseError("day,weight\n0,0\n2,0.5\n1,0.5\n");  // days out of order
    EXPECT_EQ(e.line, 4u);
    e = parseError("day,weight\n0,0.2\n1,0.8\n");  // day 0 must weigh 0
    EXPECT_EQ(e.line, 2u);
    e = parseError("day,weight\n0,0\n1,0.5\n2,-0.1\n");
    EXPECT_EQ(e.line, 4u);
    e = parseError("day,weight\n0,0\n1,0.5\n");  // sums to 0.5
    EXPECT_NE(e.message.find("sum to 1"), std::string::npos);
    e = parseError("day,weight\n");
    EXPECT_NE(e.message.find("no day,weight rows"), std::string::npos);
    e = parseError("day,weight\n0,0,1\n");
    EXPECT_EQ(e.line, 2u);
    EXPECT_EQ(e.describe().rfind("si.csv:2", 0), 0u) << e.describe();
}

TEST(TransmissionSerialInterval, AMissingFileIsAnIoError) {
    auto si = readSerialIntervalFile(testing::testTempPath("no-such-si.csv").string());
    ASSERT_FALSE(si.ok());
    EXPECT_EQ(si.error().code, ErrorCode::Io);
}

// Hand computation (the rule in serial_interval.h): one day's lag puts 6/7 of the pairs in the
// same week and 1/7 a week apart; eight days' lag 6/7 one week and 1/7 two weeks apart.
TEST(TransmissionSerialInterval, WeeksSpreadEachDayLagOverTheWeekdaysOfItsOnset) {
    SerialInterval daily;
    daily.weights.assign(9, 0.0);
    daily.weights[1] = 0.5;
    daily.weights[8] = 0.5;
    const SerialInterval weekly = toWeeks(daily);
    ASSERT_EQ(weekly.weights.size(), 3u);
    EXPECT_NEAR(weekly.weights[0], 0.5 * 6.0 / 7.0, 1e-15);
    EXPECT_NEAR(weekly.weights[1], 0.5 / 7.0 + 0.5 * 6.0 / 7.0, 1e-15);
    EXPECT_NEAR(weekly.weights[2], 0.5 / 7.0, 1e-15);
    EXPECT_EQ(weekly.periodDays, 7);
    // The mean in days is kept: a uniform onset position within the week adds nothing on average.
    EXPECT_NEAR(weekly.meanDays(), daily.meanDays(), 1e-12);
}

}  // namespace
}  // namespace siftwave::transmission
