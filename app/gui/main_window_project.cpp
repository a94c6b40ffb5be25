// MainWindow: the project menu (File > Open project, Save project, Save project as); what a
// project holds and how it is read and saved is project_controller.h.
#include "main_window.h"

#include "project_session.h"
#include "settings.h"

#include "widgets/common/workbench.h"

#include <QDir>
#include <QFileDialog>
#include <QFileInfo>
#include <QStatusBar>

namespace siftwave::gui {

void MainWindow::openProject(const QString& path) {
    std::optional<ProjectController::Opening> opening = m_projectControl->read(path);
    if (!opening)
        return;
    const QString dropPath = resolvedProjectPath(path, opening->file.dropPath);
    startOpening(dropPath, std::move(opening));
}

bool MainWindow::saveProject(const QString& path) {
    return m_projectControl->save(path, m_currentRegion);
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
    QString start = m_projectControl->path();
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
    if (m_projectControl->path().isEmpty())
        showSaveProjectDialog();
    else
        saveProject(m_projectControl->path());
}

}  // namespace siftwave::gui
