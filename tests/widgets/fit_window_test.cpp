// The fit follows the window: dragging the fit window's edge on the plot refits.
#include "main_window.h"

#include "widgets/common/text_table_model.h"
#include "widgets/common/workbench.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"
#include "widgets/plot/series_plot.h"

#include <QElapsedTimer>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTest>

#include <cmath>

using siftwave::gui::MainWindow;

namespace {

void sendMouse(QWidget* target, QEvent::Type type, QPointF pos, Qt::MouseButtons buttons) {
    QMouseEvent event(type, pos, target->mapToGlobal(pos), Qt::LeftButton, buttons, Qt::NoModifier);
    QCoreApplication::sendEvent(target, &event);
}

}  // namespace

class FitWindowTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void initTestCase() { QStandardPaths::setTestModeEnabled(true); }

    void theFitIsDrawnWithTheCoresPointwiseBand() {
        MainWindow::Options options;
        options.rememberLayout = false;
        MainWindow window(options);
        window.resize(1400, 900);
        window.show();
        QSignalSpy opened(&window, &MainWindow::dropOpened);
        window.openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(opened.wait(20000));
        QVERIFY(window.selectRegion(QStringLiteral("1203")));
        const siftwave::fit::FitResult* fit = window.currentFit();
        QVERIFY(fit);
        QCOMPARE(fit->method, siftwave::fit::FitMethod::LeastSquares);  // no weekday factors
        QCOMPARE(fit->fittedLower.size(), fit->fitted.size());

        // On every window day the plot shows the core's curve and interval (least squares has no
        // weekday factors, so the drawn wave K f(t) is the fitted value itself).
        const auto& curve = window.seriesPlot()->view().fit;
        QVERIFY(curve);
        QCOMPARE(static_cast<int>(curve->low.size()), window.seriesPlot()->view().periods());
        for (int d = fit->first; d <= fit->last; ++d) {
            const std::size_t i = static_cast<std::size_t>(d - fit->first);
            QVERIFY(std::abs(curve->mid[d] - fit->fitted[i]) <= 1e-9 * (1 + fit->fitted[i]));
            QCOMPARE(curve->low[d], fit->fittedLower[i]);
            QCOMPARE(curve->high[d], fit->fittedUpper[i]);
            QVERIFY(curve->low[d] <= curve->mid[d] && curve->mid[d] <= curve->high[d]);
        }
        // Nothing is drawn outside the window (it may end on the last day of the release).
        QVERIFY(fit->first > 0);
        QVERIFY(std::isnan(curve->mid[fit->first - 1]) && std::isnan(curve->low[fit->first - 1]));
        if (fit->last + 1 < window.seriesPlot()->view().periods())
            QVERIFY(std::isnan(curve->low[fit->last + 1]));
        // The band is in the legend under what it is, filled, and the hover gives its edges.
        QCustomPlot* plot = window.seriesPlot()->customPlot();
        bool legend = false;
        for (int g = 0; g < plot->graphCount(); ++g)
            // The figures' term (report/figure_spec.cpp: "95% confidence band of the fitted
            // curve"), shortened as their caption shortens it.
            if (plot->graph(g)->name() == QStringLiteral("95% confidence band of the curve"))
                legend = plot->graph(g)->brush().style() != Qt::NoBrush;
        QVERIFY(legend);
        const int peak = fit->first + static_cast<int>(std::lround(fit->derived.peakDay.value));
        const QString hover = siftwave::widgets::hoverText(window.seriesPlot()->view(), peak);
        QVERIFY2(hover.contains(QStringLiteral("95% confidence band ")) &&
                     hover.contains(QStringLiteral(" – ")),
                 qPrintable(hover));
    }

    void draggingTheFitWindowEdgeRefitsOnTheNewWindow() {
        MainWindow::Options options;
        options.rememberLayout = false;
        MainWindow window(options);
        window.resize(1400, 900);
        window.show();
        QVERIFY(QTest::qWaitForWindowExposed(&window));
        QSignalSpy opened(&window, &MainWindow::dropOpened);
        window.openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(opened.wait(20000));
        QVERIFY(window.selectRegion(QStringLiteral("1203")));

        // The automatic window: the core's largest wave.
        QVERIFY(window.currentFit());
        const int first = window.currentFit()->first;
        const int last = window.currentFit()->last;
        const double sizeBefore = window.currentFit()->derived.waveSize.value;
        QVERIFY(last - first > 60);
        QCOMPARE(window.seriesPlot()->editableWindow()->first, first);

        // Drag the end edge 40 days to the left.
        siftwave::widgets::SeriesPlot* plot = window.seriesPlot();
        plot->customPlot()->replot();
        auto* chart = plot->chart();
        const double halfDay = (chart->pixelOfDayIndex(1) - chart->pixelOfDayIndex(0)) / 2;
        const double y = plot->customPlot()->axisRect()->center().y();
        const QPointF edge(chart->pixelOfDayIndex(last) + halfDay, y);
        const QPointF target(chart->pixelOfDayIndex(last - 40), y);
        QWidget* canvas = plot->customPlot();
        sendMouse(canvas, QEvent::MouseButtonPress, edge, Qt::LeftButton);
        QElapsedTimer clock;
        clock.start();
        sendMouse(canvas, QEvent::MouseMove, (edge + target) / 2, Qt::LeftButton);
        qInfo("one live refit while dragging: %lld ms",
              static_cast<long long>(clock.elapsed()));  // informative only
        // Live: the fit already follows before the button is released.
        QVERIFY(window.currentFit());
        QVERIFY(window.currentFit()->last < last);
        QVERIFY(window.currentFit()->last > last - 40);
        sendMouse(canvas, QEvent::MouseMove, target, Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseButtonRelease, target, Qt::NoButton);

        QVERIFY(window.currentFit());
        QCOMPARE(window.currentFit()->first, first);
        QCOMPARE(window.currentFit()->last, last - 40);
        QVERIFY(window.currentFit()->derived.waveSize.value != sizeBefore);
        // The pane now holds chosen days, and they are the dragged window.
        const auto manual = window.fitPane()->manualWindow();
        QVERIFY(manual.has_value());
        QCOMPARE(manual->last, last - 40);
        QVERIFY(window.fitPane()->summaryText().contains(
            QString::fromStdString(window.currentFit()->windowLast().iso())));
        // On release the comparison of the four models was run on the new window.
        QCOMPARE(window.fitPane()->comparisonTable()->rowCount(), 4);
    }
};

QTEST_MAIN(FitWindowTest)
#include "fit_window_test.moc"
