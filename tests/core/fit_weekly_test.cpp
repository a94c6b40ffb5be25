// Fitting weekly counts: the model's expected count of a week.
#include "siftwave/fit/models.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

namespace siftwave::fit {
namespace {

struct ModelCase {
    ModelKind kind;
    std::vector<double> p;
};

// One case per model, each a wave a few days to two weeks wide, peaking near day 45.
const std::vector<ModelCase> kCases = {{ModelKind::Gumbel, {5000, 44.3, 6.5}},
                                       {ModelKind::Logistic, {800, 41.7, 3.2}},
                                       {ModelKind::Richards, {3000, 46.1, 4.0, 0.6}},
                                       {ModelKind::LogNormal, {2000, 3.8, 0.25}}};

// Week grids that start on the window's first day, three weeks before it and three days after
// it (weeks that are not the window's own).
constexpr double kGridStarts[] = {0.0, -21.0, 3.0};
constexpr std::size_t kWeeks = 16;

// models.h, "Periods longer than a day": a week's expected count is the daily model summed over
// its seven days (the day rule of the daily fit; common practice, no source). Checked against
// the per-time evaluation incidence(), which shares no code with the day grid of
// countsOnPeriods(), to 1e-12 relative for every model, with and without the Jacobian.
TEST(FitWeekly, ExpectedCountOfAWeekIsTheDailyModelSummedOverItsSevenDays) {
    for (const auto& [kind, p] : kCases) {
        const WaveModel& m = waveModel(kind);
        const std::size_t np = p.size();
        for (double t0 : kGridStarts) {
            SCOPED_TRACE(std::string(modelName(kind)) + " from day " + std::to_string(t0));
            std::vector<double> weeks(kWeeks), weeksOnly(kWeeks), jac(kWeeks * np);
            m.countsOnPeriods(t0, 7, p, weeks, jac);
            m.countsOnPeriods(t0, 7, p, weeksOnly);
            std::vector<double> t(7), f(7), jf(7 * np);
            for (std::size_t w = 0; w < kWeeks; ++w) {
                for (std::size_t k = 0; k < 7; ++k)
                    t[k] = t0 + static_cast<double>(7 * w + k);
                m.incidence(t, p, f, jf);
                double sum = 0;
                for (double v : f)
                    sum += v;
                EXPECT_NEAR(weeks[w], sum, 1e-12 * sum) << "week " << w;
                EXPECT_EQ(weeksOnly[w], weeks[w]) << "week " << w;
                for (std::size_t j = 0; j < np; ++j) {
                    double column = 0, scale = 0;
                    for (std::size_t k = 0; k < 7; ++k) {
                        column += jf[k * np + j];
                        scale += std::abs(jf[k * np + j]);
                    }
                    // Relative to the sum of magnitudes: a column sum can cancel to near zero.
                    EXPECT_NEAR(jac[w * np + j], column, 1e-12 * scale) << "week " << w << " " << j;
                }
            }
        }
    }
}

// The weekly Jacobian is the derivative of the weekly counts: central differences (step 1e-6
// of the parameter, error of order 1e-12 relative) agree to 1e-6 of the column's scale.
TEST(FitWeekly, ExpectedCountJacobianAgreesWithCentralDifferences) {
    for (const auto& [kind, p] : kCases) {
        const WaveModel& m = waveModel(kind);
        const std::size_t np = p.size();
        std::vector<double> weeks(kWeeks), jac(kWeeks * np), up(kWeeks), down(kWeeks);
        m.countsOnPeriods(0.0, 7, p, weeks, jac);
        for (std::size_t j = 0; j < np; ++j) {
            auto pu = p, pd = p;
            const double h = 1e-6 * std::max(1.0, std::abs(p[j]));
            pu[j] += h;
            pd[j] -= h;
            m.countsOnPeriods(0.0, 7, pu, up);
            m.countsOnPeriods(0.0, 7, pd, down);
            double top = 0;
            for (std::size_t w = 0; w < kWeeks; ++w)
                top = std::max(top, std::abs(jac[w * np + j]));
            for (std::size_t w = 0; w < kWeeks; ++w) {
                const double numeric = (up[w] - down[w]) / (2 * h);
                EXPECT_NEAR(jac[w * np + j], numeric, 1e-6 * top)
                    << modelName(kind) << " parameter " << j << " week " << w;
            }
        }
    }
}

// The same sum is the integral of the incidence over the week's days by the midpoint rule,
// C(end + 1/2) - C(start - 1/2) (models.h); for curves at least 3 days wide the two differ by
// less than 1% of the peak week's count (the midpoint rule's error, sum of f''/24 over the
// days: common practice, no source). With a period of one day the counts are the day grid.
TEST(FitWeekly, ExpectedCountOfAWeekIsTheIntegralOfTheIncidenceOverItsDays) {
    for (const auto& [kind, p] : kCases) {
        const WaveModel& m = waveModel(kind);
        std::vector<double> weeks(kWeeks);
        m.countsOnPeriods(0.0, 7, p, weeks);
        const double top = *std::max_element(weeks.begin(), weeks.end());
        double total = 0;
        for (std::size_t w = 0; w < kWeeks; ++w) {
            const double start = 7.0 * static_cast<double>(w);
            const double integral = m.cumulative(start + 6.5, p) - m.cumulative(start - 0.5, p);
            EXPECT_NEAR(weeks[w], integral, 0.01 * top) << modelName(kind) << " week " << w;
            total += weeks[w];
        }
        EXPECT_NEAR(total, m.cumulative(7.0 * kWeeks - 0.5, p) - m.cumulative(-0.5, p),
                    1e-3 * total)
            << modelName(kind);
        std::vector<double> byDay(30), onDays(30);
        m.countsOnPeriods(-3.0, 1, p, byDay);
        m.incidenceOnDays(-3.0, p, onDays);
        EXPECT_EQ(byDay, onDays) << modelName(kind);
    }
}

}  // namespace
}  // namespace siftwave::fit
