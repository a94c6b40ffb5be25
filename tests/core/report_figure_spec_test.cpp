// report: the caption, the figure specification from drop + ledger, the count band.
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/briefing.h"
#include "siftwave/report/caption.h"
#include "siftwave/report/count_band.h"
#include "siftwave/report/figure_spec.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numeric>

using namespace siftwave;

namespace {

const std::string kDrop = std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_current.csv";

struct Sample {
    Drop drop;
    ledger::Ledger ledger;
    ledger::Cleaned cleaned;
};

void record(Sample& s, const ledger::Decision& d, const std::string& reason) {
    auto entry = ledger::draftEntry(s.drop, s.ledger, s.cleaned, d,
                                    {"tester", "2026-12-01T09:00:00Z", reason});
    ASSERT_TRUE(entry.ok()) << entry.error().describe();
    ASSERT_TRUE(ledger::applyEntry(s.drop, s.cleaned, *entry).ok());
    s.ledger.entries.push_back(*entry);
}

Date day(const char* iso) {
    return *Date::fromIso(iso);
}

// The sample's planted backlog (samples/manifest.json, P06) redistributed, a week of
// 1301 excluded, an accept of 1304 and its withdrawal.
Sample sample() {
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
    record(s, backlog, "three weeks held back");
    ledger::Decision exclude;
    exclude.kind = ledger::DecisionKind::Exclude;
    exclude.region = "1301";
    exclude.measure = "cases";
    exclude.window = ledger::DayRange{day("2026-03-02"), day("2026-03-08")};
    record(s, exclude, "test week");
    ledger::Decision accept;
    accept.kind = ledger::DecisionKind::Accept;
    accept.region = "1301";
    accept.measure = "cases";
    record(s, accept, "looked at");
    ledger::Decision withdraw;
    withdraw.kind = ledger::DecisionKind::Withdraw;
    withdraw.target = 3;
    record(s, withdraw, "not yet");
    return s;
}

double poissonPmf(int k, double mu) {
    return std::exp(k * std::log(mu) - mu - std::lgamma(k + 1.0));
}

// Negative binomial with size r and mean mu: C(k + r - 1, k) p^r (1 - p)^k, p = r / (r + mu).
double negbinPmf(int k, double r, double mu) {
    const double p = r / (r + mu);
    return std::exp(std::lgamma(k + r) - std::lgamma(r) - std::lgamma(k + 1.0) + r * std::log(p) +
                    k * std::log1p(-p));
}

template <class Pmf>
void expectCentral95(double low, double high, Pmf pmf) {
    double below = 0, inside = 0, above = 0;
    for (int k = 0; k < 5000; ++k) {
        const double p = pmf(k);
        (k < low ? below : k > high ? above : inside) += p;
    }
    // The interval holds at least 95% and leaves at most 2.5% in each tail.
    EXPECT_GE(inside, 0.95);
    EXPECT_LE(below, 0.025);
    EXPECT_LE(above, 0.025);
    // ... and is not wider than needed: one step in from either end loses the 2.5%.
    EXPECT_GT(below + pmf(static_cast<int>(low)), 0.025 - 1e-12);
    EXPECT_GT(above + pmf(static_cast<int>(high)), 0.025 - 1e-12);
}

// Real weekly data (r-cran-surveillance, dataset fluBYBW; tests/data/real/SOURCES.md): the
// figure is of weekly cases, smoothed over three weeks, and names its weeks.
TEST(ReportFigureSpec, AWeeklyReleaseMakesAFigureOfWeeks) {
    const Drop drop = ingest::readDrop(std::string(SIFTWAVE_TEST_DATA_DIR) +
                                       "/real/fluBYBW_weekly_long_by_date.csv")
                          .value();
    const ledger::Cleaned cleaned(drop);
    report::FigureRequest request;
    request.region = "8327";
    request.exportDate = "2026-12-04";
    const report::FigureSpec spec =
        report::buildFigureSpec(drop, ledger::Ledger{}, cleaned, request).value();
    EXPECT_TRUE(spec.axis.weekly());
    EXPECT_EQ(spec.periods(), 156);
    EXPECT_EQ(spec.title, "Region 8327: weekly cases");
    EXPECT_EQ(spec.smoothedLabel, "3-week centred mean (cleaned)");
    EXPECT_EQ(spec.subtitle.rfind("Reported 2001-W01 to 2003-W52", 0), 0u) << spec.subtitle;
    // The raw series is the file's weekly counts, week by week.
    EXPECT_EQ(std::accumulate(spec.raw.begin(), spec.raw.end(), 0.0), 63.0);
}

}  // namespace

