#pragma once
// The weights of redistribute's `level` method (decision.h): the expected level of each period
// of the window, from the cleaned series around it alone, so that a replay finds the same.

#include "ledger/effects/effect_support.h"

#include <cstdint>
#include <vector>

namespace siftwave::ledger::detail {

/// For each period of `window`: the trend from the `width` periods before the window to the
/// `width` periods after `dumpDay` (the medians of their weekday-adjusted values, interpolated
/// on the log scale between the sides' centres), times the period's weekday factor on daily
/// data (ratio to the centred 7-day mean as series/weekday.h, on the region's cleaned series
/// with the window and the dump day left out and only whole weeks of values; all 1 when some
/// weekday has none or the drop is weekly). Quantised to
/// 1e-6 of a count for the largest remainder step. All 0 when neither side holds a value.
std::vector<std::int64_t> levelWeights(const Drop& drop, const Cleaned& cleaned, std::size_t m,
                                       std::size_t r, DaySpan window, std::int32_t dumpDay,
                                       int width);

}  // namespace siftwave::ledger::detail
