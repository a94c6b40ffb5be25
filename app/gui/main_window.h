#pragma once
// The workbench's main window: the region browser, the series plot and the
// release summary in docks the user can rearrange (the arrangement and the
// window geometry are remembered), the File menu (open by menu, drag and drop
// or command line; recent files), and a progress area for background work.
// What each feature keeps lives in its controller (fit_controller.h,
// decision_controller.h, project_controller.h, batch_controller.h); the window
// keeps the layout, the menus and the wiring between them.

#include "project_controller.h"

#include "siftwave/fit/fit.h"
#include "siftwave/ledger/project.h"
#include "siftwave/scan/finding.h"
#include "widgets/common/background_task.h"
#include "widgets/plot/series_view.h"
#include "widgets_fwd.h"

#include <QMainWindow>
#include <QPointer>
#include <QString>

#include <optional>
#include <vector>

class QLabel;
class QMenu;
class QProgressBar;
class QPushButton;
class QTextBrowser;

class QUndoStack;

namespace siftwave::gui {

class BatchController;
class DecisionController;
class FitController;
class TransmissionController;

class MainWindow : public QMainWindow {
    Q_OBJECT

public:
    struct Options {
        bool rememberLayout = true;  // restore and save geometry, dock state and recent files
        bool dialogs = true;         // false: errors go to stderr only (screenshots, scripts)
        QString ledgerFolder;  // where each drop's ledger lives ("<sha256>.jsonl"); empty: app data
    };

    explicit MainWindow(Options options, QWidget* parent = nullptr);
    MainWindow() : MainWindow(Options{}) {}
    ~MainWindow() override;

    /// Reads a drop in the background; emits dropOpened() or dropFailed() when done.
    void openDrop(const QString& path);
    /// Reads another release of the same data to compare against; emits previousOpened().
    void openPreviousRelease(const QString& path);
    /// Reads earlier releases of the open drop's series (main_window_history.cpp): the plot then
    /// shows their nowcast; emits historyOpened() or historyFailed(). A project saves them.
    void openReleaseHistory(const QStringList& paths);
    /// Opens a project (project.h): its drop, register, ledger, previous release and the
    /// selection it was saved with; emits projectOpened() when all is shown, or projectFailed().
    void openProject(const QString& path);
    /// Saves the open drop as a project (the ".siftwave.json" ending is added when missing);
    /// the project gets its own ledger beside it (project_session.h). False with the reason
    /// shown when it cannot be saved.
    bool saveProject(const QString& path);
    /// The project file the window shows (empty: none, the drop was opened by itself).
    QString projectPath() const { return m_projectControl->path(); }
    /// Opens a drop or a project, by the file's ending (recent files, drag and drop).
    void openFile(const QString& path);
    /// Stops waiting for the background work shown in the status bar (the window keeps what
    /// it had).
    void cancelBackgroundWork();
    /// Fits every region of the shown measure in the background (the fit pane's model and
    /// method, each region's automatic window); emits batchFitFinished() unless cancelled.
    void startBatchFit();
    bool isBatchFitRunning() const;
    /// How long the last refit of the current region took on the GUI thread (milliseconds).
    double lastRefitMilliseconds() const;
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
    widgets::FindingReview* findingReview() const { return m_findings; }
    widgets::DecisionPane* decisionPane() const { return m_decisionPane; }
    widgets::LedgerView* ledgerView() const { return m_ledgerView; }
    widgets::BatchFitView* batchFitView() const { return m_batchView; }
    widgets::TransmissionPanel* transmissionPanel() const { return m_transmissionPanel; }
    widgets::TransmissionPane* transmissionPane() const { return m_transmissionPane; }
    widgets::DelayView* delayView() const { return m_delayView; }
    TransmissionController* transmissionController() const { return m_transmissionControl; }
    QUndoStack* undoStack() const;

