#pragma once
// Runs one scan detector on a drop, the way scan() prepares its input, for the per-detector tests.

#include "scan/scan_input.h"

#include <vector>

namespace siftwave::testing {

/// `detector` is one of scan::detail's find* functions: (const ScanInput&, std::vector<Finding>&).
template <typename Detector>
std::vector<scan::Finding> runDetector(const Drop& drop, Detector detector,
                                       const scan::ScanOptions& options = {}) {
    const scan::detail::ScanInput in = scan::detail::prepareScanInput(drop, options);
    std::vector<scan::Finding> out;
    detector(in, out);
    return out;
}

}  // namespace siftwave::testing
