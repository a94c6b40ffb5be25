// The one Markdown escape (core/src/common/text_escape.h) against the CommonMark 0.30 spec:
// raw HTML (section 6.6) and inline links and images (sections 6.3, 6.4) need their
// punctuation; entity references (section 2.5) and backslash escapes (section 2.4) take it away.
#include "common/text_escape.h"

#include <gtest/gtest.h>

namespace siftwave::detail {
namespace {

TEST(MarkdownEscape, HostileTextKeepsNoMarkupOfItsOwn) {
    EXPECT_EQ(markdownEscaped("<script>alert(1)</script>"),
              "&lt;script&gt;alert\\(1\\)&lt;/script&gt;");
    EXPECT_EQ(markdownEscaped("[x](javascript:alert(1))"), "\\[x\\]\\(javascript:alert\\(1\\)\\)");
    EXPECT_EQ(markdownEscaped("![i](x) `c` *e* _u_ # h | p ~s~"),
              "\\!\\[i\\]\\(x\\) \\`c\\` \\*e\\* \\_u\\_ \\# h \\| p \\~s\\~");
    EXPECT_EQ(markdownEscaped("a & b\nc\r\td"), "a &amp; b c  d");
    EXPECT_EQ(markdownEscaped(std::string("bell\x07") + "\x1b[31m"),
              "bell\xEF\xBF\xBD\xEF\xBF\xBD\\[31m");
    EXPECT_EQ(markdownEscaped("Kelvarra 1301, 2026-03-01: 12 cases."),
              "Kelvarra 1301, 2026-03-01: 12 cases.");
}

}  // namespace
}  // namespace siftwave::detail