    /// Starts preparing the finding's suggested decision (region selected, plot focused,
    /// preview drawn); false when the finding suggests none.
    bool decideFinding(const QString& id);
    /// Starts preparing a redistribution of a day picked on the plot (a day index of the shown
    /// series): a backlog_dump finding on that day is decided as from the list; otherwise the
    /// core's backlog estimate for the day gives the counts to move and the window. False when
    /// the day has no value, no earlier days, or a decision is already in preparation.
    bool decideDay(int day);
    /// Applies the decision in preparation through the undo stack; false when the ledger refused.
    bool applyCurrentDecision();
    /// Withdraws a ledger entry with a reason (asked for when empty and dialogs are on).
    bool withdrawEntry(std::uint64_t sequence, QString reason = {});
    /// The ledger file used for a drop.
    QString ledgerPathFor(const Drop& drop) const;
    /// The fit shown for the current region (nullptr when there is none).
    const fit::FitResult* currentFit() const;

Q_SIGNALS:
    void dropOpened(const QString& path);
    /// The message is the core's own, with file, line and column where known.
    void dropFailed(const QString& message);
    void previousOpened(const QString& path);
    /// A release history is open: `releases` earlier releases besides the drop.
    void historyOpened(int releases);
    /// A release of the history could not be read (the error is shown).
    void historyFailed(const QString& message);
    /// A project is open and shows its selection (scanFinished() follows for its findings).
    void projectOpened(const QString& path);
    /// The message says why (the core's, with file and line where known).
    void projectFailed(const QString& message);
    /// The scan of the open drop finished (findings are in the workbench).
    void scanFinished();
    /// The batch fit finished and its table is filled.
    void batchFitFinished();

protected:
    void closeEvent(QCloseEvent* event) override;
    void showEvent(QShowEvent* event) override;
    void dragEnterEvent(QDragEnterEvent* event) override;
    void dropEvent(QDropEvent* event) override;

private:
    void buildActions();
    void buildFileMenu();
    void addProjectActions(QMenu* file);
    void addPreviousReleaseActions(QMenu* file);
    void buildEditMenu();
    void buildReviewMenu();
    void buildViewMenu();
    void buildHelpMenu();
    void buildDocks();
    /// Gives the Decision pane the height it needs below the Wave fit (a decision began).
    void makeRoomForDecision();
    void showOpenDialog();
    void showOpenPreviousDialog();
    void showOpenHistoryDialog();
    void showOpenProjectDialog();
    void showSaveProjectDialog();
    void saveProjectInPlace();
    /// Reads the drop (a workbook: `sheet`, "" = the default sheet; a project names its own).
    void startOpening(const QString& dropPath, std::optional<ProjectController::Opening> project,
                      const QString& sheet = {});
    /// The project's drop is open: its view shown, then its previous release read.
    void showOpenedProject(const ProjectController::Opening& project);
    /// After a project's drop and previous release: its release history, then projectOpened().
    void openProjectHistory(const QString& projectPath,
                            const std::vector<ledger::ProjectRelease>& releases);
    void buildControllers();
    void connectWidgets();
    void updateWindowTitle();
    QString askForDropFile(const QString& title);
    void rebuildRecentMenu();
    void onDropChanged();
    void onRegionSelected(const QString& code);
    void redrawSeries();
    void updateDelayView();
    void showError(const QString& title, const QString& message);
    void setBusy(widgets::BackgroundTask* task);
    void updateReleaseSummary();
    void onWindowDragged(widgets::DayIndexRange window, bool finished);
    void startScan();
    void focusPlotOn(const scan::Finding& finding);

    Options m_options;
    widgets::Workbench* m_workbench;
    widgets::RegionModel* m_regionModel;
    widgets::RegionBrowser* m_browser;
    widgets::SeriesPlot* m_plot;
    QTextBrowser* m_release;
    widgets::FitPane* m_fitPane;
    widgets::FindingModel* m_findingModel;
    widgets::FindingReview* m_findings;
    widgets::DecisionPane* m_decisionPane;
    widgets::LedgerView* m_ledgerView;
    widgets::BatchFitView* m_batchView;
    widgets::TransmissionPanel* m_transmissionPanel;
    widgets::TransmissionPane* m_transmissionPane;
    widgets::DelayView* m_delayView;  // the case list's reporting delays (a dock)
    FitController* m_fitControl;
    DecisionController* m_decisionControl;
    ProjectController* m_projectControl;
    BatchController* m_batchControl;
    TransmissionController* m_transmissionControl;
    QPointer<widgets::BackgroundTask> m_scanTask;
    QMenu* m_recentMenu = nullptr;
    QLabel* m_dropLabel;
    widgets::SheetChooser* m_sheetChooser;
    QLabel* m_taskLabel;
    QProgressBar* m_progress;
    QPushButton* m_cancel;
    QPointer<widgets::BackgroundTask> m_task;
    QString m_currentRegion;
    bool m_layoutRestored = false;
};

}  // namespace siftwave::gui
