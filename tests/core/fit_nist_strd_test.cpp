// The Levenberg-Marquardt solver against the certified values of the NIST StRD nonlinear
// regression datasets. Source of the data and the certified values: NIST Statistical Reference
// Datasets, Statistical Engineering Division, ITL, National Institute of Standards and
// Technology, https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml (public domain); copies in
// tests/data/reference/nist-strd/ (see the README there). The Jacobians are exact: the model
// functions are evaluated in forward-mode dual numbers (automatic differentiation).
#include "siftwave/fit/levenberg_marquardt.h"

#include "core/fit_nist_strd_reader.h"
#include "siftwave/fit/double_double.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <functional>
#include <map>
#include <numbers>
#include <optional>
#include <string>

namespace siftwave::fit {
namespace {

// Forward-mode dual number with up to 9 partial derivatives.
struct Dual {
    double v = 0;
    std::array<double, 9> d{};
};
using Vec = std::array<Dual, 9>;

Dual constant(double c) {
    return Dual{c, {}};
}
Dual operator+(Dual a, const Dual& b) {
    a.v += b.v;
    for (int i = 0; i < 9; ++i)
        a.d[i] += b.d[i];
    return a;
}
Dual operator-(Dual a, const Dual& b) {
    a.v -= b.v;
    for (int i = 0; i < 9; ++i)
        a.d[i] -= b.d[i];
    return a;
}
Dual operator-(Dual a) {
    a.v = -a.v;
    for (double& x : a.d)
        x = -x;
    return a;
}
Dual operator*(const Dual& a, const Dual& b) {
    Dual r{a.v * b.v, {}};
    for (int i = 0; i < 9; ++i)
        r.d[i] = a.d[i] * b.v + a.v * b.d[i];
    return r;
}
Dual operator/(const Dual& a, const Dual& b) {
    Dual r{a.v / b.v, {}};
    for (int i = 0; i < 9; ++i)
        r.d[i] = (a.d[i] * b.v - a.v * b.d[i]) / (b.v * b.v);
    return r;
}
Dual operator+(Dual a, double c) {
    return a + constant(c);
}
Dual operator+(double c, Dual a) {
    return a + constant(c);
}
Dual operator-(double c, Dual a) {
    return constant(c) - a;
}
Dual operator*(Dual a, double c) {
    return a * constant(c);
}
Dual operator*(double c, Dual a) {
    return a * constant(c);
}
Dual operator/(Dual a, double c) {
    return a / constant(c);
}
Dual operator/(double c, Dual a) {
    return constant(c) / a;
}
Dual chain(const Dual& a, double value, double derivative) {
    Dual r{value, {}};
    for (int i = 0; i < 9; ++i)
        r.d[i] = derivative * a.d[i];
    return r;
}
Dual exp(const Dual& a) {
    const double e = std::exp(a.v);
    return chain(a, e, e);
}
Dual log(const Dual& a) {
    return chain(a, std::log(a.v), 1.0 / a.v);
}
Dual sin(const Dual& a) {
    return chain(a, std::sin(a.v), std::cos(a.v));
}
Dual cos(const Dual& a) {
    return chain(a, std::cos(a.v), -std::sin(a.v));
}
Dual atan(const Dual& a) {
    return chain(a, std::atan(a.v), 1.0 / (1.0 + a.v * a.v));
}
Dual pow(const Dual& a, double p) {
    return chain(a, std::pow(a.v, p), p * std::pow(a.v, p - 1));
}
Dual pow(const Dual& a, const Dual& p) {
    return exp(p * log(a));
}
Dual pow(double a, const Dual& p) {
    return exp(p * std::log(a));
}
Dual sq(const Dual& a) {
    return a * a;
}

// Model f(b, x) of each dataset, as printed in its file. x[k] is predictor k.
using ModelFn = std::function<Dual(const Vec& b, const std::array<double, 2>& x)>;

const std::map<std::string, ModelFn>& models() {
    constexpr double pi = std::numbers::pi;
    auto ratio3 = [](const Vec& b, double x) {
        return (b[0] + b[1] * x + b[2] * x * x + b[3] * x * x * x) /
               (1.0 + b[4] * x + b[5] * x * x + b[6] * x * x * x);
    };
    auto gauss = [](const Vec& b, double x) {
        return b[0] * exp(-b[1] * x) + b[2] * exp(-sq(x - b[3]) / sq(b[4])) +
               b[5] * exp(-sq(x - b[6]) / sq(b[7]));
    };
    auto lanczos = [](const Vec& b, double x) {
        return b[0] * exp(-b[1] * x) + b[2] * exp(-b[3] * x) + b[4] * exp(-b[5] * x);
    };
    auto chwirut = [](const Vec& b, double x) { return exp(-b[0] * x) / (b[1] + b[2] * x); };
    auto misra1a = [](const Vec& b, double x) { return b[0] * (1.0 - exp(-b[1] * x)); };
    static const std::map<std::string, ModelFn> table{
        {"Bennett5", [](const Vec& b, auto x) { return b[0] * pow(b[1] + x[0], -1.0 / b[2]); }},
        {"BoxBOD", [=](const Vec& b, auto x) { return misra1a(b, x[0]); }},
        {"Chwirut1", [=](const Vec& b, auto x) { return chwirut(b, x[0]); }},
        {"Chwirut2", [=](const Vec& b, auto x) { return chwirut(b, x[0]); }},
        {"DanWood", [](const Vec& b, auto x) { return b[0] * pow(x[0], b[1]); }},
        {"ENSO",
         [=](const Vec& b, auto x) {
             const double w = 2 * pi * x[0];
             return b[0] + b[1] * std::cos(w / 12) + b[2] * std::sin(w / 12) +
                    b[4] * cos(w / b[3]) + b[5] * sin(w / b[3]) + b[7] * cos(w / b[6]) +
                    b[8] * sin(w / b[6]);
         }},
        {"Eckerle4",
         [](const Vec& b, auto x) { return (b[0] / b[1]) * exp(-0.5 * sq((x[0] - b[2]) / b[1])); }},
        {"Gauss1", [=](const Vec& b, auto x) { return gauss(b, x[0]); }},
        {"Gauss2", [=](const Vec& b, auto x) { return gauss(b, x[0]); }},
        {"Gauss3", [=](const Vec& b, auto x) { return gauss(b, x[0]); }},
        {"Hahn1", [=](const Vec& b, auto x) { return ratio3(b, x[0]); }},
        {"Kirby2",
         [](const Vec& b, auto x) {
             const double t = x[0];
             return (b[0] + b[1] * t + b[2] * t * t) / (1.0 + b[3] * t + b[4] * t * t);
         }},
        {"Lanczos1", [=](const Vec& b, auto x) { return lanczos(b, x[0]); }},
        {"Lanczos2", [=](const Vec& b, auto x) { return lanczos(b, x[0]); }},
        {"Lanczos3", [=](const Vec& b, auto x) { return lanczos(b, x[0]); }},
        {"MGH09",
         [](const Vec& b, auto x) {
             const double t = x[0];
             return b[0] * (t * t + t * b[1]) / (t * t + t * b[2] + b[3]);
         }},
        {"MGH10", [](const Vec& b, auto x) { return b[0] * exp(b[1] / (x[0] + b[2])); }},
        {"MGH17",
         [](const Vec& b, auto x) {
             return b[0] + b[1] * exp(-x[0] * b[3]) + b[2] * exp(-x[0] * b[4]);
         }},
        {"Misra1a", [=](const Vec& b, auto x) { return misra1a(b, x[0]); }},
        {"Misra1b",
         [](const Vec& b, auto x) { return b[0] * (1.0 - pow(1.0 + b[1] * x[0] / 2.0, -2.0)); }},
        {"Misra1c",
         [](const Vec& b, auto x) { return b[0] * (1.0 - pow(1.0 + 2.0 * b[1] * x[0], -0.5)); }},
        {"Misra1d",
         [](const Vec& b, auto x) { return b[0] * b[1] * x[0] * pow(1.0 + b[1] * x[0], -1.0); }},
        // Nelson's model is for log(y): the residual is log(y) - f.
        {"Nelson", [](const Vec& b, auto x) { return b[0] - b[1] * x[0] * exp(-b[2] * x[1]); }},
        {"Rat42", [](const Vec& b, auto x) { return b[0] / (1.0 + exp(b[1] - b[2] * x[0])); }},
        {"Rat43", [](const Vec& b,
                     auto x) { return b[0] / pow(1.0 + exp(b[1] - b[2] * x[0]), 1.0 / b[3]); }},
        // pi as written in the file: 3.141592653589793238462643383279E0.
        {"Roszman1", [=](const Vec& b,
                         auto x) { return b[0] - b[1] * x[0] - atan(b[2] / (x[0] - b[3])) / pi; }},
        {"Thurber", [=](const Vec& b, auto x) { return ratio3(b, x[0]); }},
    };
    return table;
}

class NistProblem final : public LeastSquaresProblem {
public:
    NistProblem(const test::NistDataset& d, ModelFn model) : m_data(d), m_model(std::move(model)) {}
    int residualCount() const override { return static_cast<int>(m_data.y.size()); }
    int parameterCount() const override { return static_cast<int>(m_data.certified.size()); }
    // Lanczos1's data are its model rounded to 13 digits, so its residuals (about 1e-13) sit at
    // the rounding level of the data and of a double evaluation of the model: the three Lanczos
    // problems also give their residuals in double-double, from the data's decimal text.
    bool evaluateExtended(std::span<const double> high, std::span<const double> low,
                          std::span<double> r) const override {
        if (m_data.name.rfind("Lanczos", 0) != 0)
            return false;
        std::array<DoubleDouble, 6> b;
        for (std::size_t j = 0; j < 6; ++j)
            b[j] = dd_detail::quickTwoSum(high[j], low[j]);
        for (std::size_t i = 0; i < m_data.y.size(); ++i) {
            const DoubleDouble x = m_data.xExact[0][i];
            const DoubleDouble f =
                b[0] * exp(-(b[1] * x)) + b[2] * exp(-(b[3] * x)) + b[4] * exp(-(b[5] * x));
            r[i] = (m_data.yExact[i] - f).value();
        }
        return true;
    }

