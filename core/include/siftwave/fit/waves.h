#pragma once
// Automatic wave detection on a series of periods (days or weeks).
//
// The series is smoothed with a centred moving average (no lag, see series/smoothing.h) and
// read as a zig-zag with hysteresis: a peak is confirmed once the curve has fallen by
// `delta` below its running maximum, a trough once it has risen by `delta` above its running
// minimum, with delta = max(minProminenceShare x the highest smoothed value, minPeak / 2).
// Every wave therefore rises and falls by at least delta (its prominence). A wave runs from
// the start of its sustained rise (the last period after the preceding trough on which the
// curve is still within riseShare of the rise from trough to peak) to the trough before the
// next wave, or to the end of the series when no later trough is seen.
// Peak detection by hysteresis thresholds is common practice (no source).
//
// Everything here counts periods of the series; the thresholds depend on the cadence
// (forCadence()), chosen so that a wave has enough counts and periods to be fitted (common
// practice, no source):
//                      daily (the defaults)       weekly
//   smoothingWindow    7 days (weekday effect)    3 weeks (a weekly count has no weekday
//                                                 effect; 3 weeks calm district-level noise)
//   minPeak            5 cases per day            5 cases per week (weekly surveillance of a
//                                                 district peaks at a few cases a week)
//   minPeriods         14 days                    6 weeks (the 4 Richards parameters + 2)
//   minProminenceShare, riseShare: the same shares for both.

#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <span>
#include <vector>

namespace siftwave::fit {

/// The defaults are the daily ones; forCadence(Cadence::Weekly) gives the weekly ones.
struct WaveDetectionOptions {
    int smoothingWindow = 7;          // periods of the centred average the waves are read from
    double minProminenceShare = 0.2;  // a wave rises and falls by at least this share of the top
    double minPeak = 5.0;             // smoothed cases per period a wave must reach at its peak
    double riseShare = 0.02;          // "start of the sustained rise": within 2% of trough level
    int minPeriods = 14;              // shorter waves are dropped

    /// The thresholds for a cadence (the table in the header comment).
    static WaveDetectionOptions forCadence(Cadence cadence);
    /// Usage errors for windows < 1, shares outside (0, 1), negative minPeak or minPeriods < 3.
    Status validate() const;
};

struct Wave {
    int first = 0;              // period index where the rise starts
    int peak = 0;               // period index of the smoothed maximum
    int last = 0;               // period index of the trough after (or the last period)
    double peakValue = 0;       // smoothed cases per period at the peak
    bool peakConfirmed = true;  // false: the curve was still rising at the end of the series
    bool troughSeen = false;    // true: the decline ended in a trough before the series end
};

/// Waves in time order. NaN values are missing periods. Empty when nothing reaches minPeak.
std::vector<Wave> detectWaves(std::span<const double> counts,
                              const WaveDetectionOptions& options = {});

/// The same on a series already smoothed with the centred average of options.smoothingWindow.
std::vector<Wave> detectWavesInSmoothed(std::span<const double> smoothed,
                                        const WaveDetectionOptions& options = {});

}  // namespace siftwave::fit
