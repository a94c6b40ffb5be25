#pragma once
// Mutating access to Cleaned, for replay only.

#include "siftwave/ledger/cleaned.h"

namespace siftwave::ledger {

struct Cleaned::Access {
    static std::size_t cellIndex(const Cleaned& c, std::size_t measure, std::size_t region,
                                 std::int32_t day) {
        return c.index(measure, region, day);
    }
    static CleanedCell& cell(Cleaned& c, std::size_t measure, std::size_t region,
                             std::int32_t day) {
        return c.m_cells[c.index(measure, region, day)];
    }
    static std::int64_t& total(Cleaned& c, std::size_t measure, std::size_t region) {
        return c.m_totals[measure * c.m_regions + region];
    }
    static std::vector<std::uint64_t>& touches(Cleaned& c, std::size_t cellIndex) {
        return c.m_touches[cellIndex];
    }
    /// Entries in effect on a cell, oldest first (withdrawals are never on it).
    static std::vector<std::uint64_t>& writers(Cleaned& c, std::size_t cellIndex) {
        return c.m_writers[cellIndex];
    }
    static const std::vector<std::uint64_t>* writersIfAny(const Cleaned& c, std::size_t cellIndex) {
        auto it = c.m_writers.find(cellIndex);
        return it == c.m_writers.end() ? nullptr : &it->second;
    }
    static void pushEntry(Cleaned& c, DecisionKind kind, std::uint64_t target, Effect effect) {
        c.m_inEffect.push_back(true);
        c.m_applied.push_back(Applied{kind, target, std::move(effect)});
        ++c.m_entryCount;
    }
    static DecisionKind kindOf(const Cleaned& c, std::uint64_t sequence) {
        return c.m_applied[sequence - 1].kind;
    }
    static std::uint64_t targetOf(const Cleaned& c, std::uint64_t sequence) {
        return c.m_applied[sequence - 1].target;
    }
    static const Effect& effectOf(const Cleaned& c, std::uint64_t sequence) {
        return c.m_applied[sequence - 1].effect;
    }
    static void setInEffect(Cleaned& c, std::uint64_t sequence, bool value) {
        c.m_inEffect[sequence - 1] = value;
    }
};

}  // namespace siftwave::ledger
