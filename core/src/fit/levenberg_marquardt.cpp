#include "siftwave/fit/levenberg_marquardt.h"

#include "fit/gram.h"
#include "siftwave/fit/double_double.h"

#include <Eigen/Dense>

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <limits>
#include <memory>

namespace siftwave::fit {
namespace {

using Matrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
using Vector = Eigen::VectorXd;

bool allFinite(const double* v, std::size_t n) {
    for (std::size_t i = 0; i < n; ++i) {
        if (!std::isfinite(v[i]))
            return false;
    }
    return true;
}

// Residuals and Jacobian at x, analytic or by central differences.
class Evaluator {
public:
    Evaluator(const LeastSquaresProblem& problem, SolverSummary& summary)
        : m_problem(problem),
          m_summary(summary),
          m_m(problem.residualCount()),
          m_n(problem.parameterCount()) {
        if (!problem.hasJacobian()) {  // scratch for the central differences only
            m_scratch.resize(static_cast<std::size_t>(m_m));
            m_scratch2.resize(static_cast<std::size_t>(m_m));
        }
    }

    bool residuals(const Vector& x, Vector& r) {
        ++m_summary.evaluations;
        r.resize(m_m);
        const bool ok = m_problem.evaluate({x.data(), static_cast<std::size_t>(m_n)},
                                           {r.data(), static_cast<std::size_t>(m_m)}, {});
        return ok && std::isfinite(r.squaredNorm());
    }

