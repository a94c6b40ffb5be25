#pragma once
// The region register: the list of known regions (code, name, parent, population).
// Codes are text, kept verbatim like a Drop's codes.

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace siftwave {

struct RegionEntry {
    std::string code;
    std::string name;
    std::string parent;  // empty for a top-level region
    std::optional<std::int64_t> population;
    std::uint32_t line = 0;  // line in the register file
};

struct RegionRegister {
    std::string path;
    std::vector<RegionEntry> entries;  // file order

    const RegionEntry* find(std::string_view code) const;
    bool hasHierarchy() const;
    /// Codes whose parent is `code`, in file order.
    std::vector<std::string> childrenOf(std::string_view code) const;
    /// Rebuilds the lookup; call after filling entries.
    void index();

private:
    std::unordered_map<std::string, std::size_t> m_lookup;
};

}  // namespace siftwave
