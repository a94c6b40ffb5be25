#pragma once
// Text rules for region codes, shared by code_collision, code_variant and unknown_code.

#include <optional>
#include <string>
#include <string_view>

namespace siftwave::scan::detail {

/// The folded form two variants of one code share: surrounding whitespace
/// removed, ASCII upper case, leading zeros removed (a code of only zeros keeps one).
std::string foldCode(std::string_view code);

struct CodeCollision {
    std::string reason;  // "missing_token", "boolean", "whitespace", "leading_zero",
                         // "scientific", "long_number", "date_like"
    std::string readAs;  // what a spreadsheet or a data-frame reader is likely to make of it
};

/// How other tools are likely to misread the code, or nullopt when they read it as text.
std::optional<CodeCollision> codeCollision(std::string_view code);

}  // namespace siftwave::scan::detail
