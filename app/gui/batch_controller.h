#pragma once
// Batch work: fitting every region of the shown measure in the background
// (widgets/fit/batch_fit.h) with the fit pane's model and method, each region its own
// automatic window; the result goes to the "All regions" table, which it marks stale when the
// ledger or the measure changes and clears when another drop opens.

#include "widgets/common/background_task.h"
#include "widgets_fwd.h"

#include <QObject>
#include <QPointer>

namespace siftwave::gui {

class BatchController : public QObject {
    Q_OBJECT

public:
    BatchController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                    widgets::FitPane* pane, widgets::BatchFitView* view, QObject* parent = nullptr);

    /// Starts fitting every region (a run in progress is cancelled first); emits started().
    void start();
    bool isRunning() const { return m_task != nullptr; }

Q_SIGNALS:
    /// A run started (the window shows its progress and raises the table).
    void started(widgets::BackgroundTask* task);
    /// A run finished and its table is filled.
    void finished();

private:
    widgets::Workbench* m_workbench;
    widgets::SeriesPlot* m_plot;
    widgets::FitPane* m_pane;
    widgets::BatchFitView* m_view;
    QPointer<widgets::BackgroundTask> m_task;
};

}  // namespace siftwave::gui
