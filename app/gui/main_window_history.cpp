// File > Open release history: earlier releases of the open drop's series, read in the
// background; the plot then shows the nowcast they give (nowcast/triangle.h, Workbench).
#include "main_window.h"

#include "project_session.h"
#include "settings.h"
#include "widgets/common/background_task.h"
#include "widgets/common/drop_loading.h"
#include "widgets/common/workbench.h"

#include <QFileDialog>
#include <QFileInfo>

#include <array>
#include <memory>

namespace siftwave::gui {
namespace {

struct LoadedHistory {
    std::vector<std::shared_ptr<const Drop>> releases;
    std::optional<Error> error;  // the first file that could not be read
};

}  // namespace

void MainWindow::showOpenHistoryDialog() {
    const QString start = m_options.rememberLayout ? settings::lastDirectory() : QString();
    const QStringList paths = QFileDialog::getOpenFileNames(
        this, tr("Open earlier releases of this series (one per day or week)"), start,
        tr("Data drops (*.csv *.tsv *.txt);;All files (*)"));
    if (!paths.isEmpty())
        openReleaseHistory(paths);
}

void MainWindow::openReleaseHistory(const QStringList& paths) {
    if (m_task)
        m_task->cancel();
    const std::string expectedDrop =
        m_workbench->hasDrop() ? m_workbench->drop().source.sha256 : std::string();
    widgets::BackgroundTask* task = widgets::BackgroundTask::start(
        this, tr("Reading %n release(s)", nullptr, static_cast<int>(paths.size())),
        [paths] {
            LoadedHistory out;
            for (const QString& path : paths) {
                widgets::LoadRequest request;
                request.dropPath = path;
                request.withRegister = false;
                widgets::LoadedDrop loaded = widgets::loadDrop(request);
                if (!loaded.ok()) {
                    out.error = *loaded.error;
                    break;
                }
                out.releases.push_back(loaded.drop);
            }
            return out;
        },
        [this, expectedDrop](const LoadedHistory& loaded) {
            if (!m_workbench->hasDrop() || m_workbench->drop().source.sha256 != expectedDrop)
                return;
            if (loaded.error) {
                const QString message = widgets::describeError(*loaded.error);
                showError(tr("A release could not be read"), message);
                Q_EMIT historyFailed(message);
                return;
            }
            m_workbench->setReleaseHistory(loaded.releases);
            if (const QString problem = m_workbench->releaseHistoryProblem(); !problem.isEmpty())
                showError(tr("The releases give no nowcast"), problem);
            // Without a previous release open, the scan's revisions are the history's newest
            // pair: the release before the drop against the drop.
            if (!m_workbench->previousDrop())
                startScan();
            Q_EMIT historyOpened(static_cast<int>(m_workbench->releaseHistorySize()));
        });
    setBusy(task);
}

void MainWindow::openProjectHistory(const QString& projectPath,
                                    const std::vector<ledger::ProjectRelease>& releases) {
    if (releases.empty()) {
        Q_EMIT projectOpened(projectPath);
        return;
    }
    QStringList paths;
    for (const ledger::ProjectRelease& r : releases)
        paths << resolvedProjectPath(projectPath, r.path);
    auto waiting = std::make_shared<std::array<QMetaObject::Connection, 2>>();
    auto done = [this, projectPath, waiting, releases] {
        for (const QMetaObject::Connection& c : *waiting)
            disconnect(c);
        // Each release must be the one the project was saved with (its SHA-256).
        const auto& loaded = m_workbench->releaseHistory();
        for (std::size_t i = 0; i < loaded.size() && i < releases.size(); ++i) {
            if (loaded[i]->source.sha256 != releases[i].sha256) {
                showError(tr("A release of the history has changed"),
                          tr("%1 is not the file the project was saved with (its SHA-256 "
                             "differs); the nowcast uses it as it is now.")
                              .arg(QString::fromStdString(releases[i].path)));
                break;
            }
        }
        Q_EMIT projectOpened(projectPath);
    };
    (*waiting)[0] = connect(this, &MainWindow::historyOpened, this, [done](int) { done(); });
    (*waiting)[1] =
        connect(this, &MainWindow::historyFailed, this, [done](const QString&) { done(); });
    openReleaseHistory(paths);
}

}  // namespace siftwave::gui
