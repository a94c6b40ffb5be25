#pragma once
// Small Gram matrices of tall, thin row-major matrices (internal to core/src/fit):
// A = sum_i c_i x_i x_i^T and b = sum_i c_i x_i y_i over the rows x_i.
// The sums are kept in local accumulators, with the column count fixed at compile time for the
// wave models' sizes (3 and 4 columns): accumulating straight into matrix elements chains every
// += through memory and runs several times slower.

#include <array>
#include <cstddef>
#if defined(__SSE2__)
#include <emmintrin.h>
#endif
#include <span>
#include <vector>

namespace siftwave::fit::detail {

// The packed lower triangle s (n (n + 1) / 2) and g (n) of the sums; N > 0: n = N at compile
// time, N = 0: n at run time.
template <std::size_t N, bool Weighted, bool WithRhs>
void gramRows(const double* x, std::size_t m, std::size_t n, std::span<const double> c,
              std::span<const double> y, std::span<double> s, std::span<double> g) {
    const std::size_t cols = N > 0 ? N : n;
    for (std::size_t i = 0; i < m; ++i) {
        const double* row = x + i * cols;
        std::size_t k = 0;
        for (std::size_t p = 0; p < cols; ++p) {
            const double cp = Weighted ? c[i] * row[p] : row[p];
            for (std::size_t q = 0; q <= p; ++q)
                s[k++] += cp * row[q];
            if constexpr (WithRhs)
                g[p] += cp * y[i];
        }
    }
}

#if defined(__SSE2__)
// The solver's case (3 columns, no weights, with a right-hand side; once per evaluation of every
// Gumbel, logistic and log-normal fit) with the nine sums in pairs, two lanes of SSE2 (part of
// every x86-64 processor). Row (a, b, c) and y give {aa, ab}, {ac, ay}, {bc, by}, {bb, cc} and cy:
// every lane adds the same products in the same row order as gramRows<3, false, true>, so the
// sums are the same to the bit, at a third of the time (measured).
inline void gramRows3WithRhs(const double* x, std::size_t m, std::span<const double> y,
                             std::span<double> s, std::span<double> g) {
    __m128d aaAb = _mm_setzero_pd(), acAy = aaAb, bcBy = aaAb, bbCc = aaAb;
    double cy = 0.0;
    for (std::size_t i = 0; i < m; ++i) {
        const double* row = x + 3 * i;
        const __m128d ab = _mm_loadu_pd(row), bc = _mm_loadu_pd(row + 1);
        const __m128d cY = _mm_loadh_pd(_mm_load_sd(row + 2), &y[i]);
        const __m128d aa = _mm_unpacklo_pd(ab, ab), bb = _mm_unpackhi_pd(ab, ab);
        aaAb = _mm_add_pd(aaAb, _mm_mul_pd(aa, ab));
        acAy = _mm_add_pd(acAy, _mm_mul_pd(aa, cY));
        bcBy = _mm_add_pd(bcBy, _mm_mul_pd(bb, cY));
        bbCc = _mm_add_pd(bbCc, _mm_mul_pd(bc, bc));
        cy += row[2] * y[i];
    }
    // Packed lower triangle: s = {aa, ba, bb, ca, cb, cc}.
    std::array<double, 8> lanes;
    _mm_storeu_pd(&lanes[0], aaAb);
    _mm_storeu_pd(&lanes[2], acAy);
    _mm_storeu_pd(&lanes[4], bcBy);
    _mm_storeu_pd(&lanes[6], bbCc);
    s[0] += lanes[0];
    s[1] += lanes[1];
    s[2] += lanes[6];
    s[3] += lanes[2];
    s[4] += lanes[4];
    s[5] += lanes[7];
    g[0] += lanes[3];
    g[1] += lanes[5];
    g[2] += cy;
}
#endif

template <std::size_t N>
void gramPacked(const double* x, std::size_t m, std::size_t n, std::span<const double> c,
                std::span<const double> y, std::span<double> s, std::span<double> g) {
    if (c.empty() && y.empty())
        gramRows<N, false, false>(x, m, n, c, y, s, g);
    else if (c.empty()) {
#if defined(__SSE2__)
        if constexpr (N == 3) {
            gramRows3WithRhs(x, m, y, s, g);
            return;
        }
#endif
        gramRows<N, false, true>(x, m, n, c, y, s, g);
    } else if (y.empty())
        gramRows<N, true, false>(x, m, n, c, y, s, g);
    else
        gramRows<N, true, true>(x, m, n, c, y, s, g);
}

/// A = sum_i c_i x_i x_i^T (row-major n x n into `a`, both triangles) and
/// b = sum_i c_i x_i y_i when `y` is not empty (`b` may be null otherwise); x is m x n
/// row-major, `c` empty means c_i = 1.
inline void gram(const double* x, std::size_t m, std::size_t n, std::span<const double> c,
                 std::span<const double> y, double* a, double* b) {
    std::array<double, 10> fixedS{};  // n <= 4
    std::array<double, 4> fixedG{};
    std::vector<double> dynamicS, dynamicG;
    std::span<double> s(fixedS), g(fixedG);
    if (n > 4) {
        dynamicS.assign(n * (n + 1) / 2, 0.0);
        dynamicG.assign(n, 0.0);
        s = dynamicS;
        g = dynamicG;
    }
    switch (n) {
        case 3:
            gramPacked<3>(x, m, n, c, y, s, g);
            break;
        case 4:
            gramPacked<4>(x, m, n, c, y, s, g);
            break;
        default:
            gramPacked<0>(x, m, n, c, y, s, g);
            break;
    }
    std::size_t k = 0;
    for (std::size_t p = 0; p < n; ++p) {
        for (std::size_t q = 0; q <= p; ++q, ++k)
            a[p * n + q] = a[q * n + p] = s[k];
        if (b)
            b[p] = g[p];
    }
}

}  // namespace siftwave::fit::detail
