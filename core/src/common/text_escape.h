#pragma once
// Escaping of text for the HTML the ledger report and the briefing report write.

#include <string>
#include <string_view>

namespace siftwave::detail {

/// Text safe inside HTML elements and double- or single-quoted attributes.
inline std::string htmlEscaped(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char c : text) {
        switch (c) {
            case '&':
                out += "&amp;";
                break;
            case '<':
                out += "&lt;";
                break;
            case '>':
                out += "&gt;";
                break;
            case '"':
                out += "&quot;";
                break;
            case '\'':
                out += "&#39;";
                break;
            default:
                out += c;
        }
    }
    return out;
}

}  // namespace siftwave::detail
