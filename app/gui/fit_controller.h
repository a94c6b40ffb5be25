#pragma once
// The fit of the shown region: refits on every change of region, measure, fit choice or
// window (the fit pane's choices; the lowest-AICc model when asked), shows it on the plot and
// in the fit pane, and keeps the fit it shows. The fit choices a project saves are read and
// written here (restoreChoices, storeChoices).

#include "siftwave/fit/fit.h"
#include "siftwave/ledger/project.h"
#include "widgets/plot/series_view.h"
#include "widgets_fwd.h"

#include <QObject>
#include <QString>

#include <optional>

namespace siftwave::gui {

class FitController : public QObject {
    Q_OBJECT

public:
    /// The decision pane only tells whether a decision owns the plot's editable window.
    FitController(widgets::Workbench* workbench, widgets::SeriesPlot* plot, widgets::FitPane* pane,
                  const widgets::DecisionPane* decisions, QObject* parent = nullptr);

    /// Refits `region` (the plot's view of it); `compare` also runs the model comparison
    /// (slower).
    void refit(const QString& region, bool compare);
    /// The fit window dragged on the plot: one model while dragging, everything on release.
    void windowDragged(const QString& region, widgets::DayIndexRange window, bool finished);

    /// The fit shown for the current region (nullptr when there is none).
    const fit::FitResult* currentFit() const { return m_fit ? &*m_fit : nullptr; }
    /// How long the last refit took on the GUI thread (milliseconds).
    double lastRefitMilliseconds() const { return m_lastRefitMs; }

    /// Shows a project's fit choices (model, method, weekday factors, wave, window).
    void restoreChoices(const ledger::ProjectFile& project, const TimeAxis& axis);
    /// Writes the fit choices shown into a project.
    void storeChoices(ledger::ProjectFile& project, const Drop& drop) const;

private:
    void refitNow(const QString& region, bool compare);

    widgets::Workbench* m_workbench;
    widgets::SeriesPlot* m_plot;
    widgets::FitPane* m_pane;
    const widgets::DecisionPane* m_decisions;
    std::optional<fit::FitResult> m_fit;
    double m_lastRefitMs = 0;
};

}  // namespace siftwave::gui
