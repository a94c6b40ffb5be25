// The workbench before a drop is open (or after one failed to open): the plot says what to do
// instead of drawing a legend over a 1970 date axis, and the ledger status does not show a bare
// "verified" tick for a ledger that does not exist.
#include "main_window.h"

#include "widgets/common/workbench.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/ledger/ledger_view.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/series_view.h"

#include <QLabel>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTest>

using siftwave::Date;
using siftwave::widgets::SeriesPlot;
using siftwave::widgets::SeriesView;

class EmptyStateTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void anEmptyPlotSaysWhatToDo() {
        SeriesPlot plot;
        QVERIFY2(plot.emptyNote().contains(QStringLiteral("Open a drop")),
                 qPrintable(plot.emptyNote()));
        auto* canvas = plot.findChild<QCustomPlot*>(QStringLiteral("seriesCanvas"));
        QVERIFY(canvas);
        QVERIFY(!canvas->legend->visible());
        QVERIFY(!canvas->xAxis->tickLabels());

        SeriesView view;
        view.regionCode = QStringLiteral("T1");
        view.measure = QStringLiteral("cases");
        view.axis = siftwave::TimeAxis::daily(*Date::fromIso("2026-03-02"), 10);
        for (int d = 0; d < view.periods(); ++d) {
            view.raw.push_back(10 + d);
            view.rawState.push_back(siftwave::CellState::Reported);
            view.sourceLine.push_back(static_cast<std::uint32_t>(d + 2));
        }
        view.cleaned = view.raw;
        view.touchedBy.assign(view.periods(), {});
        plot.setView(view);
        QVERIFY(plot.emptyNote().isEmpty());
        QVERIFY(canvas->legend->visible());
        QVERIFY(canvas->xAxis->tickLabels());

        plot.setView(SeriesView{});  // the region went away (another drop opened)
        QVERIFY(plot.emptyNote().contains(QStringLiteral("Open a drop")));
        QVERIFY(!canvas->legend->visible());
    }

    void aRegisterRegionWithoutRowsSaysSo() {
        // samples/quenmara_regions.csv lists the province BR (Brisande); the current release
        // has rows for its districts only. Choosing BR used to read "No region selected" and,
        // with the note above, would have asked to open a drop that is open.
        QStandardPaths::setTestModeEnabled(true);
        siftwave::gui::MainWindow::Options options;
        options.rememberLayout = false;
        siftwave::gui::MainWindow window(options);
        QSignalSpy opened(&window, &siftwave::gui::MainWindow::dropOpened);
        window.openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(opened.wait(20000));
        QVERIFY(!window.workbench()->drop().regionIndex("BR").has_value());
        QVERIFY(window.selectRegion(QStringLiteral("BR")));
        const QString note = window.seriesPlot()->emptyNote();
        QVERIFY2(note.startsWith(QStringLiteral("BR has no rows in this release")),
                 qPrintable(note));
        QVERIFY2(!note.contains(QStringLiteral("Open a drop")), qPrintable(note));
        const QString fit = window.fitPane()->summaryText();
        QVERIFY2(fit.contains(QStringLiteral("BR has no rows in this release")), qPrintable(fit));

        QVERIFY(window.selectRegion(QStringLiteral("1301")));
        QVERIFY(window.seriesPlot()->emptyNote().isEmpty());
    }

    void noLedgerIsNotShownAsVerified() {
        siftwave::widgets::Workbench workbench;
        siftwave::widgets::LedgerView view(&workbench);
        const QString text = view.chainStatus()->text();
        QVERIFY2(text.startsWith(QStringLiteral("No ledger open")), qPrintable(text));
        QVERIFY2(!text.contains(QStringLiteral("✔")), qPrintable(text));
    }
};

QTEST_MAIN(EmptyStateTest)
#include "empty_state_test.moc"
