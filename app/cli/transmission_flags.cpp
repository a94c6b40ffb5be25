#include "transmission_flags.h"

#include <charconv>
#include <cmath>

namespace siftwave::cli {
namespace {

Error usage(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}

// A flag's number: false when absent; a usage error when it is not a number.
Result<bool> readNumber(const ParsedArgs& args, const char* name, double& out) {
    auto text = args.optionalValue(name);
    if (!text)
        return false;
    const char* end = text->data() + text->size();
    auto [p, ec] = std::from_chars(text->data(), end, out);
    if (ec != std::errc() || p != end || !std::isfinite(out))
        return usage("--" + std::string(name) + " wants a number, not '" + *text + "'");
    return true;
}

// The serial interval: --si-mean with --si-sd, or --si-file, or none.
Status readSerialInterval(const ParsedArgs& args, transmission::TransmissionOptions& o) {
    double mean = 0.0, sd = 0.0;
    auto hasMean = readNumber(args, "si-mean", mean);
    if (!hasMean)
        return hasMean.error();
    auto hasSd = readNumber(args, "si-sd", sd);
    if (!hasSd)
        return hasSd.error();
    const auto file = args.optionalValue("si-file");
    if (file && (*hasMean || *hasSd))
        return usage("give either --si-mean and --si-sd or --si-file, not both");
    if (*hasMean != *hasSd)
        return usage("--si-mean and --si-sd go together");
    if (file) {
        auto si = transmission::readSerialIntervalFile(*file);
        if (!si)
            return si.error();
        o.serialInterval = std::move(si.value());
    } else if (*hasMean) {
        auto si = transmission::discretisedGamma(mean, sd);
        if (!si)
            return si.error();  // a usage error: the numbers given are not allowed
        o.serialInterval = std::move(si.value());
    }
    return Ok{};
}

}  // namespace

std::vector<FlagSpec> transmissionFlagSpecs(const std::string& windowFlag) {
    return {
        {windowFlag, true, false, "N",
         "transmission window: periods ending on each period (default 7 days, 4 weeks)"},
        {"si-mean", true, false, "D", "serial interval mean in days (with --si-sd)"},
        {"si-sd", true, false, "D", "serial interval sd in days (with --si-mean)"},
        {"si-file", true, false, "F",
         "serial interval as a CSV file 'day,weight' (days 0, 1, ...; day 0 weighs 0)"},
        {"prior-mean", true, false, "M", "gamma prior mean of R (default 5)"},
        {"prior-sd", true, false, "S", "gamma prior sd of R (default 5)"},
        {"weekday", false, false, "",
         "daily counts: weekday terms in the growth regression (window >= 14)"},
    };
}

bool hasTransmissionFlags(const ParsedArgs& args, const std::string& windowFlag) {
    for (const char* name : {"si-mean", "si-sd", "si-file", "prior-mean", "prior-sd", "weekday"})
        if (args.has(name))
            return true;
    return args.has(windowFlag);
}

Result<transmission::TransmissionOptions> transmissionOptionsFrom(const ParsedArgs& args,
                                                                  const std::string& windowFlag,
                                                                  Cadence cadence) {
    auto o = transmission::TransmissionOptions::forCadence(cadence);
    double value = 0.0;
    auto window = readNumber(args, windowFlag.c_str(), value);
    if (!window)
        return window.error();
    if (*window) {
        if (value != std::floor(value) || value < 3 || value > 1000)
            return usage("--" + windowFlag + " wants a whole number of periods from 3 to 1000");
        o.setWindow(static_cast<int>(value));
    }
    for (auto [name, target] :
         {std::pair{"prior-mean", &o.cori.priorMean}, std::pair{"prior-sd", &o.cori.priorSd}}) {
        auto given = readNumber(args, name, *target);
        if (!given)
            return given.error();
    }
    o.growth.weekdayTerms = args.has("weekday");
    if (Status s = readSerialInterval(args, o); !s)
        return s.error();
    if (Status s = o.validate(cadence); !s)
        return s.error();
    return o;
}

}  // namespace siftwave::cli
