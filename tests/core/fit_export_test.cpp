// Fit results to JSON and CSV rows (fit_export.h): the fields the CLI prints, nulls and empty
// cells for what is not a number, and spreadsheet-safe text.
#include "siftwave/fit/fit_export.h"

#include "core/fit_wave_generator.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

namespace siftwave::fit {
namespace {

const Date kFirst = *Date::fromIso("2026-03-02");

FitResult fittedWave() {
    static const std::vector<double> counts = test::generateCounts({}, 3);
    auto r = fitSeries({kFirst, counts}, {}, 250000.0);
    EXPECT_TRUE(r);
    return r.value();
}

std::size_t fieldCount(const std::string& line) {
    return static_cast<std::size_t>(std::count(line.begin(), line.end(), ',')) + 1;
}

TEST(FitExport, JsonHoldsTheFitsFieldsAndTheCaution) {
    const FitResult f = fittedWave();
    const nlohmann::json j = fitToJson("KV", f, {}, false);
    EXPECT_EQ(j["region"], "KV");
    EXPECT_EQ(j["model"], "gumbel");
    EXPECT_EQ(j["method"], "lsq");
    EXPECT_EQ(j["window"]["first"], f.windowFirst().iso());
    EXPECT_EQ(j["parameters"].size(), f.parameters.size());
    EXPECT_EQ(j["peak_date"], f.dateOf(f.derived.peakDay.value).iso());
    EXPECT_DOUBLE_EQ(j["aicc"].get<double>(), f.goodness.aicc);
    EXPECT_TRUE(j["peak_infectious_load_per_100k"].is_number());
    EXPECT_EQ(j["summary"]["brief"], f.summary.brief());
    EXPECT_EQ(j["caution"], caution);
    EXPECT_FALSE(j.contains("comparison"));
    EXPECT_FALSE(j.contains("curve"));
}

TEST(FitExport, JsonWritesNonFiniteNumbersAsNullAndAddsTheCurveAndComparisonOnRequest) {
    FitResult f = fittedWave();
    f.goodness.aicc = std::numeric_limits<double>::quiet_NaN();
    std::vector<ModelComparisonRow> rows(2);
    rows[0].model = ModelKind::Gumbel;
    rows[0].fit = f;
    rows[1].model = ModelKind::Logistic;
    rows[1].error = "did not start";
    const nlohmann::json j = fitToJson("KV", f, rows, true);
    EXPECT_TRUE(j["aicc"].is_null());
    ASSERT_EQ(j["comparison"].size(), 2u);
    EXPECT_TRUE(j["comparison"][0]["aicc"].is_null());
    EXPECT_EQ(j["comparison"][1]["error"], "did not start");
    ASSERT_EQ(j["curve"].size(), f.fitted.size());
    EXPECT_EQ(j["curve"][0]["date"], f.windowFirst().iso());
}

TEST(FitExport, CsvRowHasAFieldPerHeaderColumn) {
    RegionFit ok{"KV", fittedWave(), std::nullopt, {}};
    const std::string header(fitCsvHeader());
    const std::string row = fitCsvRow(ok);
    EXPECT_EQ(row.rfind("KV,gumbel,lsq,", 0), 0u) << row;
    EXPECT_EQ(fieldCount(row), fieldCount(header));
    EXPECT_EQ(row.back(), ',');  // no error
}

TEST(FitExport, CsvFailureRowKeepsTheColumnsAndNeutralisesText) {
    RegionFit failed{"=cmd", std::nullopt, makeError(ErrorCode::NotFound, "no wave found"), {}};
    const std::string row = fitCsvRow(failed);
    EXPECT_EQ(row.rfind("'=cmd,", 0), 0u) << row;
    EXPECT_EQ(fieldCount(row), fieldCount(std::string(fitCsvHeader())));
    EXPECT_NE(row.find(",no wave found"), std::string::npos);
}

}  // namespace
}  // namespace siftwave::fit
