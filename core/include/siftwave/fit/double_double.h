#pragma once
// Double-double arithmetic: a value hi + lo with |lo| <= ulp(hi) / 2, about 32 significant digits,
// for residuals that sit at the rounding level of their data (a least-squares fit whose residual
// sum of squares is 1e-25 on data of size 1, NIST StRD's Lanczos1) and for the point a
// Gauss-Newton polish moves in that precision.
// Sources: T. J. Dekker (1971), "A floating-point technique for extending the available
// precision", Numer. Math. 18, 224-242 (two-sum, two-product); Y. Hida, X. S. Li & D. H. Bailey
// (2001), "Algorithms for quad-double precision floating point arithmetic", ARITH-15 (the sloppy
// add, the product with an FMA, the division, exp by argument reduction with 2^9 and a Taylor
// series). Needs round-to-nearest and no -ffast-math (the build never sets it).

#include <cmath>
#include <cstdint>
#include <optional>
#include <string_view>

namespace siftwave::fit {

struct DoubleDouble {
    double hi = 0;
    double lo = 0;

    constexpr DoubleDouble() = default;
    constexpr DoubleDouble(double h) : hi(h) {}  // NOLINT: doubles convert exactly
    constexpr DoubleDouble(double h, double l) : hi(h), lo(l) {}
    double value() const { return hi + lo; }
};

namespace dd_detail {
// a + b exactly as s + e (Knuth's two-sum, any order of magnitudes).
inline DoubleDouble twoSum(double a, double b) {
    const double s = a + b;
    const double bb = s - a;
    return {s, (a - (s - bb)) + (b - bb)};
}
// a + b exactly when |a| >= |b| (Dekker's fast two-sum).
inline DoubleDouble quickTwoSum(double a, double b) {
    const double s = a + b;
    return {s, b - (s - a)};
}
// a * b exactly as p + e (the FMA gives the rounding error of the product).
inline DoubleDouble twoProduct(double a, double b) {
    const double p = a * b;
    return {p, std::fma(a, b, -p)};
}
}  // namespace dd_detail

inline DoubleDouble operator+(const DoubleDouble& a, const DoubleDouble& b) {
    DoubleDouble s = dd_detail::twoSum(a.hi, b.hi);
    const DoubleDouble t = dd_detail::twoSum(a.lo, b.lo);
    s.lo += t.hi;
    s = dd_detail::quickTwoSum(s.hi, s.lo);
    s.lo += t.lo;
    return dd_detail::quickTwoSum(s.hi, s.lo);
}
inline DoubleDouble operator-(const DoubleDouble& a) {
    return {-a.hi, -a.lo};
}
inline DoubleDouble operator-(const DoubleDouble& a, const DoubleDouble& b) {
    return a + (-b);
}
inline DoubleDouble operator*(const DoubleDouble& a, const DoubleDouble& b) {
    DoubleDouble p = dd_detail::twoProduct(a.hi, b.hi);
    p.lo += a.hi * b.lo + a.lo * b.hi;
    return dd_detail::quickTwoSum(p.hi, p.lo);
}
inline DoubleDouble operator/(const DoubleDouble& a, const DoubleDouble& b) {
    const double q1 = a.hi / b.hi;
    DoubleDouble r = a - b * DoubleDouble(q1);
    const double q2 = r.hi / b.hi;
    r = r - b * DoubleDouble(q2);
    const double q3 = r.hi / b.hi;
    return dd_detail::quickTwoSum(q1, q2) + DoubleDouble(q3);
}
inline DoubleDouble ldexp(const DoubleDouble& a, int e) {
    return {std::ldexp(a.hi, e), std::ldexp(a.lo, e)};
}

/// e^a to about 1e-30 relative: a = k ln 2 + r, |r| <= ln 2 / 2, expm1(r / 512) by its Taylor
/// series, squared back nine times as expm1(2t) = 2 expm1(t) + expm1(t)^2 (Hida, Li & Bailey).
inline DoubleDouble exp(const DoubleDouble& a) {
    if (a.hi > 709.0)
        return {HUGE_VAL, 0.0};
    if (a.hi < -745.0)
        return {0.0, 0.0};
    constexpr DoubleDouble ln2{6.931471805599452862e-01, 2.319046813846299558e-17};
    const double k = std::nearbyint(a.hi / ln2.hi);
    const DoubleDouble r = ldexp(a - ln2 * DoubleDouble(k), -9);
    DoubleDouble term = r;
    DoubleDouble sum = r;
    for (int i = 2; i <= 12; ++i) {
        term = term * r / DoubleDouble(static_cast<double>(i));
        sum = sum + term;
        if (std::abs(term.hi) < 1e-34 * std::abs(sum.hi))
            break;
    }
    for (int i = 0; i < 9; ++i)
        sum = ldexp(sum, 1) + sum * sum;
    return ldexp(sum + DoubleDouble(1.0), static_cast<int>(k));
}

/// A decimal number as printed ("2.044333373291E+00", "-0.05", "12") to double-double precision
/// (up to 30 significant digits; more are an error): the digits as an integer in double-double,
/// scaled by the power of ten. nullopt when the text is not such a number.
inline std::optional<DoubleDouble> parseDoubleDouble(std::string_view text) {
    std::size_t i = 0;
    bool negative = false;
    if (i < text.size() && (text[i] == '+' || text[i] == '-'))
        negative = text[i++] == '-';
    DoubleDouble mantissa;
    int digits = 0, exponent = 0;
    bool seenDot = false, seenDigit = false;
    for (; i < text.size(); ++i) {
        const char c = text[i];
        if (c == '.' && !seenDot) {
            seenDot = true;
        } else if (c >= '0' && c <= '9') {
            seenDigit = true;
            if (digits > 0 || c != '0')
                ++digits;
            if (digits > 30)
                return std::nullopt;
            mantissa = mantissa * DoubleDouble(10.0) + DoubleDouble(static_cast<double>(c - '0'));
            if (seenDot)
                --exponent;
        } else {
            break;
        }
    }
    if (!seenDigit)
        return std::nullopt;
    if (i < text.size() && (text[i] == 'e' || text[i] == 'E')) {
        ++i;
        bool expNegative = false;
        if (i < text.size() && (text[i] == '+' || text[i] == '-'))
            expNegative = text[i++] == '-';
        int e = 0;
        bool expDigit = false;
        for (; i < text.size() && text[i] >= '0' && text[i] <= '9' && e < 10000; ++i) {
            e = e * 10 + (text[i] - '0');
            expDigit = true;
        }
        if (!expDigit)
            return std::nullopt;
        exponent += expNegative ? -e : e;
    }
    if (i != text.size() || exponent < -300 || exponent > 300)
        return std::nullopt;
    DoubleDouble power(1.0);
    for (int k = 0; k < std::abs(exponent); ++k)
        power = power * DoubleDouble(10.0);
    DoubleDouble v = exponent < 0 ? mantissa / power : mantissa * power;
    return negative ? -v : v;
}

}  // namespace siftwave::fit