    bool residualsAndJacobian(const Vector& x, Vector& r, Matrix& J) {
        r.resize(m_m);
        J.resize(m_m, m_n);
        if (m_problem.hasJacobian()) {
            ++m_summary.evaluations;
            const bool ok = m_problem.evaluate(
                {x.data(), static_cast<std::size_t>(m_n)},
                {r.data(), static_cast<std::size_t>(m_m)},
                {J.data(), static_cast<std::size_t>(m_m) * static_cast<std::size_t>(m_n)});
            // NaN or Inf anywhere makes the sum of squares non-finite (as does a square that
            // overflows, which the solver could not use either); Eigen's sums are vectorised.
            return ok && std::isfinite(r.squaredNorm()) && std::isfinite(J.squaredNorm());
        }
        if (!residuals(x, r))
            return false;
        Vector xp = x;
        for (int j = 0; j < m_n; ++j) {
            const double step =
                std::cbrt(std::numeric_limits<double>::epsilon()) * std::max(std::abs(x[j]), 1e-3);
            xp[j] = x[j] + step;
            ++m_summary.evaluations;
            const bool up =
                m_problem.evaluate({xp.data(), static_cast<std::size_t>(m_n)}, m_scratch, {});
            xp[j] = x[j] - step;
            ++m_summary.evaluations;
            const bool down =
                m_problem.evaluate({xp.data(), static_cast<std::size_t>(m_n)}, m_scratch2, {});
            xp[j] = x[j];
            if (!up || !down)
                return false;
            for (int i = 0; i < m_m; ++i) {
                J(i, j) = (m_scratch[static_cast<std::size_t>(i)] -
                           m_scratch2[static_cast<std::size_t>(i)]) /
                          (2.0 * step);
            }
        }
        return allFinite(J.data(), static_cast<std::size_t>(J.size()));
    }

private:
    const LeastSquaresProblem& m_problem;
    SolverSummary& m_summary;
    int m_m;
    int m_n;
    std::vector<double> m_scratch;
    std::vector<double> m_scratch2;
};

// (J^T J)^-1 from the Cholesky factor of the column-scaled normal matrix when its condition
// number is at most 1e8 (cond(J) <= 1e4: the normal equations then lose at most ~1e-8 of
// relative accuracy); false otherwise, and the caller uses the rank-revealing QR below.
bool covarianceFromNormalEquations(const Matrix& J, SolverResult& result) {
    const Eigen::Index n = J.cols();
    Matrix A(n, n);
    detail::gram(J.data(), static_cast<std::size_t>(J.rows()), static_cast<std::size_t>(n), {}, {},
                 A.data(), nullptr);
    Vector scale(n);
    for (Eigen::Index a = 0; a < n; ++a) {
        if (!(A(a, a) > 0) || !std::isfinite(A(a, a)))
            return false;
        scale[a] = std::sqrt(A(a, a));
    }
    for (Eigen::Index a = 0; a < n; ++a) {
        for (Eigen::Index b = 0; b <= a; ++b) {
            A(a, b) /= scale[a] * scale[b];
            A(b, a) = A(a, b);
        }
    }
    const Eigen::SelfAdjointEigenSolver<Matrix> eigen(A, Eigen::EigenvaluesOnly);
    if (eigen.info() != Eigen::Success)
        return false;
    const Vector& lambda = eigen.eigenvalues();  // ascending
    if (!(lambda[0] >= 1e-8 * lambda[n - 1]))
        return false;
    const Eigen::LLT<Matrix> llt(A);
    if (llt.info() != Eigen::Success)
        return false;
    const Matrix inverse = llt.solve(Matrix::Identity(n, n));
    const auto nu = static_cast<std::size_t>(n);
    for (std::size_t a = 0; a < nu; ++a) {
        for (std::size_t b = 0; b < nu; ++b) {
            result.unscaledCovariance[a * nu + b] =
                inverse(static_cast<Eigen::Index>(a), static_cast<Eigen::Index>(b)) /
                (scale[static_cast<Eigen::Index>(a)] * scale[static_cast<Eigen::Index>(b)]);
        }
    }
    result.covarianceAvailable = allFinite(result.unscaledCovariance.data(), nu * nu);
    return result.covarianceAvailable;
}

void fillCovariance(const Matrix& J, LinearSolver solver, SolverResult& result) {
    const auto n = static_cast<std::size_t>(J.cols());
    result.unscaledCovariance.assign(n * n, std::numeric_limits<double>::quiet_NaN());
    result.covarianceAvailable = false;
    if (J.rows() < J.cols())
        return;
    if (solver == LinearSolver::NormalEquations && covarianceFromNormalEquations(J, result))
        return;
    // Column scaling first, so that parameters of very different sizes do not fake a rank loss.
    Vector scale = J.colwise().norm().transpose();
    for (Eigen::Index j = 0; j < scale.size(); ++j) {
        if (!(scale[j] > 0))
            return;
    }
    const Eigen::MatrixXd Js = J * scale.cwiseInverse().asDiagonal();  // column-major for QR
    Eigen::ColPivHouseholderQR<Eigen::MatrixXd> qr(Js);
    qr.setThreshold(1e-14);
    if (qr.rank() < J.cols())
        return;
    const Matrix R = qr.matrixR().topLeftCorner(J.cols(), J.cols()).triangularView<Eigen::Upper>();
    const Matrix Rinv =
        R.triangularView<Eigen::Upper>().solve(Matrix::Identity(J.cols(), J.cols()));
    const Matrix inner = Rinv * Rinv.transpose();  // (R^T R)^-1 in pivoted order
    const auto& perm = qr.colsPermutation();
    const Matrix covScaled = perm * inner * perm.transpose();
    for (std::size_t a = 0; a < n; ++a) {
        for (std::size_t b = 0; b < n; ++b) {
            result.unscaledCovariance[a * n + b] =
                covScaled(static_cast<Eigen::Index>(a), static_cast<Eigen::Index>(b)) /
                (scale[static_cast<Eigen::Index>(a)] * scale[static_cast<Eigen::Index>(b)]);
        }
    }
    result.covarianceAvailable = allFinite(result.unscaledCovariance.data(), n * n);
}

}  // namespace

Status SolverOptions::validate() const {
    if (maxIterations < 1)
        return makeError(ErrorCode::Usage, "maxIterations must be at least 1");
    if (!(functionTolerance >= 0) || !(parameterTolerance >= 0) || !(gradientTolerance >= 0)) {
        return makeError(ErrorCode::Usage, "solver tolerances must be zero or positive");
    }
    if (!(initialStepBound > 0))
        return makeError(ErrorCode::Usage, "initialStepBound must be positive");
    return Ok{};
}

const char* terminationName(Termination termination) {
    switch (termination) {
        case Termination::FunctionTolerance:
            return "function_tolerance";
        case Termination::ParameterTolerance:
            return "parameter_tolerance";
        case Termination::GradientTolerance:
            return "gradient_tolerance";
        case Termination::NoFurtherReduction:
            return "no_further_reduction";
        case Termination::MaxIterations:
            return "max_iterations";
        case Termination::InvalidStart:
            return "invalid_start";
        case Termination::NumericalFailure:
            return "numerical_failure";
    }
    return "unknown";
}

bool isConverged(Termination t) {
    return t == Termination::FunctionTolerance || t == Termination::ParameterTolerance ||
           t == Termination::GradientTolerance || t == Termination::NoFurtherReduction;
}

std::string SolverSummary::brief() const {
    char buf[200];
    std::snprintf(buf, sizeof buf, "%s (%s) in %d iterations, cost %.3g -> %.3g",
                  converged() ? "converged" : "not converged", terminationName(termination),
                  iterations, initialCost, finalCost);
    return buf;
}

// ---------------------------------------------------------------- the workspace
// Everything a solve writes besides its result, sized on first use and kept at that size by
// Eigen's resize (equal sizes keep their storage), so that a batch of solves of similar problems
// allocates once.
namespace detail {
struct LevenbergMarquardtBuffers {
    Vector x;            // the current point
    Vector r, rNew;      // residuals at x and at the trial point
    Matrix J, JNew;      // Jacobians at x and at the trial point
    Eigen::MatrixXd Jc;  // column-major copy: Householder QR runs down contiguous columns
    Vector D;            // the scaling: MINPACK's diag, the largest column norms of J seen so far
    Vector xNew, qtr, rhs, h, g, columnNorms2, Rh, w;
    Matrix R, S, A, dampedA, Rl;  // Rl: the triangular factor of the damped system
    Eigen::LLT<Matrix> llt, dampedLlt;
    Eigen::HouseholderQR<Matrix> dampedQr;
    Eigen::HouseholderQR<Eigen::MatrixXd> qr;
};
}  // namespace detail

SolverWorkspace::SolverWorkspace()
    : m_buffers(std::make_unique<detail::LevenbergMarquardtBuffers>()) {}
SolverWorkspace::~SolverWorkspace() = default;
SolverWorkspace::SolverWorkspace(SolverWorkspace&&) noexcept = default;
SolverWorkspace& SolverWorkspace::operator=(SolverWorkspace&&) noexcept = default;

namespace {

constexpr double kEpsilon = std::numeric_limits<double>::epsilon();
constexpr double kDwarf = std::numeric_limits<double>::min();

// ---------------------------------------------------------------- the solver's steps
// One solve, in the steps of the header's description (after Ceres' TrustRegionMinimizer): start
// (evaluate and factorise at x0), step (the trust-region step and its predicted reduction), accept
// or reject (the ratio of actual to predicted reduction moves x and the step bound), polish
// (Gauss-Newton refinement), finish (the result and the covariance). The step control is that of
// MINPACK's lmder/lmpar: J. J. More (1978), "The Levenberg-Marquardt algorithm: implementation and
// theory", Lecture Notes in Mathematics 630, 105-116, sections 4-7.
class LevenbergMarquardt {
public:
    LevenbergMarquardt(const LeastSquaresProblem& problem, const SolverOptions& options,
                       bool identityScaling, detail::LevenbergMarquardtBuffers& work,
                       SolverResult& result)
        : m_problem(problem),
          m_options(options),
          m_identityScaling(identityScaling),
          m_w(work),
          m_result(result),
          m_summary(result.summary),
          m_eval(problem, result.summary),
          m_m(problem.residualCount()),
          m_n(problem.parameterCount()),
          m_x(work.x) {}

