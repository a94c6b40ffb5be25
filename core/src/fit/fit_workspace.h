#pragma once
// The scratch memory of a fit (internal to the fit's .cpp files; FitWorkspace in fit.h owns one).
// Every buffer a fit writes besides its result lives here and is passed to the step that
// uses it, so that a batch worker that fits thousands of regions with one workspace allocates
// these once, and two fits that run at once simply hold two workspaces.

#include "fit/smoothed_least_squares.h"
#include "siftwave/fit/levenberg_marquardt.h"
#include "siftwave/fit/models.h"

#include <vector>

namespace siftwave::fit::detail {

struct FitBuffers {
    std::vector<double> smoothed;         // the centred average of the counts, partial edges
    std::vector<double> startT, startY;   // the start: days and incidence per day (step 3)
    std::vector<double> t, y, w;          // the LSQ target: days, values, weights (step 2)
    SmoothedLeastSquares::Workspace lsq;  // the LSQ problem's model days
    SolverResult solution;                // the LSQ solve
    SolverWorkspace solver;               // the solver's matrices (LSQ and likelihood)
    GuessWorkspace guess;                 // the start's linearisation
    std::vector<double> sandwich;         // G, P and e^2 of the LSQ covariance (step 4)
    std::vector<double> modelStorage;     // likelihood fits: the model and its Jacobian
    std::vector<double> loadDays;         // the infectious load's daily incidence
};

}  // namespace siftwave::fit::detail
