#include "ledger_support.h"

#include "common.h"

#include "siftwave/ledger/ledger_file.h"

#include <cstdio>
#include <filesystem>

namespace siftwave::cli {

Result<Ledger> openLedger(const std::string& path, bool allowMissing) {
    Result<Ledger> ledger = readLedgerFile(path);
    if (!ledger && allowMissing && ledger.error().code == ErrorCode::NotFound)
        return Ledger{};
    return ledger;
}

Result<Cleaned> replayLedger(const Drop& drop, const Ledger& ledger,
                             const std::string& ledgerPath) {
    Result<Cleaned> cleaned = replay(drop, ledger);
    if (!cleaned) {
        Error e = cleaned.error();
        if (e.file.empty())
            e.file = ledgerPath;
        return e;
    }
    return cleaned;
}

nlohmann::json entryToJsonObject(const LedgerEntry& entry) {
    Result<std::string> line = entryLine(entry);
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
