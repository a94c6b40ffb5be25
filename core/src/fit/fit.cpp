#include "siftwave/fit/fit.h"

#include "siftwave/transmission/growth_rate.h"

#include "fit/curve_band.h"
#include "fit/fit_workspace.h"
#include "fit/gram.h"
#include "fit/likelihood.h"
#include "fit/smoothed_least_squares.h"
#include "siftwave/series/smoothing.h"

#include <Eigen/Dense>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <limits>
#include <numbers>
#include <span>

namespace siftwave::fit {
namespace {

using detail::centredKernel;
using detail::SmoothedLeastSquares;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
using Matrix = Eigen::MatrixXd;
// The wave models' matrices (at most 4 parameters) on the stack: a batch fit would otherwise
// make a dozen small heap allocations per region for them.
constexpr int kMaxWaveParameters = 4;
using SmallMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor,
                                  kMaxWaveParameters, kMaxWaveParameters>;

// ---------------------------------------------------------------- small numerical helpers
enum DerivedIndex {
    kPeakDay,
    kPeakIncidence,
    kWaveSize,
    kFraction,
    kStart,
    kEnd,
    kFastest,
    kDoubling,
    kLoad,
    kDerivedCount
};

// The infectious load on window day d: the fitted incidence summed over the W days ending on d,
// sum_{k=0}^{W-1} K f(d - k).
double infectiousLoadOn(const WaveModel& model, std::span<const double> p, int d, int W,
                        std::vector<double>& days) {
    days.resize(static_cast<std::size_t>(W));
    model.incidenceOnDays(d - W + 1, p, days, {});
    double sum = 0;
    for (double f : days)
        sum += f;
    return sum;
}

// The day of the peak infectious load: the largest W-day rolling sum of the fitted incidence
// over days. It lies where the day entering and the day leaving the sum carry about the same
// incidence, after the peak and less than W days after it; the search covers the days from
// the one before the peak to W + 1 days after it. NaN when the peak is not a usable day.
double peakInfectiousLoadDay(const WaveModel& model, std::span<const double> p, double peak, int W,
                             std::vector<double>& f) {
    if (!(std::abs(peak) < 1e7))
        return kNaN;
    const int from = static_cast<int>(std::floor(peak)) - 1;
    const int to = static_cast<int>(std::ceil(peak)) + W + 1;
    // The incidence on days from - W + 1 .. to, then the rolling sums of W of them.
    f.resize(static_cast<std::size_t>(to - from + W));
    model.incidenceOnDays(from - W + 1, p, f, {});
    double sum = 0;
    for (int k = 0; k < W; ++k)
        sum += f[static_cast<std::size_t>(k)];
    int best = from;
    double bestSum = sum;
    for (int d = from + 1; d <= to; ++d) {
        const std::size_t entering = static_cast<std::size_t>(d - from + W - 1);
        sum += f[entering] - f[entering - static_cast<std::size_t>(W)];
        if (sum > bestSum) {
            bestSum = sum;
            best = d;
        }
    }
    return best;
}

// The peak incidence per period: K f at the peak for days; for longer periods the expected count
// of the period of that many days centred on the peak day (fit.h, "Derived quantities").
double peakIncidencePerPeriod(const WaveModel& model, std::span<const double> p, double peak,
                              int periodDays) {
    if (periodDays == 1)
        return model.incidenceAt(peak, p);
    double count = 0;
    model.countsOnPeriods(peak - 0.5 * (periodDays - 1), periodDays, p,
                          std::span<double>(&count, 1));
    return count;
}

// `loadDay`: where the infectious load peaks. Searched (and returned) when `searchLoad`; given
// otherwise, and the load is taken there. The delta method uses the latter, which is exact to
// first order (the envelope theorem: at a maximum the derivative of the location does not
// enter). `lastDataDay`: the last day with data, counted from the window's first day.
// `scratch`: the daily incidence the load is summed from.
std::array<double, kDerivedCount> derive(const WaveModel& model, std::span<const double> p,
                                         const FitOptions& o, int periodDays, double lastDataDay,
                                         double& loadDay, bool searchLoad,
                                         std::vector<double>& scratch) {
    std::array<double, kDerivedCount> d{};
    const double K = p[0];
    const double peak = model.peakTime(p);
    d[kPeakDay] = peak;
    d[kPeakIncidence] = peakIncidencePerPeriod(model, p, peak, periodDays);
    d[kWaveSize] = K;
    d[kFraction] = model.cumulative(lastDataDay + 0.5, p) / K;
    d[kStart] = model.quantileTime(o.startQuantile, p);
    d[kEnd] = model.quantileTime(o.endQuantile, p);
    const double scale = std::max(1e-3, d[kEnd] - d[kStart]);
    const double h = 1e-4 * scale;
    d[kFastest] = model.fastestGrowthTime(p);
    // The model's instantaneous doubling time at its fastest-growth day (issue 15).
    const double f1 = model.incidenceAt(d[kFastest] + h, p),
                 f0 = model.incidenceAt(d[kFastest] - h, p);
    const double growth = (f1 > 0 && f0 > 0) ? (std::log(f1) - std::log(f0)) / (2 * h) : kNaN;
    d[kDoubling] = growth > 0 ? std::numbers::ln2 / growth : kNaN;
    // In days for every cadence: the model's daily curve summed over W days (fit.h).
    const int W = o.infectiousWindowDays;
    if (searchLoad)
        loadDay = peakInfectiousLoadDay(model, p, peak, W, scratch);
    d[kLoad] = std::isfinite(loadDay)
                   ? infectiousLoadOn(model, p, static_cast<int>(loadDay), W, scratch)
                   : kNaN;
    return d;
}

Estimate estimateFrom(double value, double se, double q) {
    Estimate e;
    e.value = value;
    e.se = se;
    e.lower = std::isfinite(se) ? value - q * se : kNaN;
    e.upper = std::isfinite(se) ? value + q * se : kNaN;
    return e;
}

/// The interval of a quantity that cannot leave [lowest, highest] (a count, a share) is cut
/// there, as the curve's band is cut at zero: "-575 cases per day" is never a possible value.
Estimate withinBounds(Estimate e, double lowest,
                      double highest = std::numeric_limits<double>::infinity()) {
    if (std::isfinite(e.lower))
        e.lower = std::clamp(e.lower, lowest, highest);
    if (std::isfinite(e.upper))
        e.upper = std::clamp(e.upper, lowest, highest);
    return e;
}

// G row d = sum of P rows d - taps + 1 .. d (rows of `cols` values; N > 0: cols = N at compile
// time), as running sums re-summed every 64 days so rounding cannot drift. The running sums are
// plain locals (one per column, at most 4): held in an array they were stored and reloaded on
// every day, which put a store-to-load delay on each day's chain of additions.
template <std::size_t N>
void trailingWindowSums(std::span<const double> P, std::span<double> G, std::size_t days,
                        std::size_t cols, std::size_t taps) {
    const std::size_t c = N > 0 ? N : cols;
    double s0 = 0, s1 = 0, s2 = 0, s3 = 0;  // wave models have at most 4 parameters
    auto at = [&](std::size_t d, std::size_t j) { return P[d * c + j]; };
    for (std::size_t d = 0; d < days; ++d) {
        if (d % 64 == 0) {
            s0 = s1 = s2 = s3 = 0.0;
            for (std::size_t e = d - std::min(d, taps - 1); e <= d; ++e) {
                s0 += at(e, 0);
                s1 += c > 1 ? at(e, 1) : 0.0;
                s2 += c > 2 ? at(e, 2) : 0.0;
                s3 += c > 3 ? at(e, 3) : 0.0;
            }
        } else {
            s0 += at(d, 0);
            s1 += c > 1 ? at(d, 1) : 0.0;
            s2 += c > 2 ? at(d, 2) : 0.0;
            s3 += c > 3 ? at(d, 3) : 0.0;
            if (d >= taps) {
                s0 -= at(d - taps, 0);
                s1 -= c > 1 ? at(d - taps, 1) : 0.0;
                s2 -= c > 2 ? at(d - taps, 2) : 0.0;
                s3 -= c > 3 ? at(d - taps, 3) : 0.0;
            }
        }
        G[d * c] = s0;
        if (c > 1)
            G[d * c + 1] = s1;
        if (c > 2)
            G[d * c + 2] = s2;
        if (c > 3)
            G[d * c + 3] = s3;
    }
}

// The start of a fit to counts of periods of `pd` days (pd > 1): the smoothed count of each
// window period divided by pd, as incidence per day on the window's days, interpolated linearly
// between the middle days of the periods and held flat before the first middle and after the
// last; NaN where the periods on both sides are missing. The linearisations (models.h) read a
// day grid. Kept out of line, as are the weekly checks and messages below: inlined, they made
// fitSeries large enough for the compiler to stop inlining its vector appends and the sandwich's
// Gram sums, which cost the daily batch fit 2% more instructions.
[[gnu::noinline]] void dailyRatesForStart(std::span<const double> smoothed, int first, int last,
                                          int pd, std::vector<double>& t, std::vector<double>& y) {
    const int periods = last - first + 1;
    auto rate = [&](int j) {
        j = std::clamp(j, 0, periods - 1);
        return smoothed[static_cast<std::size_t>(first + j)] / pd;
    };
    const double middle = 0.5 * (pd - 1);
    for (int day = 0; day < periods * pd; ++day) {
        const double x = (day - middle) / pd;  // position in periods, 0 at the first middle
        const int j = static_cast<int>(std::floor(x));
        const double share = x - j;
        const double a = rate(j), b = rate(j + 1);
        double v = (1.0 - share) * a + share * b;
        if (!std::isfinite(a))
            v = b;
        else if (!std::isfinite(b))
            v = a;
        t.push_back(day);
        y.push_back(v);
    }
}

// What a series of periods of this many days cannot be fitted with: a period that is neither a
// day nor a week, weekday factors on weekly counts. nullopt when the two go together.
[[gnu::cold]] std::optional<Error> periodMismatch(int periodDays, const FitOptions& o) {
    if (periodDays != 1 && periodDays != 7) {
        return makeError(ErrorCode::Usage, "a period of the series must be 1 or 7 days, not " +
                                               std::to_string(periodDays));
    }
    if (periodDays != 1 && o.weekdayFactors) {
        return makeError(ErrorCode::Usage,
                         "weekday factors need daily counts: a weekly count holds every weekday "
                         "once");
    }
    return std::nullopt;
}

// NotFound: `before` + " days" or " weeks" + `after`.
[[gnu::cold]] Error tooShort(const char* before, int periodDays, const char* after = "") {
    return makeError(ErrorCode::NotFound,
                     std::string(before) + (periodDays == 1 ? " days" : " weeks") + after);
}

// ---------------------------------------------------------------- window choice
// Why no wave was found, in the period's unit: nothing reached the smallest peak, or no rise
// and fall was large and long enough.
[[gnu::cold]] Error noWaveError(std::span<const double> counts, std::span<const double> smoothed,
                                const FitOptions& o, int periodDays) {
    const std::vector<double> own =
        o.detection.smoothingWindow == o.smoothingWindow
            ? std::vector<double>()
            : series::centredMovingAverage(counts, o.detection.smoothingWindow);
    const std::span<const double> s = own.empty() ? smoothed : std::span<const double>(own);
    double top = 0;
    for (double v : s)
        top = std::isfinite(v) ? std::max(top, v) : top;
    const char* unit = periodDays == 7 ? "week" : "day";
    char buf[256];
    if (top < o.detection.minPeak) {
        std::snprintf(buf, sizeof buf,
                      "no wave found: the highest %d-%s centred average of the counts is %.2g per "
                      "%s, below the %.3g per %s a wave must reach (give the window as FIRST:LAST)",
                      o.detection.smoothingWindow, unit, top, unit, o.detection.minPeak, unit);
    } else {
        std::snprintf(buf, sizeof buf,
                      "no wave found: the smoothed series never rises and falls by the required "
                      "share over at least %d %ss (give the window as FIRST:LAST)",
                      o.detection.minPeriods, unit);
    }
    return makeError(ErrorCode::NotFound, buf);
}

Result<std::pair<int, int>> chooseWindow(std::span<const double> counts,
                                         std::span<const double> smoothed, const FitOptions& o,
                                         int periodDays, std::vector<Wave>& waves) {
    waves = o.detection.smoothingWindow == o.smoothingWindow
                ? detectWavesInSmoothed(smoothed, o.detection)
                : detectWaves(counts, o.detection);
    const int n = static_cast<int>(counts.size());
    if (o.window) {
        auto [a, b] = *o.window;
        if (a < 0 || b >= n || b < a) {
            return makeError(ErrorCode::Usage,
                             "the fit window " + std::to_string(a) + ".." + std::to_string(b) +
                                 " lies outside the series (0.." + std::to_string(n - 1) + ")");
        }
        return std::pair{a, b};
    }
    if (waves.empty())
        return noWaveError(counts, smoothed, o, periodDays);
    const Wave* chosen = &waves.front();
    switch (o.wave) {
        case WaveChoice::Largest:
            for (const Wave& w : waves) {
                if (w.peakValue > chosen->peakValue)
                    chosen = &w;
            }
            break;
        case WaveChoice::Latest:
            chosen = &waves.back();
            break;
        case WaveChoice::Index:
            if (o.waveIndex < 0 || o.waveIndex >= static_cast<int>(waves.size())) {
                return makeError(ErrorCode::NotFound, "wave " + std::to_string(o.waveIndex + 1) +
                                                          " asked for, " +
                                                          std::to_string(waves.size()) + " found");
            }
            chosen = &waves[static_cast<std::size_t>(o.waveIndex)];
            break;
    }
    return std::pair{chosen->first, chosen->last};
}

}  // namespace

// ---------------------------------------------------------------- names, options, summary
const char* methodName(FitMethod method) {
    switch (method) {
        case FitMethod::LeastSquares:
            return "lsq";
        case FitMethod::Poisson:
            return "poisson";
        case FitMethod::NegativeBinomial:
            return "negbin";
    }
    return "unknown";
}

std::optional<FitMethod> methodFromName(std::string_view name) {
    for (FitMethod m : {FitMethod::LeastSquares, FitMethod::Poisson, FitMethod::NegativeBinomial}) {
        if (name == methodName(m))
            return m;
    }
    return std::nullopt;
}

FitOptions FitOptions::forCadence(Cadence cadence) {
    FitOptions o;
    if (cadence == Cadence::Weekly) {
        o.smoothingWindow = 1;
        o.detection = WaveDetectionOptions::forCadence(cadence);
    }
    return o;
}

const char* fitStatusName(FitStatus status) {
    switch (status) {
        case FitStatus::Ok:
            return "ok";
        case FitStatus::NotConverged:
            return "not_converged";
        case FitStatus::Implausible:
            return "implausible";
        case FitStatus::NoWave:
            return "no_wave";
    }
    return "?";
}

const char* fitStatusAdvice(FitStatus status) {
    switch (status) {
        case FitStatus::Ok:
            return "";
        case FitStatus::NotConverged:
            return "another window (--window FIRST:LAST), another model (--model) or the other "
                   "method (--method)";
        case FitStatus::Implausible:
            return "a window that holds the wave's peak (--window FIRST:LAST), another model "
                   "(--model best) or the other method (--method); do not brief these numbers";
        case FitStatus::NoWave:
            return "another window (--window FIRST:LAST) or another wave (--wave); the counts "
                   "may hold no wave to fit";
    }
    return "";
}

Status FitOptions::validate() const {
    if (smoothingWindow < 1 || smoothingWindow > 365) {
        return makeError(ErrorCode::Usage,
                         "the smoothing window must be between 1 and 365 periods");
    }
    if (!(startQuantile > 0 && startQuantile < endQuantile && endQuantile < 1)) {
        return makeError(ErrorCode::Usage,
                         "start and end quantiles must satisfy 0 < start < end < 1");
    }
    if (infectiousWindowDays < 1 || infectiousWindowDays > 365) {
        return makeError(ErrorCode::Usage, "the infectious window must be between 1 and 365 days");
    }
    if (window && (window->first < 0 || window->second < window->first)) {
        return makeError(ErrorCode::Usage, "the fit window must satisfy 0 <= FIRST <= LAST");
    }
    if (weekdayFactors && method == FitMethod::LeastSquares) {
        return makeError(
            ErrorCode::Usage,
            "weekday factors are estimated by the likelihood methods (poisson, negbin); "
            "least squares fits the 7-day average, which has no weekday effect");
    }
    if (auto s = detection.validate(); !s)
        return s;
    return solver.validate();
}

std::string FitSummary::brief() const {
    char buf[160];
    std::snprintf(buf, sizeof buf, "%s (%s) after %d iterations",
                  converged() ? "converged" : "not converged", terminationName(termination),
                  iterations);
    std::string out = buf;
    if (!message.empty() && message != "converged")
        out += ": " + message;
    for (const auto& n : notes)
        out += "; " + n;
    return out;
}

Date FitResult::dateOf(double day) const {
    return windowFirst() + static_cast<int>(std::lround(std::isfinite(day) ? day : 0.0));
}

std::vector<double> FitResult::parameterValues() const {
    std::vector<double> v;
    for (const auto& p : parameters)
        v.push_back(p.estimate.value);
    return v;
}

// ---------------------------------------------------------------- the fit
FitWorkspace::FitWorkspace() : m_buffers(std::make_unique<detail::FitBuffers>()) {}
FitWorkspace::~FitWorkspace() = default;
FitWorkspace::FitWorkspace(FitWorkspace&&) noexcept = default;
FitWorkspace& FitWorkspace::operator=(FitWorkspace&&) noexcept = default;

namespace {

// What the steps of one fit share: the series and options, the model and the window, the
// parameters and their covariance, and the model's values and Jacobian on the "model days"
// (every window period and, for LSQ, the h periods either side that the centred average
// reaches: shared by the sandwich, the fitted curve and its band). The names say "days": for
// weekly data each is a period, its value the week's count.
struct FitState {
    FitState(const Series& s, const FitOptions& options, detail::FitBuffers& buffers)
        : series(s), o(options), work(buffers), pd(s.periodDays) {}

