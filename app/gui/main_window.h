#pragma once
// The workbench's main window: the region browser, the series plot and the
// release summary in docks the user can rearrange (the arrangement and the
// window geometry are remembered), the File menu (open by menu, drag and drop
// or command line; recent files), and a progress area for background work.

#include "siftwave/fit/fit.h"
#include "widgets/background_task.h"
#include "widgets/series_view.h"

#include <QMainWindow>
#include <QPointer>
#include <QString>

#include <optional>

class QLabel;
class QMenu;
class QProgressBar;
class QPushButton;
class QTextBrowser;

namespace siftwave::widgets {
class FitPane;
class RegionBrowser;
class RegionModel;
class SeriesPlot;
class Workbench;
}  // namespace siftwave::widgets

namespace siftwave::gui {

class MainWindow : public QMainWindow {
    Q_OBJECT

public:
    struct Options {
        bool rememberLayout = true;  // restore and save geometry, dock state and recent files
        bool dialogs = true;         // false: errors go to stderr only (screenshots, scripts)
    };

    explicit MainWindow(Options options, QWidget* parent = nullptr);
    MainWindow() : MainWindow(Options{}) {}
    ~MainWindow() override;

    /// Reads a drop in the background; emits dropOpened() or dropFailed() when done.
    void openDrop(const QString& path);
    /// Reads another release of the same data to compare against; emits previousOpened().
    void openPreviousRelease(const QString& path);
    /// Stops waiting for the background read (the window keeps what it had).
    void cancelBackgroundWork();
    bool isBusy() const { return m_task != nullptr; }

    /// Makes a region current (browser and plot); false when the drop has no such code.
    bool selectRegion(const QString& code);
    QString currentRegion() const;
    /// Selects a finding by id and focuses the plot on it; false when there is none.
    bool focusFinding(const QString& id);

    widgets::Workbench* workbench() const { return m_workbench; }
    widgets::RegionBrowser* regionBrowser() const { return m_browser; }
    widgets::SeriesPlot* seriesPlot() const { return m_plot; }
    widgets::FitPane* fitPane() const { return m_fitPane; }
    /// The fit shown for the current region (nullptr when there is none).
    const fit::FitResult* currentFit() const { return m_fit ? &*m_fit : nullptr; }

Q_SIGNALS:
    void dropOpened(const QString& path);
    /// The message is the core's own, with file, line and column where known.
    void dropFailed(const QString& message);
    void previousOpened(const QString& path);

protected:
    void closeEvent(QCloseEvent* event) override;
    void showEvent(QShowEvent* event) override;
    void dragEnterEvent(QDragEnterEvent* event) override;
    void dropEvent(QDropEvent* event) override;

private:
    void buildActions();
    void buildDocks();
    void showOpenDialog();
    void showOpenPreviousDialog();
    QString askForDropFile(const QString& title);
    void rebuildRecentMenu();
    void onDropChanged();
    void onRegionSelected(const QString& code);
    void redrawSeries();
    void showError(const QString& title, const QString& message);
    void setBusy(widgets::BackgroundTask* task);
    void updateReleaseSummary();
    /// Refits the current region; `compare` also runs the model comparison (slower).
    void refit(bool compare);
    void onFitWindowDragged(widgets::DayIndexRange window, bool finished);

    Options m_options;
    widgets::Workbench* m_workbench;
    widgets::RegionModel* m_regionModel;
    widgets::RegionBrowser* m_browser;
    widgets::SeriesPlot* m_plot;
    QTextBrowser* m_release;
    widgets::FitPane* m_fitPane;
    std::optional<fit::FitResult> m_fit;
    QMenu* m_recentMenu = nullptr;
    QLabel* m_dropLabel;
    QLabel* m_taskLabel;
    QProgressBar* m_progress;
    QPushButton* m_cancel;
    QPointer<widgets::BackgroundTask> m_task;
    QString m_currentRegion;
    bool m_layoutRestored = false;
};

}  // namespace siftwave::gui
