// SeriesPlot: the date axis, the draggable window edges, the reset, the hover text, and the
// live layer that a drag step redraws alone.
#include "widgets/plot/series_plot.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"
#include "widgets/plot/series_view.h"

#include "siftwave/fit/fit.h"

#include <QSignalSpy>
#include <QTest>

#include <cmath>
#include <limits>
#include <vector>

using siftwave::Date;
using siftwave::widgets::DayIndexRange;
using siftwave::widgets::SeriesPlot;
using siftwave::widgets::SeriesView;

namespace {

// The plot at the tests' size, on screen (mouse events and grabs need it exposed).
bool showOnScreen(SeriesPlot& plot) {
    plot.resize(900, 500);
    plot.show();
    return QTest::qWaitForWindowExposed(&plot);
}

SeriesView syntheticView() {
    SeriesView view;
    view.regionCode = QStringLiteral("T1");
    view.measure = QStringLiteral("cases");
    view.axis = siftwave::TimeAxis::daily(*Date::fromIso("2026-03-02"), 60);
    view.valueLabel = QStringLiteral("Daily cases");
    for (int d = 0; d < view.periods(); ++d) {
        view.raw.push_back(10 + d % 7);
        view.rawState.push_back(siftwave::CellState::Reported);
        view.sourceLine.push_back(static_cast<std::uint32_t>(d + 2));
    }
    view.raw[5] = std::numeric_limits<double>::quiet_NaN();
    view.rawState[5] = siftwave::CellState::Absent;
    view.sourceLine[5] = 0;
    view.cleaned = view.raw;
    view.touchedBy.assign(view.periods(), {});
    view.touchedBy[7] << QStringLiteral("#3 redistribute backlog (alice)");
    return view;
}

// A fitted curve over days 10..40 of syntheticView(): a bump of height `peak` over a floor of 8,
// with a band of +-1.5 around it.
siftwave::widgets::FittedCurve syntheticFit(double peak, double centre) {
    siftwave::widgets::FittedCurve curve;
    curve.label = QStringLiteral("Gumbel fit (least squares)");
    curve.bandLabel = QStringLiteral("95% confidence band of the curve");
    const double nan = std::numeric_limits<double>::quiet_NaN();
    curve.mid.assign(60, nan);
    curve.low.assign(60, nan);
    curve.high.assign(60, nan);
    for (int d = 10; d <= 40; ++d) {
        curve.mid[d] = 8 + (peak - 8) * std::exp(-0.5 * std::pow((d - centre) / 5.0, 2));
        curve.low[d] = curve.mid[d] - 1.5;
        curve.high[d] = curve.mid[d] + 1.5;
    }
    return curve;
}

void sendMouse(QWidget* target, QEvent::Type type, QPointF pos, Qt::MouseButtons buttons) {
    QMouseEvent event(type, pos, target->mapToGlobal(pos), Qt::LeftButton, buttons, Qt::NoModifier);
    QCoreApplication::sendEvent(target, &event);
}

}  // namespace

class SeriesPlotTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void daysSitOnTheirUtcMidnightOnTheDateAxis() {
        // 2026-03-02 is 20514 days after 1970-01-01 (Date's own arithmetic; QDate cross-check
        // below).
        const Date day = *Date::fromIso("2026-03-02");
        const QDateTime midnight(QDate(2026, 3, 2), QTime(0, 0), Qt::UTC);
        QCOMPARE(siftwave::widgets::plotKeyOfDay(day),
                 static_cast<double>(midnight.toSecsSinceEpoch()));
        QCOMPARE(siftwave::widgets::dayOfPlotKey(midnight.toSecsSinceEpoch() + 3600.0 * 11), day);
    }

    void draggingAWindowEdgeMovesItAndReportsTheNewWindow() {
        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        plot.setView(syntheticView());
        plot.setEditableWindow(DayIndexRange{10, 30});
        plot.customPlot()->replot();
        QSignalSpy changing(&plot, &SeriesPlot::windowChanging);
        QSignalSpy changed(&plot, &SeriesPlot::windowChanged);

        QWidget* canvas = plot.customPlot();
        auto* chart = plot.chart();
        const double halfDay = (chart->pixelOfDayIndex(1) - chart->pixelOfDayIndex(0)) / 2;
        const double y = plot.customPlot()->axisRect()->center().y();
        const QPointF endEdge(chart->pixelOfDayIndex(30) + halfDay, y);
        const QPointF target(chart->pixelOfDayIndex(40), y);
        sendMouse(canvas, QEvent::MouseButtonPress, endEdge, Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseMove, (endEdge + target) / 2, Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseMove, target, Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseButtonRelease, target, Qt::NoButton);

        QVERIFY(changing.count() >= 2);  // live, while dragging
        QCOMPARE(changed.count(), 1);
        const auto window = changed.front().front().value<DayIndexRange>();
        QCOMPARE(window.first, 10);
        QCOMPARE(window.last, 40);
        QCOMPARE(plot.editableWindow()->last, 40);
    }

    void draggingAwayFromAnEdgePansInsteadOfMovingTheWindow() {
        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        plot.setView(syntheticView());
        plot.setEditableWindow(DayIndexRange{10, 30});
        QSignalSpy changed(&plot, &SeriesPlot::windowChanged);
        const double before = plot.customPlot()->xAxis->range().lower;
        QWidget* canvas = plot.customPlot();
        const double y = plot.customPlot()->axisRect()->center().y();
        const QPointF start(plot.chart()->pixelOfDayIndex(45), y);
        sendMouse(canvas, QEvent::MouseButtonPress, start, Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseMove, start + QPointF(-120, 0), Qt::LeftButton);
        sendMouse(canvas, QEvent::MouseButtonRelease, start + QPointF(-120, 0), Qt::NoButton);
        QCOMPARE(changed.count(), 0);
        QCOMPARE(*plot.editableWindow(), (DayIndexRange{10, 30}));
        QVERIFY(plot.customPlot()->xAxis->range().lower >
                before);  // the view moved right (data left)

        plot.resetView();
        QCOMPARE(plot.customPlot()->xAxis->range().lower, before);
    }

    void aRawBarTheLedgerLoweredRunsOffTheTopWithItsValue() {
        SeriesPlot plot;
        plot.resize(900, 500);
        plot.show();
        SeriesView view = syntheticView();
        view.raw[20] = 500;     // a backlog dump as reported ...
        view.cleaned[20] = 15;  // ... and spread back by a decision
        plot.setView(view);
        QCustomPlot* canvas = plot.customPlot();
        // Scaled to the cleaned series (at most 16 here), not to the raw spike.
        QVERIFY(canvas->yAxis->range().upper < 30);
        bool labelled = false;
        for (int i = 0; i < canvas->itemCount(); ++i)
            if (auto* text = qobject_cast<QCPItemText*>(canvas->item(i)))
                labelled = labelled || text->text().contains(QStringLiteral("raw 500"));
        QVERIFY(labelled);
        // Where raw and cleaned agree, the raw bars set the scale as before.
        view.cleaned[20] = 500;
        plot.setView(view);
        QVERIFY(canvas->yAxis->range().upper >= 500);
    }

    void theWindowTheFitAndItsBandSitOnABufferedLayerBetweenTheBarsAndTheLines() {
        SeriesPlot plot;
        plot.resize(900, 500);
        plot.show();
        SeriesView view = syntheticView();
        view.fit = syntheticFit(14, 25);
        plot.setView(view);
        plot.setEditableWindow(DayIndexRange{10, 40});
        QCustomPlot* canvas = plot.customPlot();
        QCPLayer* live = plot.chart()->liveLayer();
        QVERIFY(live);
        QCOMPARE(live->mode(), QCPLayer::lmBuffered);
        QCPLayer* bars = canvas->layer(QStringLiteral("seriesBars"));
        QCPLayer* main = canvas->layer(QStringLiteral("main"));
        QVERIFY(bars && main);
        QVERIFY(bars->index() < live->index() && live->index() < main->index());
        int onLive = 0;
        for (int i = 0; i < canvas->plottableCount(); ++i) {
            QCPAbstractPlottable* p = canvas->plottable(i);
            if (p->name() == QStringLiteral("Raw, as reported"))
                QCOMPARE(p->layer(), bars);
            else if (p->name() == QStringLiteral("Cleaned"))
                QCOMPARE(p->layer(), main);
            else if (p->layer() == live)
                ++onLive;  // the band's two edges and the curve
        }
        QCOMPARE(onLive, 3);
        QCOMPARE(live->children().size(), 6);  // and the window's shading and its two edges
    }

    void aDragStepRedrawsTheLiveLayerAloneAndShowsWhatAFullReplotShows() {
        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        SeriesView view = syntheticView();
        view.fit = syntheticFit(14, 25);
        plot.setView(view);
        plot.setEditableWindow(DayIndexRange{10, 40});
        QCustomPlot* canvas = plot.customPlot();
        QCoreApplication::processEvents();  // the queued repaint of the window
        canvas->replot();                   // and every layer after it
        QVERIFY(!plot.lastRepaintWasLiveOnly());
        const QImage before = canvas->grab().toImage();
        const int revision = plot.chart()->fullReplotRevision();
        const int legendItems = canvas->legend->itemCount();
        QSignalSpy fullReplots(canvas, &QCustomPlot::afterReplot);

        // What a refit while dragging does: a curve of the same kind, a window one day shorter.
        plot.setFit(syntheticFit(13, 22));  // below the counts (at most 16): same axis
        plot.setEditableWindow(DayIndexRange{10, 39});
        QCOMPARE(plot.chart()->fullReplotRevision(), revision);
        QCOMPARE(canvas->legend->itemCount(), legendItems);
        QTRY_VERIFY(plot.lastRepaintWasLiveOnly());
        QCOMPARE(fullReplots.count(), 0);
        const QImage live = canvas->grab().toImage();  // paints the buffers as they are
        QVERIFY(live != before);
        canvas->replot();
        QCOMPARE(fullReplots.count(), 1);
        QCOMPARE(canvas->grab().toImage(), live);  // nothing stale on the other layers
    }

    void aRefitThatRaisesTheValueAxisRedrawsEveryLayer() {
        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        SeriesView view = syntheticView();
        view.fit = syntheticFit(14, 25);
        plot.setView(view);
        QCustomPlot* canvas = plot.customPlot();
        canvas->replot();
        QCoreApplication::processEvents();
        const int revision = plot.chart()->fullReplotRevision();
        QSignalSpy fullReplots(canvas, &QCustomPlot::afterReplot);
        plot.setFit(syntheticFit(40, 25));  // above every count: the axis grows
        QVERIFY(canvas->yAxis->range().upper >= 40);
        QVERIFY(plot.chart()->fullReplotRevision() != revision);
        QTRY_COMPARE(fullReplots.count(), 1);
        QVERIFY(!plot.lastRepaintWasLiveOnly());
        // A fit without a band takes the band out of the legend: every layer again.
        siftwave::widgets::FittedCurve bare = syntheticFit(40, 25);
        bare.low.clear();
        bare.high.clear();
        bare.bandLabel.clear();
        const int legendItems = canvas->legend->itemCount();
        plot.setFit(bare);
        QCOMPARE(canvas->legend->itemCount(), legendItems - 1);
        QTRY_COMPARE(fullReplots.count(), 2);
    }

    // Issue 15: the workbench's live fit of a fit that is not ok draws no curve, band or legend
    // entry; a note on the plot says why (the status and each reason), as a figure's caption
    // does; a fit that is ok again brings the curve back and the note goes.
    void aFitThatIsNotOkDrawsNoCurveAndSaysWhy() {
        std::vector<double> counts(60);
        for (int i = 0; i < 60; ++i)
            counts[static_cast<std::size_t>(i)] =
                10 + 200.0 * std::exp(-0.5 * std::pow((i - 30) / 6.0, 2));
        const SeriesView view = syntheticView();
        auto fit = siftwave::fit::fitSeries({view.axis.first(), counts});
        QVERIFY(fit.ok());
        QCOMPARE(fit->status, siftwave::fit::FitStatus::Ok);
        const auto drawn = siftwave::widgets::curveFromFit(*fit, view.axis);
        QVERIFY(drawn.notDrawn.isEmpty());
        QVERIFY(!drawn.mid.empty());

        fit->status = siftwave::fit::FitStatus::Implausible;
        fit->statusReasons = {"the 95% interval of the wave size K is wider than K",
                              "the fitted peak lies outside the window"};
        const auto refused = siftwave::widgets::curveFromFit(*fit, view.axis);
        QVERIFY(refused.mid.empty() && refused.low.empty() && refused.high.empty());
        QCOMPARE(refused.notDrawn,
                 QStringLiteral("No curve drawn: the fit is implausible\n• the 95% interval of "
                                "the wave size K is wider than K\n• the fitted peak lies outside "
                                "the window"));

        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        plot.setView(view);
        QCustomPlot* canvas = plot.customPlot();
        const int legendItems = canvas->legend->itemCount();
        const int graphs = canvas->graphCount();
        plot.setFit(refused);
        QCOMPARE(canvas->graphCount(), graphs);
        QCOMPARE(canvas->legend->itemCount(), legendItems);
        QString shown = plot.chart()->fitNote();  // wrapped to the plot's width
        QCOMPARE(shown.replace(QStringLiteral("\n  "), QStringLiteral(" ")), refused.notDrawn);
        QVERIFY(siftwave::widgets::hoverText(plot.view(), 30).indexOf(QStringLiteral("Fitted")) <
                0);

        plot.setFit(drawn);
        QVERIFY(canvas->graphCount() > graphs);
        QVERIFY(plot.chart()->fitNote().isEmpty());
        plot.setFit(refused);
        QCOMPARE(canvas->graphCount(), graphs);
        QVERIFY(!plot.chart()->fitNote().isEmpty());
        plot.setFit(std::nullopt);
        QVERIFY(plot.chart()->fitNote().isEmpty());
    }

    void hoverTextNamesTheDayItsNumbersSourceAndLedgerEntries() {
        const SeriesView view = syntheticView();
        const QString text = siftwave::widgets::hoverText(view, 7);
        QVERIFY(text.contains(QStringLiteral("2026-03-09")));
        QVERIFY(
            text.contains(QStringLiteral("Mon")));  // 2026-03-09 is a Monday (ISO 8601 week day 1)
        QVERIFY(text.contains(QStringLiteral("Raw cases: 10")));
        QVERIFY(text.contains(QStringLiteral("Source line 9")));
        QVERIFY(text.contains(QStringLiteral("#3 redistribute backlog (alice)")));
        const QString absent = siftwave::widgets::hoverText(view, 5);
        QVERIFY(absent.contains(QStringLiteral("absent")));
        QVERIFY(absent.contains(QStringLiteral("No source row")));
        QVERIFY(siftwave::widgets::hoverText(view, 60).isEmpty());
    }

    // Weekly data: a bar spans its week, the axis says weekly, the hover names the ISO week.
    void aWeeklySeriesDrawsWeekWideBarsAndNamesItsWeeks() {
        SeriesView view = syntheticView();
        // ISO 8601: 2026-03-02 is the Monday of 2026-W10.
        view.axis = siftwave::TimeAxis::weekly(*Date::fromIso("2026-03-02"), 60,
                                               siftwave::WeekStart::Monday);
        // The label is the plot model's (core decides it from the cadence); the chart draws it.
        view.valueLabel =
            QString::fromStdString(siftwave::report::valueAxisLabel(view.axis, "cases"));
        SeriesPlot plot;
        QVERIFY(showOnScreen(plot));
        plot.setView(view);
        QCustomPlot* canvas = plot.customPlot();
        QCOMPARE(canvas->yAxis->label(), QStringLiteral("Weekly cases"));
        QCPBars* bars = nullptr;
        for (int i = 0; i < canvas->plottableCount() && !bars; ++i)
            bars = qobject_cast<QCPBars*>(canvas->plottable(i));
        QVERIFY(bars);
        QVERIFY2(bars->width() > 5 * 86400.0 && bars->width() < 7 * 86400.0,
                 qPrintable(QString::number(bars->width() / 86400.0)));
        // The bar of week 0 is centred on its Thursday (the week's fourth day).
        QCOMPARE(bars->data()->at(0)->key,
                 siftwave::widgets::plotKeyOfDay(*Date::fromIso("2026-03-05")));
        QCOMPARE(siftwave::widgets::periodOfPlotKey(view.axis, bars->data()->at(3)->key), 3);
        const QString text = siftwave::widgets::hoverText(view, 1);
        QVERIFY2(text.contains(QStringLiteral("<b>2026-W11</b> 2026-03-09 to 2026-03-15")),
                 qPrintable(text));
    }
};

QTEST_MAIN(SeriesPlotTest)
#include "series_plot_test.moc"
