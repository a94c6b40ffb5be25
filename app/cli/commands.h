#pragma once
// The subcommands of siftwave-cli. Each lives in its own <name>_command.cpp and
// is listed once in main.cpp's table.

namespace siftwave::cli {

// Each returns the process exit code (see ExitCode in args.h). argv[first] is
// the first argument after the subcommand name.
int runInspect(int argc, char** argv, int first);
int runScan(int argc, char** argv, int first);
int runDecide(int argc, char** argv, int first);
int runApply(int argc, char** argv, int first);
int runLedger(int argc, char** argv, int first);
int runSigningKey(int argc, char** argv, int first);
int runFit(int argc, char** argv, int first);
int runTransmission(int argc, char** argv, int first);
int runFigure(int argc, char** argv, int first);  // app/cli/qt/ (app/cli/no_qt/ without Qt)
int runReport(int argc, char** argv, int first);  // app/cli/qt/ (app/cli/no_qt/ without Qt)

}  // namespace siftwave::cli
