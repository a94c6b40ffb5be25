#pragma once
// Small Gram matrices of tall, thin row-major matrices (internal to core/src/fit):
// A = sum_i c_i x_i x_i^T and b = sum_i c_i x_i y_i over the rows x_i.
// The sums are kept in local accumulators for the usual wave-model sizes (3 and 4 columns):
// accumulating straight into matrix elements chains every += through memory and runs several
// times slower. Results are the same sums in the same order.

#include <array>
#include <cstddef>
#include <span>

namespace siftwave::fit::detail {

/// Lower triangle and mirror of A = sum_i c_i x_i x_i^T (row-major n x n into `a`), and
/// b = sum_i c_i x_i y_i when `y` is not empty (`b` may be null otherwise). `c` empty means
/// c_i = 1.
template <std::size_t N, bool Weighted, bool WithRhs>
void gramRows(const double* x, std::size_t m, std::span<const double> c, std::span<const double> y,
              std::array<double, N*(N + 1) / 2>& s, std::array<double, N>& g) {
    for (std::size_t i = 0; i < m; ++i) {
        const double* row = x + i * N;
        std::size_t k = 0;
        for (std::size_t p = 0; p < N; ++p) {
            const double cp = Weighted ? c[i] * row[p] : row[p];
            for (std::size_t q = 0; q <= p; ++q)
                s[k++] += cp * row[q];
            if constexpr (WithRhs)
                g[p] += cp * y[i];
        }
    }
}

template <std::size_t N>
void gramFixed(const double* x, std::size_t m, std::span<const double> c, std::span<const double> y,
               double* a, double* b) {
    std::array<double, N*(N + 1) / 2> s{};
    std::array<double, N> g{};
    if (c.empty() && y.empty())
        gramRows<N, false, false>(x, m, c, y, s, g);
    else if (c.empty())
        gramRows<N, false, true>(x, m, c, y, s, g);
    else if (y.empty())
        gramRows<N, true, false>(x, m, c, y, s, g);
    else
        gramRows<N, true, true>(x, m, c, y, s, g);
    std::size_t k = 0;
    for (std::size_t p = 0; p < N; ++p) {
        for (std::size_t q = 0; q <= p; ++q, ++k)
            a[p * N + q] = a[q * N + p] = s[k];
        if (b)
            b[p] = g[p];
    }
}

inline void gram(const double* x, std::size_t m, std::size_t n, std::span<const double> c,
                 std::span<const double> y, double* a, double* b) {
    switch (n) {
        case 1:
            return gramFixed<1>(x, m, c, y, a, b);
        case 2:
            return gramFixed<2>(x, m, c, y, a, b);
        case 3:
            return gramFixed<3>(x, m, c, y, a, b);
        case 4:
            return gramFixed<4>(x, m, c, y, a, b);
        case 5:
            return gramFixed<5>(x, m, c, y, a, b);
        case 6:
            return gramFixed<6>(x, m, c, y, a, b);
        case 7:
            return gramFixed<7>(x, m, c, y, a, b);
        case 8:
            return gramFixed<8>(x, m, c, y, a, b);
        default:
            break;
    }
    for (std::size_t p = 0; p < n * n; ++p)
        a[p] = 0.0;
    for (std::size_t p = 0; b && p < n; ++p)
        b[p] = 0.0;
    for (std::size_t i = 0; i < m; ++i) {
        const double* row = x + i * n;
        const double ci = c.empty() ? 1.0 : c[i];
        for (std::size_t p = 0; p < n; ++p) {
            const double cp = ci * row[p];
            for (std::size_t q = 0; q <= p; ++q)
                a[p * n + q] += cp * row[q];
            if (!y.empty())
                b[p] += cp * y[i];
        }
    }
    for (std::size_t p = 0; p < n; ++p) {
        for (std::size_t q = 0; q < p; ++q)
            a[q * n + p] = a[p * n + q];
    }
}

}  // namespace siftwave::fit::detail
