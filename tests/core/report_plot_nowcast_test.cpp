// The nowcast on the plot model (plot_model.h: NowcastSpec).
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/figure_spec.h"
#include "siftwave/report/plot_model.h"

#include <gtest/gtest.h>

#include <cmath>

namespace siftwave::report {
namespace {

TEST(ReportPlotNowcast, ACaseListPlotCarriesTheNowcastOverItsLastPeriodsWithItsCaution) {
    Result<Drop> drop =
        ingest::readDrop(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv");
    ASSERT_TRUE(drop.ok());
    const ledger::Ledger ledger;
    Result<ledger::Cleaned> cleaned = ledger::replay(*drop, ledger);
    ASSERT_TRUE(cleaned.ok());
    PlotRequest request;
    request.region = "all";
    request.nowcast = nowcast::NowcastOptions{};
    Result<PlotModel> model = buildPlotModel(*drop, ledger, *cleaned, request);
    ASSERT_TRUE(model.ok()) << model.error().describe();
    ASSERT_TRUE(model->nowcast) << model->nowcastError;
    const NowcastSpec& n = *model->nowcast;
    ASSERT_EQ(n.mid.size(), static_cast<std::size_t>(model->periods()));
    EXPECT_TRUE(std::isnan(n.mid.front()));          // an old, complete period: no estimate drawn
    EXPECT_EQ(n.now, *Date::fromIso("2011-07-05"));  // the list's last report date
    EXPECT_NE(n.label.find("estimate of reports still to come"), std::string::npos);
    EXPECT_NE(n.caution.find("not a forecast of new infections"), std::string::npos);
    int estimated = 0;
    for (std::size_t i = 0; i < n.mid.size(); ++i) {
        if (std::isnan(n.mid[i]))
            continue;
        ++estimated;
        EXPECT_GE(n.mid[i], model->raw[i]);  // never below what is reported
        EXPECT_LE(n.low[i], n.mid[i]);
        EXPECT_GE(n.high[i], n.mid[i]);
    }
    EXPECT_GT(estimated, 0);
}

TEST(ReportPlotNowcast, ACaseListFigureCarriesTheNowcastAndItsCautionInTheCaption) {
    Result<Drop> drop =
        ingest::readDrop(std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/husO104Hosp_case_list.csv");
    ASSERT_TRUE(drop.ok());
    const ledger::Ledger ledger;
    Result<ledger::Cleaned> cleaned = ledger::replay(*drop, ledger);
    FigureRequest request;
    request.region = "all";
    Result<FigureSpec> spec = buildFigureSpec(*drop, ledger, *cleaned, request);
    ASSERT_TRUE(spec.ok()) << spec.error().describe();
    EXPECT_TRUE(spec->nowcast);
    ASSERT_FALSE(spec->captionLines.empty());
    EXPECT_NE(spec->captionLines.back().find("not a forecast of new infections"),
              std::string::npos);
}

TEST(ReportPlotNowcast, ACountReleaseSaysWhyItHasNoNowcast) {
    Result<Drop> drop =
        ingest::parseDrop("date,region,cases\n2026-03-01,A,3\n2026-03-02,A,4\n", "r.csv");
    ASSERT_TRUE(drop.ok());
    const ledger::Ledger ledger;
    Result<ledger::Cleaned> cleaned = ledger::replay(*drop, ledger);
    PlotRequest request;
    request.region = "A";
    request.nowcast = nowcast::NowcastOptions{};
    Result<PlotModel> model = buildPlotModel(*drop, ledger, *cleaned, request);
    ASSERT_TRUE(model.ok());
    EXPECT_FALSE(model->nowcast);
    EXPECT_NE(model->nowcastError.find("case list"), std::string::npos);
}

}  // namespace
}  // namespace siftwave::report
