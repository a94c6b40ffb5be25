#pragma once
// The python3 interpreter that can import SciPy (Debian python3-scipy), for cross-checks against
// that general-purpose reference library; empty when there is none (the test then skips).
#include <cstdlib>
#include <string>

namespace siftwave::testing {

// Debian's interpreter first (python3-scipy installs there), then whatever python3 is on PATH.
inline std::string pythonWithScipy() {
    for (const char* python : {"/usr/bin/python3", "python3"}) {
        const std::string probe =
            std::string(python) + " -c 'import scipy.optimize' >/dev/null 2>&1";
        if (std::system(probe.c_str()) == 0)
            return python;
    }
    return {};
}

}  // namespace siftwave::testing
