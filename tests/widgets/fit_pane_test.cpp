// FitPane's own wording: when the core finds no wave, the pane names its own controls (the
// "days" window) instead of the command line's FIRST:LAST argument, which a workbench user
// cannot type anywhere.
#include "widgets/fit/fit_pane.h"

#include "siftwave/fit/fit.h"

#include <QComboBox>
#include <QTest>

#include <cmath>

#include <vector>

using siftwave::widgets::FitPane;

class FitPaneTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void noWaveNamesThePaneControlsNotTheCommandLine() {
        // A flat series never rises: the core's automatic window finds no wave.
        const std::vector<double> flat(60, 5.0);
        const siftwave::fit::DailySeries series{*siftwave::Date::fromYmd(2026, 3, 1), flat};
        const auto result = siftwave::fit::fitSeries(series);
        QVERIFY(!result.ok());
        QVERIFY(result.error().message.find("no wave found") != std::string::npos);

        FitPane pane;
        pane.showFit(result, {});
        const QString summary = pane.summaryText();
        QVERIFY2(summary.startsWith(QStringLiteral("No fit: no wave found")), qPrintable(summary));
        QVERIFY2(!summary.contains(QStringLiteral("FIRST:LAST")), qPrintable(summary));
        QVERIFY2(summary.contains(QStringLiteral("Choose “days” under Window")),
                 qPrintable(summary));
    }

    // Issue 15: the pane shows the fit's status, with the reasons and what to try when not ok.
    void theStatusAndItsReasonsLeadTheSummary() {
        std::vector<double> counts(120);
        for (int i = 0; i < 120; ++i)
            counts[static_cast<std::size_t>(i)] = 400.0 * std::exp(-0.5 * std::pow((i - 60) / 12.0, 2));
        const siftwave::fit::DailySeries series{*siftwave::Date::fromYmd(2026, 3, 2), counts};
        auto result = siftwave::fit::fitSeries(series);
        QVERIFY(result.ok());
        QCOMPARE(result->status, siftwave::fit::FitStatus::Ok);
        FitPane pane;
        pane.showFit(result, {});
        QVERIFY2(pane.summaryText().startsWith(QStringLiteral("Status: <b>ok</b>")),
                 qPrintable(pane.summaryText()));
        result->status = siftwave::fit::FitStatus::Implausible;
        result->statusReasons = {"the wave size K = 1e+10 is over 20 times the window's 500 counts"};
        pane.showFit(result, {});
        const QString summary = pane.summaryText();
        QVERIFY2(summary.startsWith(QStringLiteral("Status: <b>implausible</b>")), qPrintable(summary));
        QVERIFY(summary.contains(QStringLiteral("over 20 times the window")));
        QVERIFY(summary.contains(QStringLiteral("Try a window that holds the wave's peak")));
    }

    // Weekly data: the pane offers weekly methods, no weekday factors, the weekly defaults of the
    // core (no LSQ smoothing, wave detection in weeks), and a chosen window in whole weeks.
    void aWeeklyCalendarGivesTheWeeklyFitChoices() {
        FitPane pane;
        // ISO 8601: 2026-01-05 is the Monday of 2026-W02.
        pane.setCalendar(siftwave::TimeAxis::weekly(*siftwave::Date::fromYmd(2026, 1, 5), 20,
                                                    siftwave::WeekStart::Monday));
        auto* method = pane.findChild<QComboBox*>(QStringLiteral("fitMethod"));
        QVERIFY(method);
        QCOMPARE(method->itemText(0), QStringLiteral("least squares on weekly counts"));
        method->setCurrentIndex(1);  // Poisson: weekday factors stay off for weekly counts
        const siftwave::fit::FitOptions options = pane.options();
        QCOMPARE(options.smoothingWindow, 1);
        QCOMPARE(
            options.detection.minPeriods,
            siftwave::fit::WaveDetectionOptions::forCadence(siftwave::Cadence::Weekly).minPeriods);
        QVERIFY(!options.weekdayFactors);
        pane.setManualWindow({2, 5});
        const auto window = pane.manualWindow();
        QVERIFY(window.has_value());
        QCOMPARE(window->first, 2);
        QCOMPARE(window->last, 5);
        QCOMPARE(pane.options().window, std::make_optional(std::make_pair(2, 5)));
    }

    void otherReasonsAreShownAsTheCoreGivesThem() {
        const siftwave::Error error =
            siftwave::makeError(siftwave::ErrorCode::Numerical, "the solver could not start");
        QCOMPARE(FitPane::noFitText(error), QStringLiteral("No fit: the solver could not start."));
    }
};

QTEST_MAIN(FitPaneTest)
#include "fit_pane_test.moc"