    // Evaluates and factorises at the start; false (with the summary saying why) when the solve
    // cannot begin.
    bool start(std::span<const double> x0);
    // The step h that minimises the linear model within the scaled trust region |D h| <= Delta
    // (More's lmpar), and the reduction the linear model predicts for it; false when the
    // iteration ends here (a non-finite step).
    bool step(double& predicted);
    // Evaluates x + h; moves there when the actual reduction is at least 1e-4 of the predicted
    // one; updates Delta and lambda from their ratio; tests convergence (`m_done`).
    void acceptOrReject(double predicted);
    // Undamped Gauss-Newton steps after convergence (SolverOptions::refinementSteps).
    void polish();
    // The same steps on a double-double point with extended-precision residuals, when the problem
    // provides them (LeastSquaresProblem::evaluateExtended).
    void polishExtended();
    // Parameters, residuals, Jacobian and covariance into the result; the closing message.
    void finish();

    bool done() const { return m_done; }
    // True when a column of J has shrunk below 1e-8 of its largest norm in this run: the model has
    // (nearly) stopped depending on that parameter, the run ended in a flat region.
    // (The column norms of the last factorisation: O(n), no pass over J.)
    bool columnCollapsed() const {
        for (Eigen::Index j = 0; j < m_n; ++j) {
            if (std::sqrt(m_w.columnNorms2[j]) < 1e-8 * m_w.D[j])
                return true;
        }
        return false;
    }

private:
    void factorise();
    void updateScaling(bool first);
    bool gradientSmall();
    bool solveDamped(double lambda);
    double newtonCorrection(const Matrix& Rlambda, double dxnorm);
    void updateBound(double ratio, double actual, double pnorm, bool blownUp);
    void testConvergence(double actual, double predictedRel, double ratio);
    void accept(double costNew);
    void stop(Termination termination, const char* message = nullptr) {
        m_summary.termination = termination;
        if (message)
            m_summary.message = message;
        m_done = true;
    }
    double scaledNorm(const Vector& v) const { return m_w.D.cwiseProduct(v).norm(); }

