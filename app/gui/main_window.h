#pragma once
// The workbench's main window: the region browser, the series plot and the
// release summary in docks the user can rearrange (the arrangement and the
// window geometry are remembered), the File menu (open by menu, drag and drop
// or command line; recent files), and a progress area for background work.

#include "siftwave/fit/fit.h"
#include "siftwave/scan/finding.h"
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

class QUndoStack;

namespace siftwave::widgets {
class DecisionPane;
class FindingModel;
class FindingReview;
class LedgerView;
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
        QString ledgerFolder;  // where each drop's ledger lives ("<sha256>.jsonl"); empty: app data
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
    widgets::FindingReview* findingReview() const { return m_findings; }
    widgets::DecisionPane* decisionPane() const { return m_decisionPane; }
    widgets::LedgerView* ledgerView() const { return m_ledgerView; }
    QUndoStack* undoStack() const { return m_undo; }

    /// Starts preparing the finding's suggested decision (region selected, plot focused,
    /// preview drawn); false when the finding suggests none.
    bool decideFinding(const QString& id);
    /// Applies the decision in preparation through the undo stack; false when the ledger refused.
    bool applyCurrentDecision();
    /// Withdraws a ledger entry with a reason (asked for when empty and dialogs are on).
    bool withdrawEntry(std::uint64_t sequence, QString reason = {});
    /// The ledger file used for a drop.
    QString ledgerPathFor(const Drop& drop) const;
    /// The fit shown for the current region (nullptr when there is none).
    const fit::FitResult* currentFit() const { return m_fit ? &*m_fit : nullptr; }

Q_SIGNALS:
    void dropOpened(const QString& path);
    /// The message is the core's own, with file, line and column where known.
    void dropFailed(const QString& message);
    void previousOpened(const QString& path);
    /// The scan of the open drop finished (findings are in the workbench).
    void scanFinished();

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
    void onWindowDragged(widgets::DayIndexRange window, bool finished);
    void startScan();
    void previewDecision();
    void endDecision();
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
    QUndoStack* m_undo;
    QPointer<widgets::BackgroundTask> m_scanTask;
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
