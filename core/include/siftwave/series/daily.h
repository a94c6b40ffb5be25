#pragma once
// A region's daily counts from a Drop as plain doubles: reported cells give their value,
// every other cell (absent, blank, unparsable) is NaN, so smoothing and fitting skip it.

#include "siftwave/drop.h"

#include <cstddef>
#include <vector>

namespace siftwave::series {

/// Day i of the result is drop.firstDay + i; NaN where the cell is not Reported.
std::vector<double> countsOf(const Drop& drop, std::size_t measure, std::size_t region);

}  // namespace siftwave::series
