#pragma once
// Projects: the project file the window shows, reading one before its drop is opened,
// showing its view and fit choices once the drop is open, and saving the window as one
// (with its own ledger beside it, project_session.h). The file format is the core's
// (siftwave/ledger/project.h).

#include "siftwave/ledger/project.h"
#include "widgets_fwd.h"

#include <QObject>
#include <QString>

#include <optional>

namespace siftwave::gui {

class FitController;
class TransmissionController;

class ProjectController : public QObject {
    Q_OBJECT

public:
    /// A project being opened: the file as read and its absolute path.
    struct Opening {
        QString path;
        ledger::ProjectFile file;
    };

    ProjectController(widgets::Workbench* workbench, widgets::SeriesPlot* plot, FitController* fit,
                      QObject* parent = nullptr);

    /// Reads a project file; emits openFailed() and returns nothing when it cannot be read.
    std::optional<Opening> read(const QString& path);
    /// Shows a project's view and fit settings (region, measures, fit choices, visible days)
    /// over the drop just opened.
    void restoreView(const ledger::ProjectFile& project);
    /// The transmission settings a project keeps (restored and saved with the fit choices).
    void setTransmission(TransmissionController* transmission) { m_transmission = transmission; }
    /// Saves the window as a project (the ".siftwave.json" ending is added when missing);
    /// emits saved() or errorOccurred().
    bool save(const QString& path, const QString& currentRegion);

    /// The project file shown (empty: none, the drop was opened by itself).
    QString path() const { return m_path; }
    void setPath(const QString& path) { m_path = path; }

Q_SIGNALS:
    void errorOccurred(const QString& title, const QString& message);
    /// The project file could not be read (title and the core's message).
    void openFailed(const QString& title, const QString& message);
    /// The project was saved at `path` (now path()).
    void saved(const QString& path);
    /// restoreView() asks the window to show a region, then to redraw the series.
    void regionRequested(const QString& code);
    void redrawRequested();

private:
    ledger::ProjectFile projectOfWindow(const QString& projectPath,
                                        const QString& currentRegion) const;

    widgets::Workbench* m_workbench;
    widgets::SeriesPlot* m_plot;
    FitController* m_fit;
    TransmissionController* m_transmission = nullptr;
    QString m_path;
};

}  // namespace siftwave::gui
