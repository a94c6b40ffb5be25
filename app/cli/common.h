#pragma once
// Pieces every siftwave-cli subcommand shares: the ingest flags, loading a drop
// with them, and printing errors and JSON the same way everywhere.

#include "args.h"

#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"

#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::cli {

/// --date-col, --region-col, --value-col (repeatable), --measure-col, --layout,
/// --date-format, --delimiter, --header/--no-header, --missing (repeatable).
std::vector<FlagSpec> ingestFlagSpecs();

/// The IngestOptions the flags ask for; a usage error when a value is wrong.
Result<ingest::IngestOptions> ingestOptionsFrom(const ParsedArgs& args);

/// Reads FILE with the ingest flags in `args`.
Result<Drop> loadDrop(const std::string& path, const ParsedArgs& args);

/// --regions REG and --no-regions, for the commands that read a region register; `use` says
/// what the register is for. Without either flag the register beside FILE is read, when there
/// is one (siftwave::ingest::registerBeside: <name>_regions.csv, regions.csv, or the one
/// *regions*.csv or *register*.csv in FILE's folder), as the workbench does.
std::vector<FlagSpec> registerFlagSpecs(const std::string& use);

/// The register those flags ask for: --regions, none with --no-regions, else the one beside
/// `dropPath`; nullopt when there is none.
Result<std::optional<RegionRegister>> loadRegister(const ParsedArgs& args,
                                                   const std::string& dropPath);

/// Prints an error: "siftwave-cli: file:line:column: message" on stderr, or
/// {"error": {"code", "message", "file", "line", "column"}} on stdout with --json.
void printError(const Error& error, bool json);

/// Text from a data file made safe to print on a terminal: C0 control characters (ESC among
/// them), DEL and the C1 controls U+0080..U+009F become visible escapes (\x1b, \u0085), so a
/// region code cannot move the cursor, recolour or retitle the terminal (ECMA-48 control
/// functions start with ESC or a C1 character). Everything else, UTF-8 included, is kept.
std::string terminalText(std::string_view text);

/// Prints JSON (indented 2) and a newline on stdout.
void printJson(const nlohmann::json& value);
/// `value` as printJson writes it, placed inside a document at nesting `depth` (each line after
/// the first indented by 2 x depth more), with no newline after it: for documents written a
/// piece at a time, so that a long list never has to be held whole (scan --json).
void printJsonAt(const nlohmann::json& value, int depth);

/// Converts an Error to its JSON object.
nlohmann::json errorToJson(const Error& error);

/// Prints a usage error (and, without --json, the usage synopsis on stderr); returns kExitUsage.
int usageError(const std::string& message, bool json, const std::string& usage);

/// Runs a subcommand (argv[2] is its first argument) and returns its exit code. The core reports
/// bad data as values; what still throws (memory exhausted, a library's own exception) becomes
/// a message and exit 1, never an abort.
int runGuarded(const char* name, int (*run)(int, char**, int), int argc, char** argv);

/// What a subcommand's arguments came to: the parsed flags, or the exit code to return at once.
struct CommandLine {
    std::optional<ParsedArgs> args;  // empty: return `exitCode`
    int exitCode = kExitOk;
    bool json = false;  // --json was given (errors are then printed as JSON)
};

/// The first step every subcommand shares: "--help" or "-h" anywhere prints `usage` on stdout
/// (exit 0); a flag the command does not take, or a missing value, is a usage error (exit 2)
/// printed as JSON when --json is among the arguments, else with the synopsis on stderr.
CommandLine parseCommandLine(int argc, char** argv, int first, const std::vector<FlagSpec>& specs,
                             const std::string& usage);

/// parseCommandLine() for a command that reads exactly one FILE (inspect, scan): a usage
/// error "<command> needs a FILE to read" / "<command> reads one FILE at a time" otherwise.
CommandLine parseOneFileCommandLine(int argc, char** argv, int first,
                                    const std::vector<FlagSpec>& specs, const std::string& usage,
                                    const std::string& command);

}  // namespace siftwave::cli
