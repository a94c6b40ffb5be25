// MainWindow: projects (File > Open project, Save project, Save project as). The file format
// is the core's (siftwave/ledger/project.h); where the files go is project_session.h.
#include "main_window.h"

#include "project_session.h"
#include "settings.h"

#include "widgets/drop_loading.h"
#include "widgets/fit_pane.h"
#include "widgets/series_plot.h"
#include "widgets/workbench.h"

#include <QDir>
#include <QFileDialog>
#include <QFileInfo>
#include <QStatusBar>

namespace siftwave::gui {

void MainWindow::openProject(const QString& path) {
    Result<ProjectFile> read = readProjectFile(path.toStdString());
    if (!read) {
        const QString message = widgets::describeError(read.error());
        showError(tr("The project could not be opened"), message);
        Q_EMIT projectFailed(message);
        return;
    }
    const QString dropPath = resolvedProjectPath(path, read->dropPath);
    startOpening(dropPath, OpeningProject{QFileInfo(path).absoluteFilePath(), std::move(*read)});
}

void MainWindow::restoreProjectView(const ProjectFile& project) {
    const Drop& drop = m_workbench->drop();
    const auto measure = drop.measureIndex(project.view.measure);
    const auto second = drop.measureIndex(project.view.secondMeasure);
    const std::optional<fit::ModelKind> model = fit::modelFromName(project.fit.model);
    const auto extra = [&project](const char* key) {
        const auto it = project.extra.find(key);
        return it == project.extra.end() ? std::string() : it->second;
    };
    m_fitPane->setChoices(
        project.fit.model == "best" ? std::nullopt
                                    : std::optional(model.value_or(fit::ModelKind::Gumbel)),
        fit::methodFromName(project.fit.method).value_or(fit::FitMethod::LeastSquares),
        extra("fit.weekday_factors") == "true",
        extra("fit.wave") == "latest" ? fit::WaveChoice::Latest : fit::WaveChoice::Largest);
    m_fitPane->setCalendar(drop.axis);
    if (project.fit.windowFirst && project.fit.windowLast)
        m_fitPane->setManualWindow(
            widgets::DayIndexRange{*project.fit.windowFirst - drop.axis.first(),
                                   *project.fit.windowLast - drop.axis.first()});
    else
        m_fitPane->setAutomaticWindow();
    m_plot->chooseMeasure(measure ? static_cast<int>(*measure) : 0);
    m_plot->chooseSecondMeasure(second && second != measure ? static_cast<int>(*second) : -1);
    if (!project.view.region.empty())
        selectRegion(QString::fromStdString(project.view.region));
    redrawSeries();  // the fit settings are new even when the region is not
    if (project.view.visibleFirst && project.view.visibleLast)
        m_plot->setVisibleDays(
            widgets::DayIndexRange{*project.view.visibleFirst - drop.axis.first(),
                                   *project.view.visibleLast - drop.axis.first()});
}

ProjectFile MainWindow::projectOfWindow(const QString& projectPath) const {
    ProjectFile p;
    const Drop& drop = m_workbench->drop();
    p.dropPath = storedProjectPath(projectPath, m_workbench->dropPath());
    p.dropSha256 = drop.source.sha256;
    if (const Drop* previous = m_workbench->previousDrop()) {
        p.previousDropPath = storedProjectPath(projectPath, m_workbench->previousPath());
        p.previousDropSha256 = previous->source.sha256;
    }
    if (const RegionRegister* reg = m_workbench->regionRegister())
        p.registerPath = storedProjectPath(projectPath, QString::fromStdString(reg->path));
    p.ledgerPath = storedProjectPath(projectPath, m_workbench->ledgerPath());
    p.ledgerEntries = m_workbench->ledger().entries.size();
    p.ledgerHeadHash = m_workbench->ledger().headHash();
    p.view.region = m_currentRegion.toStdString();
    if (m_plot->measure() < static_cast<int>(drop.measures.size()))
        p.view.measure = drop.measures[static_cast<std::size_t>(m_plot->measure())];
    if (m_plot->secondMeasure() >= 0)
        p.view.secondMeasure = drop.measures[static_cast<std::size_t>(m_plot->secondMeasure())];
    if (!m_plot->view().empty()) {
        const widgets::DayIndexRange visible = m_plot->visibleDays();
        p.view.visibleFirst = drop.periodStart(visible.first);
        p.view.visibleLast = drop.periodStart(visible.last);
    }
    const fit::FitOptions options = m_fitPane->options();
    p.fit.model = options.modelChoice == fit::ModelChoice::LowestAicc
                      ? "best"
                      : fit::modelName(options.model);
    p.fit.method = fit::methodName(options.method);
    if (const auto window = m_fitPane->manualWindow()) {
        p.fit.windowFirst = drop.periodStart(window->first);
        p.fit.windowLast = drop.periodStart(window->last);
    }
    p.fit.smoothingDays = options.smoothingWindow;
    p.extra["fit.weekday_factors"] = options.weekdayFactors ? "true" : "false";
    p.extra["fit.wave"] = options.wave == fit::WaveChoice::Latest ? "latest" : "largest";
    return p;
}

bool MainWindow::saveProject(const QString& requestedPath) {
    if (!m_workbench->hasDrop())
        return false;
    const QString path = QFileInfo(withProjectSuffix(requestedPath)).absoluteFilePath();
    // The project keeps its own ledger; from now on the window appends there.
    const Result<QString> ledger = adoptLedgerForProject(path, m_workbench->ledgerPath());
    if (!ledger) {
        showError(tr("The project could not be saved"), widgets::describeError(ledger.error()));
        return false;
    }
    if (*ledger != m_workbench->ledgerPath()) {
        if (Status reopened = m_workbench->openLedger(*ledger); !reopened) {
            showError(tr("The project's ledger cannot be used"),
                      widgets::describeError(reopened.error()));
            return false;
        }
    }
    if (Status written = writeProjectFile(path.toStdString(), projectOfWindow(path)); !written) {
        showError(tr("The project could not be saved"), widgets::describeError(written.error()));
        return false;
    }
    m_projectPath = path;
    if (m_options.rememberLayout) {
        settings::addRecentFile(path);
        rebuildRecentMenu();
    }
    updateWindowTitle();
    statusBar()->showMessage(tr("Project saved: %1").arg(path), 5000);
    return true;
}

void MainWindow::showOpenProjectDialog() {
    const QString start = m_options.rememberLayout ? settings::lastDirectory() : QString();
    const QString path = QFileDialog::getOpenFileName(
        this, tr("Open a project"), start,
        tr("Siftwave projects (*%1);;All files (*)").arg(QString::fromLatin1(kProjectSuffix)));
    if (path.isEmpty())
        return;
    if (m_options.rememberLayout)
        settings::setLastDirectory(QFileInfo(path).absolutePath());
    openProject(path);
}

void MainWindow::showSaveProjectDialog() {
    if (!m_workbench->hasDrop())
        return;
    QString start = m_projectPath;
    if (start.isEmpty()) {
        const QString folder = m_options.rememberLayout ? settings::lastDirectory() : QString();
        start = QDir(folder.isEmpty() ? QFileInfo(m_workbench->dropPath()).absolutePath() : folder)
                    .filePath(QFileInfo(m_workbench->dropPath()).completeBaseName() +
                              QString::fromLatin1(kProjectSuffix));
    }
    const QString path = QFileDialog::getSaveFileName(
        this, tr("Save the project as"), start,
        tr("Siftwave projects (*%1)").arg(QString::fromLatin1(kProjectSuffix)));
    if (path.isEmpty())
        return;
    if (m_options.rememberLayout)
        settings::setLastDirectory(QFileInfo(path).absolutePath());
    saveProject(path);
}

void MainWindow::saveProjectInPlace() {
    if (m_projectPath.isEmpty())
        showSaveProjectDialog();
    else
        saveProject(m_projectPath);
}

}  // namespace siftwave::gui
