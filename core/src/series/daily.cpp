#include "siftwave/series/daily.h"

#include <limits>

namespace siftwave::series {

std::vector<double> countsOf(const Drop& drop, std::size_t measure, std::size_t region) {
    const auto cells = drop.series(measure, region);
    std::vector<double> out(cells.size(), std::numeric_limits<double>::quiet_NaN());
    for (std::size_t i = 0; i < cells.size(); ++i) {
        if (cells[i].reported())
            out[i] = cells[i].value;
    }
    return out;
}

}  // namespace siftwave::series
