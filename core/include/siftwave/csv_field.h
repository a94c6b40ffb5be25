#pragma once
// One CSV field as every CSV that Siftwave writes spells it (cleaned data, audit tables, fits,
// scans): RFC 4180 quoting, and text that a spreadsheet would run as a formula neutralised.

#include <string>
#include <string_view>

namespace siftwave {

/// A CSV field per RFC 4180. When `text` is true, a value that starts with =, +, -, @, TAB or
/// CR gets a leading apostrophe, so that a spreadsheet shows it instead of evaluating it
/// (the OWASP "CSV injection" advice); numbers are written with `text` false.
std::string csvField(std::string_view value, bool text);

}  // namespace siftwave
