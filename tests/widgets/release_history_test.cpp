// File > Open release history: the open drop and its earlier releases give the nowcast the
// series plot shows (Workbench::setReleaseHistory, app/gui/main_window_history.cpp).
#include "../support/case_list_generator.h"
#include "main_window.h"
#include "widgets/common/workbench.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_plot.h"

#include <QDir>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

#include <fstream>

class ReleaseHistoryTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void theReleasesOfASeriesShowTheirNowcastOnThePlot() {
        QStandardPaths::setTestModeEnabled(true);
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        siftwave::testing::CaseListSpec spec;
        spec.days = 30;
        spec.seed = 5;
        const auto cases = siftwave::testing::generateCases(spec);
        QStringList earlier;
        QString latest;
        for (int k = 0; k < spec.days; ++k) {
            const siftwave::Date asOf = spec.first + k;
            const QString path = dir.filePath(
                QStringLiteral("cases_%1.csv").arg(QString::fromStdString(asOf.iso())));
            std::ofstream(path.toStdString())
                << siftwave::testing::releaseText(cases, spec.first, asOf);
            if (k + 1 == spec.days)
                latest = path;
            else
                earlier << path;
        }
        siftwave::gui::MainWindow::Options options;
        options.rememberLayout = false;
        options.dialogs = false;
        options.ledgerFolder = dir.filePath(QStringLiteral("ledgers"));
        siftwave::gui::MainWindow window(options);
        window.resize(1200, 800);
        window.show();
        QSignalSpy scanned(&window, &siftwave::gui::MainWindow::scanFinished);
        window.openDrop(latest);
        QVERIFY(scanned.wait(30000));
        QSignalSpy opened(&window, &siftwave::gui::MainWindow::historyOpened);
        window.openReleaseHistory(earlier);
        QVERIFY(opened.wait(30000));
        QCOMPARE(opened.front().front().toInt(), spec.days - 1);
        // No previous release is open: the scan runs again and its revisions are the history's
        // newest pair (the release before the drop against it; late reports revise the last
        // days of every release here).
        QTRY_COMPARE_WITH_TIMEOUT(scanned.count(), 2, 30000);
        bool revised = false;
        for (const siftwave::scan::Finding& f : window.workbench()->findings())
            revised = revised || f.kind == siftwave::scan::FindingKind::Revision;
        QVERIFY(revised);
        // ... and the plot draws that release dotted, as an opened previous release.
        QVERIFY(window.workbench()->previousDrop() == nullptr);
        QVERIFY(window.workbench()->comparedPrevious() != nullptr);
        QVERIFY(!window.workbench()->seriesView(QStringLiteral("all"), 0).previous.empty());
        QVERIFY(window.selectRegion(QStringLiteral("all")));
        auto* plot = window.findChild<siftwave::widgets::SeriesPlot*>();
        QVERIFY(plot);
        QCustomPlot* canvas = plot->customPlot();
        bool nowcast = false;
        for (int i = 0; i < canvas->plottableCount(); ++i)
            nowcast = nowcast || canvas->plottable(i)->name().contains(
                                     QStringLiteral("estimate of reports still to come"));
        QVERIFY(nowcast);
        if (const QByteArray out = qgetenv("SIFTWAVE_HISTORY_PNG"); !out.isEmpty())
            window.grab().save(QString::fromLocal8Bit(out));

        // A project keeps the history: reopened, the same releases give the nowcast again.
        const QString project = dir.filePath(QStringLiteral("study.siftwave.json"));
        QVERIFY(window.saveProject(project));
        siftwave::gui::MainWindow reopened(options);
        reopened.resize(1200, 800);
        reopened.show();
        QSignalSpy projectOpened(&reopened, &siftwave::gui::MainWindow::projectOpened);
        reopened.openProject(project);
        QVERIFY(projectOpened.wait(30000));
        QCOMPARE(static_cast<int>(reopened.workbench()->releaseHistorySize()), spec.days - 1);
        QVERIFY(reopened.workbench()->releaseHistoryProblem().isEmpty());
    }
};

QTEST_MAIN(ReleaseHistoryTest)
#include "release_history_test.moc"
