#include "batch_controller.h"

#include "widgets/common/text_table_model.h"
#include "widgets/common/workbench.h"
#include "widgets/fit/batch_fit.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/series_view.h"

#include <map>
#include <string>

namespace siftwave::gui {

using widgets::BackgroundTask;

BatchController::BatchController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                                 widgets::FitPane* pane, widgets::BatchFitView* view,
                                 QObject* parent)
    : QObject(parent), m_workbench(workbench), m_plot(plot), m_pane(pane), m_view(view) {
    connect(m_view, &widgets::BatchFitView::runRequested, this, &BatchController::start);
    connect(m_workbench, &widgets::Workbench::ledgerChanged, m_view,
            [this] { m_view->setStale(tr("the ledger changed the cleaned counts since")); });
    connect(m_workbench, &widgets::Workbench::dropChanged, m_view, [this] {
        if (m_task)
            m_task->cancel();
        m_view->clear(m_workbench->hasDrop() ? tr("Not run yet.") : tr("No drop open."));
    });
    connect(m_plot, &widgets::SeriesPlot::measureChosen, m_view,
            [this](int) { m_view->setStale(tr("another measure is shown now")); });
}

void BatchController::start() {
    if (!m_workbench->hasDrop())
        return;
    if (m_task)
        m_task->cancel();
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
    fit::FitOptions options = m_pane->options();
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
    m_view->setRunning(true);
    m_task = BackgroundTask::start(
        this, tr("Fitting every region"),
        [request = std::move(request)](BackgroundTask::Progress& progress) {
            return widgets::runBatchFit(request, progress);
        },
        [this, sha, what, names](const widgets::BatchFitOutcome& outcome) {
            if (!m_workbench->hasDrop() || m_workbench->drop().source.sha256 != sha)
                return;
            m_view->setOutcome(outcome, names, what);
            Q_EMIT finished();
        });
    connect(m_task, &BackgroundTask::finished, m_view, [this, task = m_task.data()] {
        if (m_task == task)
            m_task.clear();
        m_view->setRunning(false);
        if (m_view->table()->rowCount() == 0 && m_workbench->hasDrop())
            m_view->clear(tr("Cancelled."));
    });
    Q_EMIT started(m_task);
}

}  // namespace siftwave::gui