    const LeastSquaresProblem& m_problem;
    const SolverOptions& m_options;
    const bool m_identityScaling;  // D = 1 throughout (the fallback run)
    detail::LevenbergMarquardtBuffers& m_w;
    SolverResult& m_result;
    SolverSummary& m_summary;
    Evaluator m_eval;
    const int m_m;
    const int m_n;
    Vector& m_x;  // the current point (in the workspace)
    double m_cost = 0;
    double m_delta = 0;   // the trust region's radius, in the scaled norm |D h|
    double m_lambda = 0;  // the Levenberg-Marquardt parameter of the last step
    double m_xnorm = 0;   // |D x|
    bool m_first = true;  // the first step also bounds Delta by its own length
    bool m_done = false;
    // True while R and Q^T r come from the Cholesky factor of A = J^T J (g = J^T r kept too).
    bool m_fromNormalEquations = false;
};

bool LevenbergMarquardt::start(std::span<const double> x0) {
    m_x = Eigen::Map<const Vector>(x0.data(), static_cast<Eigen::Index>(x0.size()));
    if (static_cast<int>(x0.size()) != m_n || m_m < 1 || m_n < 1) {
        m_summary.message = "the problem and the starting point disagree on the parameter count";
        return false;
    }
    if (!m_eval.residualsAndJacobian(m_x, m_w.r, m_w.J)) {
        m_summary.termination = Termination::InvalidStart;
        m_summary.message = "the model cannot be evaluated at the starting point";
        return false;
    }
    m_cost = 0.5 * m_w.r.squaredNorm();
    m_summary.initialCost = m_cost;
    m_w.xNew.resize(m_n);
    m_summary.termination = Termination::MaxIterations;
    // J = Q R once per Jacobian; every trial step then solves the small system [R; sqrt(lambda) D]
    // h = [-Q^T r; 0] (MINPACK's approach: More 1978, section 3). With the normal equations (R from
    // the Cholesky factor of J^T J) the same step comes from the Cholesky factor of J^T J + lambda
    // D^2, a few dozen operations. Each factorisation also gives the squared column norms of J,
    // from which the scaling D is kept.
    m_w.R.resize(m_n, m_n);
    m_w.qtr.resize(m_n);
    m_w.S.resize(2 * m_n, m_n);
    m_w.rhs.resize(2 * m_n);
    m_w.columnNorms2.resize(m_n);
    factorise();
    updateScaling(true);
    // The initial bound: 100 |D x0| (MINPACK's factor), or 100 when x0 = 0.
    m_delta = m_options.initialStepBound * (m_xnorm > 0 ? m_xnorm : 1.0);
    m_lambda = 0;
    if (m_cost == 0)
        stop(Termination::FunctionTolerance);
    else if (gradientSmall())
        stop(Termination::GradientTolerance);
    return true;
}

void LevenbergMarquardt::factorise() {
    const int m = m_m, n = m_n;
    m_fromNormalEquations = false;
    if (m_options.linearSolver == LinearSolver::NormalEquations) {
        // R from the Cholesky factor of J^T J and Q^T r = R^-T J^T r: the same small system at a
        // fraction of the cost; QR when J^T J is not numerically positive definite. J^T J and J^T r
        // by plain loops over the rows (tall, thin J: cheaper than GEMM).
        m_w.A.resize(n, n);
        m_w.g.resize(n);
        detail::gram(m_w.J.data(), static_cast<std::size_t>(m), static_cast<std::size_t>(n), {},
                     {m_w.r.data(), static_cast<std::size_t>(m)}, m_w.A.data(), m_w.g.data());
        m_w.columnNorms2 = m_w.A.diagonal();
        m_w.llt.compute(m_w.A);
        if (m_w.llt.info() == Eigen::Success) {
            m_w.R = m_w.llt.matrixU();
            m_w.qtr = m_w.llt.matrixL().solve(m_w.g);
            m_fromNormalEquations =
                allFinite(m_w.R.data(), static_cast<std::size_t>(m_w.R.size())) &&
                allFinite(m_w.qtr.data(), static_cast<std::size_t>(n));
            if (m_fromNormalEquations)
                return;
        }
    }
    m_w.Jc = m_w.J;
    m_w.qr.compute(m_w.Jc);
    m_w.R = m_w.qr.matrixQR().topRows(n).triangularView<Eigen::Upper>();
    m_w.qtr = (m_w.qr.householderQ().transpose() * m_w.r).head(n);
    m_w.columnNorms2 = m_w.J.colwise().squaredNorm().transpose();
}

// MINPACK's mode 1: D_j = the largest norm of column j of J seen so far (1 for a zero column), or
// the identity (the fallback run).
void LevenbergMarquardt::updateScaling(bool first) {
    if (first)
        m_w.D.setOnes(m_n);
    if (!m_identityScaling) {
        for (Eigen::Index j = 0; j < m_n; ++j) {
            const double norm = std::sqrt(m_w.columnNorms2[j]);
            if (first)
                m_w.D[j] = norm > 0 ? norm : 1.0;
            else
                m_w.D[j] = std::max(m_w.D[j], norm);
        }
    }
    m_xnorm = scaledNorm(m_x);
}

bool LevenbergMarquardt::gradientSmall() {
    if (m_options.gradientTolerance <= 0)
        return false;
    const double rnorm = m_w.r.norm();
    if (rnorm == 0.0)
        return true;
    const Vector gradient = m_w.J.transpose() * m_w.r;
    double worst = 0;
    for (Eigen::Index j = 0; j < m_n; ++j) {
        const double cn = m_w.J.col(j).norm();
        if (cn > 0)
            worst = std::max(worst, std::abs(gradient[j]) / (cn * rnorm));
    }
    return worst <= m_options.gradientTolerance;
}

// h(lambda) solving [R; sqrt(lambda) D] h = [-Q^T r; 0] in the least-squares sense, and Rl, the
// triangular factor of that system (Rl^T Rl = R^T R + lambda D^2; for lambda = 0, R itself, left
// in place). lambda = 0 is the Gauss-Newton
// step, refused (false) when R is numerically singular. With the normal equations the damped step
// comes from the Cholesky factor of A + lambda D^2 (QR when that fails).
bool LevenbergMarquardt::solveDamped(double lambda) {
    const Eigen::Index n = m_n;
    if (lambda == 0) {
        const double largest = m_w.R.diagonal().cwiseAbs().maxCoeff();
        if (!(m_w.R.diagonal().cwiseAbs().minCoeff() > static_cast<double>(n) * kEpsilon * largest))
            return false;
        m_w.h = -m_w.qtr;
        m_w.R.triangularView<Eigen::Upper>().solveInPlace(m_w.h);  // Rl = R: not copied
        return allFinite(m_w.h.data(), static_cast<std::size_t>(n));
    }
    if (m_fromNormalEquations) {
        m_w.dampedA = m_w.A;
        for (Eigen::Index j = 0; j < n; ++j)
            m_w.dampedA(j, j) += lambda * m_w.D[j] * m_w.D[j];
        m_w.dampedLlt.compute(m_w.dampedA);
        if (m_w.dampedLlt.info() == Eigen::Success) {
            m_w.h = -m_w.g;
            m_w.dampedLlt.solveInPlace(m_w.h);
            m_w.Rl = m_w.dampedLlt.matrixU();
            return allFinite(m_w.h.data(), static_cast<std::size_t>(n));
        }
    }
    m_w.S.topRows(n) = m_w.R;
    m_w.S.bottomRows(n).setZero();
    const double root = std::sqrt(lambda);
    for (Eigen::Index j = 0; j < n; ++j)
        m_w.S(n + j, j) = root * m_w.D[j];
    m_w.rhs.head(n) = -m_w.qtr;
    m_w.rhs.tail(n).setZero();
    m_w.dampedQr.compute(m_w.S);
    m_w.h = m_w.dampedQr.solve(m_w.rhs);
    m_w.Rl = m_w.dampedQr.matrixQR().topRows(n).triangularView<Eigen::Upper>();
    return allFinite(m_w.h.data(), static_cast<std::size_t>(n));
}

// phi(lambda) = |D h| - Delta has the derivative -|Rl^-T D^2 h / |D h||^2 |D h| ... ; More's
// Newton correction is (phi / Delta) / |Rl^-T (D^2 h / |D h|)|^2 (lmpar, equation 5.5).
double LevenbergMarquardt::newtonCorrection(const Matrix& Rlambda, double dxnorm) {
    m_w.w = m_w.D.cwiseProduct(m_w.D.cwiseProduct(m_w.h)) / dxnorm;
    Rlambda.triangularView<Eigen::Upper>().transpose().solveInPlace(m_w.w);
    return m_w.w.squaredNorm();
}

bool LevenbergMarquardt::step(double& predicted) {
    ++m_summary.iterations;
    predicted = 0;
    const double delta = m_delta;
    // The Gauss-Newton step when it lies within 1.1 Delta (lambda = 0).
    double parl = 0;
    double dxnorm = 0;
    double fp = 0;
    const bool gaussNewton = solveDamped(0);
    if (gaussNewton) {
        dxnorm = scaledNorm(m_w.h);
        fp = dxnorm - delta;
        if (fp > 0.1 * delta && dxnorm > 0)
            parl = fp / delta / newtonCorrection(m_w.R, dxnorm);  // lower bound on lambda
    }
    if (!gaussNewton || fp > 0.1 * delta) {
        // Upper bound |D^-1 J^T r| / Delta, then More's safeguarded Newton iteration on
        // phi(lambda) = |D h(lambda)| - Delta, to within 10% of Delta (at most 10 solves).
        m_w.w.noalias() = m_w.R.triangularView<Eigen::Upper>().transpose() * m_w.qtr;
        const double gnorm = m_w.w.cwiseQuotient(m_w.D).norm();
        double paru = gnorm / delta;
        if (paru == 0)
            paru = kDwarf / std::min(delta, 0.1);
        double lambda = std::clamp(m_lambda, parl, std::max(parl, paru));
        if (lambda == 0)
            lambda = gaussNewton && dxnorm > 0 ? gnorm / dxnorm : 0;
        for (int k = 1;; ++k) {
            if (lambda == 0)
                lambda = std::max(kDwarf, 0.001 * paru);
            if (!solveDamped(lambda)) {
                stop(Termination::NumericalFailure,
                     "the damped linear system gave a non-finite step");
                return false;
            }
            dxnorm = scaledNorm(m_w.h);
            const double previous = fp;
            fp = dxnorm - delta;
            if (std::abs(fp) <= 0.1 * delta || (parl == 0 && fp <= previous && previous < 0) ||
                k == 10 || dxnorm == 0)
                break;
            const double parc = fp / delta / newtonCorrection(m_w.Rl, dxnorm);
            if (fp > 0)
                parl = std::max(parl, lambda);
            else
                paru = std::min(paru, lambda);
            lambda = std::max(parl, lambda + parc);
        }
        m_lambda = lambda;
    } else {
        m_lambda = 0;
    }
    // Predicted reduction of the cost: 1/2 |J h|^2 + lambda |D h|^2 (More 1978, section 4).
    m_w.Rh.noalias() = m_w.R.triangularView<Eigen::Upper>() * m_w.h;
    const double pnorm = scaledNorm(m_w.h);
    predicted = 0.5 * m_w.Rh.squaredNorm() + m_lambda * pnorm * pnorm;
    if (m_first) {
        m_delta = std::min(m_delta, pnorm);
        m_first = false;
    }
    return true;
}

void LevenbergMarquardt::acceptOrReject(double predicted) {
    // With an analytic Jacobian, a trial point is evaluated with its Jacobian at once (shared work,
    // and most trial points are accepted); with numerical differences only on acceptance.
    m_w.xNew = m_x + m_w.h;
    const double pnorm = scaledNorm(m_w.h);
    const bool evaluated = m_problem.hasJacobian()
                               ? m_eval.residualsAndJacobian(m_w.xNew, m_w.rNew, m_w.JNew)
                               : m_eval.residuals(m_w.xNew, m_w.rNew);
    const double costNew =
        evaluated ? 0.5 * m_w.rNew.squaredNorm() : std::numeric_limits<double>::infinity();
    // Relative actual and predicted reductions (lmder's actred, prered); a trial point whose
    // residual norm grew tenfold (or that cannot be evaluated) counts as actred = -1.
    const bool blownUp = !(costNew < 100.0 * m_cost);
    const double actual = blownUp ? -1.0 : 1.0 - costNew / m_cost;
    const double predictedRel = predicted / m_cost;
    const double ratio = predictedRel != 0 ? actual / predictedRel : 0.0;
    updateBound(ratio, actual, pnorm, blownUp);
    if (ratio >= 1e-4)
        accept(costNew);
    if (!m_done)
        testConvergence(actual, predictedRel, ratio);
}

// lmder's update of the step bound (More 1978, section 7): shrink towards the step by a factor
// from the cubic interpolation of the cost along it when the ratio is below 1/4, double the step's
// length when it is above 3/4 (or the step was Gauss-Newton).
void LevenbergMarquardt::updateBound(double ratio, double actual, double pnorm, bool blownUp) {
    if (ratio <= 0.25) {
        const double directional =
            -(m_w.Rh.squaredNorm() / (2.0 * m_cost)) - m_lambda * pnorm * pnorm / (2.0 * m_cost);
        double factor = actual >= 0 ? 0.5 : 0.5 * directional / (directional + 0.5 * actual);
        if (blownUp || factor < 0.1 || !std::isfinite(factor))
            factor = 0.1;
        m_delta = factor * std::min(m_delta, pnorm / 0.1);
        m_lambda /= factor;
    } else if (m_lambda == 0 || ratio >= 0.75) {
        m_delta = pnorm / 0.5;
        m_lambda *= 0.5;
    }
}

void LevenbergMarquardt::accept(double costNew) {
    m_x = m_w.xNew;
    m_cost = costNew;
    if (m_problem.hasJacobian()) {
        m_w.r.swap(m_w.rNew);
        m_w.J.swap(m_w.JNew);
    } else if (!m_eval.residualsAndJacobian(m_x, m_w.r, m_w.J)) {
        stop(Termination::NumericalFailure, "the Jacobian is not finite at an accepted point");
        return;
    }
    factorise();
    updateScaling(false);
    if (m_cost == 0)
        stop(Termination::FunctionTolerance);
    else if (gradientSmall())
        stop(Termination::GradientTolerance);
}

// lmder's tests: the user's tolerances first, then the limits of double precision.
void LevenbergMarquardt::testConvergence(double actual, double predictedRel, double ratio) {
    const double ftol = m_options.functionTolerance;
    if (std::abs(actual) <= ftol && predictedRel <= ftol && 0.5 * ratio <= 1.0)
        stop(Termination::FunctionTolerance);
    else if (m_delta <= m_options.parameterTolerance * m_xnorm)
        stop(Termination::ParameterTolerance);
    else if (std::abs(actual) <= kEpsilon && predictedRel <= kEpsilon && 0.5 * ratio <= 1.0)
        stop(Termination::NoFurtherReduction, "no step lowers the cost any more");
    else if (m_delta <= kEpsilon * m_xnorm || !(m_delta > 0))
        stop(Termination::NoFurtherReduction, "the trust region has shrunk to rounding level");
}
// Gauss-Newton polish: near the minimum the cost cannot resolve steps finer than about sqrt(machine
// epsilon), but the Gauss-Newton iteration converges on J^T r = 0 to working precision. Steps are
// taken while they keep shrinking (a converging fixed-point iteration) and do not raise the cost by
// more than 1e-9 of itself (rounding noise in small costs); a step is halved up to 8 times in a
// curved valley.
void LevenbergMarquardt::polish() {
    double previousStep = std::numeric_limits<double>::infinity();
    for (int k = 0; m_summary.converged() && k < m_options.refinementSteps; ++k) {
        Vector step = m_w.J.colPivHouseholderQr().solve(-m_w.r);
        if (!allFinite(step.data(), static_cast<std::size_t>(m_n)))
            break;
        bool accepted = false;
        double costNew = m_cost;
        for (int halving = 0; halving <= 8 && !accepted; ++halving, step *= 0.5) {
            if (step.norm() >= previousStep)
                continue;
            m_w.xNew = m_x + step;
            if (!m_eval.residualsAndJacobian(m_w.xNew, m_w.rNew, m_w.JNew))
                continue;
            costNew = 0.5 * m_w.rNew.squaredNorm();
            accepted = costNew <= m_cost * (1.0 + 1e-9);
        }
        if (!accepted)
            break;
        previousStep = (m_w.xNew - m_x).norm();
        const bool tiny = previousStep <= 1e-15 * m_x.norm();
        m_x = m_w.xNew;
        m_w.r.swap(m_w.rNew);
        m_w.J.swap(m_w.JNew);
        m_cost = costNew;
        if (tiny)
            break;
    }
}

// Gauss-Newton in double-double: the point is kept as xHigh + xLow, the residuals come from the
// problem's extended evaluation, the step from J (double: the step only needs the digits of a
// correction). The reported parameters are xHigh (the point rounded to double); the residuals and
// the cost are those of the double-double point, the least-squares minimum the parameters round.
void LevenbergMarquardt::polishExtended() {
    if (!m_summary.converged() || m_options.refinementSteps <= 0)
        return;
    const auto n = static_cast<std::size_t>(m_n);
    const auto m = static_cast<std::size_t>(m_m);
    Vector low = Vector::Zero(m_n), highNew(m_n), lowNew(m_n), r(m_m), rNew(m_m);
    ++m_summary.evaluations;
    if (!m_problem.evaluateExtended({m_x.data(), n}, {low.data(), n}, {r.data(), m}))
        return;
    double cost = 0.5 * r.squaredNorm();
    double previousStep = std::numeric_limits<double>::infinity();
    const Eigen::ColPivHouseholderQR<Matrix> qr(m_w.J);
    for (int k = 0; k < m_options.refinementSteps; ++k) {
        const Vector step = qr.solve(-r);
        const double stepNorm = step.norm();
        if (!std::isfinite(stepNorm) || stepNorm >= previousStep)
            break;
        for (Eigen::Index j = 0; j < m_n; ++j) {
            DoubleDouble s = dd_detail::twoSum(m_x[j], step[j]);
            s.lo += low[j];
            s = dd_detail::quickTwoSum(s.hi, s.lo);
            highNew[j] = s.hi;
            lowNew[j] = s.lo;
        }
        ++m_summary.evaluations;
        if (!m_problem.evaluateExtended({highNew.data(), n}, {lowNew.data(), n}, {rNew.data(), m}))
            break;
        const double costNew = 0.5 * rNew.squaredNorm();
        if (!(costNew <= cost * (1.0 + 1e-9)))
            break;
        previousStep = stepNorm;
        m_x.swap(highNew);
        low.swap(lowNew);
        r.swap(rNew);
        cost = costNew;
    }
    // The Jacobian at the rounded point, the extended residuals and cost.
    if (m_eval.residualsAndJacobian(m_x, m_w.rNew, m_w.JNew))
        m_w.J.swap(m_w.JNew);
    m_w.r = r;
    m_cost = cost;
}

void LevenbergMarquardt::finish() {
    m_summary.finalCost = m_cost;
    m_result.parameters.assign(m_x.data(), m_x.data() + m_n);
    m_result.residuals.assign(m_w.r.data(), m_w.r.data() + m_m);
    m_result.jacobian.assign(m_w.J.data(), m_w.J.data() + m_w.J.size());
    fillCovariance(m_w.J, m_options.linearSolver, m_result);
    if (m_summary.message.empty()) {
        m_summary.message = m_summary.converged() ? "converged" : "stopped before convergence";
    }
}

}  // namespace

SolverResult solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                               const SolverOptions& options) {
    SolverResult result;
    SolverWorkspace workspace;
    solveLeastSquares(problem, start, options, result, workspace);
    return result;
}

