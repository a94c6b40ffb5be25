#include "siftwave/csv_field.h"

namespace siftwave {

std::string csvField(std::string_view value, bool text) {
    std::string v(value);
    if (text && !v.empty() &&
        (v[0] == '=' || v[0] == '+' || v[0] == '-' || v[0] == '@' || v[0] == '\t' ||
         v[0] == '\r')) {
        v.insert(v.begin(), '\'');
    }
    if (v.find_first_of(",\"\r\n") == std::string::npos)
        return v;
    std::string out = "\"";
    for (char c : v) {
        if (c == '"')
            out += '"';
        out += c;
    }
    out += '"';
    return out;
}

}  // namespace siftwave
