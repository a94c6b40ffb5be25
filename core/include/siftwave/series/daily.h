#pragma once
// A region's counts per period (day or week) from a Drop as plain doubles: reported cells give
// their value, every other cell (absent, blank, unparsable) is NaN, so smoothing and fitting skip
// it.

#include "siftwave/drop.h"

#include <cstddef>
#include <vector>

namespace siftwave::series {

/// Element i is period i of the drop's time axis; NaN where the cell is not Reported.
std::vector<double> countsOf(const Drop& drop, std::size_t measure, std::size_t region);

}  // namespace siftwave::series
