#pragma once
// SeriesPlot: one region's series on screen, with the ways to look at it.
//
// Wheel zooms and dragging pans the time axis; "Reset view" shows everything;
// hovering shows the day's numbers (see hoverText()). A window (the fit window
// or a redistribution window) can be shown with draggable edges: dragging an
// edge emits windowChanging() as it moves and windowChanged() on release, so the
// owner can preview or refit live. The measure and an optional second measure
// are chosen in the bar above the plot. A day's bar can be picked for a
// decision: Shift+click, or the context menu's "Redistribute this day…"
// (redistributeDayRequested()); the owner decides what that prepares.
//
// Repaints while dragging are queued (one per event-loop turn) and redraw only the chart's
// live layer (the window, the fit and its band, the preview) when nothing else changed; see
// SeriesChart::useLiveLayer().

#include "widgets/plot/series_view.h"

#include <QStringList>
#include <QWidget>

#include <memory>
#include <optional>

class QComboBox;
class QCPItemText;
class QCustomPlot;
class QLabel;
class QMenu;
class QMouseEvent;
class QToolButton;

namespace siftwave::widgets {

class SeriesChart;

class SeriesPlot : public QWidget {
    Q_OBJECT

public:
    explicit SeriesPlot(QWidget* parent = nullptr);
    ~SeriesPlot() override;

    /// Shows a series; the measure lists are the drop's (index 0.. in drop order).
    /// An empty view with `regionWithoutRows` set: that region (from the register) was chosen
    /// but has no rows in this release; the title and the plot say so.
    void setView(const SeriesView& view, const QString& regionWithoutRows = QString());
    void setMeasures(const QStringList& measures);
    int measure() const;
    /// -1 when no second measure is shown.
    int secondMeasure() const;
    /// Chooses the measures as the analyst would (emits measureChosen / secondMeasureChosen).
    void chooseMeasure(int measure);
    void chooseSecondMeasure(int measure);  // -1: none

    /// Shows a window with draggable edges (nullopt hides it).
    void setEditableWindow(std::optional<DayIndexRange> window);
    std::optional<DayIndexRange> editableWindow() const;
    /// Replaces the fitted curve, keeping the visible range (a live refit while dragging).
    void setFit(const std::optional<FittedCurve>& fit);
    /// Draws preview values over the series (empty clears).
    void setPreview(const std::vector<double>& values, const QString& label = {});

    void resetView();
    void focusOn(DayIndexRange days);
    /// The days the time axis shows (day indices; may reach outside the calendar).
    DayIndexRange visibleDays() const;
    /// Shows exactly these days (no margin), e.g. a view restored from a project.
    void setVisibleDays(DayIndexRange days);

    /// Whether picking a day for a decision is offered (off while a decision is in preparation).
    void setDayPickingEnabled(bool enabled);
    bool dayPickingEnabled() const { return m_dayPicking; }
    /// The plot's context menu for a day (a day index; outside the calendar: view actions only).
    /// Owned by the caller; shown by the right mouse button.
    QMenu* createContextMenu(int day);

    const SeriesView& view() const;

    /// The text drawn over an empty plot (no drop or no region); empty while a series is shown.
    QString emptyNote() const;
    SeriesChart* chart() const { return m_chart.get(); }
    QCustomPlot* customPlot() const { return m_plot; }
    /// How long the last repaint of the plot took (milliseconds), and whether it redrew the live
    /// layer alone (QT_LOGGING_RULES="siftwave.refit.debug=true" prints both).
    double lastRepaintMs() const { return m_lastRepaintMs; }
    bool lastRepaintWasLiveOnly() const { return m_lastRepaintLiveOnly; }

Q_SIGNALS:
    void measureChosen(int measure);
    void secondMeasureChosen(int measure);  // -1: none
    void windowChanging(siftwave::widgets::DayIndexRange window);
    void windowChanged(siftwave::widgets::DayIndexRange window);
    /// A bar was clicked (a day index into the view's calendar).
    void dayClicked(int day);
    /// The analyst picked a day's bar to redistribute it (Shift+click or the context menu).
    void redistributeDayRequested(int day);

protected:
    bool eventFilter(QObject* watched, QEvent* event) override;

private:
    enum class Edge { None, Start, End };
    Edge edgeNear(double x) const;
    void updateTitle();
    void showEmptyNote();
    void showHover(QMouseEvent* event);
    /// Queues one repaint: the live layer alone when nothing outside it changed, else all.
    void repaintLater();

    QLabel* m_title;
    QComboBox* m_measure;
    QComboBox* m_second;
    QToolButton* m_reset;
    QCustomPlot* m_plot;
    QCPItemText* m_emptyNote = nullptr;  // owned by m_plot
    QString m_regionWithoutRows;
    std::unique_ptr<SeriesChart> m_chart;
    bool m_windowEditable = false;
    bool m_dayPicking = true;
    Edge m_dragging = Edge::None;
    QPoint m_pressPos;
    bool m_repaintQueued = false;
    int m_paintedRevision = -1;  // the chart's fullReplotRevision() at the last full replot
    double m_lastRepaintMs = 0;
    bool m_lastRepaintLiveOnly = false;
};

}  // namespace siftwave::widgets
