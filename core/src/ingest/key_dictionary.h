#pragma once
// Text keys (region codes, date texts, measure names) -> dense indices in
// first-seen order, compared byte for byte (never trimmed or case-folded).
//
// Rows of a drop repeat their keys in a regular order (all regions for one
// date, or all dates for one region), so a lookup first tries the key seen
// last and the one after it before it hashes; the hash map takes string_view
// directly (transparent lookup), so no lookup allocates.

#include <cstdint>
#include <cstring>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace siftwave::ingest::detail {

struct TransparentStringHash {
    using is_transparent = void;
    std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
};

/// Byte equality, inlined: keys are short, and a library call per row costs more than the
/// compare. Keys of 4 to 16 bytes are compared as two overlapping words each (no loop, so no
/// branch that depends on where the first difference is).
[[gnu::always_inline]] inline bool sameBytes(const std::string& a, std::string_view b) {
    const std::size_t n = a.size();
    if (n != b.size())
        return false;
    const char* x = a.data();
    const char* y = b.data();
    if (n >= 8 && n <= 16) {
        std::uint64_t x0, x1, y0, y1;
        std::memcpy(&x0, x, 8);
        std::memcpy(&y0, y, 8);
        std::memcpy(&x1, x + n - 8, 8);
        std::memcpy(&y1, y + n - 8, 8);
        return ((x0 ^ y0) | (x1 ^ y1)) == 0;
    }
    if (n >= 4 && n < 8) {
        std::uint32_t x0, x1, y0, y1;
        std::memcpy(&x0, x, 4);
        std::memcpy(&y0, y, 4);
        std::memcpy(&x1, x + n - 4, 4);
        std::memcpy(&y1, y + n - 4, 4);
        return ((x0 ^ y0) | (x1 ^ y1)) == 0;
    }
    for (std::size_t i = 0; i < n; ++i) {
        if (x[i] != y[i])
            return false;
    }
    return true;
}

class KeyDictionary {
public:
    static constexpr std::uint32_t kNone = UINT32_MAX;

    /// Index of `key`, or kNone. Tries the key found last and the one after it
    /// first, inline; the rest out of line.
    [[gnu::always_inline]] std::uint32_t find(std::string_view key) {
        const std::size_t n = m_keys.size();
        if (m_last < n && sameBytes(m_keys[m_last], key))
            return m_last;
        if (m_last + 1 < n && sameBytes(m_keys[m_last + 1], key))
            return ++m_last;
        return findElsewhere(key);
    }

    /// Index of `key`, adding it at the end when new (`added` tells which).
    std::uint32_t intern(std::string_view key, bool& added) {
        std::uint32_t i = find(key);
        added = i == kNone;
        if (added) {
            i = static_cast<std::uint32_t>(m_keys.size());
            m_keys.emplace_back(key);
            m_index.emplace(m_keys.back(), i);
            m_last = i;
        }
        return i;
    }

    std::size_t size() const { return m_keys.size(); }
    const std::string& key(std::uint32_t i) const { return m_keys[i]; }
    const std::vector<std::string>& keys() const { return m_keys; }
    std::vector<std::string> takeKeys() { return std::move(m_keys); }

private:
    [[gnu::noinline]] std::uint32_t findElsewhere(std::string_view key) {
        if (!m_keys.empty() && sameBytes(m_keys[0], key))
            return m_last = 0;
        auto it = m_index.find(key);
        if (it == m_index.end())
            return kNone;
        return m_last = it->second;
    }

    std::vector<std::string> m_keys;
    std::unordered_map<std::string, std::uint32_t, TransparentStringHash, std::equal_to<>> m_index;
    std::uint32_t m_last = 0;
};

}  // namespace siftwave::ingest::detail
