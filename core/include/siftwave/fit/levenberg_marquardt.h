#pragma once
// Levenberg-Marquardt for nonlinear least squares: minimise 1/2 sum_i r_i(x)^2.
//
// Trust-region step control as in MINPACK's lmder (J. J. More (1978), "The Levenberg-Marquardt
// algorithm: implementation and theory", Lecture Notes in Mathematics 630, 105-116): each step h
// minimises |r + J h| within the scaled region |D h| <= Delta, D = diag of the largest column
// norms of J seen so far. h solves [J; sqrt(lambda) D] h = [-r; 0] by Householder QR of J once per
// Jacobian and of the small system [R; sqrt(lambda) D] per trial (never forming J^T J unless
// LinearSolver::NormalEquations asks for it), and lambda comes from More's safeguarded Newton
// iteration so that |D h| is within 10% of Delta (lambda = 0, Gauss-Newton, when that step fits).
// The ratio of the actual to the predicted reduction then moves x (ratio >= 1e-4) and Delta
// (halved or more below 1/4, doubled above 3/4). When a scaled run stalls (no convergence, or
// a stop where J is rank deficient) it is repeated with identity scaling and the lower cost kept.
// After convergence, optional undamped Gauss-Newton steps polish the last digits. Problems that
// can evaluate their residuals to about twice double precision (evaluateExtended) get the polish
// and the final residuals, cost and covariance in that precision (a Lanczos-type fit whose
// residuals are at the rounding level of the data).
// Also: D. W. Marquardt (1963), "An algorithm for least-squares estimation of nonlinear
// parameters", SIAM J. Appl. Math. 11(2), 431-441.
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
    /// Optional, for data whose residuals sit at their own rounding level: fills r at the
    /// double-double point x = xHigh + xLow with the residuals computed to about twice double
    /// precision (double_double.h) and rounded to double. The polish then moves the point in that
    /// precision and the final residuals and cost come from here. False: not provided (the
    /// default) or outside the domain.
    virtual bool evaluateExtended(std::span<const double> xHigh, std::span<const double> xLow,
                                  std::span<double> r) const {
        (void)xHigh;
        (void)xLow;
        (void)r;
        return false;
    }
};

enum class LinearSolver {
    QR,               // Householder QR of J: keeps every digit (default; the NIST checks use it)
    NormalEquations,  // Cholesky of J^T J: several times faster for tall, small problems, loses
                      // digits when J is ill-conditioned (falls back to QR if not positive
                      // definite)
};

struct SolverOptions {
    int maxIterations = 200;              // linear solves (accepted or not)
    double functionTolerance = 1e-10;     // stop when a step lowers the cost by <= this * cost
    double parameterTolerance = 1e-10;    // stop when |h| <= this * (|x| + this)
    double gradientTolerance = 0;         // > 0: stop when max_j |J_j . r| / (|J_j| |r|) <= this
                                          // (MINPACK gtol); 0: not checked
    double initialStepBound = 100;        // Delta_0 = this * |D x0| (MINPACK's factor)
    bool identityScalingFallback = true;  // a stalled scaled run is repeated with D = 1
    int refinementSteps = 0;              // undamped Gauss-Newton steps after convergence (0: none)
    LinearSolver linearSolver = LinearSolver::QR;

    /// Usage error when a count or a tolerance is not positive.
    Status validate() const;
};

enum class Termination {
    FunctionTolerance,   // converged: relative cost change below functionTolerance
    ParameterTolerance,  // converged: relative step below parameterTolerance
    GradientTolerance,   // converged: gradient (scaled) below gradientTolerance
    NoFurtherReduction,  // converged as far as double precision allows (trust region at rounding
                         // level)
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
