#include "siftwave/fit/waves.h"

#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <string>

namespace siftwave::fit {

namespace {

// The running extremes of the zig-zag: the lowest point since the last peak (the trough) and
// the highest since that trough.
struct Extremes {
    int minIndex = -1, maxIndex = -1;
    double lo = 0, hi = 0;  // s[minIndex], s[maxIndex]
};

// Seeking a peak from day i on: the first day that lies delta below the running maximum, once
// that maximum is delta above the trough (the peak is then confirmed); n when none does. A new
// low before that moves the trough (and restarts the maximum) there. Missing days (NaN) compare
// false everywhere and change nothing. Updates are selected, not branched on: on a noisy rise or
// a flat stretch the tests are unpredictable.
[[gnu::noinline]] int risingPhase(std::span<const double> s, int i, double delta, Extremes& x) {
    const int n = static_cast<int>(s.size());
    int minIndex = x.minIndex, maxIndex = x.maxIndex;
    double lo = x.lo, hi = x.hi;
    for (; i < n; ++i) {
        const double v = s[static_cast<std::size_t>(i)];
        const bool higher = v > hi;
        maxIndex = higher ? i : maxIndex;
        hi = higher ? v : hi;
        if (hi - lo >= delta && v < hi - delta)
            break;
        const bool lower = v < lo;
        minIndex = lower ? i : minIndex;
        maxIndex = lower ? i : maxIndex;
        hi = lower ? v : hi;
        lo = lower ? v : lo;
    }
    x = {minIndex, maxIndex, lo, hi};
    return i;
}

// Seeking a trough from day i on: the first day that lies delta above the running minimum;
// n when none does.
[[gnu::noinline]] int fallingPhase(std::span<const double> s, int i, double delta, Extremes& x) {
    const int n = static_cast<int>(s.size());
    int minIndex = x.minIndex;
    double lo = x.lo;
    for (; i < n; ++i) {
        const double v = s[static_cast<std::size_t>(i)];
        const bool lower = v < lo;
        minIndex = lower ? i : minIndex;
        lo = lower ? v : lo;
        if (v > lo + delta)
            break;
    }
    x.minIndex = minIndex;
    x.lo = lo;
    return i;
}

}  // namespace

WaveDetectionOptions WaveDetectionOptions::forCadence(Cadence cadence) {
    WaveDetectionOptions o;
    if (cadence == Cadence::Weekly) {
        o.smoothingWindow = 3;
        o.minPeak = 5.0;
        o.minPeriods = 6;
    }
    return o;
}

Status WaveDetectionOptions::validate() const {
    if (smoothingWindow < 1 || smoothingWindow > 365) {
        return makeError(ErrorCode::Usage,
                         "the wave-detection smoothing window must be 1..365 periods");
    }
    if (!(minProminenceShare > 0 && minProminenceShare < 1) || !(riseShare >= 0 && riseShare < 1)) {
        return makeError(ErrorCode::Usage, "wave-detection shares must lie between 0 and 1");
    }
    if (!(minPeak >= 0))
        return makeError(ErrorCode::Usage, "minPeak must not be negative");
    if (minPeriods < 3)
        return makeError(ErrorCode::Usage, "minPeriods must be at least 3");
    return Ok{};
}

std::vector<Wave> detectWaves(std::span<const double> counts, const WaveDetectionOptions& options) {
    return detectWavesInSmoothed(series::centredMovingAverage(counts, options.smoothingWindow),
                                 options);
}

namespace {

// The highest finite value (0 at least), as four running maxima over interleaved days: one
// alone is a chain of dependent comparisons a day long.
double highestFinite(std::span<const double> s) {
    std::array<double, 4> tops{};
    for (std::size_t i = 0; i < s.size(); ++i) {
        const double v = s[i];
        const double finite = std::isfinite(v) ? v : 0.0;  // selected, not branched on
        double& top = tops[i % 4];
        top = finite > top ? finite : top;
    }
    return std::max(std::max(tops[0], tops[1]), std::max(tops[2], tops[3]));
}

// The turning points of the zig-zag: troughs[k] precedes peaks[k]. Local vectors: a detection
// runs once per fit, and a few dozen turns reserved at once make one small allocation each.
struct Turns {
    std::vector<int> troughs, peaks;
    bool openRise = false;  // the last rise has not turned yet (an unconfirmed peak)
};

// Zig-zag: alternate troughs and peaks, each confirmed by a move of delta. Each phase runs in its
// own call-free loop (risingPhase, fallingPhase), kept out of line: x86-64 has no callee-saved
// vector registers, so with a push_back in the day loop, or inlined among this function's many
// values, the compiler kept the running extremes in memory, and every day waited on a store.
Turns zigZag(std::span<const double> s, double delta) {
    Turns turns;
    turns.troughs.reserve(32);
    turns.peaks.reserve(32);
    const int n = static_cast<int>(s.size());
    bool seekingPeak = true;
    Extremes x;
    int begin = 0;  // the first finite day starts the zig-zag
    while (begin < n && !std::isfinite(s[static_cast<std::size_t>(begin)]))
        ++begin;
    if (begin < n) {
        x.minIndex = x.maxIndex = begin;
        x.lo = x.hi = s[static_cast<std::size_t>(begin)];
    }
    for (int i = begin + 1; i < n;) {
        if (seekingPeak) {
            i = risingPhase(s, i, delta, x);
            if (i < n) {  // confirmed: the trough and peak of a wave; the fall starts at day i
                turns.troughs.push_back(x.minIndex);
                turns.peaks.push_back(x.maxIndex);
                seekingPeak = false;
                x.minIndex = i;
                x.lo = s[static_cast<std::size_t>(i)];
                ++i;
            }
        } else {
            i = fallingPhase(s, i, delta, x);
            if (i < n) {  // a rise of delta above the trough: seek the next peak from day i
                seekingPeak = true;
                x.maxIndex = i;
                x.hi = s[static_cast<std::size_t>(i)];
                ++i;
            }
        }
    }
    const int minIndex = x.minIndex, maxIndex = x.maxIndex;
    // A last rise that has not turned yet is a wave with an unconfirmed peak.
    if (seekingPeak && maxIndex > minIndex && minIndex >= 0 &&
        s[static_cast<std::size_t>(maxIndex)] - s[static_cast<std::size_t>(minIndex)] >= delta) {
        turns.troughs.push_back(minIndex);
        turns.peaks.push_back(maxIndex);
        turns.openRise = true;
    }
    return turns;
}

// A wave per peak: from the start of its sustained rise to the next trough (or the last finite
// day), kept when it reaches minPeak and lasts minPeriods.
std::vector<Wave> wavesFrom(std::span<const double> s, const Turns& turns,
                            const WaveDetectionOptions& options) {
    std::vector<Wave> waves;
    const std::vector<int>&troughs = turns.troughs, &peaks = turns.peaks;
    int lastFinite = static_cast<int>(s.size()) - 1;
    while (lastFinite > 0 && !std::isfinite(s[static_cast<std::size_t>(lastFinite)]))
        --lastFinite;
    for (std::size_t k = 0; k < peaks.size(); ++k) {
        Wave w;
        w.peak = peaks[k];
        w.peakValue = s[static_cast<std::size_t>(w.peak)];
        const int trough = troughs[k];
        const double troughValue = s[static_cast<std::size_t>(trough)];
        const double level = troughValue + options.riseShare * (w.peakValue - troughValue);
        // The last day before the peak still at or below that level (NaN compares false).
        w.first = w.peak - 1;
        while (w.first > trough && !(s[static_cast<std::size_t>(w.first)] <= level))
            --w.first;
        if (k + 1 < peaks.size()) {
            w.last = troughs[k + 1];
            w.troughSeen = true;
        } else {
            w.last = lastFinite;
            w.troughSeen = false;
        }
        w.peakConfirmed = !(turns.openRise && k + 1 == peaks.size());
        if (w.peakValue < options.minPeak)
            continue;
        if (w.last - w.first + 1 < options.minPeriods)
            continue;
        waves.push_back(w);
    }
    return waves;
}

}  // namespace

std::vector<Wave> detectWavesInSmoothed(std::span<const double> s,
                                        const WaveDetectionOptions& options) {
    const double top = highestFinite(s);
    if (s.empty() || top < options.minPeak || !(top > 0))
        return {};
    const double delta = std::max(options.minProminenceShare * top, options.minPeak / 2.0);
    return wavesFrom(s, zigZag(s, delta), options);
}

}  // namespace siftwave::fit
