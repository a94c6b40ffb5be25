// The review loop through the widgets: finding -> preview -> apply with a reason ->
// ledger entry with the region total conserved; withdraw and undo restore the values.
#include "main_window.h"
#include "sample_window.h"

#include "widgets/common/workbench.h"
#include "widgets/findings/finding_review.h"
#include "widgets/ledger/decision_pane.h"
#include "widgets/ledger/ledger_view.h"

#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/replay.h"

#include <QLabel>
#include <QLineEdit>
#include <QPushButton>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTableView>
#include <QTemporaryDir>
#include <QTest>
#include <QUndoStack>

using siftwave::gui::MainWindow;

namespace {

const siftwave::scan::Finding* findingOf(const siftwave::widgets::Workbench& wb,
                                         siftwave::scan::FindingKind kind,
                                         const std::string& region) {
    for (const auto& f : wb.findings())
        if (f.kind == kind && f.region && *f.region == region)
            return &f;
    return nullptr;
}

}  // namespace

class RedistributionTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_ledgers;
    std::unique_ptr<MainWindow> m_window;

private Q_SLOTS:
    void init() {
        QVERIFY(m_ledgers.isValid());
        siftwave::testing::SampleWindowOptions options;
        options.dialogs = true;
        m_window = siftwave::testing::openSampleWindow(m_ledgers.path(), options);
        QVERIFY(m_window);
    }
    void cleanup() { m_window.reset(); }

    void aBacklogDumpIsRedistributedThroughThePreviewAndTheReason() {
        MainWindow& window = *m_window;
        siftwave::widgets::Workbench& wb = *window.workbench();
        // The samples README plants a backlog dump in 1301's cases on 2026-08-24.
        const auto* dump = findingOf(wb, siftwave::scan::FindingKind::BacklogDump, "1301");
        QVERIFY(dump);
        const QString id = QString::fromStdString(dump->id);
        const auto& drop = wb.drop();
        const std::size_t region = *drop.regionIndex("1301");
        const std::size_t cases = *drop.measureIndex("cases");
        const std::int64_t rawTotal = siftwave::ledger::rawTotal(drop, cases, region);
        const int dumpDay = *dump->first - drop.axis.first();
        const std::int32_t dumpValue = drop.cell(cases, region, dumpDay).value;
        QVERIFY(wb.openFindings(QStringLiteral("1301")) >= 1);
        const int openBefore = wb.openFindings(QStringLiteral("1301"));

        // Select the finding and press Decide: the suggestion is previewed, nothing recorded.
        QVERIFY(window.findingReview()->selectFinding(id));
        auto* decide =
            window.findingReview()->findChild<QPushButton*>(QStringLiteral("decideFinding"));
        QVERIFY(decide && decide->isEnabled());
        QTest::mouseClick(decide, Qt::LeftButton);
        siftwave::widgets::DecisionPane* pane = window.decisionPane();
        QVERIFY(pane->isActive());
        QCOMPARE(window.currentRegion(), QStringLiteral("1301"));
        QVERIFY(pane->previewOk());
        QVERIFY2(pane->previewText().contains(QStringLiteral("(conserved)")),
                 qPrintable(pane->previewText()));
        QVERIFY(wb.ledger().entries.empty());

        // The reason is required: prefilled from the evidence, Apply is off when it is blank.
        auto* reason = pane->findChild<QLineEdit*>(QStringLiteral("decisionReason"));
        auto* apply = pane->findChild<QPushButton*>(QStringLiteral("applyDecision"));
        QVERIFY(reason && apply);
        QVERIFY(reason->text().contains(id));
        QVERIFY(reason->text().contains(QStringLiteral("excess")));
        reason->clear();
        QVERIFY(!apply->isEnabled());
        QTest::keyClicks(reason,
                         QStringLiteral("held-back cases of three weeks, spread back (test)"));
        QVERIFY(apply->isEnabled());
        QTest::mouseClick(apply, Qt::LeftButton);

        // One entry, answering the finding, with the region total exactly as before.
        QCOMPARE(wb.ledger().entries.size(), std::size_t(1));
        const siftwave::ledger::LedgerEntry& entry = wb.ledger().entries.front();
        QCOMPARE(entry.decision.kind, siftwave::ledger::DecisionKind::Redistribute);
        QCOMPARE(QString::fromStdString(entry.reason),
                 QStringLiteral("held-back cases of three weeks, spread back (test)"));
        QCOMPARE(QString::fromStdString(entry.decision.finding), id);
        QCOMPARE(wb.cleaned().total(cases, region), rawTotal);
        QCOMPARE(wb.cleaned().cell(cases, region, dumpDay).value,
                 dumpValue - entry.decision.excess);
        QVERIFY(wb.chainOk());
        QVERIFY(window.ledgerView()->chainStatus()->text().contains(QStringLiteral("verified")));
        // The ledger's row gives the whole reason on hover, where its column is cut.
        const QAbstractItemModel* rows = window.ledgerView()->view()->model();
        QVERIFY(rows->index(0, siftwave::widgets::LedgerModel::ReasonColumn)
                    .data(Qt::ToolTipRole)
                    .toString()
                    .startsWith(QString::fromStdString(entry.reason)));
        QVERIFY(wb.isDecided(dump->id));
        QCOMPARE(wb.openFindings(QStringLiteral("1301")), openBefore - 1);
        QVERIFY(!pane->isActive());
        // The entry is on disk, and the file replays to the same cleaned values.
        const auto onDisk = siftwave::ledger::readLedgerFile(wb.ledgerPath().toStdString());
        QVERIFY(onDisk.ok());
        QCOMPARE(onDisk->entries.size(), std::size_t(1));
        const auto replayed = siftwave::ledger::replay(drop, *onDisk);
        QVERIFY(replayed.ok());
        QCOMPARE(replayed->total(cases, region), rawTotal);
        QCOMPARE(replayed->cell(cases, region, dumpDay).value,
                 wb.cleaned().cell(cases, region, dumpDay).value);

        // Withdraw restores the values, by appending (history is kept).
        QVERIFY(window.withdrawEntry(1, QStringLiteral("test: withdraw")));
        QCOMPARE(wb.ledger().entries.size(), std::size_t(2));
        QVERIFY(!wb.cleaned().inEffect(1));
        QCOMPARE(wb.cleaned().cell(cases, region, dumpDay).value,
                 static_cast<std::int64_t>(dumpValue));
        for (int d = 0; d < drop.periods(); ++d) {
            const auto& raw = drop.cell(cases, region, d);
            if (raw.reported())
                QCOMPARE(wb.cleaned().cell(cases, region, d).value,
                         static_cast<std::int64_t>(raw.value));
        }
        QVERIFY(!wb.isDecided(dump->id));
    }

    void undoAppendsAWithdrawalAndRedoRestores() {
        MainWindow& window = *m_window;
        siftwave::widgets::Workbench& wb = *window.workbench();
        const auto* negative = findingOf(wb, siftwave::scan::FindingKind::NegativeCount, "1306");
        QVERIFY(negative);  // planted in 1306 cases on 2026-06-11 (samples README)
        const auto& drop = wb.drop();
        const std::size_t region = *drop.regionIndex("1306");
        const std::size_t cases = *drop.measureIndex("cases");
        const int day = *negative->first - drop.axis.first();
        QVERIFY(drop.cell(cases, region, day).value < 0);

        QVERIFY(window.decideFinding(QString::fromStdString(negative->id)));
        QVERIFY(window.decisionPane()->previewOk());
        window.decisionPane()->setReason(
            QStringLiteral("a correction of double entries, spread back (test)"));
        QVERIFY(window.applyCurrentDecision());
        QCOMPARE(wb.cleaned().cell(cases, region, day).value, 0);
        QCOMPARE(wb.cleaned().total(cases, region),
                 siftwave::ledger::rawTotal(drop, cases, region));

        window.undoStack()->undo();
        QCOMPARE(wb.ledger().entries.size(), std::size_t(2));
        QCOMPARE(wb.ledger().entries.back().decision.kind,
                 siftwave::ledger::DecisionKind::Withdraw);
        QCOMPARE(wb.cleaned().cell(cases, region, day).value,
                 static_cast<std::int64_t>(drop.cell(cases, region, day).value));

        window.undoStack()->redo();
        QCOMPARE(wb.ledger().entries.size(), std::size_t(3));
        QVERIFY(wb.cleaned().inEffect(1));
        QCOMPARE(wb.cleaned().cell(cases, region, day).value, 0);
        QVERIFY(wb.chainOk());
    }

    void reopeningTheDropReplaysItsLedger() {
        MainWindow& window = *m_window;
        const auto* dump =
            findingOf(*window.workbench(), siftwave::scan::FindingKind::BacklogDump, "1301");
        QVERIFY(dump);
        const int day =
            *dump->first -
            window.workbench()->drop().axis.first();  // copied: reopening drops the findings
        QVERIFY(window.decideFinding(QString::fromStdString(dump->id)));
        QVERIFY(window.applyCurrentDecision());  // the prefilled reason is a reason
        const auto region = *window.workbench()->drop().regionIndex("1301");
        const auto value = window.workbench()->cleaned().cell(0, region, day).value;
        QVERIFY(value != window.workbench()->drop().cell(0, region, day).value);

        QSignalSpy opened(&window, &MainWindow::dropOpened);
        window.openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(opened.wait(30000));
        QCOMPARE(window.workbench()->ledger().entries.size(), std::size_t(1));
        QCOMPARE(window.workbench()->cleaned().cell(0, region, day).value, value);
    }
};

QTEST_MAIN(RedistributionTest)
#include "redistribution_test.moc"
