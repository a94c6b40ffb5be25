#pragma once
// Integer apportionment by the largest remainder (Hamilton) method.
//
// Given a whole number `total` >= 0 and non-negative integer weights w_i with
// W = sum w_i > 0, each part has the exact quota q_i = total * w_i / W. Every
// part first receives floor(q_i); the total - sum floor(q_i) units left over
// (fewer than the number of parts) go one each to the parts with the largest
// fractional remainders q_i - floor(q_i). The result sums to `total` exactly
// and every part is floor(q_i) or floor(q_i) + 1 (the quota rule).
//
// Everything is computed in integers: the remainder of part i is
// (total * w_i) mod W, so comparisons are exact and platform independent.
// Ties between equal remainders go to the lower index first (deterministic;
// our choice, common practice, no source). A part with weight 0 receives 0.
//
// Source: A. Hamilton's method as described in P. Tannenbaum, "Excursions in
// Modern Mathematics", chapter "The Mathematics of Apportionment"; also known
// as the Hare-quota largest remainder method (Hare-Niemeyer).

#include "siftwave/result.h"

#include <cstdint>
#include <span>
#include <vector>

namespace siftwave::ledger {

/// Splits `total` over `weights` by the largest remainder method.
/// Errors (InvalidValue): total < 0, a negative weight, or all weights zero
/// while total > 0. With total == 0 every part is 0.
Result<std::vector<std::int64_t>> apportionLargestRemainder(std::int64_t total,
                                                            std::span<const std::int64_t> weights);

}  // namespace siftwave::ledger
