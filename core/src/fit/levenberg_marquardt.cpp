#include "siftwave/fit/levenberg_marquardt.h"

#include "fit/gram.h"

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
    if (!(initialDamping > 0))
        return makeError(ErrorCode::Usage, "initialDamping must be positive");
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
    Vector D, xNew, qtr, rhs, h, g, columnNorms2, Ah, qtrPlusRh;
    Matrix R, S, A, dampedA;
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

// ---------------------------------------------------------------- the solver's
// steps One solve, in the steps of the header's description (after Ceres' TrustRegionMinimizer):
// start (evaluate and factorise at x0), step (the damped step and its predicted reduction), accept
// or reject (the gain ratio moves x and the damping), polish (Gauss-Newton refinement), finish (the
// result and the covariance).
class LevenbergMarquardt {
public:
    LevenbergMarquardt(const LeastSquaresProblem& problem, const SolverOptions& options,
                       detail::LevenbergMarquardtBuffers& work, SolverResult& result)
        : m_problem(problem),
          m_options(options),
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
    // One damped step h and the reduction the linear model predicts for it; false when the
    // iteration ends here (a non-finite step, or a step below the parameter tolerance).
    bool step(double& predicted);
    // Evaluates x + h; true when it lowers the cost (gain ratio rho > 0), then moves there. False:
    // the damping grows. Either way, `m_done` says whether the iteration has ended.
    void acceptOrReject(double predicted);
    // Undamped Gauss-Newton steps after convergence (SolverOptions::refinementSteps).
    void polish();
    // Parameters, residuals, Jacobian and covariance into the result; the closing message.
    void finish();

    bool done() const { return m_done; }

private:
    void factorise();
    bool gradientSmall();
    bool dampedNormalStep(double& predicted);
    void dampedQrStep(double& predicted);
    void accept(double rho, double costNew);
    void reject();
    void stop(Termination termination, const char* message = nullptr) {
        m_summary.termination = termination;
        if (message)
            m_summary.message = message;
        m_done = true;
    }

