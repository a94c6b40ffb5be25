#pragma once
// A small command-line parser for siftwave-cli subcommands.
//
// Each subcommand declares the flags it accepts; anything else is a usage
// error (exit code 2). Flags are "--name value" or "--name=value"; switches
// take no value; repeatable flags collect every occurrence in order.

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace siftwave::cli {

struct FlagSpec {
    std::string name;        // without the leading "--"
    bool takesValue = true;  // false: a switch
    bool repeatable = false;
    std::string valueName;  // for help text, e.g. "FILE"
    std::string help;       // one line
};

class ParsedArgs {
public:
    std::vector<std::string> positional;

    bool has(const std::string& name) const { return m_values.count(name) > 0; }
    /// Last value of a flag, or `fallback` when absent.
    std::string value(const std::string& name, const std::string& fallback = {}) const;
    std::optional<std::string> optionalValue(const std::string& name) const;
    /// Every value of a repeatable flag, in order.
    std::vector<std::string> values(const std::string& name) const;

    void add(const std::string& name, std::string value) {
        m_values[name].push_back(std::move(value));
    }

private:
    std::map<std::string, std::vector<std::string>> m_values;
};

/// Parses argv[first..argc). On a usage error returns nullopt and sets `error`.
std::optional<ParsedArgs> parseArgs(int argc, char** argv, int first,
                                    const std::vector<FlagSpec>& specs, std::string& error);

/// Lines "  --name VALUE   help" for a usage message.
std::string formatFlags(const std::vector<FlagSpec>& specs);

/// Process exit codes shared by every subcommand (see README, "Command line").
enum ExitCode : int { kExitOk = 0, kExitBadInput = 1, kExitUsage = 2 };

}  // namespace siftwave::cli
