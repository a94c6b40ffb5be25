// siftwave-cli-render: the `figure` and `report` commands of siftwave-cli, which draw with Qt.
// siftwave-cli runs it with its own arguments (app/cli/render/render_launcher.cpp); run by hand,
// it takes the same: siftwave-cli-render figure FILE ... or siftwave-cli-render report FILE ....
#include "../commands.h"
#include "../common.h"

#include <cstdio>
#include <string>

int main(int argc, char** argv) {
    const std::string name = argc >= 2 ? argv[1] : "";
    if (name == "figure")
        return siftwave::cli::runGuarded("figure", siftwave::cli::runFigure, argc, argv);
    if (name == "report")
        return siftwave::cli::runGuarded("report", siftwave::cli::runReport, argc, argv);
    std::fprintf(stderr,
                 "usage: siftwave-cli-render figure|report ARGS (run by siftwave-cli figure and "
                 "siftwave-cli report)\n");
    return siftwave::cli::kExitUsage;
}
