// The transmission panel under the series plot: R_t (Cori et al. 2013) of the cleaned series
// with its band and the line R = 1, r(t) as the second choice, recomputed when a decision is
// applied, its time axis aligned with the series plot's, and the caution beside it.
// SIFTWAVE_SAVE_PNG=<path> saves the window after the decision, to look at.
#include "export_figure_action.h"
#include "main_window.h"
#include "sample_drop.h"
#include "sample_window.h"
#include "transmission_controller.h"

#include "widgets/common/workbench.h"
#include "widgets/export/figure_export_dialog.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/transmission_panel.h"
#include "widgets/transmission/transmission_pane.h"

#include <QFile>
#include <QLabel>
#include <QTemporaryDir>
#include <QTest>

#include <cmath>

using siftwave::gui::MainWindow;
using siftwave::widgets::TransmissionMeasure;

namespace {

// The period of a date on the shown axis.
std::size_t periodOf(const MainWindow& w, const char* iso) {
    const auto& axis = w.transmissionPanel()->result()->axis;
    return static_cast<std::size_t>(*axis.periodOf(*siftwave::Date::fromIso(iso)));
}

}  // namespace

class TransmissionPanelTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_dir;
    std::unique_ptr<MainWindow> m_window;

private Q_SLOTS:
    void init() {
        QVERIFY(m_dir.isValid());
        m_window = siftwave::testing::openSampleWindow(m_dir.filePath(QStringLiteral("ledgers")),
                                                       {false, QSize(1400, 900), false});
        QVERIFY(m_window);
        QVERIFY(m_window->selectRegion(QStringLiteral("1301")));
    }
    void cleanup() { m_window.reset(); }

    void withoutASerialIntervalThePanelSaysWhyThereIsNoR() {
        auto* panel = m_window->transmissionPanel();
        QVERIFY(panel->result());
        QVERIFY(panel->chart().note().contains(QStringLiteral("no serial interval")));
        // r(t) needs none.
        panel->chooseMeasure(TransmissionMeasure::GrowthRate);
        QVERIFY(panel->chart().note().isEmpty());
        QVERIFY(panel->result()->rows[100].growth.ok());
    }

    void thePanelFollowsTheCleanedSeriesWhenADecisionIsApplied() {
        m_window->transmissionPane()->setSerialInterval(4.7, 2.9);
        auto* panel = m_window->transmissionPanel();
        QVERIFY(panel->result() && panel->result()->refusal.empty());
        QVERIFY(panel->chart().note().isEmpty());
        const std::size_t dump = periodOf(*m_window, "2026-08-24");
        const double before = panel->result()->rows[dump].reproduction.mean;
        QVERIFY(std::isfinite(before));
        // The sample's planted backlog (samples/manifest.json, P06), spread back.
        const siftwave::ledger::Decision backlog = siftwave::testing::sampleBacklogDecision();
        auto applied = m_window->workbench()->apply(backlog, QStringLiteral("backlog (test)"));
        QVERIFY2(applied.ok(), applied.ok() ? "" : applied.error().describe().c_str());
        // The spike is gone from the cleaned series, so R on the dump day falls.
        const double after = panel->result()->rows[dump].reproduction.mean;
        QVERIFY2(after < before - 0.1,
                 qPrintable(QStringLiteral("%1 -> %2").arg(before).arg(after)));
        // Same estimate as the core gives on the workbench's cleaned counts.
        const auto direct = siftwave::transmission::estimateTransmission(
            m_window->workbench()->cleanedCounts(QStringLiteral("1301"), 0), panel->result()->axis,
            *m_window->transmissionController()->options());
        QCOMPARE(direct.rows[dump].reproduction.mean, after);

        // Time-aligned: the same days, the same left edge of the plotting area.
        QCustomPlot* series = m_window->seriesPlot()->customPlot();
        m_window->seriesPlot()->focusOn({100, 200});
        series->replot();
        QCoreApplication::processEvents();
        panel->customPlot()->replot();
        QCOMPARE(panel->customPlot()->xAxis->range().lower, series->xAxis->range().lower);
        QCOMPARE(panel->customPlot()->xAxis->range().upper, series->xAxis->range().upper);
        QCustomPlot* ours = panel->customPlot();
        auto globalX = [](QCustomPlot* plot, int x) { return plot->mapToGlobal(QPoint(x, 0)).x(); };
        QCOMPARE(globalX(ours, ours->axisRect()->left()),
                 globalX(series, series->axisRect()->left()));
        QCOMPARE(globalX(ours, ours->axisRect()->right()),
                 globalX(series, series->axisRect()->right()));
        auto* caution = panel->findChild<QLabel*>(QStringLiteral("transmissionCaution"));
        QVERIFY(caution && caution->text().contains(QStringLiteral("public-health authority")));
        m_window->seriesPlot()->resetView();
        if (const QByteArray png = qgetenv("SIFTWAVE_SAVE_PNG"); !png.isEmpty()) {
            QTest::qWait(50);
            m_window->grab().save(QString::fromLocal8Bit(png));
        }
    }

    // File > Export figure hands the dialog the panel as shown: the figure has it under the plot
    // (its axis label), its caption line and the caution.
    void anExportedFigureHasThePanelAsShown() {
        m_window->transmissionPane()->setSerialInterval(4.7, 2.9);
        auto inputs = siftwave::gui::figureExportInputs(*m_window);
        QVERIFY(inputs.transmission && inputs.transmission->serialInterval);
        QVERIFY(!inputs.transmissionGrowthRate);
        siftwave::widgets::FigureExportDialog dialog(inputs);
        const QString svg = m_dir.filePath(QStringLiteral("panel-1301.svg"));
        dialog.setRegions({QStringLiteral("1301")});
        dialog.setOutputPath(svg);
        auto written = dialog.exportFigures();
        QVERIFY2(written.ok(), written.ok() ? "" : written.error().describe().c_str());
        QFile file(svg);
        QVERIFY(file.open(QIODevice::ReadOnly));
        const QString text = QString::fromUtf8(file.readAll());
        QVERIFY(text.contains(QStringLiteral("R_t, 95% CrI")));
        QVERIFY(text.contains(QStringLiteral("Lower panel: R_t (Cori et al. 2013")));
        QVERIFY(text.contains(QStringLiteral("Do not act on them alone")));
        // Without a serial interval and with R_t chosen, no panel travels with the figure.
        m_window->transmissionPane()->setSerialInterval(0, 2);
        QVERIFY(!siftwave::gui::figureExportInputs(*m_window).transmission);
    }

    // A project keeps the settings and the measure shown (its extra map, "transmission.*").
    void aProjectKeepsTheSettings() {
        auto* pane = m_window->transmissionPane();
        siftwave::widgets::TransmissionPane::Choices chosen;
        chosen.window = 14;
        chosen.siMean = 6.5;
        chosen.siSd = 3.25;
        chosen.priorMean = 2.0;
        chosen.priorSd = 1.0;
        chosen.weekday = true;
        pane->setChoices(chosen);
        m_window->transmissionPanel()->chooseMeasure(TransmissionMeasure::GrowthRate);
        siftwave::ledger::ProjectFile project;
        m_window->transmissionController()->storeChoices(project);
        QCOMPARE(project.extra["transmission.si_mean"], std::string("6.5"));
        pane->setChoices({});
        m_window->transmissionPanel()->chooseMeasure(TransmissionMeasure::ReproductionNumber);
        m_window->transmissionController()->restoreChoices(project);
        QVERIFY(pane->choices() == chosen);
        QCOMPARE(m_window->transmissionPanel()->measure(), TransmissionMeasure::GrowthRate);
        QVERIFY(m_window->transmissionController()->options());
        QCOMPARE(m_window->transmissionController()->options()->cori.window, 14);
    }

    void invalidSettingsAreShownNotApplied() {
        m_window->transmissionPane()->setWeekdayTerms(true);  // needs a window of 14 days
        auto* panel = m_window->transmissionPanel();
        QVERIFY(!panel->result());
        QVERIFY(panel->chart().note().contains(QStringLiteral("14")));
        m_window->transmissionPane()->setWindow(14);
        QVERIFY(panel->result());
    }
};

QTEST_MAIN(TransmissionPanelTest)
#include "transmission_panel_test.moc"
