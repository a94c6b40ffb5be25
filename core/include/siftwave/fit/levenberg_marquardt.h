#pragma once
// Levenberg-Marquardt for nonlinear least squares: minimise 1/2 sum_i r_i(x)^2.
//
// Each iteration solves the damped normal equations
//     (J^T J + lambda D) h = -J^T r,   D = diag of the largest column norms^2 of J seen so far,
// as the linear least-squares problem [J; sqrt(lambda D)] h = [-r; 0] by Householder QR
// (never forming J^T J, so ill-conditioned problems keep their digits). A step is taken when
// the gain ratio rho = (actual reduction) / (reduction predicted by the linear model) is
// positive; lambda then shrinks by max(1/3, 1 - (2 rho - 1)^3), else it grows by nu = 2, 4, 8...
// Sources: D. W. Marquardt (1963), "An algorithm for least-squares estimation of nonlinear
// parameters", SIAM J. Appl. Math. 11(2), 431-441; J. J. More (1978), "The Levenberg-Marquardt
// algorithm: implementation and theory", Lecture Notes in Mathematics 630, 105-116 (scaling D);
// K. Madsen, H. B. Nielsen & O. Tingleff (2004), "Methods for Non-Linear Least Squares
// Problems", 2nd ed., DTU, section 3.2 (the damping update).
//
// At the solution, the unscaled covariance (J^T J)^-1 is returned; multiplied by
// s^2 = 2 cost / (m - n) it is the usual asymptotic covariance of the estimates. It comes from a
// column-pivoted QR of the column-scaled J (rank-revealing); with LinearSolver::NormalEquations
// it comes from the Cholesky factor of the column-scaled J^T J instead when that is well
// conditioned (condition number <= 1e8, i.e. cond(J) <= 1e4, so at most ~1e-8 of relative
// accuracy is lost), and from the QR otherwise.
//
// The solver is compiled once; problems implement LeastSquaresProblem. Eigen stays inside.

#include <memory>
#include <span>
#include <string>
#include <vector>

#include "siftwave/result.h"

namespace siftwave::fit {

class LeastSquaresProblem {
public:
    virtual ~LeastSquaresProblem() = default;
    virtual int residualCount() const = 0;
    virtual int parameterCount() const = 0;
    /// Fills r (residualCount()) at x and, when `jacobian` is not empty and hasJacobian(),
    /// dr/dx row-major (residualCount() x parameterCount()). Returns false when x is outside
    /// the problem's domain (the solver then treats the step as a failure and damps more).
    virtual bool evaluate(std::span<const double> x, std::span<double> r,
                          std::span<double> jacobian) const = 0;
    /// False: the solver differentiates numerically (central differences).
    virtual bool hasJacobian() const { return true; }
};

enum class LinearSolver {
    QR,               // Householder QR of J: keeps every digit (default; the NIST checks use it)
    NormalEquations,  // Cholesky of J^T J: several times faster for tall, small problems, loses
                      // digits when J is ill-conditioned (falls back to QR if not positive
                      // definite)
};

struct SolverOptions {
    int maxIterations = 200;            // linear solves (accepted or not)
    double functionTolerance = 1e-10;   // stop when a step lowers the cost by <= this * cost
    double parameterTolerance = 1e-10;  // stop when |h| <= this * (|x| + this)
    double gradientTolerance = 0;       // > 0: stop when max_j |J_j . r| / (|J_j| |r|) <= this
                                        // (MINPACK gtol); 0: not checked
    double initialDamping = 1e-3;       // lambda_0 (dimensionless: the damping is lambda D)
    int refinementSteps = 0;            // undamped Gauss-Newton steps after convergence (0: none)
    LinearSolver linearSolver = LinearSolver::QR;

    /// Usage error when a count or a tolerance is not positive.
    Status validate() const;
};

enum class Termination {
    FunctionTolerance,   // converged: relative cost change below functionTolerance
    ParameterTolerance,  // converged: relative step below parameterTolerance
    GradientTolerance,   // converged: gradient (scaled) below gradientTolerance
    NoFurtherReduction,  // converged as far as double precision allows (damping saturated)
    MaxIterations,       // not converged: iteration limit reached
    InvalidStart,        // not run: the starting point is outside the domain or gives NaN
    NumericalFailure,    // not converged: NaN/Inf in the Jacobian or a singular system
};

/// "function_tolerance", "parameter_tolerance", ... (stable names for JSON).
const char* terminationName(Termination termination);
/// True for the four converged reasons.
bool isConverged(Termination termination);

struct SolverSummary {
    Termination termination = Termination::InvalidStart;
    int iterations = 0;      // linear solves
    int evaluations = 0;     // residual evaluations (Jacobians not counted)
    double initialCost = 0;  // 1/2 sum r^2 at the start
    double finalCost = 0;
    std::string message;

    bool converged() const { return isConverged(termination); }
    /// "converged (function_tolerance) in 12 iterations, cost 3.2e+01 -> 1.1e-01".
    std::string brief() const;
};

struct SolverResult {
    std::vector<double> parameters;
    std::vector<double> residuals;
    /// dr/dx at the solution, row-major m x n (the Jacobian the covariance comes from).
    std::vector<double> jacobian;
    /// (J^T J)^-1 at the solution, row-major n x n; NaN when J is rank-deficient.
    std::vector<double> unscaledCovariance;
    bool covarianceAvailable = false;
    SolverSummary summary;
};

namespace detail {
struct LevenbergMarquardtBuffers;  // levenberg_marquardt.cpp
}

/// The solver's working memory: the residuals and Jacobians, the factorisations and the step
/// (Ceres passes its evaluators' scratch the same way). Made once and passed to every solve of
/// a fit or of a batch worker, it keeps its storage from one solve to the next, so thousands of
/// solves of similar size make no large allocation. A workspace serves one solve at a time:
/// solves that run at once (on other threads, or a problem whose evaluate() solves another
/// problem) each take their own, so re-entrancy follows from the arguments.
class SolverWorkspace {
public:
    SolverWorkspace();
    ~SolverWorkspace();
    SolverWorkspace(SolverWorkspace&&) noexcept;
    SolverWorkspace& operator=(SolverWorkspace&&) noexcept;

    detail::LevenbergMarquardtBuffers& buffers() { return *m_buffers; }

private:
    std::unique_ptr<detail::LevenbergMarquardtBuffers> m_buffers;
};

/// One solve with a workspace of its own (for single problems; a batch passes one, below).
SolverResult solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                               const SolverOptions& options = {});

/// The same into `result`, whose vectors keep their storage, with the working memory of
/// `workspace`: a batch fit that solves thousands of problems of similar size then makes no
/// large allocation per solve. `start` must not alias `result.parameters`.
void solveLeastSquares(const LeastSquaresProblem& problem, std::span<const double> start,
                       const SolverOptions& options, SolverResult& result,
                       SolverWorkspace& workspace);

}  // namespace siftwave::fit
