// FitPane's own wording: when the core finds no wave, the pane names its own controls (the
// "days" window) instead of the command line's FIRST:LAST argument, which a workbench user
// cannot type anywhere.
#include "widgets/fit_pane.h"

#include "siftwave/fit/fit.h"

#include <QTest>

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

    void otherReasonsAreShownAsTheCoreGivesThem() {
        const siftwave::Error error =
            siftwave::makeError(siftwave::ErrorCode::Numerical, "the solver could not start");
        QCOMPARE(FitPane::noFitText(error), QStringLiteral("No fit: the solver could not start."));
    }
};

QTEST_MAIN(FitPaneTest)
#include "fit_pane_test.moc"
