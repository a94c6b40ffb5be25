// jsonText (json_text.h) against nlohmann's own writer, basic_json::dump(2) (the reference:
// nlohmann/json 3.11, the general-purpose JSON library Debian packages), followed by the
// terminal escaping of DEL and the C1 controls that the CLI applied to it before jsonText
// existed. The two must agree byte for byte on every kind of value.
#include "siftwave/json_text.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>
#include <random>
#include <string>

namespace {

using nlohmann::json;

// The reference: what the CLI printed before (dump(2), invalid UTF-8 replaced, then DEL and
// U+0080..U+009F as \u escapes), with each line after the first indented by 2 × depth.
std::string reference(const json& value, int depth) {
    const std::string text = value.dump(2, ' ', false, json::error_handler_t::replace);
    std::string safe;
    char escape[8];
    for (std::size_t i = 0; i < text.size(); ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        const auto next = i + 1 < text.size() ? static_cast<unsigned char>(text[i + 1]) : 0;
        if (c == 0x7F) {
            safe += "\\u007f";
        } else if (c == 0xC2 && next >= 0x80 && next <= 0x9F) {
            std::snprintf(escape, sizeof escape, "\\u%04x", next);
            safe += escape;
            ++i;
        } else {
            safe += static_cast<char>(c);
        }
    }
    std::string out;
    for (const char c : safe) {
        out += c;
        if (c == '\n')
            out.append(static_cast<std::size_t>(2 * depth), ' ');
    }
    return out;
}

TEST(JsonText, MatchesDumpOnEveryKindOfValue) {
    json j;
    j["plain"] = "Region 12 (north)";
    j["quote and backslash"] = "a \"b\" \\ c";
    j["controls"] = std::string("tab\there\nline\x01\x1f");
    j["nul inside"] = std::string("nul\0inside", 10);
    j["del and c1"] = std::string("del\x7f csi\xc2\x9b end");
    j["utf8"] = "Saint-Étienne – Łódź";
    j["invalid utf8"] = std::string("bad\xff\xfe byte");
    j["empty object"] = json::object();
    j["empty array"] = json::array();
    j["null"] = nullptr;
    j["bools"] = {true, false};
    j["integers"] = {0, -1, 42, std::numeric_limits<std::int64_t>::min(),
                     std::numeric_limits<std::uint64_t>::max()};
    j["doubles"] = {0.0,
                    -0.0,
                    1.0,
                    100000.0,
                    1e15,
                    1e16,
                    1e-4,
                    1e-5,
                    0.1,
                    1.0 / 3,
                    -2.5e-7,
                    6.02e23,
                    5e-324,
                    1e308,
                    123456789012345.6,
                    1e21,
                    -1e22,
                    std::nan(""),
                    std::numeric_limits<double>::infinity()};
    j["nested"] = {{"a", {{"b", json::array({json::object(), json::array({1, 2})})}}}};
    j["key with \"quote\""] = 1;
    for (int depth : {0, 1, 3})
        EXPECT_EQ(siftwave::jsonText(j, depth), reference(j, depth)) << "depth " << depth;
    for (const json& scalar : {json(1.5), json("x"), json(nullptr), json::array(), json::object()})
        EXPECT_EQ(siftwave::jsonText(scalar, 2), reference(scalar, 2));
}

// Many random doubles across the whole range: the digits and the fixed/exponent choice are
// nlohmann's (its Grisu2 and format rules), not another shortest-digits routine.
TEST(JsonText, WritesRandomDoublesAsDumpDoes) {
    std::mt19937_64 random(20261205);
    std::uniform_int_distribution<std::uint64_t> bits;
    json values = json::array();
    for (int i = 0; i < 20000; ++i) {
        double v;
        const std::uint64_t b = bits(random);
        std::memcpy(&v, &b, sizeof v);
        values.push_back(v);
        values.push_back(std::ldexp(static_cast<double>(b >> 11), -40));  // everyday magnitudes
    }
    EXPECT_EQ(siftwave::jsonText(values), reference(values, 0));
}

TEST(JsonText, AppendsToWhatIsThere) {
    std::string out = "  ";
    siftwave::appendJsonText(out, json{{"k", {1, 2}}}, 1);
    EXPECT_EQ(out, "  {\n    \"k\": [\n      1,\n      2\n    ]\n  }");
}

}  // namespace