    const LeastSquaresProblem& m_problem;
    const SolverOptions& m_options;
    detail::LevenbergMarquardtBuffers& m_w;
    SolverResult& m_result;
    SolverSummary& m_summary;
    Evaluator m_eval;
    const int m_m;
    const int m_n;
    Vector& m_x;  // the current point (in the workspace)
    double m_cost = 0;
    double m_lambda = 0;
    double m_nu = 2.0;
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
    m_lambda = m_options.initialDamping;
    m_nu = 2.0;
    m_summary.termination = Termination::MaxIterations;
    // J = Q R once per Jacobian; every damped step then solves the small system [R; sqrt(lambda D)]
    // h = [-Q^T r; 0] (MINPACK's approach: More 1978, section 3). With the normal equations (R from
    // the Cholesky factor of J^T J) the same step comes from the Cholesky factor of J^T J + lambda
    // D (dampedNormalStep below), a few dozen operations. Each factorisation also gives the squared
    // column norms of J (the diagonal of J^T J), from which the damping scale D is kept.
    m_w.R.resize(m_n, m_n);
    m_w.qtr.resize(m_n);
    m_w.S.resize(2 * m_n, m_n);
    m_w.rhs.resize(2 * m_n);
    m_w.columnNorms2.resize(m_n);
    factorise();
    m_w.D = m_w.columnNorms2.cwiseMax(1e-300);
    if (gradientSmall())
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

// The damped step from the normal equations: (A + lambda D) h = -g, whose solution is that of the
// least-squares system [R; sqrt(lambda D)] h = [-Q^T r; 0] when R^T R = A and R^T Q^T r = g; the
// predicted reduction 0.5 (|Q^T r|^2 - |Q^T r + R h|^2) is then -g.h - 0.5 h^T A h. False when A +
// lambda D is not numerically positive definite (the caller then solves the system by QR).
bool LevenbergMarquardt::dampedNormalStep(double& predicted) {
    m_w.dampedA = m_w.A;
    for (Eigen::Index j = 0; j < m_n; ++j)
        m_w.dampedA(j, j) += m_lambda * m_w.D[j];
    m_w.dampedLlt.compute(m_w.dampedA);
    if (m_w.dampedLlt.info() != Eigen::Success)
        return false;
    m_w.h = -m_w.g;
    m_w.dampedLlt.solveInPlace(m_w.h);
    m_w.Ah.noalias() = m_w.A * m_w.h;
    predicted = -m_w.g.dot(m_w.h) - 0.5 * m_w.h.dot(m_w.Ah);
    return true;
}

// The damped step by QR of the small system [R; sqrt(lambda D)] h = [-Q^T r; 0].
void LevenbergMarquardt::dampedQrStep(double& predicted) {
    const Eigen::Index n = m_n;
    m_w.S.topRows(n) = m_w.R;
    m_w.S.bottomRows(n).setZero();
    for (Eigen::Index j = 0; j < n; ++j)
        m_w.S(n + j, j) = std::sqrt(m_lambda * m_w.D[j]);
    m_w.rhs.head(n) = -m_w.qtr;
    m_w.rhs.tail(n).setZero();
    m_w.dampedQr.compute(m_w.S);
    m_w.h = m_w.dampedQr.solve(m_w.rhs);
    m_w.qtrPlusRh.noalias() = m_w.R * m_w.h;
    m_w.qtrPlusRh += m_w.qtr;
    predicted = 0.5 * (m_w.qtr.squaredNorm() - m_w.qtrPlusRh.squaredNorm());
}

bool LevenbergMarquardt::step(double& predicted) {
    ++m_summary.iterations;
    predicted = 0;
    if (!(m_fromNormalEquations && dampedNormalStep(predicted)))
        dampedQrStep(predicted);
    if (!allFinite(m_w.h.data(), static_cast<std::size_t>(m_n))) {
        stop(Termination::NumericalFailure, "the damped linear system gave a non-finite step");
        return false;
    }
    if (m_w.h.norm() <=
        m_options.parameterTolerance * (m_x.norm() + m_options.parameterTolerance)) {
        stop(Termination::ParameterTolerance);
        return false;
    }
    return true;
}

void LevenbergMarquardt::acceptOrReject(double predicted) {
    // With an analytic Jacobian, a trial point is evaluated with its Jacobian at once (shared work,
    // and most trial points are accepted); with numerical differences only on acceptance.
    m_w.xNew = m_x + m_w.h;
    double rho = -1.0;
    double costNew = m_cost;
    const bool evaluated = m_problem.hasJacobian()
                               ? m_eval.residualsAndJacobian(m_w.xNew, m_w.rNew, m_w.JNew)
                               : m_eval.residuals(m_w.xNew, m_w.rNew);
    if (evaluated) {
        costNew = 0.5 * m_w.rNew.squaredNorm();
        if (predicted > 0)
            rho = (m_cost - costNew) / predicted;
    }
    if (rho > 0)
        accept(rho, costNew);
    else
        reject();
}

void LevenbergMarquardt::accept(double rho, double costNew) {
    const double reduction = m_cost - costNew;
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
    m_w.D = m_w.D.cwiseMax(m_w.columnNorms2);
    m_lambda *= std::max(1.0 / 3.0, 1.0 - std::pow(2.0 * rho - 1.0, 3));
    m_nu = 2.0;
    if (reduction <= m_options.functionTolerance * m_cost)
        stop(Termination::FunctionTolerance);
    else if (gradientSmall())
        stop(Termination::GradientTolerance);
}

void LevenbergMarquardt::reject() {
    m_lambda *= m_nu;
    m_nu *= 2.0;
    if (m_lambda > 1e30 || m_nu > 1e30)
        stop(Termination::NoFurtherReduction, "no step lowers the cost any more");
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

void solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                       const SolverOptions& options, SolverResult& result,
                       SolverWorkspace& workspace) {
    result.summary = SolverSummary{};
    result.residuals.clear();
    result.jacobian.clear();
    result.unscaledCovariance.clear();
    result.covarianceAvailable = false;
    result.parameters.assign(start.begin(), start.end());
    LevenbergMarquardt solver(problem, options, workspace.buffers(), result);
    if (!solver.start(start))
        return;
    while (!solver.done() && result.summary.iterations < options.maxIterations) {
        double predicted = 0;
        if (!solver.step(predicted))
            break;
        solver.acceptOrReject(predicted);
    }
    solver.polish();
    solver.finish();
}

}  // namespace siftwave::fit
