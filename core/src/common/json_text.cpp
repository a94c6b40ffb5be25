#include "siftwave/json_text.h"

#include <array>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <string_view>

namespace siftwave {
namespace {

using nlohmann::json;

// Text that needs no escaping in JSON and is safe on a terminal: printable ASCII other than
// the quote and the backslash. Keys and most values are such text.
bool plainAscii(std::string_view s) {
    for (const char ch : s) {
        const auto c = static_cast<unsigned char>(ch);
        if (c < 0x20 || c >= 0x7F || c == '"' || c == '\\')
            return false;
    }
    return true;
}

// DEL and the C1 controls (UTF-8 C2 80..C2 9F) in `text` as \u escapes.
std::string escapeTerminalControls(std::string_view text) {
    std::string out;
    out.reserve(text.size() + 16);
    char escape[8];
    for (std::size_t i = 0; i < text.size(); ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        const auto next = i + 1 < text.size() ? static_cast<unsigned char>(text[i + 1]) : 0;
        if (c == 0x7F) {
            out += "\\u007f";
        } else if (c == 0xC2 && next >= 0x80 && next <= 0x9F) {
            std::snprintf(escape, sizeof escape, "\\u%04x", next);
            out += escape;
            ++i;
        } else {
            out += static_cast<char>(c);
        }
    }
    return out;
}

// A JSON string. Plain text is copied as it is; anything else goes through nlohmann's own
// escaping (RFC 8259 escapes, invalid UTF-8 replaced by U+FFFD), then the terminal controls.
void appendString(std::string& out, std::string_view s) {
    if (plainAscii(s)) {
        out += '"';
        out += s;
        out += '"';
        return;
    }
    out += escapeTerminalControls(
        json(std::string(s)).dump(-1, ' ', false, json::error_handler_t::replace));
}

template <typename Integer>
void appendInteger(std::string& out, Integer v) {
    std::array<char, 24> buf{};
    const char* end = std::to_chars(buf.data(), buf.data() + buf.size(), v).ptr;
    out.append(buf.data(), static_cast<std::size_t>(end - buf.data()));
}

// A double as nlohmann writes it (shortest round-trip digits, "1.0" for whole numbers, null
// for NaN and infinities), so that every JSON Siftwave writes spells numbers one way.
void appendDouble(std::string& out, double v) {
    if (!std::isfinite(v)) {
        out += "null";
        return;
    }
    std::array<char, 64> buf{};
    char* end = nlohmann::detail::to_chars(buf.data(), buf.data() + buf.size(), v);
    out.append(buf.data(), static_cast<std::size_t>(end - buf.data()));
}

void indent(std::string& out, unsigned spaces) {
    out.append(spaces, ' ');
}

// The layout of basic_json::dump(2): one member or element per line, "key": value, empty
// containers as {} and [].
void appendValue(std::string& out, const json& value, unsigned current) {
    switch (value.type()) {
        case json::value_t::object: {
            const auto& object = value.get_ref<const json::object_t&>();
            if (object.empty()) {
                out += "{}";
                return;
            }
            out += "{\n";
            bool first = true;
            for (const auto& [key, member] : object) {
                if (!first)
                    out += ",\n";
                first = false;
                indent(out, current + 2);
                appendString(out, key);
                out += ": ";
                appendValue(out, member, current + 2);
            }
            out += '\n';
            indent(out, current);
            out += '}';
            return;
        }
        case json::value_t::array: {
            const auto& array = value.get_ref<const json::array_t&>();
            if (array.empty()) {
                out += "[]";
                return;
            }
            out += "[\n";
            for (std::size_t i = 0; i < array.size(); ++i) {
                if (i > 0)
                    out += ",\n";
                indent(out, current + 2);
                appendValue(out, array[i], current + 2);
            }
            out += '\n';
            indent(out, current);
            out += ']';
            return;
        }
        case json::value_t::string:
            appendString(out, value.get_ref<const json::string_t&>());
            return;
        case json::value_t::boolean:
            out += value.get<bool>() ? "true" : "false";
            return;
        case json::value_t::number_integer:
            appendInteger(out, value.get<json::number_integer_t>());
            return;
        case json::value_t::number_unsigned:
            appendInteger(out, value.get<json::number_unsigned_t>());
            return;
        case json::value_t::number_float:
            appendDouble(out, value.get<json::number_float_t>());
            return;
        case json::value_t::null:
            out += "null";
            return;
        case json::value_t::binary:
        case json::value_t::discarded:
            // Never built by Siftwave; nlohmann's own writer keeps them exact.
            out +=
                escapeTerminalControls(value.dump(-1, ' ', false, json::error_handler_t::replace));
            return;
    }
}

}  // namespace

void appendJsonText(std::string& out, const nlohmann::json& value, int depth) {
    // A writer of our own rather than basic_json::dump: dump escapes every key byte by byte
    // through a virtual call and builds a new string each time; this copies plain text as it
    // is, appends to one buffer, and places a nested value's lines where they belong. The
    // output is byte for byte what dump(2) then the terminal escaping gave (json_text_test).
    appendValue(out, value, static_cast<unsigned>(2 * (depth > 0 ? depth : 0)));
}

std::string jsonText(const nlohmann::json& value, int depth) {
    std::string out;
    appendJsonText(out, value, depth);
    return out;
}

}  // namespace siftwave