TEST(ReportCaption, LinesNameTheFileHashesLedgerFitAndTheCaution) {
    const Sample s = sample();
    fit::FitResult f;
    f.model = fit::ModelKind::Richards;
    f.method = fit::FitMethod::Poisson;
    f.seriesFirstDay = s.drop.axis.first();
    f.first = 10;
    f.last = 20;
    const auto lines =
        report::captionLines(report::captionFacts(s.drop, s.ledger, &f, "2026-12-01"));
    ASSERT_EQ(lines.size(), 5u);
    EXPECT_EQ(lines[0], "Source: quenmara_current.csv, 2026-02-23 to 2026-11-29, SHA-256 " +
                            s.drop.source.sha256.substr(0, 12));
    EXPECT_EQ(lines[1], "Ledger: 4 entries, head " + s.ledger.headHash().substr(0, 16));
    EXPECT_EQ(lines[2], "Fit: richards, poisson, 2026-03-05 to 2026-03-15");
    EXPECT_EQ(lines[3], "Exported 2026-12-01 by Siftwave 0.1.0");
    EXPECT_EQ(lines[4], fit::caution);
    const auto none =
        report::captionLines(report::captionFacts(s.drop, ledger::Ledger{}, nullptr, "2026-12-01"));
    EXPECT_EQ(none[1], "Ledger: none, raw counts as reported");
    EXPECT_EQ(none[2], "Fit: none");
}

TEST(ReportFigureSpec, MarksEachDecisionInEffectFromTheLedger) {
    const Sample s = sample();
    report::FigureRequest request;
    request.region = "1301";
    auto spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(spec.ok()) << spec.error().describe();
    EXPECT_EQ(spec->measure, "cases");
    EXPECT_EQ(spec->title, "Region 1301: daily cases");
    // The redistribution: on the dump day, the excess moved, pointing at the raw bar.
    ASSERT_EQ(spec->decisions.size(), 1u);  // the accept (#3) is withdrawn
    const report::DecisionMark& m = spec->decisions[0];
    EXPECT_EQ(m.sequence, 1u);
    EXPECT_EQ(m.kind, ledger::DecisionKind::Redistribute);
    EXPECT_EQ(m.first, day("2026-08-24"));
    EXPECT_EQ(m.last, day("2026-08-24"));
    EXPECT_EQ(m.count, 2444);
    EXPECT_EQ(m.anchorValue, 2643);  // samples/manifest.json, P06 "reported"
    EXPECT_EQ(m.label, "#1 2,444 moved to earlier days");
    ASSERT_TRUE(m.window);
    EXPECT_EQ(m.window->first, day("2026-08-03"));
    // The exclusion: the week's raw counts, left out.
    ASSERT_EQ(spec->excluded.size(), 1u);
    std::int64_t week = 0;
    for (Date d = day("2026-03-02"); d <= day("2026-03-08"); d = d + 1)
        week += spec->raw[static_cast<std::size_t>(d - spec->axis.first())];
    EXPECT_GT(week, 0);
    EXPECT_EQ(spec->excluded[0].count, week);
    EXPECT_EQ(spec->excluded[0].label, "#2 excluded (" + report::groupedCount(week) + ")");
    // The cleaned series: the dump day lowered by the excess, the excluded days without value.
    const auto dump = static_cast<std::size_t>(day("2026-08-24") - spec->axis.first());
    EXPECT_EQ(spec->cleaned[dump], 2643 - 2444);
    EXPECT_TRUE(std::isnan(
        spec->cleaned[static_cast<std::size_t>(day("2026-03-04") - spec->axis.first())]));
    EXPECT_NE(spec->subtitle.find("2 ledger decisions applied"), std::string::npos)
        << spec->subtitle;
}

