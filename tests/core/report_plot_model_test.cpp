// report: the plot model, one description of a region's plot for the screen and the figures.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/figure_spec.h"
#include "siftwave/report/plot_model.h"
#include "siftwave/scan/scan.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

using namespace siftwave;

namespace {

const std::string kDrop = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";
// Real weekly data: r-cran-surveillance, dataset fluBYBW (tests/data/real/SOURCES.md).
const std::string kWeekly =
    std::string(SIFTWAVE_TEST_DATA_DIR) + "/real/fluBYBW_weekly_long_by_date.csv";

Date day(const char* iso) {
    return *Date::fromIso(iso);
}

// The same series, NaN equal to NaN.
bool sameSeries(const std::vector<double>& a, const std::vector<double>& b) {
    return std::equal(a.begin(), a.end(), b.begin(), b.end(), [](double x, double y) {
        return (std::isnan(x) && std::isnan(y)) || x == y;
    });
}

void expectEveryPerPeriodSeriesOnTheAxis(const report::PlotModel& m) {
    const std::size_t n = static_cast<std::size_t>(m.periods());
    EXPECT_GT(n, 0u);
    EXPECT_EQ(m.raw.size(), n);
    EXPECT_EQ(m.rawState.size(), n);
    EXPECT_EQ(m.sourceLine.size(), n);
    EXPECT_EQ(m.cleaned.size(), n);
    EXPECT_EQ(m.smoothed.size(), n);
    EXPECT_EQ(m.touchedBy.size(), n);
}

// The sample's planted backlog (samples/manifest.json, P06) redistributed on 1301's cases.
struct Sample {
    Drop drop;
    ledger::Ledger ledger;
    ledger::Cleaned cleaned;
};

Sample sampleWithBacklogDecision() {
    Sample s;
    s.drop = ingest::readDrop(kDrop).value();
    s.cleaned = ledger::Cleaned(s.drop);
    ledger::Decision backlog;
    backlog.kind = ledger::DecisionKind::Redistribute;
    backlog.region = "1301";
    backlog.measure = "cases";
    backlog.date = day("2026-08-24");
    backlog.window = ledger::DayRange{day("2026-08-03"), day("2026-08-23")};
    backlog.excess = 2444;
    auto entry = ledger::draftEntry(s.drop, s.ledger, s.cleaned, backlog,
                                    {"tester", "2026-12-01T09:00:00Z", "three weeks held back"});
    EXPECT_TRUE(entry.ok());
    EXPECT_TRUE(ledger::applyEntry(s.drop, s.cleaned, *entry).ok());
    s.ledger.entries.push_back(*entry);
    return s;
}

}  // namespace

TEST(ReportPlotModel, ADailySampleIsPlottedPerDayWithDailyLabels) {
    const Drop drop = ingest::readDrop(kDrop).value();
    const ledger::Cleaned cleaned(drop);
    report::PlotRequest request;
    request.region = "1301";
    request.secondMeasure = drop.measures.size() > 1 ? drop.measures[1] : std::string();
    const report::PlotModel m =
        report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request).value();
    EXPECT_FALSE(m.axis.weekly());
    EXPECT_EQ(m.periods(), drop.axis.periods());
    expectEveryPerPeriodSeriesOnTheAxis(m);
    EXPECT_EQ(m.measure, "cases");
    EXPECT_EQ(m.valueLabel, "Daily cases");
    EXPECT_EQ(m.smoothedLabel, "7-day centred mean (cleaned)");
    // Before any decision the cleaned series is the raw one, and nothing touched a cell.
    EXPECT_TRUE(sameSeries(m.raw, m.cleaned));
    EXPECT_TRUE(std::all_of(m.touchedBy.begin(), m.touchedBy.end(),
                            [](const auto& texts) { return texts.empty(); }));
    if (!request.secondMeasure.empty()) {
        EXPECT_EQ(m.secondMeasure, request.secondMeasure);
        EXPECT_EQ(m.secondValueLabel, "Daily " + request.secondMeasure);
        EXPECT_EQ(m.second.size(), m.raw.size());
    }
    EXPECT_TRUE(m.previous.empty());
    EXPECT_FALSE(m.fit);
}

