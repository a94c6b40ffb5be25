#include "siftwave/fit/waves.h"

#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cmath>
#include <string>

namespace siftwave::fit {

Status WaveDetectionOptions::validate() const {
    if (smoothingWindow < 1 || smoothingWindow > 365) {
        return makeError(ErrorCode::Usage,
                         "the wave-detection smoothing window must be 1..365 days");
    }
    if (!(minProminenceShare > 0 && minProminenceShare < 1) || !(riseShare >= 0 && riseShare < 1)) {
        return makeError(ErrorCode::Usage, "wave-detection shares must lie between 0 and 1");
    }
    if (!(minPeak >= 0))
        return makeError(ErrorCode::Usage, "minPeak must not be negative");
    if (minDays < 3)
        return makeError(ErrorCode::Usage, "minDays must be at least 3");
    return Ok{};
}

std::vector<Wave> detectWaves(std::span<const double> counts, const WaveDetectionOptions& options) {
    return detectWavesInSmoothed(series::centredMovingAverage(counts, options.smoothingWindow),
                                 options);
}

std::vector<Wave> detectWavesInSmoothed(std::span<const double> s,
                                        const WaveDetectionOptions& options) {
    std::vector<Wave> waves;
    const int n = static_cast<int>(s.size());
    double top = 0;
    for (double v : s) {
        const double finite = std::isfinite(v) ? v : 0.0;  // selected, not branched on
        top = finite > top ? finite : top;
    }
    if (n == 0 || top < options.minPeak || !(top > 0))
        return waves;
    const double delta = std::max(options.minProminenceShare * top, options.minPeak / 2.0);

    // Zig-zag: alternate troughs and peaks, each confirmed by a move of delta.
    thread_local std::vector<int> troughs;  // troughs[k] precedes peaks[k]; per thread, reused
    thread_local std::vector<int> peaks;
    troughs.clear();
    peaks.clear();
    bool seekingPeak = true;
    int minIndex = -1, maxIndex = -1;
    double lo = 0, hi = 0;  // s[minIndex], s[maxIndex]
    int begin = 0;          // the first finite day starts the zig-zag
    while (begin < n && !std::isfinite(s[static_cast<std::size_t>(begin)]))
        ++begin;
    if (begin < n) {
        minIndex = maxIndex = begin;
        lo = hi = s[static_cast<std::size_t>(begin)];
    }
    for (int i = begin + 1; i < n; ++i) {
        const double v = s[static_cast<std::size_t>(i)];
        if (!std::isfinite(v))
            continue;
        if (seekingPeak) {
            // Select rather than branch: on a noisy rise the new-maximum test is unpredictable.
            const bool higher = v > hi;
            maxIndex = higher ? i : maxIndex;
            hi = higher ? v : hi;
            if (hi - lo >= delta && v < hi - delta) {
                troughs.push_back(minIndex);
                peaks.push_back(maxIndex);
                seekingPeak = false;
                minIndex = i;
                lo = v;
            } else {
                // No significant rise yet: a new low moves the trough on (selected, not branched
                // on: on a flat, noisy stretch the test is unpredictable).
                const bool lower = v < lo;
                minIndex = lower ? i : minIndex;
                maxIndex = lower ? i : maxIndex;
                hi = lower ? v : hi;
                lo = lower ? v : lo;
            }
        } else {
            const bool lower = v < lo;
            minIndex = lower ? i : minIndex;
            lo = lower ? v : lo;
            if (v > lo + delta) {
                seekingPeak = true;
                maxIndex = i;
                hi = v;
            }
        }
    }
    // A last rise that has not turned yet is a wave with an unconfirmed peak.
    bool openRise = false;
    if (seekingPeak && maxIndex > minIndex && minIndex >= 0 &&
        s[static_cast<std::size_t>(maxIndex)] - s[static_cast<std::size_t>(minIndex)] >= delta) {
        troughs.push_back(minIndex);
        peaks.push_back(maxIndex);
        openRise = true;
    }
    int lastFinite = n - 1;
    while (lastFinite > 0 && !std::isfinite(s[static_cast<std::size_t>(lastFinite)]))
        --lastFinite;

    for (std::size_t k = 0; k < peaks.size(); ++k) {
        Wave w;
        w.peak = peaks[k];
        w.peakValue = s[static_cast<std::size_t>(w.peak)];
        const int trough = troughs[k];
        const double troughValue = s[static_cast<std::size_t>(trough)];
        const double level = troughValue + options.riseShare * (w.peakValue - troughValue);
        w.first = trough;
        for (int i = trough; i < w.peak; ++i) {
            const double v = s[static_cast<std::size_t>(i)];
            if (std::isfinite(v) && v <= level)
                w.first = i;
        }
        if (k + 1 < peaks.size()) {
            w.last = troughs[k + 1];
            w.troughSeen = true;
        } else {
            w.last = lastFinite;
            w.troughSeen = false;
        }
        w.peakConfirmed = !(openRise && k + 1 == peaks.size());
        if (w.peakValue < options.minPeak)
            continue;
        if (w.last - w.first + 1 < options.minDays)
            continue;
        waves.push_back(w);
    }
    return waves;
}

}  // namespace siftwave::fit
