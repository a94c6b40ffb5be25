#include "siftwave/transmission/transmission.h"

#include <cstdio>

namespace siftwave::transmission {
namespace detail {

// The serial interval per period of the axis, or the reason R_t is refused for the series.
std::string serialIntervalForAxis(const TransmissionOptions& o, const TimeAxis& axis,
                                  SerialInterval& used) {
    if (!o.serialInterval)
        return "no serial interval given: R_t needs its mean and sd or a day,weight file";
    if (!axis.weekly()) {
        used = *o.serialInterval;
        return {};
    }
    used = toWeeks(*o.serialInterval);
    const double within = used.weights.empty() ? 0.0 : used.weights[0];
    if (within > o.maxWithinPeriodShare) {
        char text[256];
        std::snprintf(text, sizeof text,
                      "weekly counts with a serial interval of mean %.1f days: %.0f%% of "
                      "transmission falls within one week, so weekly counts cannot tell one "
                      "generation from the next; use daily counts for R_t",
                      o.serialInterval->meanDays(), 100.0 * within);
        return text;
    }
    return {};
}

}  // namespace detail

TransmissionOptions TransmissionOptions::forCadence(Cadence cadence) {
    TransmissionOptions o;
    o.setWindow(cadence == Cadence::Weekly ? 4 : 7);
    return o;
}

Status TransmissionOptions::validate(Cadence cadence) const {
    if (auto s = growth.validate(cadence); !s)
        return s;
    if (auto s = cori.validate(); !s)
        return s;
    if (!(maxWithinPeriodShare >= 0.0 && maxWithinPeriodShare <= 1.0))
        return makeError(ErrorCode::Usage, "the largest within-week share must be 0 to 1");
    return Ok{};
}

std::string TransmissionResult::settingsBrief() const {
    char text[512];
    const std::string si =
        options.serialInterval ? options.serialInterval->description : std::string("none");
    std::snprintf(text, sizeof text,
                  "window %d %s ending on each %s; serial interval %s; prior mean %g, sd %g; "
                  "no R above posterior CV %g%s",
                  options.cori.window, axis.unitPlural(), axis.unitName(), si.c_str(),
                  options.cori.priorMean, options.cori.priorSd, options.cori.maxCv,
                  options.growth.weekdayTerms ? "; weekday terms in r" : "");
    return text;
}

TransmissionResult estimateTransmission(std::span<const double> counts, const TimeAxis& axis,
                                        const TransmissionOptions& options) {
    TransmissionResult result;
    result.axis = axis;
    result.options = options;
    result.refusal = detail::serialIntervalForAxis(options, axis, result.serialIntervalUsed);
    const std::vector<GrowthEstimate> growth = growthRates(counts, axis, options.growth);
    std::vector<CoriEstimate> cori;
    if (result.refusal.empty())
        cori = coriEstimates(counts, result.serialIntervalUsed, axis, options.cori);
    result.rows.resize(counts.size());
    for (std::size_t i = 0; i < counts.size(); ++i) {
        TransmissionRow& row = result.rows[i];
        row.period = static_cast<std::int32_t>(i);
        row.growth = growth[i];
        if (result.refusal.empty()) {
            row.reproduction = cori[i];
        } else {
            row.reproduction.reason = result.refusal;
        }
    }
    return result;
}

}  // namespace siftwave::transmission
