#include "siftwave/ledger/apportion.h"

#include "ledger/wide_int.h"

#include <algorithm>
#include <numeric>

namespace siftwave::ledger {

Result<std::vector<std::int64_t>> apportionLargestRemainder(std::int64_t total,
                                                            std::span<const std::int64_t> weights) {
    if (total < 0)
        return makeError(ErrorCode::InvalidValue, "cannot apportion a negative amount");
    detail::WideInt weightSum = 0;
    for (std::int64_t w : weights) {
        if (w < 0)
            return makeError(ErrorCode::InvalidValue, "apportionment weights must not be negative");
        weightSum += w;
    }
    std::vector<std::int64_t> parts(weights.size(), 0);
    if (total == 0)
        return parts;
    if (weightSum == 0) {
        return makeError(ErrorCode::InvalidValue,
                         "cannot apportion over weights that are all zero");
    }
    // Exact quota total * w_i / W as floor and remainder.
    std::vector<detail::WideInt> remainders(weights.size(), 0);
    std::int64_t given = 0;
    for (std::size_t i = 0; i < weights.size(); ++i) {
        const detail::WideInt product = static_cast<detail::WideInt>(total) * weights[i];
        parts[i] = static_cast<std::int64_t>(product / weightSum);
        remainders[i] = product % weightSum;
        given += parts[i];
    }
    std::int64_t left = total - given;  // < number of parts with a non-zero remainder
    std::vector<std::size_t> order(weights.size());
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return remainders[a] > remainders[b]; });
    for (std::size_t k = 0; k < order.size() && left > 0; ++k, --left)
        ++parts[order[k]];
    return parts;
}

}  // namespace siftwave::ledger
