// Error::describe(): the one line every front end prints for a core error.
#include "siftwave/result.h"

#include <gtest/gtest.h>

namespace siftwave {
namespace {

TEST(ErrorDescribe, GivesFileLineColumnThenTheMessageThenThePlace) {
    Error e = makeError(ErrorCode::InvalidValue, "the day is excluded");
    e.file = "release.csv";
    e.line = 12;
    e.column = 3;
    e.region = "0412";
    e.date = "2026-03-04";
    EXPECT_EQ(e.describe(), "release.csv:12:3: the day is excluded (region 0412, 2026-03-04)");
}

TEST(ErrorDescribe, DoesNotNameTheRegionTwiceWhenTheMessageAlreadyDoes) {
    Error e = makeError(ErrorCode::NotFound, "region '9999' is not in the drop");
    e.region = "9999";
    EXPECT_EQ(e.describe(), "region '9999' is not in the drop");
    e.date = "2026-03-04";
    EXPECT_EQ(e.describe(), "region '9999' is not in the drop (2026-03-04)");
    // Another region's name in the message is not this one.
    e.region = "999";
    EXPECT_EQ(e.describe(), "region '9999' is not in the drop (region 999, 2026-03-04)");
}

}  // namespace
}  // namespace siftwave
