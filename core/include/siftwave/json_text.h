#pragma once
// JSON text as every JSON that Siftwave writes spells it (CLI output, fit batches, scans):
// indented by two spaces, invalid UTF-8 replaced by U+FFFD, and DEL and the C1 controls
// escaped so that the text is safe to show on a terminal.

#include <nlohmann/json.hpp>

#include <string>

namespace siftwave {

/// `value` as indented JSON text. `depth` is the nesting level the text will be printed at:
/// every line after the first is indented by 2 × depth more spaces, so a value printed as an
/// element of an enclosing array or object (depth 1) lines up with one printed whole.
///
/// JSON escapes the C0 controls (RFC 8259, section 7) but allows DEL and the C1 controls raw,
/// and a terminal may act on them (U+009B is a control sequence introducer). Outside strings
/// JSON text is ASCII, so those bytes only occur inside strings, where \u escapes mean the same.
std::string jsonText(const nlohmann::json& value, int depth = 0);

/// Appends jsonText(value, depth) to `out`: the batch writers reuse one buffer.
void appendJsonText(std::string& out, const nlohmann::json& value, int depth = 0);

}  // namespace siftwave
