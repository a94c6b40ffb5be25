#pragma once
// Pieces every siftwave-cli subcommand shares: the ingest flags, loading a drop
// with them, and printing errors and JSON the same way everywhere.

#include "args.h"

#include "siftwave/drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/result.h"

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

namespace siftwave::cli {

/// --date-col, --region-col, --value-col (repeatable), --measure-col, --layout,
/// --date-format, --delimiter, --header/--no-header, --missing (repeatable).
std::vector<FlagSpec> ingestFlagSpecs();

/// The IngestOptions the flags ask for; a usage error when a value is wrong.
Result<IngestOptions> ingestOptionsFrom(const ParsedArgs& args);

/// Reads FILE with the ingest flags in `args`.
Result<Drop> loadDrop(const std::string& path, const ParsedArgs& args);

/// Prints an error: "siftwave-cli: file:line:column: message" on stderr, or
/// {"error": {"code", "message", "file", "line", "column"}} on stdout with --json.
void printError(const Error& error, bool json);

/// Prints JSON (indented 2) and a newline on stdout.
void printJson(const nlohmann::json& value);

/// Converts an Error to its JSON object.
nlohmann::json errorToJson(const Error& error);

}  // namespace siftwave::cli
