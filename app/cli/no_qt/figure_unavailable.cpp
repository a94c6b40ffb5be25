// Without Qt (SIFTWAVE_WITH_QT=OFF) siftwave-cli cannot draw: `figure` and
// `report` say so and exit 2, and every other subcommand works as usual.
#include "../args.h"
#include "../commands.h"

#include <cstdio>

namespace siftwave::cli {
namespace {

int unavailable(const char* name) {
    std::fprintf(stderr,
                 "siftwave-cli %s: this siftwave-cli was built without Qt "
                 "(SIFTWAVE_WITH_QT=OFF), and figures and reports are drawn with Qt. "
                 "Rebuild with -DSIFTWAVE_WITH_QT=ON to use it.\n",
                 name);
    return kExitUsage;
}

}  // namespace

int runFigure(int, char**, int) {
    return unavailable("figure");
}

int runReport(int, char**, int) {
    return unavailable("report");
}

}  // namespace siftwave::cli