namespace {

// One run of the loop from `start`, with MINPACK's column scaling or the identity; true when the
// run stalled (see `stalled`).
bool runOnce(const LeastSquaresProblem& problem, std::span<const double> start,
             const SolverOptions& options, bool identityScaling, SolverResult& result,
             SolverWorkspace& workspace) {
    result.summary = SolverSummary{};
    result.residuals.clear();
    result.jacobian.clear();
    result.unscaledCovariance.clear();
    result.covarianceAvailable = false;
    result.parameters.assign(start.begin(), start.end());
    LevenbergMarquardt solver(problem, options, identityScaling, workspace.buffers(), result);
    if (!solver.start(start))
        return false;
    while (!solver.done() && result.summary.iterations < options.maxIterations) {
        double predicted = 0;
        if (!solver.step(predicted))
            break;
        solver.acceptOrReject(predicted);
    }
    solver.polish();
    solver.polishExtended();
    solver.finish();
    // Stalled: not converged, or stopped where J is rank deficient or a column of J has all but
    // vanished (a flat direction: typically a parameter running off to where the model no longer
    // depends on it, as BoxBOD from NIST's first start, where b2 grows and the model is the
    // constant b1; the column scaling then keeps shrinking the steps along that column).
    return !result.summary.converged() || !result.covarianceAvailable || solver.columnCollapsed();
}

}  // namespace

void solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                       const SolverOptions& options, SolverResult& result,
                       SolverWorkspace& workspace) {
    const bool stalled = runOnce(problem, start, options, false, result, workspace);
    if (!options.identityScalingFallback || !stalled)
        return;
    // The fallback: the same loop with identity scaling (D = 1) from the same start; the run with
    // the lower cost is kept, the iterations and evaluations of both are counted.
    SolverResult second;
    runOnce(problem, start, options, true, second, workspace);
    const int iterations = result.summary.iterations + second.summary.iterations;
    const int evaluations = result.summary.evaluations + second.summary.evaluations;
    const bool better = second.summary.termination != Termination::InvalidStart &&
                        (second.summary.finalCost < result.summary.finalCost ||
                         (second.summary.converged() && !result.summary.converged() &&
                          second.summary.finalCost <= result.summary.finalCost));
    if (better) {
        second.summary.message += " (after a stalled scaled run: identity scaling)";
        result = std::move(second);
    }
    result.summary.iterations = iterations;
    result.summary.evaluations = evaluations;
}

}  // namespace siftwave::fit
