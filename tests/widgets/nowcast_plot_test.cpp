// The nowcast on the series plot: a case list's last days drawn in their own style with their
// band, labelled as an estimate of reports still to come (report::NowcastSpec -> SeriesChart).
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/plot_model.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/series_view.h"

#include <QTest>

#include <cmath>

class NowcastPlotTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void aCaseListShowsItsNowcastAndBandInTheLegendAndOnTheAxis() {
        auto drop =
            siftwave::ingest::readDrop(QStringLiteral(SIFTWAVE_TEST_DATA_DIR).toStdString() +
                                       "/real/husO104Hosp_case_list.csv");
        QVERIFY(drop.ok());
        const siftwave::ledger::Ledger ledger;
        auto cleaned = siftwave::ledger::replay(*drop, ledger);
        QVERIFY(cleaned.ok());
        siftwave::report::PlotRequest request;
        request.region = "all";
        request.nowcast = siftwave::nowcast::NowcastOptions{};
        // The whole list at its last report date (2011-07-05): its last days are still open.
        auto model = siftwave::report::buildPlotModel(*drop, ledger, *cleaned, request);
        QVERIFY(model.ok());
        QVERIFY(model->nowcast.has_value());
        const siftwave::widgets::SeriesView view = siftwave::widgets::seriesViewOf(*model);
        QVERIFY(view.nowcast.has_value());

        siftwave::widgets::SeriesPlot plot;
        plot.resize(900, 500);
        plot.setView(view);
        QCustomPlot* canvas = plot.customPlot();
        canvas->replot();
        bool line = false, band = false;
        for (int i = 0; i < canvas->legend->itemCount(); ++i) {
            auto* item = qobject_cast<QCPPlottableLegendItem*>(canvas->legend->item(i));
            if (!item)
                continue;
            const QString name = item->plottable()->name();
            line = line || name.contains(QStringLiteral("estimate of reports still to come"));
            band = band || name == QStringLiteral("95% interval of the nowcast");
        }
        QVERIFY(line);
        QVERIFY(band);
        double top = 0;
        for (double v : view.nowcast->mid)
            if (!std::isnan(v))
                top = std::max(top, v);
        QVERIFY(top > 0);
        QVERIFY(canvas->yAxis->range().upper >= top);
        if (const QByteArray out = qgetenv("SIFTWAVE_NOWCAST_PNG"); !out.isEmpty())
            plot.grab().save(QString::fromLocal8Bit(out));
    }
};

QTEST_MAIN(NowcastPlotTest)
#include "nowcast_plot_test.moc"
