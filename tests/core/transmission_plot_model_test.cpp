// The plot model carries the transmission estimates of the cleaned series (the panel under the
// series, on screen and in figures), computed by the same core call as the CLI's.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/briefing.h"
#include "siftwave/report/figure_spec.h"
#include "siftwave/report/plot_model.h"
#include "siftwave/transmission/transmission.h"

#include <gtest/gtest.h>

#include <cmath>

namespace siftwave {
namespace {

const std::string kDrop = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";

TEST(TransmissionPlotModel, TheModelHoldsTheEstimatesOfItsCleanedSeriesWhenAskedFor) {
    const Drop drop = ingest::readDrop(kDrop).value();
    const ledger::Cleaned cleaned(drop);
    report::PlotRequest request;
    request.region = "KV";
    EXPECT_FALSE(report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request)->transmission);
    auto options = transmission::TransmissionOptions::forCadence(Cadence::Daily);
    options.serialInterval = transmission::discretisedGamma(4.7, 2.9).value();
    request.transmission = options;
    const auto model = report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request).value();
    ASSERT_TRUE(model.transmission);
    const auto direct = transmission::estimateTransmission(model.cleaned, model.axis, options);
    ASSERT_EQ(model.transmission->rows.size(), static_cast<std::size_t>(model.periods()));
    for (std::size_t i = 0; i < direct.rows.size(); ++i) {
        const auto& a = model.transmission->rows[i].reproduction;
        const auto& b = direct.rows[i].reproduction;
        EXPECT_EQ(a.reason, b.reason);
        if (b.hasPosterior()) {
            EXPECT_EQ(a.mean, b.mean);
        }
    }
    EXPECT_TRUE(model.transmission->rows[100].reproduction.ok());
}

TEST(TransmissionPlotModel, InvalidOptionsForTheCadenceAreAUsageError) {
    const Drop drop = ingest::readDrop(kDrop).value();
    const ledger::Cleaned cleaned(drop);
    report::PlotRequest request;
    request.region = "KV";
    request.transmission = transmission::TransmissionOptions{};
    request.transmission->growth.weekdayTerms = true;  // window 7 < 14
    const auto model = report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request);
    ASSERT_FALSE(model.ok());
    EXPECT_EQ(model.error().code, ErrorCode::Usage);
}

}  // namespace
}  // namespace siftwave

namespace siftwave {
namespace {

// A figure with the panel says what the panel shows and carries the transmission caution after
// the fit's; the report adds each region's latest estimates and the caution at its head.
TEST(TransmissionPlotModel, FiguresAndTheReportCarryThePanelItsSettingsAndTheCaution) {
    const Drop drop = ingest::readDrop(kDrop).value();
    const ledger::Cleaned cleaned(drop);
    auto options = transmission::TransmissionOptions::forCadence(Cadence::Daily);
    options.serialInterval = transmission::discretisedGamma(4.7, 2.9).value();
    report::FigureRequest request;
    request.region = "1301";
    request.transmission = options;
    const auto spec = report::buildFigureSpec(drop, ledger::Ledger{}, cleaned, request).value();
    const std::string& caution = spec.captionLines.back();
    EXPECT_NE(caution.find(fit::caution), std::string::npos);
    EXPECT_NE(caution.find(transmission::caution), std::string::npos);
    bool panelLine = false;
    for (const std::string& line : spec.captionLines)
        panelLine = panelLine || line.rfind("Lower panel: R_t (Cori et al. 2013", 0) == 0;
    EXPECT_TRUE(panelLine);

    report::BriefingRequest briefing;
    briefing.regions = {"1301"};
    briefing.fitRegions = false;
    briefing.transmission = options;
    const auto built = report::buildBriefing(drop, ledger::Ledger{}, cleaned, briefing);
    ASSERT_TRUE(built.ok()) << built.error().describe();
    const std::string html = report::briefingHtml(*built, {});
    EXPECT_NE(html.find("<h3>Transmission</h3>"), std::string::npos);
    EXPECT_NE(html.find("R_t (Cori et al. 2013)"), std::string::npos);
    EXPECT_NE(html.find("Do not act on them alone"), std::string::npos);
}

}  // namespace
}  // namespace siftwave
