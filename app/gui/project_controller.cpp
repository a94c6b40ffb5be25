#include "project_controller.h"

#include "fit_controller.h"
#include "project_session.h"
#include "transmission_controller.h"

#include "widgets/common/drop_loading.h"
#include "widgets/common/workbench.h"
#include "widgets/plot/series_plot.h"

#include <QFileInfo>

namespace siftwave::gui {

ProjectController::ProjectController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                                     FitController* fit, QObject* parent)
    : QObject(parent), m_workbench(workbench), m_plot(plot), m_fit(fit) {}

std::optional<ProjectController::Opening> ProjectController::read(const QString& path) {
    Result<ledger::ProjectFile> read = ledger::readProjectFile(path.toStdString());
    if (!read) {
        Q_EMIT openFailed(tr("The project could not be opened"),
                          widgets::describeError(read.error()));
        return std::nullopt;
    }
    return Opening{QFileInfo(path).absoluteFilePath(), std::move(*read)};
}

void ProjectController::restoreView(const ledger::ProjectFile& project) {
    const Drop& drop = m_workbench->drop();
    const auto measure = drop.measureIndex(project.view.measure);
    const auto second = drop.measureIndex(project.view.secondMeasure);
    m_fit->restoreChoices(project, drop.axis);
    if (m_transmission)
        m_transmission->restoreChoices(project);
    m_plot->chooseMeasure(measure ? static_cast<int>(*measure) : 0);
    m_plot->chooseSecondMeasure(second && second != measure ? static_cast<int>(*second) : -1);
    if (!project.view.region.empty())
        Q_EMIT regionRequested(QString::fromStdString(project.view.region));
    Q_EMIT redrawRequested();  // the fit settings are new even when the region is not
    if (project.view.visibleFirst && project.view.visibleLast)
        m_plot->setVisibleDays(
            widgets::DayIndexRange{*project.view.visibleFirst - drop.axis.first(),
                                   *project.view.visibleLast - drop.axis.first()});
}

ledger::ProjectFile ProjectController::projectOfWindow(const QString& projectPath,
                                                       const QString& currentRegion) const {
    ledger::ProjectFile p;
    const Drop& drop = m_workbench->drop();
    p.dropPath = storedProjectPath(projectPath, m_workbench->dropPath());
    p.dropSha256 = drop.source.sha256;
    p.dropSheet = drop.source.sheet;  // a workbook: reopened from this sheet, whatever the default
    if (const Drop* previous = m_workbench->previousDrop()) {
        p.previousDropPath = storedProjectPath(projectPath, m_workbench->previousPath());
        p.previousDropSha256 = previous->source.sha256;
    }
    for (const std::shared_ptr<const Drop>& release : m_workbench->releaseHistory())
        p.releaseHistory.push_back(
            {storedProjectPath(projectPath, QString::fromStdString(release->source.path)),
             release->source.sha256});
    if (const RegionRegister* reg = m_workbench->regionRegister())
        p.registerPath = storedProjectPath(projectPath, QString::fromStdString(reg->path));
    p.ledgerPath = storedProjectPath(projectPath, m_workbench->ledgerPath());
    p.ledgerEntries = m_workbench->ledger().entries.size();
    p.ledgerHeadHash = m_workbench->ledger().headHash();
    p.view.region = currentRegion.toStdString();
    if (m_plot->measure() < static_cast<int>(drop.measures.size()))
        p.view.measure = drop.measures[static_cast<std::size_t>(m_plot->measure())];
    if (m_plot->secondMeasure() >= 0)
        p.view.secondMeasure = drop.measures[static_cast<std::size_t>(m_plot->secondMeasure())];
    if (!m_plot->view().empty()) {
        const widgets::DayIndexRange visible = m_plot->visibleDays();
        p.view.visibleFirst = drop.periodStart(visible.first);
        p.view.visibleLast = drop.periodStart(visible.last);
    }
    m_fit->storeChoices(p, drop);
    if (m_transmission)
        m_transmission->storeChoices(p);
    return p;
}

bool ProjectController::save(const QString& requestedPath, const QString& currentRegion) {
    if (!m_workbench->hasDrop())
        return false;
    const QString path = QFileInfo(withProjectSuffix(requestedPath)).absoluteFilePath();
    // The project keeps its own ledger; from now on the window appends there.
    const Result<QString> ledger = adoptLedgerForProject(path, m_workbench->ledgerPath());
    if (!ledger) {
        Q_EMIT errorOccurred(tr("The project could not be saved"),
                             widgets::describeError(ledger.error()));
        return false;
    }
    if (*ledger != m_workbench->ledgerPath()) {
        if (Status reopened = m_workbench->openLedger(*ledger); !reopened) {
            Q_EMIT errorOccurred(tr("The project's ledger cannot be used"),
                                 widgets::describeError(reopened.error()));
            return false;
        }
    }
    if (Status written =
            ledger::writeProjectFile(path.toStdString(), projectOfWindow(path, currentRegion));
        !written) {
        Q_EMIT errorOccurred(tr("The project could not be saved"),
                             widgets::describeError(written.error()));
        return false;
    }
    m_path = path;
    Q_EMIT saved(path);
    return true;
}

}  // namespace siftwave::gui
