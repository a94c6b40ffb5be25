// The main window on the bundled sample: opening, selecting, a bad file, the screenshot.
#include "main_window.h"

#include "widgets/common/workbench.h"
#include "widgets/findings/region_browser.h"
#include "widgets/findings/region_model.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/series_view.h"

#include <QComboBox>
#include <QDateEdit>
#include <QFile>
#include <QImage>
#include <QMessageBox>
#include <QProcess>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QTreeView>

#include <cmath>

using siftwave::gui::MainWindow;

namespace {

const QString kSample = QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv");

MainWindow::Options testOptions() {
    MainWindow::Options options;
    options.rememberLayout = false;  // never touch the user's settings
    return options;
}

bool openAndWait(MainWindow& window, const QString& path) {
    QSignalSpy opened(&window, &MainWindow::dropOpened);
    window.openDrop(path);
    return opened.wait(20000);
}

/// Physical line `number` (1-based) of a text file, without its line break.
QString lineOfFile(const QString& path, quint32 number) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return {};
    for (quint32 n = 1; !file.atEnd(); ++n) {
        const QByteArray line = file.readLine();
        if (n == number)
            return QString::fromUtf8(line).trimmed();
    }
    return {};
}

}  // namespace

class MainWindowTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void initTestCase() { QStandardPaths::setTestModeEnabled(true); }

    void opensTheSampleAndListsEveryRegionCodeVerbatim() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        // The sample README lists the codes NA and 0412 as traps; both must be there as written.
        const auto& drop = window.workbench()->drop();
        QVERIFY(drop.regionIndex("NA").has_value());
        QVERIFY(drop.regionIndex("0412").has_value());
        QVERIFY(window.selectRegion(QStringLiteral("NA")));
        QCOMPARE(window.currentRegion(), QStringLiteral("NA"));
        QVERIFY(window.selectRegion(QStringLiteral("0412")));
        QCOMPARE(window.seriesPlot()->view().regionCode, QStringLiteral("0412"));
        QCOMPARE(window.seriesPlot()->view().regionName, QStringLiteral("Skaldrin"));
    }

    void aRegionWithoutAWaveDoesNotShowTheWindowOfTheRegionBefore() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        auto* from = window.fitPane()->findChild<QDateEdit*>(QStringLiteral("fitWindowFrom"));
        auto* to = window.fitPane()->findChild<QDateEdit*>(QStringLiteral("fitWindowTo"));
        QVERIFY(from && to);
        QVERIFY(window.selectRegion(QStringLiteral("KV")));
        const QDate kvFirst = from->date();
        // 412 is the variant code of Skaldrin's last week (samples/manifest.json P14): no wave.
        QVERIFY(window.selectRegion(QStringLiteral("412")));
        QVERIFY2(window.fitPane()->summaryText().startsWith(QStringLiteral("No fit")),
                 qPrintable(window.fitPane()->summaryText()));
        const auto& drop = window.workbench()->drop();
        QCOMPARE(from->date().toString(Qt::ISODate),
                 QString::fromStdString(drop.axis.first().iso()));
        QCOMPARE(to->date().toString(Qt::ISODate),
                 QString::fromStdString(drop.axis.lastStart().iso()));
        QVERIFY(from->date() != kvFirst);
    }

    void selectingARegionPlotsItsRowsFromTheFile() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        QVERIFY(window.selectRegion(QStringLiteral("1301")));
        const siftwave::widgets::SeriesView& view = window.seriesPlot()->view();
        QCOMPARE(view.regionCode, QStringLiteral("1301"));
        QCOMPARE(view.periods(), window.workbench()->drop().periods());
        // Every plotted raw value is the one on its source line of the file (long layout:
        // date,region,cases,deaths per the samples README).
        int checked = 0;
        for (int d = 0; d < view.periods(); d += 17) {
            if (std::isnan(view.raw[d]))
                continue;
            const QStringList fields =
                lineOfFile(kSample, view.sourceLine[d]).split(QLatin1Char(','));
            QCOMPARE(fields.value(0), QString::fromStdString(view.periodStart(d).iso()));
            QCOMPARE(fields.value(1), QStringLiteral("1301"));
            QCOMPARE(fields.value(2).toDouble(), view.raw[d]);
            ++checked;
        }
        QVERIFY(checked > 10);
        // The hover text names the date, the raw value and the source line.
        const QString hover = siftwave::widgets::hoverText(view, 0);
        QVERIFY(hover.contains(QString::fromStdString(view.periodStart(0).iso())));
        QVERIFY(hover.contains(QStringLiteral("Source line %1").arg(view.sourceLine[0])));
    }

    void aSecondMeasureIsDrawnOnTheRightAxis() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        QVERIFY(window.selectRegion(QStringLiteral("1102")));
        auto* second =
            window.seriesPlot()->findChild<QComboBox*>(QStringLiteral("secondMeasureChoice"));
        QVERIFY(second);
        second->setCurrentIndex(second->findText(QStringLiteral("deaths")));
        QCOMPARE(window.seriesPlot()->view().secondMeasure, QStringLiteral("deaths"));
        QCOMPARE(static_cast<int>(window.seriesPlot()->view().second.size()),
                 window.workbench()->drop().periods());
    }

    void thePreviousReleaseIsDrawnAndItsRevisionsNamed() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        QSignalSpy previous(&window, &MainWindow::previousOpened);
        window.openPreviousRelease(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_previous.csv"));
        QVERIFY(previous.wait(20000));
        // The samples README plants revisions of 1405's historic cases between the releases.
        QVERIFY(window.selectRegion(QStringLiteral("1405")));
        const siftwave::widgets::SeriesView& view = window.seriesPlot()->view();
        QCOMPARE(static_cast<int>(view.previous.size()), view.periods());
        int revised = 0;
        for (int d = 0; d < view.periods(); ++d) {
            if (std::isnan(view.previous[d]) || std::isnan(view.raw[d]) ||
                view.previous[d] == view.raw[d])
                continue;
            ++revised;
            QVERIFY(siftwave::widgets::hoverText(view, d).contains(QStringLiteral("revised by")));
        }
        QVERIFY(revised > 0);
        // The previous release is a week shorter: its last week has no number.
        QVERIFY(std::isnan(view.previous[view.periods() - 1]));
    }

    void aBadFileShowsTheReadersMessageAndTheWindowStaysUsable() {
        QTemporaryDir dir;
        QVERIFY(dir.isValid());
        const QString bad = dir.filePath(QStringLiteral("bad.csv"));
        QFile file(bad);
        QVERIFY(file.open(QIODevice::WriteOnly));
        file.write("date,region,cases\n2026-03-01,AB,4\n2026-02-30,AB,5\n");  // no 30 February
        file.close();

        MainWindow window(testOptions());
        window.show();
        QSignalSpy failed(&window, &MainWindow::dropFailed);
        window.openDrop(bad);
        QVERIFY(failed.wait(20000));
        const QString message = failed.front().front().toString();
        QVERIFY2(message.contains(QStringLiteral("bad.csv")), qPrintable(message));
        QVERIFY2(message.contains(QStringLiteral(":3:")), qPrintable(message));  // line 3
        auto* box = window.findChild<QMessageBox*>(QStringLiteral("errorDialog"));
        QVERIFY(box);
        QVERIFY(box->isVisible());
        QCOMPARE(box->text(), message);
        QVERIFY(!window.workbench()->hasDrop());
        box->accept();

        QVERIFY(openAndWait(window, kSample));
        QVERIFY(window.workbench()->hasDrop());
        QVERIFY(window.selectRegion(QStringLiteral("1301")));
    }

    void cancellingTheReadKeepsWhatWasOpen() {
        MainWindow window(testOptions());
        window.show();
        QVERIFY(openAndWait(window, kSample));
        QSignalSpy opened(&window, &MainWindow::dropOpened);
        window.openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_previous.csv"));
        QVERIFY(window.isBusy());
        window.cancelBackgroundWork();
        QVERIFY(!window.isBusy());
        QTest::qWait(300);
        QCOMPARE(opened.count(), 0);
        QVERIFY(window.workbench()->dropPath().endsWith(QStringLiteral("quenmara_current.csv")));
    }

    void screenshotWritesAPngOfTheWindowAndExits() {
        QTemporaryDir dir;
        const QString png = dir.filePath(QStringLiteral("shot.png"));
        QProcess gui;
        QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
        env.insert(QStringLiteral("QT_QPA_PLATFORM"), QStringLiteral("offscreen"));
        gui.setProcessEnvironment(env);
        gui.start(QStringLiteral(SIFTWAVE_GUI_PATH),
                  {QStringLiteral("--screenshot"), png, QStringLiteral("--select"),
                   QStringLiteral("1301"), kSample});
        QVERIFY(gui.waitForFinished(60000));
        QCOMPARE(gui.exitCode(), 0);
        const QImage image(png);
        QCOMPARE(image.size(), QSize(1440, 900));

        // An unknown region is an error (exit 1), the picture is still written.
        QProcess unknown;
        unknown.setProcessEnvironment(env);
        unknown.start(QStringLiteral(SIFTWAVE_GUI_PATH),
                      {QStringLiteral("--screenshot"), png, QStringLiteral("--select"),
                       QStringLiteral("ZZ"), kSample});
        QVERIFY(unknown.waitForFinished(60000));
        QCOMPARE(unknown.exitCode(), 1);
    }
};

QTEST_MAIN(MainWindowTest)
#include "main_window_test.moc"
