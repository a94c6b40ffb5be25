// The reporting-delay view (widgets/nowcast/delay_view.h) on the real husO104Hosp list: the
// overall quantiles, one table row per group of event dates, the median and its bands on the
// plot, right-truncated groups marked; a drop of counts says why it has no delays.
#include "widgets/nowcast/delay_view.h"
#include "siftwave/ingest/ingest.h"
#include "widgets/plot/qcustomplot_include.h"

#include <QComboBox>
#include <QLabel>
#include <QTableWidget>
#include <QTest>

class DelayViewTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void aCaseListShowsItsDelaysOverTime() {
        auto drop =
            siftwave::ingest::readDrop(QStringLiteral(SIFTWAVE_TEST_DATA_DIR).toStdString() +
                                       "/real/husO104Hosp_case_list.csv");
        QVERIFY(drop.ok());
        siftwave::widgets::DelayView view;
        view.resize(700, 640);
        view.show();
        view.showDelays(*drop, 0);
        QVERIFY(view.report().has_value());
        const auto& report = *view.report();
        // Python's statistics.quantiles(method="inclusive") (type 7) of dReport - dHosp over the
        // 630 cases: q25 4, median 7, q75 10, q95 15 (nowcast_delays_test checks the core).
        QCOMPARE(report.overall.cases, std::size_t{630});
        QCOMPARE(report.overall.median, 7.0);
        QCOMPARE(report.overall.q75, 10.0);
        bool summaryFound = false;
        for (QLabel* label : view.findChildren<QLabel*>())
            summaryFound = summaryFound || label->text().contains(QStringLiteral(
                                               "630 cases, reported up to 2011-07-05: median "
                                               "delay 7 days (25-75%: 4-10, 5-95%: 2-15)"));
        QVERIFY(summaryFound);
        QCOMPARE(view.table()->rowCount(), static_cast<int>(report.groups.size()));
        QVERIFY(report.groups.size() >= 5);
        bool truncatedMarked = false;
        for (int row = 0; row < view.table()->rowCount(); ++row)
            truncatedMarked = truncatedMarked || view.table()->item(row, 1)->text().endsWith(
                                                     QStringLiteral(" (truncated)"));
        QVERIFY(truncatedMarked);  // the last weeks' long delays are not in yet
        QCustomPlot* plot = view.customPlot();
        bool median = false;
        for (int i = 0; i < plot->graphCount(); ++i)
            median = median || (plot->graph(i)->name() == QStringLiteral("Median delay") &&
                                plot->graph(i)->dataCount() > 0);
        QVERIFY(median);
        if (const QByteArray out = qgetenv("SIFTWAVE_DELAYS_PNG"); !out.isEmpty())
            view.grab().save(QString::fromLocal8Bit(out));
        // Calendar months: May, June, July.
        view.findChild<QComboBox*>()->setCurrentIndex(1);
        QCOMPARE(view.table()->rowCount(), 3);
    }

    void aDropOfCountsSaysItHasNoReportDates() {
        auto drop = siftwave::ingest::parseDrop("region,date,cases\nA,2026-03-01,3\n", "c.csv");
        QVERIFY(drop.ok());
        siftwave::widgets::DelayView view;
        view.showDelays(*drop, 0);
        QVERIFY(!view.report().has_value());
        bool said = false;
        for (QLabel* label : view.findChildren<QLabel*>())
            said = said || label->text().contains(QStringLiteral("no report dates"));
        QVERIFY(said);
    }
};

QTEST_MAIN(DelayViewTest)
#include "delay_view_test.moc"
