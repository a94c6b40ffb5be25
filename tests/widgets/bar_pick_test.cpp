// Starting a redistribution by picking a bar on the plot: Shift+click, or the context menu's
// "Redistribute … over earlier days". A day the scan flagged gets the finding's own proposal;
// any other day gets the core's backlog estimate. Then the same preview, reason and Apply.
#include "main_window.h"
#include "sample_window.h"

#include "widgets/common/workbench.h"
#include "widgets/ledger/decision_pane.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"
#include "widgets/plot/series_plot.h"

#include "siftwave/ledger/replay.h"
#include "siftwave/scan/backlog.h"

#include <QAction>
#include <QLineEdit>
#include <QMenu>
#include <QPushButton>
#include <QSignalSpy>
#include <QSpinBox>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

using siftwave::gui::MainWindow;

class BarPickTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_ledgers;
    std::unique_ptr<MainWindow> m_window;

    // The canvas point over a day's bar, low in the plot (bars start at 0).
    QPoint barPoint(int day) const {
        auto* plot = m_window->seriesPlot();
        const QRect rect = plot->customPlot()->axisRect()->rect();
        return QPoint(static_cast<int>(std::lround(plot->chart()->pixelOfDayIndex(day))),
                      rect.bottom() - 8);
    }

private Q_SLOTS:
    void init() {
        QVERIFY(m_ledgers.isValid());
        siftwave::testing::SampleWindowOptions options;
        options.size = QSize(1400, 900);
        options.waitForExposed = true;  // the tests click on the plot
        m_window = siftwave::testing::openSampleWindow(m_ledgers.path(), options);
        QVERIFY(m_window);
    }
    void cleanup() { m_window.reset(); }

    void shiftClickingTheDumpBarPreparesTheFindingsRedistribution() {
        MainWindow& window = *m_window;
        siftwave::widgets::Workbench& wb = *window.workbench();
        QVERIFY(window.selectRegion(QStringLiteral("1301")));
        const auto& drop = wb.drop();
        // manifest P06: the backlog of 1301's cases lands on 2026-08-24.
        const int dumpDay = *siftwave::Date::fromIso("2026-08-24") - drop.axis.first();
        window.seriesPlot()->setEditableWindow(std::nullopt);  // no window edge under the mouse
        window.seriesPlot()->focusOn(siftwave::widgets::DayIndexRange{dumpDay - 20, dumpDay + 20});
        QWidget* canvas = window.seriesPlot()->customPlot();
        QTest::mouseClick(canvas, Qt::LeftButton, Qt::ShiftModifier, barPoint(dumpDay));

        siftwave::widgets::DecisionPane* pane = window.decisionPane();
        QVERIFY(pane->isActive());
        const siftwave::ledger::Decision decision = pane->decision();
        QCOMPARE(decision.kind, siftwave::ledger::DecisionKind::Redistribute);
        QCOMPARE(decision.region, std::string("1301"));
        QCOMPARE(*decision.date, *siftwave::Date::fromIso("2026-08-24"));
        QVERIFY(!decision.finding.empty());  // the scan's finding for that day answers it
        QVERIFY(pane->previewOk());
        // While a decision is in preparation, picking another day is not offered.
        QSignalSpy picked(window.seriesPlot(),
                          &siftwave::widgets::SeriesPlot::redistributeDayRequested);
        QTest::mouseClick(canvas, Qt::LeftButton, Qt::ShiftModifier, barPoint(dumpDay - 3));
        QCOMPARE(picked.count(), 0);
        QVERIFY(window.applyCurrentDecision());
        QCOMPARE(wb.cleaned().total(0, *drop.regionIndex("1301")),
                 siftwave::ledger::rawTotal(drop, 0, *drop.regionIndex("1301")));
    }

    void theContextMenuRedistributesAnUnflaggedDayWithTheCoresEstimate() {
        MainWindow& window = *m_window;
        siftwave::widgets::Workbench& wb = *window.workbench();
        QVERIFY(window.selectRegion(QStringLiteral("1203")));
        const auto& drop = wb.drop();
        const std::size_t region = *drop.regionIndex("1203");
        // A Monday near the second wave's peak (2026-07-20): Mondays carry the weekend's catch-up.
        const siftwave::Date date = *siftwave::Date::fromIso("2026-07-20");
        const int day = date - drop.axis.first();
        for (const auto& f : wb.findings())
            QVERIFY(!(f.region == "1203" && f.first == date));  // not a flagged day

        std::unique_ptr<QMenu> menu(window.seriesPlot()->createContextMenu(day));
        auto* action = menu->findChild<QAction*>(QStringLiteral("redistributeDay"));
        QVERIFY(action);
        QVERIFY(action->isEnabled());
        QVERIFY(action->text().contains(QStringLiteral("2026-07-20")));
        action->trigger();

        siftwave::widgets::DecisionPane* pane = window.decisionPane();
        QVERIFY(pane->isActive());
        siftwave::ledger::Decision decision = pane->decision();
        const auto estimate = siftwave::scan::estimateBacklog(drop, "cases", "1203", date);
        QVERIFY(estimate.ok());
        QCOMPARE(decision.excess, estimate->excess);
        QCOMPARE(decision.window->first, estimate->windowFirst);
        QCOMPARE(decision.window->last, estimate->windowLast);
        QVERIFY(decision.finding.empty());
        auto* reason = pane->findChild<QLineEdit*>(QStringLiteral("decisionReason"));
        QVERIFY(reason->text().contains(QStringLiteral("picked on the plot")));
        QVERIFY(reason->text().contains(QStringLiteral("2026-07-20")));

        // The analyst sets the counts to move; the preview follows and keeps the total.
        auto* excess = pane->findChild<QSpinBox*>(QStringLiteral("decisionExcess"));
        QVERIFY(excess && excess->isVisible());
        excess->setValue(40);
        QVERIFY(pane->previewOk());
        QVERIFY2(pane->previewText().contains(QStringLiteral("(conserved)")),
                 qPrintable(pane->previewText()));
        QVERIFY(pane->previewText().contains(QStringLiteral("Moves 40 counts")));
        const std::int32_t before = drop.cell(0, region, day).value;
        reason->setText(QStringLiteral("a Monday catch-up, spread back (test)"));
        QTest::mouseClick(pane->findChild<QPushButton*>(QStringLiteral("applyDecision")),
                          Qt::LeftButton);
        QCOMPARE(wb.ledger().entries.size(), std::size_t(1));
        const siftwave::ledger::LedgerEntry& entry = wb.ledger().entries.front();
        QCOMPARE(entry.decision.kind, siftwave::ledger::DecisionKind::Redistribute);
        QCOMPARE(entry.decision.excess, std::int64_t(40));
        QCOMPARE(entry.reason, std::string("a Monday catch-up, spread back (test)"));
        QCOMPARE(wb.cleaned().cell(0, region, day).value, static_cast<std::int64_t>(before - 40));
        QCOMPARE(wb.cleaned().total(0, region), siftwave::ledger::rawTotal(drop, 0, region));
        QVERIFY(wb.chainOk());
    }

    void aDayWithoutANumberCannotBePicked() {
        MainWindow& window = *m_window;
        QVERIFY(window.selectRegion(QStringLiteral("1310")));
        // manifest P12: 1310 has no rows from 2026-07-13.
        const int day =
            *siftwave::Date::fromIso("2026-07-14") - window.workbench()->drop().axis.first();
        std::unique_ptr<QMenu> menu(window.seriesPlot()->createContextMenu(day));
        auto* action = menu->findChild<QAction*>(QStringLiteral("redistributeDay"));
        QVERIFY(action);
        QVERIFY(!action->isEnabled());
        QVERIFY(!window.decideDay(day));
        QVERIFY(!window.decisionPane()->isActive());
    }
};

QTEST_MAIN(BarPickTest)
#include "bar_pick_test.moc"
