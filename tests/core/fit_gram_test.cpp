// The small Gram sums of the solver (core/src/fit/gram.h) against a plain double loop:
// every specialised path (three columns with a right-hand side in SSE2 lanes, three and four
// columns at compile time, weighted sums) must give the same sums to the bit, since each adds
// the same products in the same row order.
#include "fit/gram.h"
#include "support/xorshift.h"

#include <gtest/gtest.h>

#include <cstddef>
#include <vector>

namespace siftwave::fit::detail {
namespace {

// Values of mixed sign and size, so that a changed order of additions would show in the bits.
std::vector<double> mixedValues(std::size_t count, std::uint64_t seed) {
    siftwave::testing::Xorshift64 rng(seed);
    std::vector<double> v(count);
    for (double& x : v) {
        const double unit =
            static_cast<double>(rng.below(1u << 30)) / static_cast<double>(1u << 30);
        const double scale = static_cast<double>(1 + rng.below(1000));
        x = (unit - 0.5) * scale;
    }
    return v;
}

struct Sums {
    std::vector<double> a, b;
};

Sums plainSums(const std::vector<double>& x, std::size_t m, std::size_t n,
               const std::vector<double>& c, const std::vector<double>& y) {
    Sums out{std::vector<double>(n * n, 0.0), std::vector<double>(n, 0.0)};
    for (std::size_t p = 0; p < n; ++p) {
        for (std::size_t q = 0; q <= p; ++q) {
            double sum = 0.0;
            for (std::size_t i = 0; i < m; ++i) {
                const double cp = c.empty() ? x[i * n + p] : c[i] * x[i * n + p];
                sum += cp * x[i * n + q];
            }
            out.a[p * n + q] = out.a[q * n + p] = sum;
        }
        if (!y.empty()) {
            double sum = 0.0;
            for (std::size_t i = 0; i < m; ++i) {
                const double cp = c.empty() ? x[i * n + p] : c[i] * x[i * n + p];
                sum += cp * y[i];
            }
            out.b[p] = sum;
        }
    }
    return out;
}

void expectSameBits(std::size_t n, bool weighted, bool withRhs) {
    for (std::size_t m : {1u, 2u, 7u, 367u, 1006u}) {
        const auto x = mixedValues(m * n, 11 + m * n);
        const auto y = withRhs ? mixedValues(m, 23 + m) : std::vector<double>{};
        const auto c = weighted ? mixedValues(m, 37 + m) : std::vector<double>{};
        std::vector<double> a(n * n, -1.0), b(n, -1.0);
        gram(x.data(), m, n, c, y, a.data(), withRhs ? b.data() : nullptr);
        const Sums expected = plainSums(x, m, n, c, y);
        for (std::size_t k = 0; k < n * n; ++k)
            EXPECT_EQ(a[k], expected.a[k]) << "n " << n << " m " << m << " element " << k;
        for (std::size_t k = 0; withRhs && k < n; ++k)
            EXPECT_EQ(b[k], expected.b[k]) << "n " << n << " m " << m << " rhs " << k;
    }
}

TEST(FitGram, ThreeColumnsWithRightHandSideMatchThePlainLoopToTheBit) {
    expectSameBits(3, false, true);
}

TEST(FitGram, EveryOtherPathMatchesThePlainLoopToTheBit) {
    for (std::size_t n : {1u, 2u, 3u, 4u, 6u}) {
        for (bool weighted : {false, true}) {
            for (bool withRhs : {false, true})
                expectSameBits(n, weighted, withRhs);
        }
    }
}

}  // namespace
}  // namespace siftwave::fit::detail
