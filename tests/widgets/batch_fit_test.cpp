// Fitting every region in the background: the table lists each region with the core's numbers,
// a click selects the region, cancel leaves the window as it was, a ledger change marks the
// table out of date.
#include "main_window.h"
#include "sample_window.h"

#include "widgets/common/text_table_model.h"
#include "widgets/common/workbench.h"
#include "widgets/fit/batch_fit.h"
#include "widgets/fit/fit_pane.h"

#include "siftwave/fit/fit.h"

#include <QLabel>
#include <QPushButton>
#include <QSignalSpy>
#include <QSortFilterProxyModel>
#include <QStandardPaths>
#include <QTableView>
#include <QTemporaryDir>
#include <QTest>

using siftwave::gui::MainWindow;

class BatchFitTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_ledgers;
    std::unique_ptr<MainWindow> m_window;

    int rowOf(const QString& code) const {
        const auto* table = m_window->batchFitView()->table();
        for (int r = 0; r < table->rowCount(); ++r)
            if (table->text(r, 0) == code)
                return r;
        return -1;
    }

private Q_SLOTS:
    void init() {
        QVERIFY(m_ledgers.isValid());
        siftwave::testing::SampleWindowOptions options;
        options.size = QSize(1400, 900);
        m_window = siftwave::testing::openSampleWindow(m_ledgers.path(), options);
        QVERIFY(m_window);
    }
    void cleanup() { m_window.reset(); }

    void everyRegionIsListedWithTheCoresFitAndAClickSelectsIt() {
        MainWindow& window = *m_window;
        siftwave::widgets::BatchFitView* view = window.batchFitView();
        QSignalSpy finished(&window, &MainWindow::batchFitFinished);
        QTest::mouseClick(view->findChild<QPushButton*>(QStringLiteral("runBatchFit")),
                          Qt::LeftButton);
        QVERIFY(window.isBatchFitRunning());
        QVERIFY(finished.wait(30000));
        QVERIFY(!window.isBatchFitRunning());
        const auto& drop = window.workbench()->drop();
        QCOMPARE(view->table()->rowCount(), static_cast<int>(drop.regionCodes.size()));
        QVERIFY2(view->summaryText().contains(QStringLiteral("Gumbel")),
                 qPrintable(view->summaryText()));

        // The row of 1203 shows what the core's single fit of the same series says.
        const int row = rowOf(QStringLiteral("1203"));
        QVERIFY(row >= 0);
        siftwave::fit::FitOptions options = window.fitPane()->options();
        options.window.reset();
        const auto counts = window.workbench()->cleanedCounts(QStringLiteral("1203"), 0);
        const auto single =
            siftwave::fit::fitSeries(siftwave::fit::DailySeries{drop.axis.first(), counts}, options,
                                     window.workbench()->population(QStringLiteral("1203")));
        QVERIFY(single.ok());
        QCOMPARE(view->table()->text(row, 2),
                 QString::fromStdString(single->dateOf(single->derived.peakDay.value).iso()));
        QCOMPARE(view->table()->text(row, 3),
                 QLocale::c().toString(single->derived.waveSize.value, 'f', 0));
        QCOMPARE(view->table()->text(row, 1), QStringLiteral("Harlingmoor"));
        // The status column shows the core's status (issue 15), and the summary counts each.
        const QString status =
            QString::fromLatin1(siftwave::fit::fitStatusName(single->status)).replace(QLatin1Char('_'), QLatin1Char(' '));
        QVERIFY2(view->table()->text(row, 6).startsWith(status),
                 qPrintable(view->table()->text(row, 6)));
        QVERIFY2(view->summaryText().contains(QStringLiteral(" ok, ")) &&
                     view->summaryText().contains(QStringLiteral(" implausible, ")),
                 qPrintable(view->summaryText()));
        // Province rows sum their districts; the register names them all.
        QVERIFY(!view->table()->text(rowOf(QStringLiteral("KV")), 1).isEmpty());

        // Clicking the row (sorted view) selects the region.
        QTableView* table = view->tableView();
        auto* proxy = qobject_cast<QSortFilterProxyModel*>(table->model());
        const QModelIndex index = proxy->mapFromSource(view->table()->index(row, 0));
        table->scrollTo(index);
        QTest::mouseClick(table->viewport(), Qt::LeftButton, Qt::NoModifier,
                          table->visualRect(index).center());
        QCOMPARE(window.currentRegion(), QStringLiteral("1203"));

        // A decision changes the cleaned counts: the table says it is out of date.
        const siftwave::scan::Finding* negative = nullptr;
        for (const auto& f : window.workbench()->findings())
            if (f.kind == siftwave::scan::FindingKind::NegativeCount)
                negative = &f;
        QVERIFY(negative);
        QVERIFY(window.decideFinding(QString::fromStdString(negative->id)));
        QVERIFY(window.applyCurrentDecision());
        QVERIFY(view->summaryText().contains(QStringLiteral("Out of date")));
    }

    void cancellingLeavesTheWindowAsItWasAndALaterRunFinishes() {
        MainWindow& window = *m_window;
        QSignalSpy finished(&window, &MainWindow::batchFitFinished);
        window.startBatchFit();
        QVERIFY(window.isBatchFitRunning());
        window.cancelBackgroundWork();  // the status bar's Cancel
        QVERIFY(!window.isBatchFitRunning());
        QTest::qWait(500);
        QCOMPARE(finished.count(), 0);  // a cancelled batch never fills the table
        QCOMPARE(window.batchFitView()->table()->rowCount(), 0);
        QVERIFY(window.batchFitView()->summaryText().contains(QStringLiteral("Cancelled")));
        QVERIFY(window.selectRegion(QStringLiteral("1301")));  // still usable
        window.startBatchFit();
        QVERIFY(finished.wait(30000));
        QVERIFY(window.batchFitView()->table()->rowCount() > 0);
    }
};

QTEST_MAIN(BatchFitTest)
#include "batch_fit_test.moc"
