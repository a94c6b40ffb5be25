// Optional cross-check against scipy.optimize.curve_fit (SciPy, a general-purpose reference
// library; Debian package python3-scipy). Runs only where python3 can import scipy; otherwise it
// is skipped (GTEST_SKIP), which ctest reports as skipped, not passed. The CI machine may not
// have scipy.
//
// Same data, same model (Gumbel incidence K/beta exp(-z - exp(-z))), same least-squares
// criterion (smoothing window 1: the raw daily counts): the parameters agree to 1e-6 relative.
#include "siftwave/fit/fit.h"

#include "core/fit_wave_generator.h"

#include "support/python_scipy.h"

#include <gtest/gtest.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>

namespace siftwave::fit {
namespace {

TEST(FitScipy, CurveFitGivesTheSameGumbelParametersToOneInAMillion) {
    const std::string python = siftwave::testing::pythonWithScipy();
    if (python.empty())
        GTEST_SKIP() << "python3-scipy is not installed: cross-check not run";
    test::GeneratedWave g;
    g.size = 40;
    const auto counts = test::generateCounts(g, 2024);
    const std::string dir = ::testing::TempDir();
    const std::string dataPath = dir + "fit_scipy_data.txt";
    const std::string scriptPath = dir + "fit_scipy.py";
    {
        std::ofstream data(dataPath);
        data.precision(17);
        for (std::size_t i = 0; i < counts.size(); ++i)
            data << i << ' ' << counts[i] << '\n';
    }
    FitOptions o;
    o.smoothingWindow = 1;
    o.window = std::pair{0, g.days - 1};
    o.solver.functionTolerance = 1e-15;
    o.solver.parameterTolerance = 1e-15;
    o.solver.refinementSteps = 10;
    auto r = fitSeries({*Date::fromIso("2026-03-02"), counts}, o);
    ASSERT_TRUE(r) << r.error().message;
    ASSERT_TRUE(r->summary.converged());
    const auto p = r->parameterValues();
    {
        std::ofstream script(scriptPath);
        script << "import numpy as np\n"
                  "from scipy.optimize import curve_fit\n"
                  "t, y = np.loadtxt('"
               << dataPath
               << "', unpack=True)\n"
                  "def gumbel(t, K, mu, beta):\n"
                  "    z = (t - mu) / beta\n"
                  "    return K / beta * np.exp(-z - np.exp(-z))\n"
                  "p, _ = curve_fit(gumbel, t, y, p0=["
               << p[0] * 1.05 << ", " << p[1] + 2 << ", " << p[2] * 0.9
               << "], ftol=1e-14, xtol=1e-14, gtol=0, maxfev=100000)\n"
                  "print('%.17g %.17g %.17g' % tuple(p))\n";
    }
    FILE* pipe = popen((python + " " + scriptPath).c_str(), "r");
    ASSERT_NE(pipe, nullptr);
    char buf[256] = {};
    const bool read = std::fgets(buf, sizeof buf, pipe) != nullptr;
    pclose(pipe);
    ASSERT_TRUE(read);
    std::istringstream in(buf);
    double K = 0, mu = 0, beta = 0;
    in >> K >> mu >> beta;
    EXPECT_NEAR(p[0], K, 1e-6 * K);
    EXPECT_NEAR(p[1], mu, 1e-6 * mu);
    EXPECT_NEAR(p[2], beta, 1e-6 * beta);
    std::printf("siftwave K %.10g mu %.10g beta %.10g | curve_fit K %.10g mu %.10g beta %.10g\n",
                p[0], p[1], p[2], K, mu, beta);
}

}  // namespace
}  // namespace siftwave::fit
