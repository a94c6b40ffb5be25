#pragma once
// Decisions: prepared from a finding or from a day picked on the plot, previewed in the
// decision pane and on the plot, applied through the undo stack (Workbench::apply(), the one
// door; Undo appends a withdrawal), withdrawn. The controller owns the undo stack and the
// decision in preparation (the pane's).

#include "siftwave/ledger/decision.h"
#include "siftwave/scan/finding.h"
#include "widgets_fwd.h"

#include <QObject>
#include <QString>

#include <cstdint>

class QTimer;
class QUndoStack;
class QWidget;

namespace siftwave::gui {

class DecisionController : public QObject {
    Q_OBJECT

public:
    /// `dialogs`: whether a missing withdrawal reason may be asked for (parented to `window`).
    DecisionController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                       widgets::DecisionPane* pane, bool dialogs, QWidget* window);

    /// Starts preparing the finding's suggested decision; false when it suggests none.
    bool decideFinding(const QString& id);
    /// Starts preparing a redistribution of a day picked on the plot (MainWindow::decideDay).
    bool decideDay(int day);
    /// Starts preparing the choice to work on the nowcast-completed series of the region and
    /// measure in view (a case list only; ledger::nowcastCompletion, the same function as
    /// `decide ... nowcast_complete`); false, with the reason shown, when it cannot.
    bool decideNowcastCompletion();
    /// Applies the decision in preparation through the undo stack; false when refused.
    bool apply();
    /// Withdraws a ledger entry with a reason (asked for when empty and dialogs are on).
    bool withdraw(std::uint64_t sequence, QString reason);
    /// Drops the decision in preparation and its preview.
    void discard();
    /// Another drop: no undo history, no decision in preparation.
    void reset();
    bool isActive() const;

    QUndoStack* undoStack() const { return m_undo; }

Q_SIGNALS:
    /// Something went wrong; the window shows it.
    void errorOccurred(const QString& title, const QString& message);
    /// The plot should show the finding (its region, measure and days).
    void focusRequested(const scan::Finding& finding);
    /// A decision is being prepared (the window raises its pane).
    void decisionStarted();
    /// The decision was applied or discarded: the series is drawn as it is now.
    void decisionEnded();

private:
    void begin(const ledger::Decision& decision, const QString& title, const QString& reason);
    void preview();
    /// The re-scan of what the decision would create (decision_check.h): at once when a decision
    /// begins, then 250 ms after the last edit (two scans of the measure each time; a dragged
    /// window or a held spin box would otherwise queue one per step).
    void runCheck();
    void end();

    widgets::Workbench* m_workbench;
    widgets::SeriesPlot* m_plot;
    widgets::DecisionPane* m_pane;
    bool m_dialogs;
    QWidget* m_window;
    QUndoStack* m_undo;
    QTimer* m_checkTimer;
};

}  // namespace siftwave::gui