TEST(ReportFigureSpec, UnknownRegionOrMeasureIsNotFound) {
    const Sample s = sample();
    report::FigureRequest request;
    request.region = "9999";
    auto missing = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_FALSE(missing.ok());
    EXPECT_EQ(missing.error().code, ErrorCode::NotFound);
    request.region = "1301";
    request.measure = "hospitalisations";
    EXPECT_EQ(report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request).error().code,
              ErrorCode::NotFound);
    request.region.clear();
    EXPECT_EQ(report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request).error().code,
              ErrorCode::Usage);
}

TEST(ReportFigureSpec, AFitBringsItsCurveBandWindowAndPeak) {
    const Sample s = sample();
    report::FigureRequest request;
    request.region = "1301";
    fit::FitOptions options;
    options.window = std::make_pair(100, 200);
    request.fit = options;
    auto spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(spec.ok());
    ASSERT_TRUE(spec->fit) << spec->fitError;
    EXPECT_EQ(spec->fit->windowFirst, s.drop.axis.first() + 100);
    EXPECT_EQ(spec->fit->windowLast, s.drop.axis.first() + 200);
    EXPECT_TRUE(std::isnan(spec->fit->mid[99]));
    EXPECT_FALSE(std::isnan(spec->fit->mid[150]));
    for (int d = 100; d <= 200; ++d) {
        EXPECT_LE(spec->fit->low[d], spec->fit->mid[d]);
        EXPECT_GE(spec->fit->high[d], spec->fit->mid[d]);
    }
    EXPECT_EQ(spec->caption.model, "gumbel");
    EXPECT_GT(spec->fit->peakValue, 0);
}

// Issue 15: a fit whose status is not ok draws no curve, band, count range or peak, and the
// caption's fit line says why.
TEST(ReportFigureSpec, AFitThatIsNotOkDrawsNoCurveAndTheCaptionSaysWhy) {
    const Sample s = sample();
    report::FigureRequest request;
    request.region = "1301";
    fit::FitOptions options;
    options.window = std::make_pair(100, 200);
    request.fit = options;
    request.countRange = true;
    auto drawn = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(drawn.ok());
    ASSERT_TRUE(drawn->fit) << drawn->fitError;
    ASSERT_EQ(drawn->fit->result.status, fit::FitStatus::Ok);
    EXPECT_TRUE(drawn->fit->notDrawn.empty());
    fit::FitResult failed = drawn->fit->result;
    failed.status = fit::FitStatus::Implausible;
    failed.statusReasons = {"the wave size K = 1e+10 is over 20 times the window's 500 counts"};
    request.fit.reset();
    request.fitResult = failed;
    auto spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(spec.ok());
    ASSERT_TRUE(spec->fit);
    EXPECT_EQ(spec->fit->notDrawn,
              "no curve drawn: the fit is implausible (the wave size K = 1e+10 is over 20 times "
              "the window's 500 counts)");
    for (double v : spec->fit->mid)
        EXPECT_TRUE(std::isnan(v));
    EXPECT_TRUE(spec->fit->countLow.empty());
    EXPECT_TRUE(std::isnan(spec->fit->peakValue));
    bool said = false;
    for (const std::string& line : spec->captionLines)
        said = said || (line.rfind("Fit: gumbel", 0) == 0 &&
                        line.find("no curve drawn: the fit is implausible") != std::string::npos);
    EXPECT_TRUE(said);
}

