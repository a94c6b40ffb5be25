// libFuzzer target: the project file reader (JSON: paths, hashes, the ledger's pinned head, view
// and fit settings, extra settings kept verbatim) on arbitrary bytes, and validate() on what it
// accepts. It returns a ProjectFile or an Error, never crashes or throws.
#include "siftwave/ledger/project.h"

#include <cstddef>
#include <cstdint>
#include <string_view>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view bytes(reinterpret_cast<const char*>(data), size);
    auto project = siftwave::ledger::parseProjectFile(bytes, "fuzz.siftwave");
    if (project)
        (void)project->validate();
    return 0;
}
