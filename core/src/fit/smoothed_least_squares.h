#pragma once
// Least squares on the centred moving average (internal to fit.cpp).
//
// Residual i: w_i ((A f)(t_i) - y_i), where y is the centred average of the counts and A f the
// same average applied to the model, so that smoothing widens model and data alike and the
// parameters keep their meaning (no smoothing bias in the peak or the width).
//
// The t_i and the "model days" below are periods of the series: days for daily counts; for
// weekly counts weeks, where the model's value is its expected count of the week
// (WaveModel::countsOnPeriods) and its time stays in days.

#include "siftwave/fit/levenberg_marquardt.h"
#include "siftwave/fit/models.h"

#include <algorithm>
#include <array>
#include <span>
#include <vector>

namespace siftwave::fit::detail {

// Smoothing kernel of the centred average: weights a_k, k = -h..h.
inline std::vector<double> centredKernel(int window) {
    if (window % 2 == 1)
        return std::vector<double>(static_cast<std::size_t>(window), 1.0 / window);
    std::vector<double> k(static_cast<std::size_t>(window) + 1, 1.0 / window);
    k.front() = k.back() = 0.5 / window;
    return k;
}

// Residual i: w_i ((A f)(t_i) - y_i), where y is the centred average of the counts and A f the
// same average applied to the model, so that smoothing widens model and data alike and the
// parameters keep their meaning (no smoothing bias in the peak or the width).
class SmoothedLeastSquares final : public LeastSquaresProblem {
public:
    /// The model days of the last evaluation; kept by the caller so that its storage serves
    /// one problem after another (one workspace per thread, used by one problem at a time).
    struct Workspace {
        std::vector<double> f, jf, p;
    };

    // The spans and the workspace are kept, not copied: they must outlive the problem.
    // `periodDays`: days per period of the series (1 or 7).
    SmoothedLeastSquares(const WaveModel& model, std::span<const double> t,
                         std::span<const double> y, std::span<const double> w,
                         std::span<const double> kernel, int span, Workspace& workspace,
                         int periodDays = 1)
        : m_model(model),
          m_t(t),
          m_y(y),
          m_w(w),
          m_kernel(kernel),
          m_h(static_cast<int>(m_kernel.size()) / 2),
          m_f(workspace.f),
          m_jf(workspace.jf),
          m_p(workspace.p),
          m_periodDays(periodDays) {
        // Model days: every day from t_0 - h to t_last + h (the window spans `span` days).
        m_days = static_cast<std::size_t>(span + 2 * m_h);
        // Targets on consecutive days (no missing day in the window) take the plainer loop.
        m_consecutive = !m_t.empty();
        for (std::size_t i = 1; i < m_t.size() && m_consecutive; ++i)
            m_consecutive = m_t[i] == m_t[0] + static_cast<double>(i);
    }
    int residualCount() const override { return static_cast<int>(m_t.size()); }
    int parameterCount() const override { return m_model.parameterCount(); }
    bool evaluate(std::span<const double> p, std::span<double> r,
                  std::span<double> jac) const override {
        if (!m_model.valid(p))
            return false;
        const bool withJacobian = !jac.empty();
        evaluateModelDays(p, withJacobian);
        const std::span<const double> f(m_f), jf(m_jf);
        const std::size_t np = p.size();
        const std::size_t cols = withJacobian ? np + 1 : 1;
        const bool uniform = m_kernel.size() % 2 == 1;
        if (uniform) {
            // Equal weights: sliding window sums of the model and its Jacobian columns.
            switch (cols) {
                case 1:
                    slidingSums<1>(f, jf, r, jac, p[0]);
                    break;
                case 4:
                    slidingSums<4>(f, jf, r, jac, p[0]);
                    break;
                case 5:
                    slidingSums<5>(f, jf, r, jac, p[0]);
                    break;
                default:
                    slidingSums<0>(f, jf, r, jac, p[0]);
                    break;
            }
            return true;
        }
        for (std::size_t i = 0; i < m_t.size(); ++i) {
            const int centre = static_cast<int>(m_t[i]) + m_h;  // index into the model days
            double model = 0;
            {
                if (withJacobian)
                    std::fill_n(&jac[i * np], np, 0.0);
                for (int k = -m_h; k <= m_h; ++k) {
                    const double wk = m_kernel[static_cast<std::size_t>(k + m_h)];
                    const std::size_t d = static_cast<std::size_t>(centre + k);
                    model += wk * f[d];
                    if (withJacobian) {
                        for (std::size_t j = 0; j < np; ++j)
                            jac[i * np + j] += wk * m_w[i] * jf[d * np + j];
                    }
                }
            }
            r[i] = m_w[i] * (model - m_y[i]);
        }
        return true;
    }

