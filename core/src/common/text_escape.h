#pragma once
// Escaping of text for the HTML and Markdown the ledger report and the briefing report write.

#include <string>
#include <string_view>

namespace siftwave::detail {

/// The entity reference of a character HTML gives a meaning (& < > " '), or nullptr. Markdown
/// uses the same references, since CommonMark passes raw HTML through.
inline const char* htmlEntityOf(char c) {
    switch (c) {
        case '&':
            return "&amp;";
        case '<':
            return "&lt;";
        case '>':
            return "&gt;";
        case '"':
            return "&quot;";
        case '\'':
            return "&#39;";
        default:
            return nullptr;
    }
}

/// Text safe inside HTML elements and double- or single-quoted attributes.
inline std::string htmlEscaped(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char c : text) {
        if (const char* entity = htmlEntityOf(c))
            out += entity;
        else
            out += c;
    }
    return out;
}

/// Text safe in Markdown (CommonMark 0.30): `<`, `>` and `&` become entity references, so a
/// renderer never sees raw HTML (section 6.6); every other ASCII punctuation character that can
/// open markup is backslash-escaped (section 2.4: links, images, emphasis, code, tables);
/// line breaks become spaces (a cell or a list item stays one line); other control characters
/// become U+FFFD.
inline std::string markdownEscaped(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char c : text) {
        if (c == '&' || c == '<' || c == '>') {
            out += htmlEntityOf(c);
            continue;
        }
        switch (c) {
            case '\\':
            case '`':
            case '*':
            case '_':
            case '[':
            case ']':
            case '(':
            case ')':
            case '#':
            case '!':
            case '|':
            case '~':
                out += '\\';
                out += c;
                break;
            case '\n':
            case '\r':
            case '\t':
                out += ' ';
                break;
            default:
                if (static_cast<unsigned char>(c) < 0x20 || c == 0x7F)
                    out += "\xEF\xBF\xBD";  // U+FFFD
                else
                    out += c;
        }
    }
    return out;
}

}  // namespace siftwave::detail
