#include "siftwave/date.h"

#include <gtest/gtest.h>

namespace siftwave {
namespace {

// ISO 8601-1:2019 calendar dates; 1970-01-01 is day 0 by definition of our serial.
TEST(Date, EpochIsDayZeroAndAThursday) {
    auto d = Date::fromIso("1970-01-01");
    ASSERT_TRUE(d);
    EXPECT_EQ(d->serial, 0);
    EXPECT_EQ(d->isoWeekday(), 4);  // Thursday: common knowledge of the calendar, no source needed
}

TEST(Date, RoundTripsThroughIsoText) {
    for (int serial = -800000; serial <= 800000; serial += 997) {
        Date d{serial};
        auto back = Date::fromIso(d.iso());
        if (d.year() < 1400 || d.year() > 9999)
            continue;
        ASSERT_TRUE(back) << d.iso();
        EXPECT_EQ(back->serial, serial);
    }
}

TEST(Date, RejectsImpossibleDays) {
    EXPECT_FALSE(Date::fromIso("2026-02-30"));
    EXPECT_FALSE(Date::fromIso("2026-13-01"));
    EXPECT_FALSE(Date::fromIso("2026-00-10"));
    EXPECT_FALSE(Date::fromIso("2025-02-29"));  // 2025 is not a leap year
    EXPECT_TRUE(Date::fromIso("2024-02-29"));   // 2024 is
    EXPECT_FALSE(Date::fromIso("1900-02-29"));  // Gregorian rule: centuries not divisible by 400
    EXPECT_TRUE(Date::fromIso("2000-02-29"));
    EXPECT_FALSE(Date::fromIso("2026-1-01"));
    EXPECT_FALSE(Date::fromIso("2026-01-01 "));
}

TEST(Date, IsoWeekdayFollowsTheCalendar) {
    // 2026-12-01 is a Tuesday (ISO weekday 2); 2024-12-29 a Sunday (7).
    EXPECT_EQ(Date::fromIso("2026-12-01")->isoWeekday(), 2);
    EXPECT_EQ(Date::fromIso("2024-12-29")->isoWeekday(), 7);
    EXPECT_EQ(Date::fromIso("1969-12-29")->isoWeekday(), 1);
}

}  // namespace
}  // namespace siftwave
