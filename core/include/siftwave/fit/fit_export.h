#pragma once
// Fit results as the CLI writes them, for every front end: one JSON object per fitted region
// (`siftwave-cli fit --json`, documented in the README) and one CSV row per region
// (`siftwave-cli fit --csv`, RFC 4180, text fields spreadsheet-safe through csv_field.h).
// Non-finite numbers are JSON null and empty CSV fields; dates are ISO 8601.

#include "siftwave/fit/batch.h"
#include "siftwave/fit/fit.h"

#include <nlohmann/json_fwd.hpp>

#include <span>
#include <string>
#include <string_view>

namespace siftwave::fit {

/// One fit: region, model, method, window, parameters with their intervals, the derived
/// quantities (dates for the date-valued ones) and their uncertainty, goodness of fit, the
/// solver's summary, the comparison of models when it is not empty, with `withCurve` the
/// fitted count of each window period and its pointwise 95% interval ("curve"), and the
/// caution.
nlohmann::json fitToJson(std::string_view region, const FitResult& fit,
                         std::span<const ModelComparisonRow> comparison, bool withCurve);

/// The header line of the CSV (no line end).
std::string_view fitCsvHeader();

/// One region's CSV row (no line end): its fit, or empty cells and the error's message.
std::string fitCsvRow(const RegionFit& region);

}  // namespace siftwave::fit