    bool evaluate(std::span<const double> p, std::span<double> r,
                  std::span<double> jacobian) const override {
        const int n = parameterCount();
        Vec b{};
        for (int j = 0; j < n; ++j) {
            b[j].v = p[static_cast<std::size_t>(j)];
            b[j].d[j] = 1.0;
        }
        const bool logResponse = m_data.name == "Nelson";
        for (std::size_t i = 0; i < m_data.y.size(); ++i) {
            std::array<double, 2> x{m_data.x[0][i], m_data.x.size() > 1 ? m_data.x[1][i] : 0.0};
            const Dual f = m_model(b, x);
            const double y = logResponse ? std::log(m_data.y[i]) : m_data.y[i];
            r[i] = y - f.v;
            if (!jacobian.empty()) {
                for (int j = 0; j < n; ++j)
                    jacobian[i * static_cast<std::size_t>(n) + j] = -f.d[j];
            }
        }
        return true;
    }

private:
    const test::NistDataset& m_data;
    ModelFn m_model;
};

// Log relative error (digits in agreement), as NIST's StRD pages score software.
double lre(double estimate, double certified) {
    if (estimate == certified)
        return 15.0;
    const double rel = std::abs(estimate - certified) / std::abs(certified);
    return std::min(15.0, -std::log10(rel));
}

struct Outcome {
    double worstParameterLre = 0;
    double worstSdLre = 0;
    double rssLre = 0;
    SolverSummary summary;
};

Outcome solveNist(const test::NistDataset& d, const std::vector<double>& start,
                  LinearSolver linearSolver = LinearSolver::QR) {
    NistProblem problem(d, models().at(d.name));
    SolverOptions options;
    options.linearSolver = linearSolver;
    options.maxIterations = 5000;
    // Run to the limit of double precision: stop only when no step lowers the cost.
    options.functionTolerance = 0;
    options.parameterTolerance = 0;
    options.gradientTolerance = 0;
    options.refinementSteps = 50;
    const SolverResult result = solveLeastSquares(problem, start, options);
    Outcome out;
    out.summary = result.summary;
    out.worstParameterLre = 15.0;
    out.worstSdLre = 15.0;
    const double rss = 2.0 * result.summary.finalCost;
    const int dof = static_cast<int>(d.y.size() - d.certified.size());
    for (std::size_t j = 0; j < d.certified.size(); ++j) {
        out.worstParameterLre =
            std::min(out.worstParameterLre, lre(result.parameters[j], d.certified[j]));
        const double sd =
            std::sqrt(rss / dof * result.unscaledCovariance[j * d.certified.size() + j]);
        out.worstSdLre = std::min(out.worstSdLre, lre(sd, d.certifiedSd[j]));
    }
    out.rssLre = lre(rss, d.residualSumOfSquares);
    return out;
}

std::string dataPath(const std::string& name) {
    return std::string(SIFTWAVE_TEST_DATA_DIR) + "/reference/nist-strd/" + name + ".dat";
}

TEST(NistStrd, ReaderReadsEveryFileWithItsHeaderCounts) {
    for (const auto& [name, model] : models()) {
        std::string error;
        auto d = test::readNistDataset(dataPath(name), error);
        ASSERT_TRUE(d) << error;
        EXPECT_EQ(static_cast<int>(d->y.size()), d->observations) << name;
        EXPECT_FALSE(d->certified.empty()) << name;
        EXPECT_EQ(d->start1.size(), d->certified.size()) << name;
    }
    EXPECT_EQ(models().size(), 27u);
}

// Digits required: NIST certifies 11 significant digits, and the certified values are
// themselves rounded to 11, so about 10.5 is the most any solver can show. We require 10 digits
// in every parameter, every standard deviation and the residual sum of squares, from both
// starting points; the table (printed, and in tests/data/reference/nist-strd/README.md) shows
// 10.3 to 12.6.
constexpr double kParameterDigits = 10.0;
constexpr double kRssDigits = 10.0;

struct Case {
    std::string name;
    int start;
};

// One case solved, with its digits printed (the table in the test log); nullopt when the data
// file cannot be read (the reader's error is then a test failure).
std::optional<Outcome> solveCase(const Case& c, LinearSolver linearSolver) {
    std::string error;
    auto d = test::readNistDataset(dataPath(c.name), error);
    if (!d) {
        ADD_FAILURE() << error;
        return std::nullopt;
    }
    const Outcome o = solveNist(*d, c.start == 1 ? d->start1 : d->start2, linearSolver);
    std::printf("%-9s %-7s start%d %s digits: params %5.1f  sd %5.1f  rss %5.1f  %s\n",
                c.name.c_str(), d->difficulty.c_str(), c.start,
                linearSolver == LinearSolver::QR ? "QR    " : "normal", o.worstParameterLre,
                o.worstSdLre, o.rssLre, o.summary.brief().c_str());
    return o;
}

class NistStrdCase : public ::testing::TestWithParam<Case> {};

TEST_P(NistStrdCase, SolverReproducesTheCertifiedValues) {
    const auto outcome = solveCase(GetParam(), LinearSolver::QR);
    ASSERT_TRUE(outcome);
    const Outcome& o = *outcome;
    EXPECT_GE(o.worstParameterLre, kParameterDigits);
    EXPECT_GE(o.worstSdLre, kParameterDigits);
    EXPECT_GE(o.rssLre, kRssDigits);
}

// The normal-equation path (the wave fits' default: Cholesky of J^T J, and the damped step from
// (J^T J + lambda D) h = -J^T r) on the same datasets, from both starting points, except the
// Squaring the condition number costs digits in the damped steps only: the Gauss-Newton polish
// solves with J itself, and the standard deviations come from (J^T J)^-1 only when cond(J^T J) <=
// 1e8 (QR otherwise). The last digit then depends on where the iteration stops (measured 9.9 to
// 12.6), so 9.5 digits are required here.
class NistStrdNormalEquations : public ::testing::TestWithParam<Case> {};

TEST_P(NistStrdNormalEquations, ReachTheCertifiedValuesLikeQr) {
    constexpr double kNormalDigits = 9.5;
    const auto outcome = solveCase(GetParam(), LinearSolver::NormalEquations);
    ASSERT_TRUE(outcome);
    const Outcome& o = *outcome;
    EXPECT_GE(o.worstParameterLre, kNormalDigits);
    EXPECT_GE(o.worstSdLre, kNormalDigits);
    EXPECT_GE(o.rssLre, kNormalDigits);
}

std::vector<Case> allCases() {
    std::vector<Case> cases;
    for (const auto& [name, model] : models()) {
        cases.push_back({name, 1});
        cases.push_back({name, 2});
    }
    return cases;
}

INSTANTIATE_TEST_SUITE_P(AllDatasets, NistStrdCase, ::testing::ValuesIn(allCases()),
                         [](const ::testing::TestParamInfo<Case>& param) {
                             return param.param.name + "_start" + std::to_string(param.param.start);
                         });

INSTANTIATE_TEST_SUITE_P(AllDatasets, NistStrdNormalEquations, ::testing::ValuesIn(allCases()),
                         [](const ::testing::TestParamInfo<Case>& param) {
                             return param.param.name + "_start" + std::to_string(param.param.start);
                         });

// The score NIST's StRD pages and B. D. McCullough (1999), "Assessing the reliability of
// statistical software: Part II", The American Statistician 53(2), 149-159, use: a case passes
// when the parameters, their standard deviations and the residual sum of squares all agree with
// the certified values to at least 6 digits (LRE). One line with the count, over all 27 problems
// from both starts (the per-case digits are in tests/data/reference/nist-strd/README.md).
TEST(NistStrd, AllCasesReachSixDigitsInParametersSdsAndRss) {
    int passed = 0, total = 0;
    std::string misses;
    for (const Case& c : allCases()) {
        std::string error;
        auto d = test::readNistDataset(dataPath(c.name), error);
        ASSERT_TRUE(d) << error;
        const Outcome o = solveNist(*d, c.start == 1 ? d->start1 : d->start2);
        ++total;
        if (std::min({o.worstParameterLre, o.worstSdLre, o.rssLre}) >= 6.0)
            ++passed;
        else
            misses += " " + c.name + "/start" + std::to_string(c.start);
    }
    std::printf("NIST StRD: %d of %d cases reach 6 digits (LRE) in parameters, SDs and RSS%s\n",
                passed, total, misses.empty() ? "" : (";  misses:" + misses).c_str());
    EXPECT_EQ(total, 54);
    EXPECT_EQ(passed, total) << misses;
}

}  // namespace
}  // namespace siftwave::fit