TEST(ReportPlotModel, AWeeklyReleaseIsPlottedPerWeekWithWeeklyLabels) {
    const Drop drop = ingest::readDrop(kWeekly).value();
    const ledger::Cleaned cleaned(drop);
    report::PlotRequest request;
    request.region = "8327";
    const report::PlotModel m =
        report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request).value();
    EXPECT_TRUE(m.axis.weekly());
    EXPECT_EQ(m.periods(), 156);
    expectEveryPerPeriodSeriesOnTheAxis(m);
    EXPECT_EQ(m.valueLabel, "Weekly cases");
    EXPECT_EQ(m.smoothedLabel, "3-week centred mean (cleaned)");
}

TEST(ReportPlotModel, TheCellsADecisionChangedNameItsEntry) {
    const Sample s = sampleWithBacklogDecision();
    report::PlotRequest request;
    request.region = "1301";
    request.measure = "cases";
    const report::PlotModel m =
        report::buildPlotModel(s.drop, s.ledger, s.cleaned, request).value();
    const int dump = s.drop.axis.periodOnGrid(day("2026-08-24"));
    ASSERT_EQ(m.touchedBy[dump].size(), 1u);
    EXPECT_EQ(m.touchedBy[dump][0], "#1 redistribute (tester): three weeks held back");
    EXPECT_TRUE(m.touchedBy[0].empty());
    EXPECT_LT(m.cleaned[dump], m.raw[dump]);
    ASSERT_EQ(m.decisions.size(), 1u);
    EXPECT_EQ(m.decisions[0].label, "#1 2,444 moved to earlier days");
}

TEST(ReportPlotModel, FindingsOfTheRegionAreMarkedOnTheirPeriods) {
    const Drop drop = ingest::readDrop(kDrop).value();
    const ledger::Cleaned cleaned(drop);
    const scan::ScanReport scanned = scan::scanDrop(drop).value();
    report::PlotRequest request;
    request.region = "1301";
    request.findings = scanned.findings;
    const report::PlotModel m =
        report::buildPlotModel(drop, ledger::Ledger{}, cleaned, request).value();
    std::size_t expected = 0;
    for (const scan::Finding& f : scanned.findings)
        if (f.region == "1301" && f.first && f.last && (!f.measure || *f.measure == "cases"))
            ++expected;
    ASSERT_GT(expected, 0u);
    ASSERT_EQ(m.findings.size(), expected);
    const auto backlog = std::find_if(m.findings.begin(), m.findings.end(), [](const auto& mark) {
        return mark.kindLabel == "backlog_dump";
    });
    ASSERT_NE(backlog, m.findings.end());
    EXPECT_EQ(backlog->firstPeriod, drop.axis.periodOnGrid(day("2026-08-24")));
    for (const report::FindingMarkSpec& mark : m.findings) {
        EXPECT_LE(0, mark.firstPeriod);
        EXPECT_LE(mark.firstPeriod, mark.lastPeriod);
        EXPECT_LT(mark.lastPeriod, m.periods());
    }
}

TEST(ReportPlotModel, AFigureShowsTheSameSeriesAsThePlotModel) {
    const Sample s = sampleWithBacklogDecision();
    report::FigureRequest request;
    request.region = "1301";
    request.exportDate = "2026-12-04";
    request.fit = fit::FitOptions::forCadence(s.drop.axis.cadence());
    const report::FigureSpec spec =
        report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request).value();
    const report::PlotModel m =
        report::buildPlotModel(s.drop, s.ledger, s.cleaned, request).value();
    EXPECT_TRUE(sameSeries(spec.raw, m.raw));
    EXPECT_TRUE(sameSeries(spec.cleaned, m.cleaned));
    EXPECT_TRUE(sameSeries(spec.smoothed, m.smoothed));
    EXPECT_EQ(spec.smoothedLabel, m.smoothedLabel);
    EXPECT_EQ(spec.valueLabel, m.valueLabel);
    EXPECT_EQ(spec.touchedBy, m.touchedBy);
    ASSERT_EQ(spec.decisions.size(), m.decisions.size());
    EXPECT_EQ(spec.decisions[0].label, m.decisions[0].label);
    ASSERT_TRUE(m.fit) << m.fitError;
    ASSERT_TRUE(spec.fit) << spec.fitError;
    {
        EXPECT_TRUE(sameSeries(spec.fit->mid, m.fit->mid));
        EXPECT_EQ(spec.fit->label, m.fit->label);
    }
}
