#include "ledger_support.h"

#include "common.h"

#include "siftwave/ledger/ledger_file.h"

#include <cstdio>
#include <filesystem>

namespace siftwave::cli {

std::vector<FlagSpec> withJsonHelpAndIngestFlags(std::vector<FlagSpec> own, const char* jsonHelp) {
    own.push_back({"json", false, false, "", jsonHelp});
    own.push_back({"help", false, false, "", "show this help"});
    for (FlagSpec& s : ingestFlagSpecs())
        own.push_back(std::move(s));
    return own;
}

CommandLine parseWithPositionals(int argc, char** argv, int first,
                                 const std::vector<FlagSpec>& specs, const std::string& usage,
                                 std::size_t positionals, const char* missing) {
    CommandLine line = parseCommandLine(argc, argv, first, specs, usage);
    if (line.args && line.args->positional.size() != positionals) {
        line.exitCode = usageError(missing, line.json, usage);
        line.args.reset();
    }
    return line;
}

bool ingestFlagsValid(const ParsedArgs& args, bool json) {
    return valueOrPrintError(ingestOptionsFrom(args), json).has_value();
}

Result<ledger::Ledger> openLedger(const std::string& path, bool allowMissing) {
    Result<ledger::Ledger> ledger = ledger::readLedgerFile(path);
    if (!ledger && allowMissing && ledger.error().code == ErrorCode::NotFound)
        return ledger::Ledger{};
    return ledger;
}

Result<ledger::Cleaned> replayLedger(const Drop& drop, const ledger::Ledger& ledger,
                                     const std::string& ledgerPath) {
    Result<ledger::Cleaned> cleaned = ledger::replay(drop, ledger);
    if (!cleaned) {
        Error e = cleaned.error();
        if (e.file.empty())
            e.file = ledgerPath;
        return e;
    }
    return cleaned;
}

std::optional<ReplayedLedger> openAndReplay(const Drop& drop, const std::string& ledgerPath,
                                            bool allowMissing, bool json) {
    std::optional<ledger::Ledger> ledger =
        valueOrPrintError(openLedger(ledgerPath, allowMissing), json);
    if (!ledger)
        return std::nullopt;
    std::optional<ledger::Cleaned> cleaned =
        valueOrPrintError(replayLedger(drop, *ledger, ledgerPath), json);
    if (!cleaned)
        return std::nullopt;
    return ReplayedLedger{std::move(*ledger), std::move(*cleaned)};
}

nlohmann::json entryToJsonObject(const ledger::LedgerEntry& entry) {
    Result<std::string> line = ledger::entryLine(entry);
    if (!line)
        return nlohmann::json::object();
    return nlohmann::json::parse(*line);
}

bool samePath(const std::string& a, const std::string& b) {
    namespace fs = std::filesystem;
    std::error_code ec;
    if (fs::exists(a, ec) && fs::exists(b, ec))
        return fs::equivalent(a, b, ec);
    return fs::weakly_canonical(a, ec) == fs::weakly_canonical(b, ec);
}

}  // namespace siftwave::cli
