// weekday_effect: factors per weekday and their strength.

#include "support/run_detector.h"
#include "support/synthetic_drop.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

namespace siftwave::scan {
namespace {

std::vector<Finding> run(const Drop& drop) {
    return siftwave::testing::runDetector(drop, detail::findWeekdayEffects);
}

TEST(WeekdayEffect, RecoversThePlantedFactorsOfAGeneratedDrop) {
    siftwave::testing::SyntheticOptions o;
    o.seed = 3;
    const auto s = siftwave::testing::makeSyntheticDrop(o);
    const auto found = run(s.drop);
    ASSERT_EQ(found.size(), 1u);
    const Finding& f = found[0];
    EXPECT_FALSE(f.region.has_value());
    EXPECT_EQ(*f.measure, "cases");
    EXPECT_EQ(f.severity, Severity::Info);
    const char* names[7] = {"monday", "tuesday",  "wednesday", "thursday",
                            "friday", "saturday", "sunday"};
    double mean = 0;
    for (double w : o.weekday)
        mean += w / 7;
    for (int w = 0; w < 7; ++w) {
        EXPECT_NEAR(f.evidence["factors"][names[w]].get<double>(), o.weekday[w] / mean, 0.05)
            << names[w];
    }
    EXPECT_EQ(f.evidence["peak"], "monday");
    EXPECT_EQ(f.evidence["trough"], "sunday");
    EXPECT_NEAR(f.evidence["strength"].get<double>(), 1.2 / 0.75 - 1, 0.12);
}

TEST(WeekdayEffect, NoFindingWithoutAWeeklyPattern) {
    siftwave::testing::SyntheticOptions o;
    o.seed = 4;
    o.weekday.fill(1.0);
    EXPECT_TRUE(run(siftwave::testing::makeSyntheticDrop(o).drop).empty());
}

TEST(WeekdayEffect, NoFindingOnTooShortASeries) {
    EXPECT_TRUE(run(siftwave::testing::handBuiltDrop(
                        {"A"}, {{50, 40, 30, 60, 50, 40, 30, 60, 50, 40, 30, 60, 50, 40}}))
                    .empty());
}

}  // namespace
}  // namespace siftwave::scan
