// Projects through the window: save, then reopen in a fresh window — the same drop, ledger head
// and selection; a project whose drop has changed is refused; a ledger is never overwritten.
#include "main_window.h"
#include "project_session.h"
#include "sample_window.h"

#include "widgets/common/workbench.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/plot/series_plot.h"

#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/project.h"

#include <QComboBox>
#include <QFile>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

using siftwave::gui::MainWindow;

namespace {

std::unique_ptr<MainWindow> makeWindow(const QString& ledgers) {
    return siftwave::testing::makeTestWindow(ledgers);
}

}  // namespace

class ProjectTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_folder;
    QString m_ledgers;
    QString m_projects;

private Q_SLOTS:
    void init() {
        QStandardPaths::setTestModeEnabled(true);
        QVERIFY(m_folder.isValid());
        m_ledgers = m_folder.filePath(QStringLiteral("ledgers"));
        m_projects = m_folder.filePath(QStringLiteral("projects"));
        QDir(m_ledgers).removeRecursively();
        QDir(m_projects).removeRecursively();
        QDir().mkpath(m_ledgers);
        QDir().mkpath(m_projects);
    }

    void aSavedProjectReopensWithTheSameLedgerHeadAndSelection() {
        auto first = makeWindow(m_ledgers);
        QSignalSpy scanned(first.get(), &MainWindow::scanFinished);
        first->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(scanned.wait(30000));
        siftwave::widgets::Workbench& wb = *first->workbench();
        // One decision, so the head is not the empty ledger's.
        const siftwave::scan::Finding* dump = nullptr;
        for (const auto& f : wb.findings())
            if (f.kind == siftwave::scan::FindingKind::BacklogDump && f.region == "1301")
                dump = &f;
        QVERIFY(dump);
        QVERIFY(first->decideFinding(QString::fromStdString(dump->id)));
        QVERIFY(first->applyCurrentDecision());
        const QString appDataLedger = wb.ledgerPath();
        QSignalSpy previousOpened(first.get(), &MainWindow::previousOpened);
        first->openPreviousRelease(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_previous.csv"));
        QVERIFY(previousOpened.wait(30000));
        const std::string previousSha = wb.previousDrop()->source.sha256;
        // A selection to come back to: region, second measure, fit method and window, zoom.
        QVERIFY(first->selectRegion(QStringLiteral("1203")));
        first->seriesPlot()->chooseSecondMeasure(1);
        auto* method = first->fitPane()->findChild<QComboBox*>(QStringLiteral("fitMethod"));
        method->setCurrentIndex(method->findData(int(siftwave::fit::FitMethod::Poisson)));
        first->fitPane()->setManualWindow(siftwave::widgets::DayIndexRange{120, 200});
        first->seriesPlot()->setVisibleDays(siftwave::widgets::DayIndexRange{100, 220});
        const siftwave::widgets::DayIndexRange visible = first->seriesPlot()->visibleDays();
        QCOMPARE(visible, (siftwave::widgets::DayIndexRange{100, 220}));

        const QString path = QDir(m_projects).filePath(QStringLiteral("morning"));
        QVERIFY(first->saveProject(path));
        const QString saved = path + QStringLiteral(".siftwave.json");
        QCOMPARE(first->projectPath(), saved);
        QVERIFY(QFile::exists(saved));
        // The project has its own ledger beside it, a byte-for-byte copy; the window now
        // appends there, and the application's copy is left as it was.
        const QString projectLedger =
            QDir(m_projects).filePath(QStringLiteral("morning.ledger.jsonl"));
        QCOMPARE(wb.ledgerPath(), projectLedger);
        QFile a(appDataLedger), b(projectLedger);
        QVERIFY(a.open(QIODevice::ReadOnly) && b.open(QIODevice::ReadOnly));
        QCOMPARE(a.readAll(), b.readAll());
        const std::string head = wb.ledger().headHash();
        const auto onDisk = siftwave::ledger::readProjectFile(saved.toStdString());
        QVERIFY(onDisk.ok());
        QCOMPARE(onDisk->ledgerPath, std::string("morning.ledger.jsonl"));  // relative: portable
        QCOMPARE(onDisk->ledgerHeadHash, head);
        QCOMPARE(onDisk->ledgerEntries, std::uint64_t(1));
        QCOMPARE(onDisk->view.region, std::string("1203"));
        QCOMPARE(onDisk->fit.method, std::string("poisson"));
        const std::int64_t cleanedDump =
            wb.cleaned()
                .cell(0, *wb.drop().regionIndex("1301"), *dump->first - wb.drop().axis.first())
                .value;
        const int dumpDay = *dump->first - wb.drop().axis.first();
        first.reset();

        // A fresh window, as the next morning.
        auto second = makeWindow(m_ledgers);
        QSignalSpy opened(second.get(), &MainWindow::projectOpened);
        second->openProject(saved);
        QVERIFY(opened.wait(30000));
        siftwave::widgets::Workbench& again = *second->workbench();
        QCOMPARE(second->projectPath(), saved);
        QCOMPARE(again.ledgerPath(), projectLedger);
        QCOMPARE(again.ledger().entries.size(), std::size_t(1));
        QCOMPARE(again.ledger().headHash(), head);
        QVERIFY(again.chainOk());
        QCOMPARE(again.cleaned().cell(0, *again.drop().regionIndex("1301"), dumpDay).value,
                 cleanedDump);
        QCOMPARE(second->currentRegion(), QStringLiteral("1203"));
        QVERIFY(again.previousDrop());  // the previous release came back too
        QCOMPARE(again.previousDrop()->source.sha256, previousSha);
        QVERIFY(!second->seriesPlot()->view().previous.empty());
        QCOMPARE(second->seriesPlot()->measure(), 0);
        QCOMPARE(second->seriesPlot()->secondMeasure(), 1);
        QCOMPARE(second->fitPane()->options().method, siftwave::fit::FitMethod::Poisson);
        QCOMPARE(*second->fitPane()->manualWindow(), (siftwave::widgets::DayIndexRange{120, 200}));
        QVERIFY(second->currentFit());
        QCOMPARE(second->currentFit()->first, 120);
        QCOMPARE(second->currentFit()->last, 200);
        // The scan finishing afterwards redraws the same series and keeps the zoom.
        QSignalSpy scannedAgain(second.get(), &MainWindow::scanFinished);
        QVERIFY(scannedAgain.wait(30000));
        QCOMPARE(second->seriesPlot()->visibleDays(), visible);
        QVERIFY(second->windowTitle().contains(QStringLiteral("morning.siftwave.json")));
    }

    void aProjectWhoseDropChangedIsRefusedAndTheWindowStaysUsable() {
        auto window = makeWindow(m_ledgers);
        QSignalSpy scanned(window.get(), &MainWindow::scanFinished);
        window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(scanned.wait(30000));
        const QString path = QDir(m_projects).filePath(QStringLiteral("changed.siftwave.json"));
        QVERIFY(window->saveProject(path));
        auto project = siftwave::ledger::readProjectFile(path.toStdString());
        QVERIFY(project.ok());
        project->dropSha256 = std::string(64, 'a');  // as if the drop file had been replaced
        QVERIFY(siftwave::ledger::writeProjectFile(path.toStdString(), *project).ok());

        QSignalSpy failed(window.get(), &MainWindow::projectFailed);
        window->openProject(path);
        QVERIFY(failed.wait(30000));
        QVERIFY2(failed.front().front().toString().contains(QStringLiteral("SHA-256")),
                 qPrintable(failed.front().front().toString()));
        // Still the drop that was open, still usable.
        QVERIFY(window->workbench()->hasDrop());
        QVERIFY(window->selectRegion(QStringLiteral("1301")));

        // Not a project at all: the core's message, with the file named.
        const QString junk = QDir(m_projects).filePath(QStringLiteral("junk.siftwave.json"));
        QFile file(junk);
        QVERIFY(file.open(QIODevice::WriteOnly));
        file.write("[1, 2]\n");
        file.close();
        QSignalSpy failedAgain(window.get(), &MainWindow::projectFailed);
        window->openProject(junk);
        QCOMPARE(failedAgain.count(), 1);
        QVERIFY(
            failedAgain.front().front().toString().contains(QStringLiteral("junk.siftwave.json")));
    }

    void savingOverAnotherProjectsLedgerIsRefused() {
        // Another ledger already sits where this project's would go.
        const QString path = QDir(m_projects).filePath(QStringLiteral("taken.siftwave.json"));
        QFile other(siftwave::gui::projectLedgerPath(path));
        QVERIFY(other.open(QIODevice::WriteOnly));
        other.write("{\"not\": \"this drop's ledger\"}\n");
        other.close();

        auto window = makeWindow(m_ledgers);
        QSignalSpy scanned(window.get(), &MainWindow::scanFinished);
        window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(scanned.wait(30000));
        QVERIFY(!window->saveProject(path));
        QVERIFY(!QFile::exists(path));
        QVERIFY(other.open(QIODevice::ReadOnly));
        QCOMPARE(other.readAll(), QByteArray("{\"not\": \"this drop's ledger\"}\n"));
    }

    void projectPathsAreRelativeInsideTheFolderAndAbsoluteOutside() {
        const QString project = QDir(m_projects).filePath(QStringLiteral("p.siftwave.json"));
        QCOMPARE(siftwave::gui::storedProjectPath(
                     project, QDir(m_projects).filePath(QStringLiteral("data/x.csv"))),
                 std::string("data/x.csv"));
        const QString outside = QDir(m_ledgers).filePath(QStringLiteral("y.jsonl"));
        QCOMPARE(siftwave::gui::storedProjectPath(project, outside),
                 QDir::cleanPath(outside).toStdString());
        QCOMPARE(siftwave::gui::resolvedProjectPath(project, "data/x.csv"),
                 QDir::cleanPath(QDir(m_projects).filePath(QStringLiteral("data/x.csv"))));
        QCOMPARE(siftwave::gui::withProjectSuffix(QStringLiteral("a")),
                 QStringLiteral("a.siftwave.json"));
        QCOMPARE(siftwave::gui::projectLedgerPath(project),
                 QDir(m_projects).filePath(QStringLiteral("p.ledger.jsonl")));
    }
};

QTEST_MAIN(ProjectTest)
#include "project_test.moc"
