#include "args.h"

#include <algorithm>

namespace siftwave::cli {

std::string ParsedArgs::value(const std::string& name, const std::string& fallback) const {
    auto it = m_values.find(name);
    return it == m_values.end() || it->second.empty() ? fallback : it->second.back();
}

std::optional<std::string> ParsedArgs::optionalValue(const std::string& name) const {
    auto it = m_values.find(name);
    if (it == m_values.end() || it->second.empty())
        return std::nullopt;
    return it->second.back();
}

std::vector<std::string> ParsedArgs::values(const std::string& name) const {
    auto it = m_values.find(name);
    return it == m_values.end() ? std::vector<std::string>{} : it->second;
}

std::optional<ParsedArgs> parseArgs(int argc, char** argv, int first,
                                    const std::vector<FlagSpec>& specs, std::string& error) {
    ParsedArgs out;
    bool onlyPositional = false;
    for (int i = first; i < argc; ++i) {
        std::string arg = argv[i];
        if (onlyPositional || arg.size() < 3 || arg.rfind("--", 0) != 0) {
            if (arg == "--") {
                onlyPositional = true;
                continue;
            }
            if (!onlyPositional && arg.size() > 1 && arg[0] == '-' && arg != "-") {
                error = "unknown option '" + arg + "'";
                return std::nullopt;
            }
            out.positional.push_back(arg);
            continue;
        }
        std::string name = arg.substr(2);
        std::optional<std::string> inlineValue;
        if (auto eq = name.find('='); eq != std::string::npos) {
            inlineValue = name.substr(eq + 1);
            name = name.substr(0, eq);
        }
        auto spec = std::find_if(specs.begin(), specs.end(),
                                 [&](const FlagSpec& s) { return s.name == name; });
        if (spec == specs.end()) {
            error = "unknown option '--" + name + "'";
            return std::nullopt;
        }
        if (!spec->takesValue) {
            if (inlineValue) {
                error = "option '--" + name + "' takes no value";
                return std::nullopt;
            }
            out.add(name, "1");
            continue;
        }
        std::string value;
        if (inlineValue) {
            value = *inlineValue;
        } else if (i + 1 < argc) {
            value = argv[++i];
        } else {
            error = "option '--" + name + "' needs a value" +
                    (spec->valueName.empty() ? std::string() : " (" + spec->valueName + ")");
            return std::nullopt;
        }
        if (!spec->repeatable && out.has(name)) {
            error = "option '--" + name + "' given twice";
            return std::nullopt;
        }
        out.add(name, std::move(value));
    }
    return out;
}

std::string formatFlags(const std::vector<FlagSpec>& specs) {
    std::string out;
    for (const FlagSpec& s : specs) {
        std::string left = "  --" + s.name;
        if (s.takesValue)
            left += ' ' + (s.valueName.empty() ? std::string("VALUE") : s.valueName);
        if (left.size() < 28)
            left.resize(28, ' ');
        else
            left += "  ";
        out += left + s.help + (s.repeatable ? " (repeatable)" : "") + '\n';
    }
    return out;
}

}  // namespace siftwave::cli
