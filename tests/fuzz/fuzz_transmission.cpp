// libFuzzer target: the serial-interval file reader (serial_interval.h) and both transmission
// measures (transmission.h) on counts made from the same bytes. Reading never crashes and either
// gives weights that sum to 1 within 0.01 with day 0 at 0, or an error with a line; the estimates
// never crash, and every period has either an estimate with an ordered interval or a reason.
#include "siftwave/transmission/transmission.h"

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <string>
#include <vector>

namespace {

using namespace siftwave;

void checkSerialInterval(const Result<transmission::SerialInterval>& si) {
    if (!si) {
        if (si.error().file != "fuzz.csv")
            __builtin_trap();
        return;
    }
    double total = 0.0;
    for (double w : si->weights) {
        if (!(w >= 0.0) || !std::isfinite(w))
            __builtin_trap();
        total += w;
    }
    if (si->weights.empty() || si->weights[0] != 0.0 || std::abs(total - 1.0) > 0.01)
        __builtin_trap();
}

// Counts from the bytes: a byte is a count, 255 a missing cell; at most 60 periods (a sanitized
// IRLS per period is slow).
std::vector<double> countsOf(const std::uint8_t* data, std::size_t size) {
    std::vector<double> counts;
    for (std::size_t i = 0; i < size && counts.size() < 60; ++i)
        counts.push_back(data[i] == 255 ? std::numeric_limits<double>::quiet_NaN()
                                        : static_cast<double>(data[i]) * (1 + data[i] % 7));
    return counts;
}

void checkRows(const transmission::TransmissionResult& result) {
    for (const auto& row : result.rows) {
        const auto& g = row.growth;
        if (g.ok() == !g.reason.empty() ||
            (g.ok() && !(g.r.lower <= g.r.value && g.r.value <= g.r.upper)))
            __builtin_trap();
        const auto& c = row.reproduction;
        if (c.ok() && !(c.lower <= c.mean && c.mean <= c.upper && c.lower >= 0.0))
            __builtin_trap();
    }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string text(reinterpret_cast<const char*>(data), size);
    const auto si = transmission::parseSerialInterval(text, "fuzz.csv");
    checkSerialInterval(si);
    const std::vector<double> counts = countsOf(data, size);
    const auto n = static_cast<std::int32_t>(counts.size());
    for (const TimeAxis& axis :
         {TimeAxis::daily(*Date::fromIso("2026-01-05"), n),
          TimeAxis::weekly(*Date::fromIso("2026-01-05"), n, WeekStart::Monday)}) {
        auto options = transmission::TransmissionOptions::forCadence(axis.cadence());
        options.serialInterval =
            si ? si.value() : transmission::discretisedGamma(4.0 + size % 5, 2.0).value();
        options.growth.weekdayTerms = !axis.weekly() && size % 2 == 0;
        if (options.growth.weekdayTerms)
            options.setWindow(14);
        checkRows(transmission::estimateTransmission(counts, axis, options));
    }
    return 0;
}
