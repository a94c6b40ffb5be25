#pragma once
// Fitting every region of the drop at once, off the GUI thread, and the table
// that shows the outcome.
//
// runBatchFit() is the work a BackgroundTask runs: the core's batch fitting
// (fit/batch.h, a pool of worker threads) over the regions in slices, so that it
// can report how far it is and stop between slices when cancelled. Each region
// is fitted on its own automatic window (the largest or latest wave), with the
// model and method the fit pane asks for; a region that fails is listed with the
// reason and never stops the others.
//
// BatchFitView lists one row per region: code, name, peak date, wave size,
// fraction observed, R², status; sortable; clicking a row asks the window to
// select that region. It computes nothing: the numbers are the core's FitResult.

#include "siftwave/date.h"
#include "siftwave/fit/batch.h"
#include "widgets/common/background_task.h"

#include <QString>
#include <QWidget>

#include <map>
#include <optional>
#include <string>
#include <vector>

class QLabel;
class QPushButton;
class QSortFilterProxyModel;
class QTableView;

namespace siftwave::widgets {

class TextTableModel;

/// Everything the worker needs, copied: it must not touch the workbench.
struct BatchFitRequest {
    Date firstDay;
    int periodDays = 1;                       // 1 (daily) or 7 (weekly counts)
    std::vector<std::string> regions;         // verbatim codes
    std::vector<std::vector<double>> counts;  // cleaned counts per region (NaN: no value)
    std::vector<std::optional<double>> populations;
    fit::BatchOptions options;  // options.fit.window must be unset
};

struct BatchFitOutcome {
    std::vector<fit::RegionFit> fits;  // in request order; fewer when cancelled
    bool cancelled = false;
    double seconds = 0;  // wall time of the fitting
};

/// Fits every region of the request (see the file comment). Reports (regions done, total).
BatchFitOutcome runBatchFit(const BatchFitRequest& request, BackgroundTask::Progress& progress);

class BatchFitView : public QWidget {
    Q_OBJECT

public:
    explicit BatchFitView(QWidget* parent = nullptr);

    /// Shows an outcome; `names` maps codes to region names (may be empty); `what` says which
    /// model, method and measure were fitted.
    void setOutcome(const BatchFitOutcome& outcome, const std::map<std::string, std::string>& names,
                    const QString& what);
    /// Marks the shown results as out of date (the cleaned data changed), with why.
    void setStale(const QString& why);
    /// Empties the table (no drop, or another drop).
    void clear(const QString& why);
    /// While a batch runs: the button is off and the table says so.
    void setRunning(bool running);

    TextTableModel* table() const { return m_rows; }
    QTableView* tableView() const { return m_view; }
    QString summaryText() const;

Q_SIGNALS:
    /// "Fit every region" was pressed.
    void runRequested();
    /// A row was clicked or activated: select this region (code verbatim).
    void regionActivated(const QString& code);

private:
    QPushButton* m_run;
    QLabel* m_summary;
    TextTableModel* m_rows;
    QSortFilterProxyModel* m_proxy;
    QTableView* m_view;
    QString m_summaryText;
};

}  // namespace siftwave::widgets
