#pragma once
// Transmission estimates as `siftwave-cli transmission` writes them, for every front end.
//
// JSON: one object {region, measure, cadence, settings, serial_interval, refusal, caution, rows};
// each row has date (the period's first day, ISO 8601), period (its name: the date, or
// "2026-W05"), r, r_lo, r_hi (per day), r_se, dispersion, quasi_poisson, doubling_time_days,
// doubling_time_lo, doubling_time_hi, halving_time_days, halving_time_lo, halving_time_hi,
// r_reason, R, R_lo, R_hi, R_cv, reason. Numbers are null where there is no estimate; the
// upper end of a doubling or halving time is null where the interval is open (r's interval
// holds 0) while the value itself is given. R, R_lo, R_hi are null where `reason` says why;
// R_cv is given wherever a posterior exists, so that the CV rule can be checked.
// CSV: the same row fields (RFC 4180, empty cells where null, "inf" for an open end).

#include "siftwave/transmission/transmission.h"

#include <nlohmann/json_fwd.hpp>

#include <string>
#include <string_view>

namespace siftwave::transmission {

nlohmann::json transmissionToJson(std::string_view region, std::string_view measure,
                                  const TransmissionResult& result);

/// The header line of the CSV (no line end).
std::string_view transmissionCsvHeader();

/// Row i's CSV line (no line end).
std::string transmissionCsvRow(const TransmissionResult& result, std::size_t i);

}  // namespace siftwave::transmission
