#pragma once
// The transmission settings as flags, for `transmission` (its window is --window) and for
// `figure` and `report` (their --window is the fit's, so theirs is --transmission-window):
// --si-mean D --si-sd D | --si-file F, --prior-mean M, --prior-sd S, --weekday, the window.

#include "args.h"

#include "siftwave/result.h"
#include "siftwave/time_axis.h"
#include "siftwave/transmission/transmission.h"

#include <string>
#include <vector>

namespace siftwave::cli {

/// The flags, the window under the name `windowFlag`.
std::vector<FlagSpec> transmissionFlagSpecs(const std::string& windowFlag);

/// Whether any of the serial-interval or prior flags, --weekday or `windowFlag` is given.
bool hasTransmissionFlags(const ParsedArgs& args, const std::string& windowFlag);

/// The options for a drop of this cadence: TransmissionOptions::forCadence, then the flags.
/// A wrong value is a usage error (ErrorCode::Usage); an unreadable or malformed serial-interval
/// file its own error (file, line, column).
Result<transmission::TransmissionOptions> transmissionOptionsFrom(const ParsedArgs& args,
                                                                  const std::string& windowFlag,
                                                                  Cadence cadence);

}  // namespace siftwave::cli
