// Both measures on one axis (transmission.h): the weekly rule, the refusal without a serial
// interval, and the export's rows.
#include "siftwave/transmission/transmission.h"
#include "siftwave/transmission/transmission_export.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <cmath>

namespace siftwave::transmission {
namespace {

// Weekly counts of exponential growth at r per day: each week's count is the sum of its days.
std::vector<double> weeklyGrowth(std::size_t weeks, double r) {
    std::vector<double> y(weeks, 0.0);
    for (std::size_t w = 0; w < weeks; ++w) {
        for (int d = 0; d < 7; ++d)
            y[w] += 20.0 * std::exp(r * static_cast<double>(7 * w + static_cast<std::size_t>(d)));
    }
    return y;
}

TimeAxis weeklyAxis(std::size_t n) {
    return TimeAxis::weekly(*Date::fromIso("2026-01-05"), static_cast<std::int32_t>(n),
                            WeekStart::Monday);
}

// Wallinga & Lipsitch (2007, Proc. R. Soc. B 274:599): R = 1 / M(-r) for the generation
// interval's moment generating function M; for the offset gamma of Cori et al. (2013), 1 + Gamma
// (shape a, scale b), that is R = exp(r) (1 + r b)^a. A serial interval of mean 8.4 d, sd 3.8 d
// (SARS, Lipsitch et al. 2003, as in ?SARS2003) keeps 8% of pairs within one week, so weekly
// counts are estimated; the whole-week discretisation brings R within 3% of the formula.
TEST(TransmissionWeekly, ALongSerialIntervalGivesWeeklyRNearWallingaLipsitch) {
    const double r = 0.05;
    const auto y = weeklyGrowth(20, r);
    TransmissionOptions o;
    o.serialInterval = discretisedGamma(8.4, 3.8).value();
    o.setWindow(3);
    const auto result = estimateTransmission(y, weeklyAxis(y.size()), o);
    ASSERT_TRUE(result.refusal.empty()) << result.refusal;
    EXPECT_LT(result.serialIntervalUsed.weights[0], 0.5);
    const double a = std::pow((8.4 - 1.0) / 3.8, 2.0), b = 3.8 * 3.8 / 7.4;
    const double expected = std::exp(r) * std::pow(1.0 + r * b, a);
    for (std::size_t t = 8; t < y.size(); ++t) {
        const auto& row = result.rows[t];
        ASSERT_TRUE(row.reproduction.ok()) << row.reproduction.reason;
        EXPECT_NEAR(row.reproduction.mean / expected, 1.0, 0.03) << t;
        EXPECT_NEAR(row.growth.r.value, r, 1e-9);
    }
}

TEST(TransmissionWeekly, AShortSerialIntervalIsRefusedForWeeklyCountsWithItsReason) {
    const auto y = weeklyGrowth(12, 0.05);
    TransmissionOptions o;
    o.serialInterval = discretisedGamma(2.6, 1.5).value();
    const auto result = estimateTransmission(y, weeklyAxis(y.size()), o);
    ASSERT_FALSE(result.refusal.empty());
    EXPECT_NE(result.refusal.find("within one week"), std::string::npos) << result.refusal;
    for (const auto& row : result.rows)
        EXPECT_EQ(row.reproduction.reason, result.refusal);
    EXPECT_TRUE(result.rows[11].growth.ok());  // the growth rate is still given
}

TEST(TransmissionWeekly, NoSerialIntervalMeansNoRWithAReason) {
    const std::vector<double> y(30, 50.0);
    const auto result = estimateTransmission(y, TimeAxis::daily(*Date::fromIso("2026-03-02"), 30),
                                             TransmissionOptions{});
    EXPECT_NE(result.rows[20].reproduction.reason.find("no serial interval"), std::string::npos);
    EXPECT_TRUE(result.rows[20].growth.ok());
}

TEST(TransmissionWeekly, JsonRowsHaveNullsWhereThereIsNoEstimateAndOpenEnds) {
    std::vector<double> y{20, 60, 15, 70, 25, 55, 30, 40, 45, 50};
    TransmissionOptions o;
    o.serialInterval = discretisedGamma(4.0, 2.0).value();
    const auto result = estimateTransmission(y, weeklyAxis(y.size()), o);
    const nlohmann::json j = transmissionToJson("N-01", "cases", result);
    EXPECT_EQ(j["cadence"], "weekly");
    EXPECT_EQ(j["settings"]["window_unit"], "week");
    ASSERT_EQ(j["rows"].size(), y.size());
    const auto& first = j["rows"][0];
    EXPECT_EQ(first["date"], "2026-01-05");
    EXPECT_EQ(first["period"], "2026-W02");
    EXPECT_TRUE(first["r"].is_null());
    EXPECT_TRUE(first["R"].is_null());
    EXPECT_TRUE(first["reason"].is_string());
    EXPECT_TRUE(first["r_reason"].is_string());
    EXPECT_NE(j["caution"].get<std::string>().find("public-health authority"), std::string::npos);
    // Row 6: r's interval holds 0 (wild counts): the doubling/halving value is given, its upper
    // end null (open).
    const auto& row = j["rows"][6];
    ASSERT_TRUE(row["r"].is_number());
    const char* key = row["r"].get<double>() > 0 ? "doubling_time" : "halving_time";
    EXPECT_TRUE(row[std::string(key) + "_days"].is_number());
    EXPECT_TRUE(row[std::string(key) + "_hi"].is_null());
    const std::string csv = transmissionCsvRow(result, 6);
    EXPECT_NE(csv.find(",inf,"), std::string::npos) << csv;
    EXPECT_EQ(std::count(csv.begin(), csv.end(), ','),
              std::count(transmissionCsvHeader().begin(), transmissionCsvHeader().end(), ','));
}

}  // namespace
}  // namespace siftwave::transmission