    const Series& series;
    const FitOptions& o;
    detail::FitBuffers& work;
    const int pd;  // days per period
    FitResult res;
    const WaveModel* model = nullptr;
    int np = 0;              // model parameters
    double lastDataDay = 0;  // the last day with data, from the window's first day
    std::vector<double> start;
    std::vector<double> kernel;  // the centred average's weights
    int h = 0;                   // periods the target's average reaches either side (LSQ)
    int modelFirst = 0;          // the first model day, a period index into the series
    std::size_t modelDays = 0;
    std::vector<double> params;
    std::vector<double> covariance;  // model parameters, np x np
    int dof = 0;
    std::span<const double> modelValues, modelJacobian;
};

// What a fit cannot start from: inconsistent options, a period that is neither a day nor a
// week, weekday factors on weekly counts, fewer than 5 periods.
std::optional<Error> unusableSeries(const Series& series, const FitOptions& o) {
    if (auto s = o.validate(); !s)
        return s.error();
    const int pd = series.periodDays;
    if (pd != 1 && (pd != 7 || o.weekdayFactors))
        return periodMismatch(pd, o);
    if (series.counts.size() < 5)
        return tooShort("the series has fewer than 5", pd);
    return std::nullopt;
}

// Step 1: the window (given, or the wave chosen among those detected in the centred average,
// which the start and the target share), the model, and the last day with data.
std::optional<Error> chooseWindowAndModel(FitState& s) {
    const FitOptions& o = s.o;
    const auto counts = s.series.counts;
    FitResult& res = s.res;
    res.model = o.model;
    res.method = o.method;
    res.seriesFirstDay = s.series.firstDay;
    res.periodDays = s.pd;
    res.options = o;
    series::centredMovingAverage(counts, std::max(o.smoothingWindow, 1), series::EdgeRule::Partial,
                                 s.work.smoothed);
    auto window = chooseWindow(counts, s.work.smoothed, o, s.pd, res.waves);
    if (!window)
        return window.error();
    res.first = window->first;
    res.last = window->second;
    s.model = &waveModel(o.model);
    s.np = s.model->parameterCount();
    if (s.np > kMaxWaveParameters)
        return makeError(ErrorCode::Numerical,
                         "the model has more parameters than the fit handles");
    int lastData = -1;
    for (int i = static_cast<int>(counts.size()) - 1; i >= 0; --i) {
        if (std::isfinite(counts[static_cast<std::size_t>(i)])) {
            lastData = i;
            break;
        }
    }
    // For weekly data the last day of the last week with a count.
    s.lastDataDay = (lastData - res.first) * s.pd + (s.pd - 1);
    // The model days: the window and, for LSQ, the reach of the target's average.
    s.kernel = centredKernel(o.smoothingWindow);
    s.h = o.method == FitMethod::LeastSquares ? static_cast<int>(s.kernel.size()) / 2 : 0;
    s.modelFirst = res.first - s.h;
    s.modelDays = static_cast<std::size_t>(res.last - res.first + 1 + 2 * s.h);
    return std::nullopt;
}

// Step 3, the start: the model's linearisation of the centred average over the window, as
// incidence per day.
std::optional<Error> findStart(FitState& s) {
    std::vector<double>& tAll = s.work.startT;
    std::vector<double>& yAll = s.work.startY;
    tAll.clear();
    yAll.clear();
    if (s.pd == 1) {
        for (int i = s.res.first; i <= s.res.last; ++i) {
            tAll.push_back(i - s.res.first);
            yAll.push_back(s.work.smoothed[static_cast<std::size_t>(i)]);
        }
    } else {
        dailyRatesForStart(s.work.smoothed, s.res.first, s.res.last, s.pd, tAll, yAll);
    }
    auto start = s.model->initialGuess(tAll, yAll, s.work.guess);
    if (!start) {
        return makeError(ErrorCode::Numerical,
                         "the window holds too few positive counts for a starting guess");
    }
    s.start = std::move(*start);
    return std::nullopt;
}

// Step 2 for LSQ, the target: the centred average where its window lies inside the series,
// with weights 1 / sqrt(max(y, 1)) when asked.
void leastSquaresTarget(FitState& s) {
    detail::FitBuffers& work = s.work;
    work.t.clear();
    work.y.clear();
    work.w.clear();
    const int n = static_cast<int>(s.series.counts.size());
    const int half = s.o.smoothingWindow / 2;
    for (int i = std::max(s.res.first, half); i <= std::min(s.res.last, n - 1 - half); ++i) {
        const double v = work.smoothed[static_cast<std::size_t>(i)];
        if (!std::isfinite(v))
            continue;
        work.t.push_back(i - s.res.first);
        work.y.push_back(v);
        work.w.push_back(s.o.weighted ? 1.0 / std::sqrt(std::max(v, 1.0)) : 1.0);
    }
}

// Step 4 for LSQ: the sandwich covariance through the smoothing operator (fit.h), from the
// solver's residuals and Jacobian at the solution. G row d: the weighted Jacobian rows smoothed
// back onto model day d, G_d = sum_i a_(d - t_i) w_i Jt_i over the targets whose average
// reaches day d (target t_i is model day t_i + h; its average covers model days t_i .. t_i + 2h).
// The solver's row Jt_i is already w_i (A J)_i; the residual carries w_i once more.
void sandwichCovariance(FitState& s, const SolverResult& sr) {
    const std::size_t npu = static_cast<std::size_t>(s.np);
    const std::size_t modelDays = s.modelDays;
    const std::vector<double>&t = s.work.t, &w = s.work.w;
    const std::vector<double>& kernel = s.kernel;
    const int m = static_cast<int>(t.size());
    std::vector<double>& scratch = s.work.sandwich;  // G, P and e^2
    scratch.resize(modelDays * (2 * npu + 1));
    const std::span<double> G(scratch.data(), modelDays * npu),
        P(scratch.data() + modelDays * npu, modelDays * npu),
        e2(scratch.data() + 2 * modelDays * npu, modelDays);
    const std::size_t taps = kernel.size();
    // Zeroed: what the sums below do not write in full (P, scattered onto the target days, or G,
    // accumulated; and e^2). The window sums write every value of G.
    std::fill(e2.begin(), e2.end(), 0.0);
    std::fill(taps % 2 == 1 ? P.begin() : G.begin(), taps % 2 == 1 ? P.end() : G.end(), 0.0);
    if (taps % 2 == 1) {
        // Equal weights a: scatter w_i Jt_i onto day t_i, then a window sum of `taps`.
        for (int i = 0; i < m; ++i) {
            const std::size_t d = static_cast<std::size_t>(t[static_cast<std::size_t>(i)]);
            const double wi = w[static_cast<std::size_t>(i)] * kernel[0];
            for (std::size_t j = 0; j < npu; ++j)
                P[d * npu + j] = wi * sr.jacobian[static_cast<std::size_t>(i) * npu + j];
        }
        switch (npu) {
            case 3:
                trailingWindowSums<3>(P, G, modelDays, npu, taps);
                break;
            case 4:
                trailingWindowSums<4>(P, G, modelDays, npu, taps);
                break;
            default:
                trailingWindowSums<0>(P, G, modelDays, npu, taps);
                break;
        }
    } else {
        for (int i = 0; i < m; ++i) {
            const std::size_t from = static_cast<std::size_t>(t[static_cast<std::size_t>(i)]);
            const double* row = &sr.jacobian[static_cast<std::size_t>(i) * npu];
            const double wi = w[static_cast<std::size_t>(i)];
            for (std::size_t k = 0; k < taps; ++k) {
                const double a = kernel[k] * wi;
                double* g = &G[(from + k) * npu];
                for (std::size_t j = 0; j < npu; ++j)
                    g[j] += a * row[j];
            }
        }
    }
    // Squared raw-count residuals e_k^2 (0 where the day is missing or outside the series).
    const auto counts = s.series.counts;
    const int n = static_cast<int>(counts.size());
    for (int k = std::max(s.modelFirst, 0); k <= std::min(s.res.last + s.h, n - 1); ++k) {
        const double x = counts[static_cast<std::size_t>(k)];
        const std::size_t d = static_cast<std::size_t>(k - s.modelFirst);
        if (std::isfinite(x))
            e2[d] = (x - s.modelValues[d]) * (x - s.modelValues[d]);
    }
    const int np = s.np;
    SmallMatrix meat(np, np);  // sum_k e_k^2 g_k g_k^T
    detail::gram(G.data(), modelDays, npu, e2, {}, meat.data(), nullptr);
    meat *= static_cast<double>(m) / std::max(1, m - np);  // HC1 small-sample factor
    const SmallMatrix bread =
        Eigen::Map<const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(
            sr.unscaledCovariance.data(), np, np);
    const SmallMatrix cov = bread * meat * bread;
    for (int a = 0; a < np; ++a) {
        for (int b = 0; b < np; ++b)
            s.covariance[static_cast<std::size_t>(a * np + b)] = cov(a, b);
    }
}

// Step 6 for LSQ: goodness of fit on the smoothed target; the solver's residuals are
// w_i (A f - y)_i. The Gaussian likelihood counts the variance as a parameter.
void leastSquaresGoodness(FitState& s, const SolverResult& sr) {
    const std::vector<double>&y = s.work.y, &w = s.work.w;
    const int m = static_cast<int>(y.size());
    double rss = 0, wrss = 0, mean = 0;
    for (double v : y)
        mean += v;
    mean /= m;
    double tss = 0;
    for (int i = 0; i < m; ++i) {
        const double wi = w[static_cast<std::size_t>(i)];
        const double e = -sr.residuals[static_cast<std::size_t>(i)] / wi;
        rss += e * e;
        wrss += e * e * wi * wi;
        tss += (y[static_cast<std::size_t>(i)] - mean) * (y[static_cast<std::size_t>(i)] - mean);
    }
    GoodnessOfFit& g = s.res.goodness;
    g.observations = m;
    g.parameters = s.np + 1;
    g.rss = rss;
    g.r2 = tss > 0 ? 1.0 - rss / tss : kNaN;
    g.rmse = std::sqrt(rss / m);
    g.logLikelihood = -0.5 * m * (std::log(2.0 * std::numbers::pi * wrss / m) + 1.0);
}

void copySolverSummary(const SolverSummary& from, FitSummary& to) {
    to.termination = from.termination;
    to.iterations = from.iterations;
    to.evaluations = from.evaluations;
    to.message = from.message;
}

// Steps 2-4 and 6 for LSQ: the target, the solve, the sandwich covariance, goodness of fit.
// `lsq` outlives the call: the model's values and Jacobian on the model days stay in its
// workspace (s.modelValues, s.modelJacobian).
std::optional<Error> fitSmoothedLeastSquares(FitState& s,
                                             std::optional<SmoothedLeastSquares>& lsq) {
    leastSquaresTarget(s);
    detail::FitBuffers& work = s.work;
    if (static_cast<int>(work.t.size()) <= s.np + 1)
        return tooShort("the window has too few", s.pd, " for this model");
    const SmoothedLeastSquares& problem = lsq.emplace(*s.model, work.t, work.y, work.w, s.kernel,
                                                      s.res.last - s.res.first + 1, work.lsq, s.pd);
    SolverResult& sr = work.solution;
    solveLeastSquares(problem, s.start, s.o.solver, sr, work.solver);
    if (sr.summary.termination == Termination::InvalidStart)
        return makeError(ErrorCode::Numerical, "the model cannot be evaluated at its start");
    s.params = sr.parameters;
    copySolverSummary(sr.summary, s.res.summary);
    s.dof = static_cast<int>(work.t.size()) - s.np;
    problem.modelDays(s.params, s.modelValues, s.modelJacobian);
    s.covariance.assign(static_cast<std::size_t>(s.np * s.np), kNaN);
    if (sr.covarianceAvailable)
        sandwichCovariance(s, sr);
    leastSquaresGoodness(s, sr);
    return std::nullopt;
}

// Steps 2-4 and 6 for the likelihood methods (likelihood.h), then the model and its Jacobian
// on the window's periods.
std::optional<Error> fitByLikelihood(FitState& s) {
    detail::LikelihoodFit lf = detail::fitLikelihood(*s.model, s.series, s.res.first, s.res.last,
                                                     s.start, s.o, s.work.solver);
    if (!lf.ok)
        return makeError(ErrorCode::Numerical, lf.message);
    s.params = lf.parameters;
    s.covariance = lf.modelCovariance;
    s.res.weekdayFactors = lf.weekdayFactors;
    s.res.dispersion = lf.dispersion;
    copySolverSummary(lf.summary, s.res.summary);
    s.res.goodness = lf.goodness;
    s.dof = s.res.goodness.observations - s.np;
    std::vector<double>& storage = s.work.modelStorage;
    storage.resize(s.modelDays * static_cast<std::size_t>(s.np + 1));
    const std::span<double> values(storage.data(), s.modelDays),
        jacobian(storage.data() + s.modelDays, s.modelDays * static_cast<std::size_t>(s.np));
    s.model->countsOnPeriods(0.0, s.pd, s.params, values, jacobian);
    s.modelValues = values;
    s.modelJacobian = jacobian;
    return std::nullopt;
}

// The parameters with their standard errors and intervals (quantile q).
void addParameterEstimates(FitState& s, double q) {
    const auto names = s.model->names();
    for (int j = 0; j < s.np; ++j) {
        const double var = s.covariance[static_cast<std::size_t>(j * s.np + j)];
        s.res.parameters.push_back({names[static_cast<std::size_t>(j)],
                                    estimateFrom(s.params[static_cast<std::size_t>(j)],
                                                 var >= 0 ? std::sqrt(var) : kNaN, q)});
    }
}

// Step 5: the fitted count of each window period and its delta-method band, weekday factors
// applied where estimated.
void addFittedCurveAndBand(FitState& s, double q, bool haveCov) {
    FitResult& res = s.res;
    const std::size_t windowDays = static_cast<std::size_t>(res.last - res.first + 1);
    const std::size_t hu = static_cast<std::size_t>(s.h);
    res.fitted.assign(s.modelValues.begin() + static_cast<std::ptrdiff_t>(hu),
                      s.modelValues.begin() + static_cast<std::ptrdiff_t>(hu + windowDays));
    if (haveCov) {
        res.covariance = s.covariance;
        res.fittedLower.resize(windowDays);
        res.fittedUpper.resize(windowDays);
        detail::deltaMethodBand(res.fitted,
                                s.modelJacobian.subspan(hu * static_cast<std::size_t>(s.np)),
                                s.covariance, s.np, q, res.fittedLower, res.fittedUpper);
    }
    if (res.weekdayFactors.empty())
        return;
    for (int i = res.first; i <= res.last; ++i) {
        const std::size_t k = static_cast<std::size_t>(i - res.first);
        const double factor =
            res.weekdayFactors[static_cast<std::size_t>((s.series.firstDay + i).isoWeekday() - 1)];
        res.fitted[k] *= factor;
        if (haveCov) {
            res.fittedLower[k] *= factor;
            res.fittedUpper[k] *= factor;
        }
    }
}

// Step 6: AIC and AICc from the log-likelihood and the parameter count.
void addInformationCriteria(GoodnessOfFit& g) {
    g.aic = -2.0 * g.logLikelihood + 2.0 * g.parameters;
    const int denom = g.observations - g.parameters - 1;
    g.aicc = denom > 0 ? g.aic + 2.0 * g.parameters * (g.parameters + 1) / denom : kNaN;
}

// The delta method's standard errors of the derived quantities: a central-difference gradient
// in each parameter, then sqrt(diag(grad Cov grad^T)).
std::array<double, kDerivedCount> derivedStandardErrors(FitState& s, double loadDay) {
    const std::vector<double>& params = s.params;
    const int np = s.np;
    Eigen::Matrix<double, kDerivedCount, Eigen::Dynamic, 0, kDerivedCount, kMaxWaveParameters> grad(
        kDerivedCount, np);
    for (int j = 0; j < np; ++j) {
        std::array<double, kMaxWaveParameters> upStore{}, downStore{};
        std::copy(params.begin(), params.end(), upStore.begin());
        std::copy(params.begin(), params.end(), downStore.begin());
        const std::span<double> up(upStore.data(), params.size()),
            down(downStore.data(), params.size());
        // The step is a hundredth of the parameter's standard error: the scale on which the
        // delta method linearises, and far above the tolerance of the searches some quantities
        // come from (the fastest growth of the Richards and log-normal curves), so that their
        // rounding does not enter the slope. Capped at 1e-3 of the value; without a usable
        // standard error, 1e-5 of the value. Near a bound of the model's domain (the Richards
        // shape a > 0) the step is halved until both sides are valid.
        const std::size_t ju = static_cast<std::size_t>(j);
        const double variance = s.covariance[ju * static_cast<std::size_t>(np) + ju];
        const double scale = std::max(std::abs(params[ju]), 1e-2);
        double step =
            variance > 0 ? std::min(1e-2 * std::sqrt(variance), 1e-3 * scale) : 1e-5 * scale;
        bool inside = false;
        for (int halving = 0; halving < 30 && !inside; ++halving, step *= 0.5) {
            up[ju] = params[ju] + step;
            down[ju] = params[ju] - step;
            inside = s.model->valid(up) && s.model->valid(down);
            if (inside)
                break;
        }
        if (!inside) {
            grad.col(j).setConstant(kNaN);
            continue;
        }
        const auto du =
            derive(*s.model, up, s.o, s.pd, s.lastDataDay, loadDay, false, s.work.loadDays);
        const auto dd =
            derive(*s.model, down, s.o, s.pd, s.lastDataDay, loadDay, false, s.work.loadDays);
        for (int k = 0; k < kDerivedCount; ++k)
            grad(k, j) = (du[k] - dd[k]) / (2 * step);
    }
    const SmallMatrix cov =
        Eigen::Map<const Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>>(
            s.covariance.data(), np, np);
    const Eigen::Matrix<double, kDerivedCount, kDerivedCount> v = grad * cov * grad.transpose();
    std::array<double, kDerivedCount> se;
    for (int k = 0; k < kDerivedCount; ++k)
        se[k] = v(k, k) >= 0 ? std::sqrt(v(k, k)) : kNaN;
    return se;
}

// The derived quantities (fit.h) with their delta-method intervals; returns their values.
std::array<double, kDerivedCount> addDerivedQuantities(FitState& s, double q, bool haveCov,
                                                       std::optional<double> population) {
    double loadDay = 0;
    const auto d0 =
        derive(*s.model, s.params, s.o, s.pd, s.lastDataDay, loadDay, true, s.work.loadDays);
    std::array<double, kDerivedCount> se;
    se.fill(kNaN);
    if (s.o.derivedIntervals && haveCov)
        se = derivedStandardErrors(s, loadDay);
    DerivedQuantities& dq = s.res.derived;
    dq.peakDay = estimateFrom(d0[kPeakDay], se[kPeakDay], q);
    dq.peakIncidence = withinBounds(estimateFrom(d0[kPeakIncidence], se[kPeakIncidence], q), 0);
    dq.waveSize = withinBounds(estimateFrom(d0[kWaveSize], se[kWaveSize], q), 0);
    dq.fractionObserved = withinBounds(estimateFrom(d0[kFraction], se[kFraction], q), 0, 1);
    dq.startDay = estimateFrom(d0[kStart], se[kStart], q);
    dq.endDay = estimateFrom(d0[kEnd], se[kEnd], q);
    dq.fastestGrowthDay = estimateFrom(d0[kFastest], se[kFastest], q);
    dq.doublingTimeDays = estimateFrom(d0[kDoubling], se[kDoubling], q);
    dq.peakInfectiousLoad = withinBounds(estimateFrom(d0[kLoad], se[kLoad], q), 0);
    if (population && *population > 0) {
        const double pop = *population;
        dq.peakInfectiousLoadPer100k =
            withinBounds(estimateFrom(d0[kLoad] * 1e5 / pop, se[kLoad] * 1e5 / pop, q), 0);
        dq.log10InfectiousShare = estimateFrom(std::log10(d0[kLoad] / pop),
                                               se[kLoad] / (d0[kLoad] * std::numbers::ln10), q);
    }
    return d0;
}

// Notes a reader should see beside the numbers.
void addNotes(FitState& s, const std::array<double, kDerivedCount>& d0, bool haveCov) {
    FitResult& res = s.res;
    const int pd = s.pd;
    if (d0[kPeakDay] < 0 || d0[kPeakDay] > (res.last - res.first) * pd + (pd - 1))
        res.summary.notes.push_back("the fitted peak lies outside the window");
    if (d0[kFraction] < 0.5) {
        res.summary.notes.push_back(
            "less than half of the fitted wave is observed: K is uncertain");
    }
    // Weekly counts cannot show a wave that rises and falls within a week or two: the fit may
    // then squeeze it against a week's boundary (start to end in a few days).
    if (pd > 1 && d0[kEnd] - d0[kStart] < 2.0 * pd) {
        res.summary.notes.push_back(
            "the fitted wave runs from start to end in less than two weeks: weekly counts "
            "cannot resolve its shape or its peak within the week");
    }
    if (!haveCov)
        res.summary.notes.push_back("standard errors unavailable (singular information)");
}

// The doubling time on the observed rise (fit.h, DerivedQuantities::observedDoublingTimeDays):
// one window of the transmission capability's growth-rate regression, from the start day (clamped
// to the window) to the peak or the last day with data, whichever comes first.
void addObservedDoubling(FitState& s, const std::array<double, kDerivedCount>& d0) {
    FitResult& res = s.res;
    DerivedQuantities& dq = res.derived;
    dq.observedDoublingTimeDays = {kNaN, kNaN, kNaN, kNaN};
    const int pd = s.pd;
    const double startDay = std::isfinite(d0[kStart]) ? std::max(0.0, d0[kStart]) : 0.0;
    const double endDay =
        std::min(std::isfinite(d0[kPeakDay]) ? d0[kPeakDay] : s.lastDataDay, s.lastDataDay);
    const int first = res.first + static_cast<int>(std::floor(startDay / pd));
    const int last =
        std::min(res.first + static_cast<int>(std::floor(std::max(endDay, 0.0) / pd)), res.last);
    dq.observedRiseFirst = first;
    dq.observedRiseLast = last;
    const int n = last - first + 1;
    if (n < 3) {
        dq.observedDoublingNote = "the observed rise is shorter than 3 periods";
        return;
    }
    const Date firstDay = res.periodStart(first);
    TimeAxis axis;
    if (pd == 1) {
        axis = TimeAxis::daily(firstDay, n);
    } else if (firstDay.isoWeekday() == 1 || firstDay.isoWeekday() == 7) {
        axis = TimeAxis::weekly(firstDay, n,
                                firstDay.isoWeekday() == 1 ? WeekStart::Monday : WeekStart::Sunday);
    } else {
        dq.observedDoublingNote = "weeks that start neither on a Monday nor on a Sunday";
        return;
    }
    transmission::GrowthOptions options;
    options.window = n;
    const auto counts =
        s.series.counts.subspan(static_cast<std::size_t>(first), static_cast<std::size_t>(n));
    const transmission::GrowthEstimate g = transmission::growthRateAt(counts, axis, n - 1, options);
    if (!g.ok() || !(g.r.value > 0)) {
        dq.observedDoublingNote =
            g.ok() ? "the counts do not rise over the observed rise" : g.reason;
        return;
    }
    const double r = g.r.value;
    dq.observedDoublingTimeDays = {g.doublingDays.value, std::numbers::ln2 * g.se / (r * r),
                                   g.doublingDays.lower, g.doublingDays.upper};
}

// Where the two doubling times disagree beyond their intervals, the fit says so (issue 15).
void noteDoublingDisagreement(FitResult& res) {
    const Estimate& a = res.derived.observedDoublingTimeDays;
    const Estimate& b = res.derived.doublingTimeDays;
    if (!std::isfinite(a.value) || !std::isfinite(b.value) || !std::isfinite(b.lower))
        return;
    if (a.upper < b.lower || b.upper < a.lower) {
        char buf[300];
        std::snprintf(buf, sizeof buf,
                      "the doubling time on the observed rise (%.2g days, 95%% %.2g .. %.2g) and "
                      "the model's instantaneous one at its fastest-growth day (%.2g days, 95%% "
                      "%.2g .. %.2g) disagree beyond their intervals: brief the observed one",
                      a.value, a.lower, a.upper, b.value, b.lower, b.upper);
        res.summary.notes.push_back(buf);
    }
}

// A parameter at a bound of its model's domain: WaveModel::valid() refuses it halved or doubled
// (the domains are open bounds such as a scale above 1e-6 or a shape below 1e3; common practice,
// no source: a fit that ends on a bound was stopped by the domain, not by the data).
bool parameterAtBound(const FitState& s, std::string& name) {
    std::vector<double> p = s.params;
    for (std::size_t j = 0; j < p.size(); ++j) {
        const double v = p[j];
        for (const double factor : {0.5, 2.0}) {
            p[j] = v * factor;
            const bool ok = s.model->valid(p);
            p[j] = v;
            if (!ok && v != 0) {
                name = s.res.parameters[j].name;
                return true;
            }
        }
    }
    return false;
}

// A 95% interval wider than its estimate (or none): the fit cannot say how big the wave is.
void checkInterval(const Estimate& e, const char* what, std::vector<std::string>& why) {
    const double width = e.upper - e.lower;
    if (!std::isfinite(width)) {
        why.push_back(std::string("the ") + what + " has no 95% interval (singular information)");
    } else if (!(width <= std::abs(e.value))) {
        char buf[200];
        std::snprintf(buf, sizeof buf,
                      "the 95%% interval of the %s (%.3g .. %.3g) is wider than "
                      "the estimate %.3g",
                      what, e.lower, e.upper, e.value);
        why.push_back(buf);
    }
}

// The lower of the fitted curve's values at the window's two ends over its top within the window:
// a wave rises and falls (or at least rises) across its window, noise or a plateau does not (on
// generated waves at most 0.014, on Poisson noise 0.59 to 0.86; our own measurement).
double edgeToTopRatio(const FitState& s, double peakDay) {
    const FitResult& res = s.res;
    const double windowDays = (res.last - res.first) * s.pd + (s.pd - 1);
    // The four models are unimodal: the top within the window is at the peak, or at the window's
    // end nearer to it.
    const double top = s.model->incidenceAt(
        std::isfinite(peakDay) ? std::clamp(peakDay, 0.0, windowDays) : 0.0, s.params);
    const double edge =
        std::min(s.model->incidenceAt(0, s.params), s.model->incidenceAt(windowDays, s.params));
    return top > 0 ? edge / std::max(top, edge) : 1.0;
}

// The status of issue 15: a fit the solver finished may still describe no wave an analyst could
// brief. Every check that fails adds its reason; the thresholds are those the issue names
// (common practice, no source).
void assessStatus(FitState& s, const std::array<double, kDerivedCount>& d0) {
    FitResult& res = s.res;
    std::vector<std::string>& why = res.statusReasons;
    char buf[240];
    if (!res.summary.converged()) {
        why.push_back(std::string("the solver stopped before convergence (") +
                      terminationName(res.summary.termination) + ")");
    }
    const int pd = s.pd;
    const double windowDays = (res.last - res.first) * pd + (pd - 1);
    if ((d0[kPeakDay] < 0 || d0[kPeakDay] > windowDays) && !(d0[kFraction] >= 0.5)) {
        why.push_back(
            "the fitted peak lies outside the window while less than half of the wave "
            "is observed");
    }
    double observed = 0;
    for (int i = res.first; i <= res.last; ++i) {
        const double c = s.series.counts[static_cast<std::size_t>(i)];
        if (std::isfinite(c))
            observed += c;
    }
    if (!(d0[kWaveSize] <= 20.0 * observed)) {
        std::snprintf(buf, sizeof buf,
                      "the wave size K = %.3g is over 20 times the window's %.0f counts",
                      d0[kWaveSize], observed);
        why.push_back(buf);
    }
    checkInterval(res.derived.waveSize, "wave size K", why);
    checkInterval(res.derived.peakIncidence, "peak incidence", why);
    if (std::string name; parameterAtBound(s, name))
        why.push_back("the parameter " + name + " is at a bound of the model's domain");
    const double flat = edgeToTopRatio(s, d0[kPeakDay]);
    if (!(flat < 0.5)) {
        std::snprintf(buf, sizeof buf,
                      "the fitted curve stays above %.0f%% of its top across the whole window: "
                      "no rise and fall to fit (noise or a plateau)",
                      100.0 * std::floor(std::min(flat, 1.0) * 10.0) / 10.0);
        why.insert(why.begin(), buf);
    }
    if (!res.summary.converged())
        res.status = FitStatus::NotConverged;
    else if (!(flat < 0.5))
        res.status = FitStatus::NoWave;
    else
        res.status = why.empty() ? FitStatus::Ok : FitStatus::Implausible;
}

// The fit of o.model, whatever o.modelChoice says (fitSeries applies the choice): the steps of
// the pipeline in fit.h, each its own function above.
Result<FitResult> fitGivenModel(const Series& series, const FitOptions& o,
                                std::optional<double> population, detail::FitBuffers& work) {
    if (auto e = unusableSeries(series, o))
        return *e;
    FitState s(series, o, work);
    if (auto e = chooseWindowAndModel(s))  // 1. the window
        return *e;
    if (auto e = findStart(s))  // 3. the start
        return *e;
    std::optional<SmoothedLeastSquares> lsq;  // holds the LSQ model days until the end
    // 2-4, 6: the target, the solve, the covariance and the goodness of fit.
    auto failed =
        o.method == FitMethod::LeastSquares ? fitSmoothedLeastSquares(s, lsq) : fitByLikelihood(s);
    if (failed)
        return *failed;
    const double q = detail::intervalQuantile(o.method, s.dof);
    const bool haveCov = detail::covarianceUsable(s.covariance, s.np);
    addParameterEstimates(s, q);
    addFittedCurveAndBand(s, q, haveCov);    // 5. the curve and its band
    addInformationCriteria(s.res.goodness);  // 6. AIC, AICc
    const auto d0 = addDerivedQuantities(s, q, haveCov, population);
    addObservedDoubling(s, d0);
    addNotes(s, d0, haveCov);
    noteDoublingDisagreement(s.res);
    assessStatus(s, d0);
    return std::move(s.res);
}

// Why no model could be kept: the first model that failed and its reason, where one did.
[[gnu::cold]] Error noModelConverged(const std::vector<ModelComparisonRow>& rows) {
    for (const auto& row : rows) {
        if (!row.error.empty())
            return makeError(ErrorCode::Numerical,
                             std::string(modelName(row.model)) + ": " + row.error);
    }
    return makeError(ErrorCode::Numerical, "no model converged on this window");
}

// The row options.modelChoice names among the four, as a fit or an error.
Result<FitResult> chosenRow(const std::vector<ModelComparisonRow>& rows, const FitOptions& o) {
    if (o.modelChoice == ModelChoice::LowestAicc) {
        if (const ModelComparisonRow* best = bestByAicc(rows))
            return *best->fit;
        return noModelConverged(rows);
    }
    for (const ModelComparisonRow& row : rows) {
        if (row.model != o.model)
            continue;
        if (row.fit)
            return *row.fit;
        return makeError(ErrorCode::Numerical, row.error);
    }
    return noModelConverged(rows);
}

// The four models with one workspace.
std::vector<ModelComparisonRow> compareModelsWith(const Series& series, const FitOptions& options,
                                                  std::optional<double> population,
                                                  detail::FitBuffers& work) {
    std::vector<ModelComparisonRow> rows;
    for (ModelKind kind : kAllModels) {
        FitOptions o = options;
        o.model = kind;
        ModelComparisonRow row;
        row.model = kind;
        auto r = fitGivenModel(series, o, population, work);
        if (r) {
            row.fit = std::move(r.value());
        } else {
            row.error = r.error().message;
        }
        rows.push_back(std::move(row));
    }
    return rows;
}

}  // namespace

Result<FitResult> fitSeries(const Series& series, const FitOptions& options,
                            std::optional<double> population, FitWorkspace& workspace) {
    if (options.modelChoice == ModelChoice::Given)
        return fitGivenModel(series, options, population, workspace.buffers());
    return chosenRow(compareModelsWith(series, options, population, workspace.buffers()), options);
}

Result<FitResult> fitSeries(const Series& series, const FitOptions& options,
                            std::optional<double> population) {
    FitWorkspace workspace;
    return fitSeries(series, options, population, workspace);
}

std::vector<ModelComparisonRow> compareModels(const Series& series, const FitOptions& options,
                                              std::optional<double> population) {
    FitWorkspace workspace;
    return compareModelsWith(series, options, population, workspace.buffers());
}

ComparedFit fitWithComparison(const Series& series, const FitOptions& options,
                              std::optional<double> population, bool compare,
                              FitWorkspace& workspace) {
    if (!compare)
        return {fitSeries(series, options, population, workspace), {}};
    std::vector<ModelComparisonRow> rows =
        compareModelsWith(series, options, population, workspace.buffers());
    Result<FitResult> fit = chosenRow(rows, options);
    return {std::move(fit), std::move(rows)};
}

ComparedFit fitWithComparison(const Series& series, const FitOptions& options,
                              std::optional<double> population, bool compare) {
    FitWorkspace workspace;
    return fitWithComparison(series, options, population, compare, workspace);
}

const ModelComparisonRow* bestByAicc(const std::vector<ModelComparisonRow>& rows) {
    const ModelComparisonRow* best = nullptr;
    for (const auto& row : rows) {
        if (!row.fit || !row.fit->summary.converged() || !std::isfinite(row.fit->goodness.aicc)) {
            continue;
        }
        if (!best || row.fit->goodness.aicc < best->fit->goodness.aicc)
            best = &row;
    }
    return best;
}

}  // namespace siftwave::fit