    /// The model K f and its Jacobian (row-major) on the model days t_0 - h .. t_last + h of the
    /// last evaluation with a Jacobian at `p`, evaluated again only when `p` differs (after the
    /// solver, the final point is usually the last one it evaluated). The spans point into the
    /// workspace: they hold until it is used again (another evaluation, another fit on this
    /// thread).
    void modelDays(std::span<const double> p, std::span<const double>& values,
                   std::span<const double>& jacobian) const {
        if (!(m_haveJacobian && std::equal(p.begin(), p.end(), m_p.begin(), m_p.end())))
            evaluateModelDays(p, true);
        values = m_f;
        jacobian = m_jf;
    }

private:
    void evaluateModelDays(std::span<const double> p, bool withJacobian) const {
        m_f.resize(m_days);
        m_jf.resize(withJacobian ? m_days * p.size() : 0);
        if (m_periodDays == 1) {
            m_model.incidenceOnDays(-m_h, p, m_f, m_jf);
        } else {
            m_model.countsOnPeriods(-m_h * m_periodDays, m_periodDays, p, m_f, m_jf);
        }
        m_p.assign(p.begin(), p.end());
        m_haveJacobian = withJacobian;
    }

    // Residuals (and weighted Jacobian rows) from window sums over the model days, kept as a
    // running sum of the columns (f, df/dp...). Cols = 1 + parameters when the Jacobian is
    // wanted, 1 without; 0 means "any" (run-time count). Re-summed from scratch every 64 target
    // days so rounding cannot drift. Every wave model is K times a curve of unit size (K =
    // p[0], models.h), so the column of K is the model's own sum divided by K and is not
    // summed separately (column 1 is skipped).
    template <int Cols>
    void slidingSums(std::span<const double> f, std::span<const double> jf, std::span<double> r,
                     std::span<double> jac, double K) const {
        const std::size_t cols = Cols > 0 ? static_cast<std::size_t>(Cols)
                                          : (jac.empty() ? 1 : 1 + jf.size() / f.size());
        const std::size_t np = cols - 1;
        const double a = 1.0 / static_cast<double>(m_kernel.size());
        std::array<double, 8> sum{};
        auto column = [&](std::size_t d, std::size_t j) {
            return j == 0 ? f[d] : jf[d * np + j - 1];
        };
        const double invK = 1.0 / K;
        // The columns that are summed: the model (0) and the Jacobian columns after K's (2..).
        auto forSummedColumns = [&](auto&& op) {
            op(std::size_t{0});
            for (std::size_t j = 2; j < cols; ++j)
                op(j);
        };
        auto writeRow = [&](std::size_t i) {
            r[i] = m_w[i] * (a * sum[0] - m_y[i]);
            if (cols > 1)
                jac[i * np] = m_w[i] * a * sum[0] * invK;
            for (std::size_t j = 2; j < cols; ++j)
                jac[i * np + j - 1] = m_w[i] * a * sum[j];
        };
        if (m_consecutive) {
            // Target i averages model days d0 + i .. d0 + i + taps - 1: each step adds the day
            // entering and removes the day leaving, in the same order as the general loop below.
            const std::size_t taps = m_kernel.size();
            const std::size_t d0 = static_cast<std::size_t>(m_t[0]);
            for (std::size_t i = 0; i < m_t.size(); ++i) {
                const std::size_t lo = d0 + i;
                if (i % 64 == 0) {
                    sum.fill(0.0);
                    for (std::size_t d = lo; d < lo + taps; ++d) {
                        forSummedColumns([&](std::size_t j) { sum[j] += column(d, j); });
                    }
                } else {
                    forSummedColumns([&](std::size_t j) {
                        sum[j] += column(lo + taps - 1, j) - column(lo - 1, j);
                    });
                }
                writeRow(i);
            }
            return;
        }
        std::size_t lo = 0, hi = 0;  // the sums cover model days [lo, hi)
        for (std::size_t i = 0; i < m_t.size(); ++i) {
            const std::size_t centre =
                static_cast<std::size_t>(m_t[i]) + static_cast<std::size_t>(m_h);
            const std::size_t first = centre - static_cast<std::size_t>(m_h);
            const std::size_t end = centre + static_cast<std::size_t>(m_h) + 1;
            if (i % 64 == 0 || first >= hi) {
                sum.fill(0.0);
                lo = hi = first;
            }
            if (end == hi + 1 && first == lo + 1) {
                // The next consecutive target day (the usual case): one day in, one day out.
                forSummedColumns([&](std::size_t j) { sum[j] += column(hi, j) - column(lo, j); });
                hi = end;
                lo = first;
            }
            for (; hi < end; ++hi) {
                forSummedColumns([&](std::size_t j) { sum[j] += column(hi, j); });
            }
            for (; lo < first; ++lo) {
                forSummedColumns([&](std::size_t j) { sum[j] -= column(lo, j); });
            }
            writeRow(i);
        }
    }

    const WaveModel& m_model;
    std::span<const double> m_t, m_y, m_w, m_kernel;
    int m_h;
    std::size_t m_days = 0;
    // The last evaluation (the solver calls evaluate() from one thread), in the workspace.
    std::vector<double>& m_f;
    std::vector<double>& m_jf;
    std::vector<double>& m_p;
    int m_periodDays = 1;
    mutable bool m_haveJacobian = false;
    bool m_consecutive = false;
};

}  // namespace siftwave::fit::detail
