// MainWindow: fitting every region in the background (widgets/batch_fit.h), shown in the
// "All regions" dock; the status bar's progress bar and Cancel follow it.
#include "main_window.h"

#include "widgets/batch_fit.h"
#include "widgets/fit_pane.h"
#include "widgets/series_plot.h"
#include "widgets/series_view.h"
#include "widgets/text_table_model.h"
#include "widgets/workbench.h"

#include <QDockWidget>

#include <map>
#include <string>

namespace siftwave::gui {

using widgets::BackgroundTask;

void MainWindow::startBatchFit() {
    if (!m_workbench->hasDrop())
        return;
    if (m_batchTask)
        m_batchTask->cancel();
    const Drop& drop = m_workbench->drop();
    const int measure = m_plot->measure();
    widgets::BatchFitRequest request;
    request.firstDay = drop.axis.first();
    request.periodDays = drop.axis.periodDays();
    std::map<std::string, std::string> names;
    for (const std::string& code : drop.regionCodes) {
        const QString region = QString::fromStdString(code);
        request.regions.push_back(code);
        request.counts.push_back(m_workbench->cleanedCounts(region, measure));
        request.populations.push_back(m_workbench->population(region));
        if (const RegionRegister* reg = m_workbench->regionRegister())
            if (const RegionEntry* entry = reg->find(code))
                names[code] = entry->name;
    }
    fit::FitOptions options = m_fitPane->options();
    options.window.reset();  // each region its own wave
    request.options.fit = options;
    const QString what =
        tr("%1, %2, %3 (automatic windows)")
            .arg(options.modelChoice == fit::ModelChoice::LowestAicc
                     ? tr("lowest AICc")
                     : widgets::modelDisplayName(options.model),
                 widgets::methodDisplayName(options.method),
                 QString::fromStdString(drop.measures.at(static_cast<std::size_t>(measure))));
    const std::string sha = drop.source.sha256;
    m_batchView->setRunning(true);
    m_batchTask = BackgroundTask::start(
        this, tr("Fitting every region"),
        [request = std::move(request)](BackgroundTask::Progress& progress) {
            return widgets::runBatchFit(request, progress);
        },
        [this, sha, what, names](const widgets::BatchFitOutcome& outcome) {
            if (!m_workbench->hasDrop() || m_workbench->drop().source.sha256 != sha)
                return;
            m_batchView->setOutcome(outcome, names, what);
            Q_EMIT batchFitFinished();
        });
    connect(m_batchTask, &BackgroundTask::finished, m_batchView, [this, task = m_batchTask.data()] {
        if (m_batchTask == task)
            m_batchTask.clear();
        m_batchView->setRunning(false);
        if (m_batchView->table()->rowCount() == 0 && m_workbench->hasDrop())
            m_batchView->clear(tr("Cancelled."));
    });
    if (auto* dock = findChild<QDockWidget*>(QStringLiteral("batchFitDock")))
        dock->raise();
    setBusy(m_batchTask);
}

}  // namespace siftwave::gui
