#pragma once
// A small deterministic random source for tests that generate their own input:
// Marsaglia's xorshift64 with shifts 13, 7, 17 (G. Marsaglia, "Xorshift RNGs",
// Journal of Statistical Software 8(14), 2003). A fixed seed gives the same
// input on every run and every machine.

#include <cstdint>

namespace siftwave::testing {

class Xorshift64 {
public:
    explicit Xorshift64(std::uint64_t seed) : m_state(seed) {}

    std::uint64_t next() {
        m_state ^= m_state << 13;
        m_state ^= m_state >> 7;
        m_state ^= m_state << 17;
        return m_state;
    }
    /// A number in [0, bound), bound > 0 (the slight unevenness of a modulo does not matter here).
    std::uint64_t below(std::uint64_t bound) { return next() % bound; }

private:
    std::uint64_t m_state;  // never 0
};

}  // namespace siftwave::testing
