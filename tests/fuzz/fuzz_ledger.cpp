// libFuzzer target: the ledger reader (JSON Lines, canonical entries, the hash chain, torn
// lines) on arbitrary bytes. It returns a Ledger or an Error, never crashes or throws.
#include "siftwave/ledger/ledger_file.h"

#include <cstddef>
#include <cstdint>
#include <string_view>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view bytes(reinterpret_cast<const char*>(data), size);
    (void)siftwave::ledger::parseLedger(bytes, "fuzz.jsonl");
    return 0;
}
