#pragma once
// Warnings of one read, kept readable on large files: each kind of note is
// listed cell by cell up to a limit, then summed up in one closing line.

#include "siftwave/drop.h"

#include <cstdint>
#include <map>
#include <string>
#include <vector>

namespace siftwave::ingest::detail {

class WarningLog {
public:
    static constexpr std::size_t kPerKindLimit = 50;

    /// A warning about one place; listed until `kind` has had kPerKindLimit of them.
    void add(const std::string& kind, std::string message, std::uint64_t line = 0,
             std::uint64_t column = 0);
    /// A warning counted only: one summary line per kind ("N cells ...; first at line L, column
    /// C").
    void count(const std::string& kind, std::uint64_t line, std::uint64_t column,
               std::string example = {});
    /// Appends everything to `out`; `summary(kind, n, example)` phrases counted kinds; places
    /// in the texts are named as `source` names them (sourcePlace()).
    void moveTo(std::vector<Warning>& out, const Provenance& source,
                const std::map<std::string, std::string>& countedPhrases);

private:
    struct Tally {
        std::size_t total = 0;
        std::uint64_t line = 0;
        std::uint64_t column = 0;
        std::string example;
    };
    std::vector<Warning> m_listed;
    std::map<std::string, std::size_t> m_listedPerKind;
    std::map<std::string, Tally> m_overflow;  // listed kinds beyond the limit
    std::vector<std::string> m_countedOrder;
    std::map<std::string, Tally> m_counted;
};

}  // namespace siftwave::ingest::detail
