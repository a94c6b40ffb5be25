#include "siftwave/fit/levenberg_marquardt.h"

#include "fit/gram.h"

#include <Eigen/Dense>

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <limits>

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

SolverResult solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                               const SolverOptions& options) {
    SolverResult result;
    solveLeastSquares(problem, start, options, result);
    return result;
}

void solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                       const SolverOptions& options, SolverResult& result) {
    result.summary = SolverSummary{};
    result.residuals.clear();
    result.jacobian.clear();
    result.unscaledCovariance.clear();
    result.covarianceAvailable = false;
    SolverSummary& summary = result.summary;
    const int m = problem.residualCount();
    const int n = problem.parameterCount();
    Vector x = Eigen::Map<const Vector>(start.data(), static_cast<Eigen::Index>(start.size()));
    result.parameters.assign(start.begin(), start.end());
    if (static_cast<int>(start.size()) != n || m < 1 || n < 1) {
        summary.message = "the problem and the starting point disagree on the parameter count";
        return;
    }
    Evaluator eval(problem, summary);
    // Working memory is kept per thread: a batch fit calls the solver thousands of times and
    // fresh allocations of these sizes make the allocator return and re-fault pages each time.
    thread_local Vector r, rNew;
    thread_local Matrix J, JNew;
    thread_local Eigen::MatrixXd
        Jc;  // column-major copy: Householder QR runs down contiguous columns
    if (!eval.residualsAndJacobian(x, r, J)) {
        summary.termination = Termination::InvalidStart;
        summary.message = "the model cannot be evaluated at the starting point";
        return;
    }
    double cost = 0.5 * r.squaredNorm();
    summary.initialCost = cost;

    // The small n-sized work arrays are per thread too (resize keeps the storage of equal sizes).
    thread_local Vector D, xNew, qtr, rhs, h, g, columnNorms2;
    thread_local Matrix R, S, A;
    thread_local Eigen::LLT<Matrix> llt;
    thread_local Eigen::HouseholderQR<Matrix> dampedQr;
    thread_local Eigen::HouseholderQR<Eigen::MatrixXd> qr;
    xNew.resize(n);
    double lambda = options.initialDamping;
    double nu = 2.0;
    summary.termination = Termination::MaxIterations;
    bool haveTermination = false;
    // With an analytic Jacobian, a trial point is evaluated with its Jacobian at once (shared
    // work, and most trial points are accepted); with numerical differences only on acceptance.
    const bool jacobianWithTrial = problem.hasJacobian();

    // J = Q R once per Jacobian; every damped step then solves the small system
    // [R; sqrt(lambda D)] h = [-Q^T r; 0] (MINPACK's approach: More 1978, section 3). With the
    // normal equations (R from the Cholesky factor of J^T J) the same step comes from the
    // Cholesky factor of J^T J + lambda D (dampedNormalStep below), a few dozen operations.
    // Each factorisation also gives the squared column norms of J (the diagonal of J^T J), from
    // which the damping scale D is kept.
    R.resize(n, n);
    qtr.resize(n);
    S.resize(2 * n, n);
    rhs.resize(2 * n);
    columnNorms2.resize(n);
    // True while R and Q^T r come from the Cholesky factor of A = J^T J (g = J^T r kept too).
    bool fromNormalEquations = false;
    auto factorise = [&]() {
        fromNormalEquations = false;
        if (options.linearSolver == LinearSolver::NormalEquations) {
            // R from the Cholesky factor of J^T J and Q^T r = R^-T J^T r: the same small system
            // at a fraction of the cost; QR when J^T J is not numerically positive definite.
            // J^T J and J^T r by plain loops over the rows (tall, thin J: cheaper than GEMM).
            A.resize(n, n);
            g.resize(n);
            detail::gram(J.data(), static_cast<std::size_t>(m), static_cast<std::size_t>(n), {},
                         {r.data(), static_cast<std::size_t>(m)}, A.data(), g.data());
            columnNorms2 = A.diagonal();
            llt.compute(A);
            if (llt.info() == Eigen::Success) {
                R = llt.matrixU();
                qtr = llt.matrixL().solve(g);
                fromNormalEquations = allFinite(R.data(), static_cast<std::size_t>(R.size())) &&
                                      allFinite(qtr.data(), static_cast<std::size_t>(n));
                if (fromNormalEquations)
                    return;
            }
        }
        Jc = J;
        qr.compute(Jc);
        R = qr.matrixQR().topRows(n).triangularView<Eigen::Upper>();
        qtr = (qr.householderQ().transpose() * r).head(n);
        columnNorms2 = J.colwise().squaredNorm().transpose();
    };
    factorise();
    D = columnNorms2.cwiseMax(1e-300);

    auto gradientSmall = [&]() {
        if (options.gradientTolerance <= 0)
            return false;
        const double rnorm = r.norm();
        if (rnorm == 0.0)
            return true;
        const Vector gradient = J.transpose() * r;
        double worst = 0;
        for (Eigen::Index j = 0; j < n; ++j) {
            const double cn = J.col(j).norm();
            if (cn > 0)
                worst = std::max(worst, std::abs(gradient[j]) / (cn * rnorm));
        }
        return worst <= options.gradientTolerance;
    };
    if (gradientSmall()) {
        summary.termination = Termination::GradientTolerance;
        haveTermination = true;
    }

    // The damped step from the normal equations: (A + lambda D) h = -g, whose solution is that
    // of the least-squares system [R; sqrt(lambda D)] h = [-Q^T r; 0] when R^T R = A and
    // R^T Q^T r = g; the predicted reduction 0.5 (|Q^T r|^2 - |Q^T r + R h|^2) is then
    // -g.h - 0.5 h^T A h. False when A + lambda D is not numerically positive definite (the
    // caller then solves the system by QR).
    thread_local Matrix dampedA;
    thread_local Eigen::LLT<Matrix> dampedLlt;
    thread_local Vector Ah;
    auto dampedNormalStep = [&](double& predicted) {
        dampedA = A;
        for (Eigen::Index j = 0; j < n; ++j)
            dampedA(j, j) += lambda * D[j];
        dampedLlt.compute(dampedA);
        if (dampedLlt.info() != Eigen::Success)
            return false;
        h = -g;
        dampedLlt.solveInPlace(h);
        Ah.noalias() = A * h;
        predicted = -g.dot(h) - 0.5 * h.dot(Ah);
        return true;
    };
    thread_local Vector qtrPlusRh;

    while (!haveTermination && summary.iterations < options.maxIterations) {
        ++summary.iterations;
        double predicted = 0;
        if (!(fromNormalEquations && dampedNormalStep(predicted))) {
            S.topRows(n) = R;
            S.bottomRows(n).setZero();
            for (Eigen::Index j = 0; j < n; ++j)
                S(n + j, j) = std::sqrt(lambda * D[j]);
            rhs.head(n) = -qtr;
            rhs.tail(n).setZero();
            dampedQr.compute(S);
            h = dampedQr.solve(rhs);
            qtrPlusRh.noalias() = R * h;
            qtrPlusRh += qtr;
            predicted = 0.5 * (qtr.squaredNorm() - qtrPlusRh.squaredNorm());
        }
        if (!allFinite(h.data(), static_cast<std::size_t>(n))) {
            summary.termination = Termination::NumericalFailure;
            summary.message = "the damped linear system gave a non-finite step";
            break;
        }
        if (h.norm() <= options.parameterTolerance * (x.norm() + options.parameterTolerance)) {
            summary.termination = Termination::ParameterTolerance;
            break;
        }
        xNew = x + h;
        double rho = -1.0;
        double costNew = cost;
        const bool evaluated = jacobianWithTrial ? eval.residualsAndJacobian(xNew, rNew, JNew)
                                                 : eval.residuals(xNew, rNew);
        if (evaluated) {
            costNew = 0.5 * rNew.squaredNorm();
            if (predicted > 0)
                rho = (cost - costNew) / predicted;
        }
        if (rho > 0) {
            const double reduction = cost - costNew;
            x = xNew;
            cost = costNew;
            if (jacobianWithTrial) {
                r.swap(rNew);
                J.swap(JNew);
            } else if (!eval.residualsAndJacobian(x, r, J)) {
                summary.termination = Termination::NumericalFailure;
                summary.message = "the Jacobian is not finite at an accepted point";
                break;
            }
            factorise();
            D = D.cwiseMax(columnNorms2);
            lambda *= std::max(1.0 / 3.0, 1.0 - std::pow(2.0 * rho - 1.0, 3));
            nu = 2.0;
            if (reduction <= options.functionTolerance * cost) {
                summary.termination = Termination::FunctionTolerance;
                break;
            }
            if (gradientSmall()) {
                summary.termination = Termination::GradientTolerance;
                break;
            }
        } else {
            lambda *= nu;
            nu *= 2.0;
            if (lambda > 1e30 || nu > 1e30) {
                summary.termination = Termination::NoFurtherReduction;
                summary.message = "no step lowers the cost any more";
                break;
            }
        }
    }

    // Gauss-Newton polish: near the minimum the cost cannot resolve steps finer than about
    // sqrt(machine epsilon), but the Gauss-Newton iteration converges on J^T r = 0 to working
    // precision. Steps are taken while they keep shrinking (a converging fixed-point iteration)
    // and do not raise the cost by more than 1e-9 of itself (rounding noise in small costs);
    // a step is halved up to 8 times in a curved valley.
    double previousStep = std::numeric_limits<double>::infinity();
    for (int k = 0; summary.converged() && k < options.refinementSteps; ++k) {
        Vector step = J.colPivHouseholderQr().solve(-r);
        if (!allFinite(step.data(), static_cast<std::size_t>(n)))
            break;
        bool accepted = false;
        double costNew = cost;
        for (int halving = 0; halving <= 8 && !accepted; ++halving, step *= 0.5) {
            if (step.norm() >= previousStep)
                continue;
            xNew = x + step;
            if (!eval.residualsAndJacobian(xNew, rNew, JNew))
                continue;
            costNew = 0.5 * rNew.squaredNorm();
            accepted = costNew <= cost * (1.0 + 1e-9);
        }
        if (!accepted)
            break;
        previousStep = (xNew - x).norm();
        const bool tiny = previousStep <= 1e-15 * x.norm();
        x = xNew;
        r.swap(rNew);
        J.swap(JNew);
        cost = costNew;
        if (tiny)
            break;
    }

    summary.finalCost = cost;
    result.parameters.assign(x.data(), x.data() + n);
    result.residuals.assign(r.data(), r.data() + m);
    result.jacobian.assign(J.data(), J.data() + J.size());
    fillCovariance(J, options.linearSolver, result);
    if (summary.message.empty()) {
        summary.message = summary.converged() ? "converged" : "stopped before convergence";
    }
}

}  // namespace siftwave::fit
