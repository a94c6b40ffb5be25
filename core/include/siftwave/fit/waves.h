#pragma once
// Automatic wave detection on a daily series.
//
// The series is smoothed with a centred moving average (no lag, see series/smoothing.h) and
// read as a zig-zag with hysteresis: a peak is confirmed once the curve has fallen by
// `delta` below its running maximum, a trough once it has risen by `delta` above its running
// minimum, with delta = max(minProminenceShare x the highest smoothed value, minPeak / 2).
// Every wave therefore rises and falls by at least delta (its prominence). A wave runs from
// the start of its sustained rise (the last day after the preceding trough on which the curve
// is still within riseShare of the rise from trough to peak) to the trough before the next
// wave, or to the end of the series when no later trough is seen.
// Peak detection by hysteresis thresholds is common practice (no source).

#include "siftwave/result.h"

#include <span>
#include <vector>

namespace siftwave::fit {

struct WaveDetectionOptions {
    int smoothingWindow = 7;          // days of the centred average the waves are read from
    double minProminenceShare = 0.2;  // a wave rises and falls by at least this share of the top
    double minPeak = 5.0;             // smoothed cases per day a wave must reach at its peak
    double riseShare = 0.02;          // "start of the sustained rise": within 2% of trough level
    int minDays = 14;                 // shorter waves are dropped

    /// Usage errors for windows < 1, shares outside (0, 1), negative minPeak or minDays < 3.
    Status validate() const;
};

struct Wave {
    int first = 0;              // day index where the rise starts
    int peak = 0;               // day index of the smoothed maximum
    int last = 0;               // day index of the trough after (or the last day)
    double peakValue = 0;       // smoothed incidence at the peak
    bool peakConfirmed = true;  // false: the curve was still rising at the end of the series
    bool troughSeen = false;    // true: the decline ended in a trough before the series end
};

/// Waves in time order. NaN values are missing days. Empty when nothing reaches minPeak.
std::vector<Wave> detectWaves(std::span<const double> counts,
                              const WaveDetectionOptions& options = {});

/// The same on a series already smoothed with the centred average of options.smoothingWindow.
std::vector<Wave> detectWavesInSmoothed(std::span<const double> smoothed,
                                        const WaveDetectionOptions& options = {});

}  // namespace siftwave::fit