TEST(ReportFigureSpec, TheBandIsTheFittedCurvesOwnConfidenceBand) {
    const Sample s = sample();
    for (const fit::FitMethod method : {fit::FitMethod::LeastSquares, fit::FitMethod::Poisson}) {
        report::FigureRequest request;
        request.region = "1301";
        fit::FitOptions options;
        options.window = std::make_pair(100, 200);
        options.method = method;
        options.weekdayFactors = method == fit::FitMethod::Poisson;
        request.fit = options;
        auto spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
        ASSERT_TRUE(spec.ok()) << spec.error().describe();
        ASSERT_TRUE(spec->fit) << spec->fitError;
        const report::FittedCurveSpec& curve = *spec->fit;
        // The drawn curve and band are fit::curveBand's over the window, day for day (the wave
        // itself: with weekday factors, FitResult::fitted zigzags, the curve does not).
        auto band = fit::curveBand(curve.result, 100, 200);
        ASSERT_TRUE(band.ok()) << band.error().describe();
        ASSERT_EQ(band->lower.size(), 101u) << "the fit should have its covariance";
        EXPECT_TRUE(curve.bandNote.empty()) << curve.bandNote;
        for (int d = 100; d <= 200; ++d) {
            EXPECT_DOUBLE_EQ(curve.mid[d], band->fitted[d - 100]);
            EXPECT_DOUBLE_EQ(curve.low[d], band->lower[d - 100]);
            EXPECT_DOUBLE_EQ(curve.high[d], band->upper[d - 100]);
        }
        EXPECT_TRUE(std::isnan(curve.mid[99]) && std::isnan(curve.low[99]));
        EXPECT_TRUE(std::isnan(curve.mid[201]) && std::isnan(curve.high[201]));
        EXPECT_EQ(curve.bandLabel, "95% confidence band of the fitted curve");
        // The caption says which band it is; no range of daily counts unless asked.
        EXPECT_NE(spec->captionLines[2].find("shaded: pointwise 95% confidence band of the curve"),
                  std::string::npos)
            << spec->captionLines[2];
        EXPECT_EQ(spec->captionLines[2].find("dotted"), std::string::npos);
        EXPECT_TRUE(curve.countLow.empty());

        // Asked for, the range of daily counts is count_band.h's on the window, and at the peak it
        // is wider than the curve's band (a day's count scatters more than the mean is unsure).
        request.countRange = true;
        spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
        ASSERT_TRUE(spec.ok() && spec->fit);
        const report::CountBand counts = report::countBand(spec->fit->result, spec->cleaned);
        ASSERT_EQ(spec->fit->countLow.size(), static_cast<std::size_t>(spec->periods()));
        for (int d = 100; d <= 200; ++d) {
            EXPECT_DOUBLE_EQ(spec->fit->countLow[d], counts.low[d - 100]);
            EXPECT_DOUBLE_EQ(spec->fit->countHigh[d], counts.high[d - 100]);
        }
        const int peak = spec->fit->peakDate - spec->axis.first();
        ASSERT_TRUE(peak >= 100 && peak <= 200);
        EXPECT_GT(spec->fit->countHigh[peak] - spec->fit->countLow[peak],
                  spec->fit->high[peak] - spec->fit->low[peak]);
        EXPECT_NE(spec->captionLines[2].find("dotted: 95% range of daily counts"),
                  std::string::npos)
            << spec->captionLines[2];
    }
}

