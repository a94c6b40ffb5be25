#pragma once
// JSON forms of entries (internal; the public surface is entry.h).

#include "siftwave/ledger/entry.h"

#include <nlohmann/json.hpp>

namespace siftwave::ledger::detail {

nlohmann::json decisionParameters(const Decision& decision);
enum class EntryPart { Signed, Hashed, Whole };  // without hash and signature; without hash; all
nlohmann::json entryToJson(const LedgerEntry& entry, EntryPart part);
Result<LedgerEntry> entryFromJson(const nlohmann::json& j, std::uint64_t lineNumber);
/// Sorted keys, no whitespace, strict UTF-8 (Encoding error otherwise).
Result<std::string> canonicalDump(const nlohmann::json& j);

}  // namespace siftwave::ledger::detail
