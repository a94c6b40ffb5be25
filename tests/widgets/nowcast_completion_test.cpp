// Review > Use the nowcast-completed counts: the analyst's explicit choice, prepared as a
// nowcast_complete decision (ledger::nowcastCompletion, as `decide` builds it), applied through
// the one door and undone by a withdrawal. Off until chosen: opening a case list changes nothing.
#include "main_window.h"
#include "widgets/common/workbench.h"
#include "widgets/ledger/decision_pane.h"

#include <QAction>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QUndoStack>

class NowcastCompletionTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void theCompletedSeriesIsADecisionTheAnalystChoosesAndCanUndo() {
        QStandardPaths::setTestModeEnabled(true);
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        siftwave::gui::MainWindow::Options options;
        options.rememberLayout = false;
        options.dialogs = false;
        options.ledgerFolder = dir.filePath(QStringLiteral("ledgers"));
        siftwave::gui::MainWindow window(options);
        window.resize(1400, 900);
        window.show();
        QSignalSpy scanned(&window, &siftwave::gui::MainWindow::scanFinished);
        window.openDrop(QStringLiteral(SIFTWAVE_TEST_DATA_DIR) +
                        QStringLiteral("/real/husO104Hosp_case_list.csv"));
        QVERIFY(scanned.wait(30000));
        QVERIFY(window.selectRegion(QStringLiteral("all")));
        siftwave::widgets::Workbench* bench = window.workbench();
        QVERIFY(bench->ledger().entries.empty());
        QCOMPARE(bench->cleaned().total(0, 0), std::int64_t{630});  // the list's 630 cases

        auto* action = window.findChild<QAction*>(QStringLiteral("nowcastCompleteAction"));
        QVERIFY(action);
        action->trigger();
        QVERIFY(window.decisionPane()->isActive());
        QVERIFY(window.applyCurrentDecision());
        QCOMPARE(bench->ledger().entries.size(), std::size_t{1});
        const siftwave::ledger::LedgerEntry& e = bench->ledger().entries.back();
        QCOMPARE(e.decision.kind, siftwave::ledger::DecisionKind::NowcastComplete);
        // husO104Hosp's last report date (dReport) is 2011-07-05.
        QCOMPARE(QString::fromStdString(e.decision.date->iso()), QStringLiteral("2011-07-05"));
        QVERIFY(e.decision.maxDelay >= 1);
        QVERIFY(e.effect.netChange() > 0);
        QCOMPARE(bench->cleaned().total(0, 0), 630 + e.effect.netChange());
        if (const QByteArray out = qgetenv("SIFTWAVE_COMPLETION_PNG"); !out.isEmpty())
            window.grab().save(QString::fromLocal8Bit(out));

        window.undoStack()->undo();  // a withdrawal: the reported counts again
        QCOMPARE(bench->ledger().entries.size(), std::size_t{2});
        QCOMPARE(bench->cleaned().total(0, 0), std::int64_t{630});
    }
};

QTEST_MAIN(NowcastCompletionTest)
#include "nowcast_completion_test.moc"