TEST(ReportFigureSpec, ThePreviousReleaseIsAlignedByDate) {
    const Sample s = sample();
    const Drop previous =
        ingest::readDrop(std::string(SIFTWAVE_SAMPLES_DIR) + "/quenmara_previous.csv").value();
    report::FigureRequest request;
    request.region = "1405";
    request.previous = &previous;
    auto spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(spec.ok()) << spec.error().describe();
    ASSERT_EQ(spec->previous.size(), static_cast<std::size_t>(spec->periods()));
    EXPECT_EQ(spec->previousLabel, "quenmara_previous.csv");
    // samples/manifest.json: "Late reports raised six days of cases since the previous
    // release", 1405, 2026-11-05 to 2026-11-10; every other day reads the same in both.
    std::vector<std::string> revised;
    int compared = 0;
    for (int d = 0; d < spec->periods(); ++d) {
        const double old = spec->previous[d];
        if (std::isnan(old) || std::isnan(spec->raw[d]))
            continue;
        ++compared;
        if (old != spec->raw[d]) {
            revised.push_back(spec->periodStart(d).iso());
            EXPECT_LT(old, spec->raw[d]);
        }
    }
    EXPECT_GT(compared, 200);
    EXPECT_EQ(revised, (std::vector<std::string>{"2026-11-05", "2026-11-06", "2026-11-07",
                                                 "2026-11-08", "2026-11-09", "2026-11-10"}));
    // A region the previous release lacks draws nothing (412 appeared since, manifest).
    request.region = "412";
    spec = report::buildFigureSpec(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(spec.ok()) << spec.error().describe();
    EXPECT_TRUE(spec->previous.empty());
}

TEST(ReportCountBand, PoissonAndNegativeBinomialBandsAreCentral95PercentRanges) {
    fit::FitResult f;
    f.method = fit::FitMethod::Poisson;
    f.fitted = {10.0, 0.7, 250.0};
    const std::vector<double> counts = {9, 1, 260};
    report::CountBand band = report::countBand(f, counts);
    for (std::size_t i = 0; i < f.fitted.size(); ++i)
        expectCentral95(band.low[i], band.high[i],
                        [mu = f.fitted[i]](int k) { return poissonPmf(k, mu); });
    f.method = fit::FitMethod::NegativeBinomial;
    f.dispersion = 4.0;
    band = report::countBand(f, counts);
    for (std::size_t i = 0; i < f.fitted.size(); ++i)
        expectCentral95(band.low[i], band.high[i],
                        [mu = f.fitted[i]](int k) { return negbinPmf(k, 4.0, mu); });
}

TEST(ReportCountBand, LeastSquaresBandUsesPearsonDispersion) {
    fit::FitResult f;
    f.method = fit::FitMethod::LeastSquares;
    f.parameters.resize(3);
    f.first = 1;
    f.fitted = {100, 100, 100, 100, 100};
    // Counts of the window days 1..5: Pearson's X^2 = (4*400)/100 + 0 = 16 over 5 - 3 = 2: phi 8.
    const std::vector<double> counts = {std::nan(""), 120, 80, 120, 80, 100};
    const report::CountBand band = report::countBand(f, counts);
    EXPECT_DOUBLE_EQ(band.dispersion, 8.0);
    EXPECT_NEAR(band.high[0], 100 + 1.959963984540054 * std::sqrt(800.0), 1e-9);
    EXPECT_NEAR(band.low[0], 100 - 1.959963984540054 * std::sqrt(800.0), 1e-9);
}

TEST(ReportBriefing, ListsEveryEntryAndReconcilesTheTotals) {
    const Sample s = sample();
    report::BriefingRequest request;
    request.fitRegions = false;
    auto briefing = report::buildBriefing(s.drop, s.ledger, s.cleaned, request);
    ASSERT_TRUE(briefing.ok()) << briefing.error().describe();
    ASSERT_EQ(briefing->ledger.size(), 4u);
    EXPECT_FALSE(briefing->ledger[2].inEffect);
    EXPECT_TRUE(briefing->chainVerified);
    ASSERT_EQ(briefing->figures.size(), 1u);
    EXPECT_EQ(briefing->figures[0].regionCode, "1301");
    bool found = false;
    for (const ledger::ReconciliationRow& row : briefing->reconciliation)
        if (row.region == "1301" && row.measure == "cases") {
            found = true;
            EXPECT_EQ(row.difference(), -briefing->figures[0].excluded[0].count);
            EXPECT_EQ(row.entries, std::vector<std::uint64_t>{2});
        }
    EXPECT_TRUE(found);
    const std::string html = report::briefingHtml(*briefing, {});
    for (const ledger::LedgerEntry& e : s.ledger.entries) {
        EXPECT_NE(html.find(report::htmlEscaped(e.reason)), std::string::npos) << e.reason;
        EXPECT_NE(html.find(e.hash.substr(0, 12)), std::string::npos);
    }
    EXPECT_NE(html.find(fit::caution), std::string::npos);
}

TEST(ReportText, GroupsThousandsAndEscapesHtml) {
    EXPECT_EQ(report::groupedCount(0), "0");
    EXPECT_EQ(report::groupedCount(999), "999");
    EXPECT_EQ(report::groupedCount(1234567), "1,234,567");
    EXPECT_EQ(report::groupedCount(-2444), "-2,444");
    EXPECT_EQ(report::htmlEscaped("<a href=\"x\">&'"), "&lt;a href=&quot;x&quot;&gt;&amp;&#39;");
}
