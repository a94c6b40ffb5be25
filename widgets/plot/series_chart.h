#pragma once
// SeriesChart: draws a SeriesView into a QCustomPlot — the one rendering used
// on screen (SeriesPlot) and in exported figures.
//
// Time runs on a real date axis: a day is placed at its UTC midnight in seconds
// since 1970-01-01 (QCustomPlot's date-time convention), ticks labelled ISO 8601.
// Raw counts are bars, the cleaned and smoothed series lines, the fitted curve a
// line over its band; findings are marks in a strip along the time axis; the
// second measure, when chosen, is a dotted line on the right axis. Overlays
// (a shaded window, a decision preview) are drawn on top and replaced in place.
//
// On screen (useLiveLayer()) what moves while a window edge is dragged — the window, the
// fitted curve and its band, the decision preview — sits on a layer of its own with its own
// paint buffer, above the raw bars and below the lines, so that one step of a drag redraws
// that layer alone (QCPLayer::replot()). This holds only while nothing else changed:
// fullReplotRevision() counts the changes that need every layer redrawn (the value axis
// rescaled, a legend entry added or removed, the labels of clipped bars). Figures leave the
// live layer off and keep one layer order.

#include "widgets/plot/series_view.h"

#include <QString>

#include <optional>
#include <vector>

class QCustomPlot;
class QCPAbstractItem;
class QCPAxis;
class QCPBars;
class QCPGraph;
class QCPItemRect;
class QCPItemText;
class QCPItemStraightLine;
class QCPLayer;

namespace siftwave::widgets {

/// Seconds since 1970-01-01T00:00Z of a day's midnight.
double plotKeyOfDay(Date day);
/// The day whose bar is nearest to a plot key.
Date dayOfPlotKey(double key);
/// The plot key of the centre of period i: the day's key for daily data, the key of the
/// week's fourth day for weekly data (a week's bar spans its seven days).
double plotKeyOfPeriod(const TimeAxis& axis, int period);
/// The plot key of the centre of the period that holds `day`.
double plotKeyOfDate(const TimeAxis& axis, Date day);
/// Half a period in plot-key units (seconds): half a day or half a week.
double halfPeriodKeys(const TimeAxis& axis);
/// The period whose bar is nearest to a plot key (may lie outside the axis).
int periodOfPlotKey(const TimeAxis& axis, double key);

/// The time axis as every Siftwave plot shows it (ISO dates, UTC, six ticks) and a value axis
/// with light grid lines: the series chart and the transmission panel under it.
void styleTimeAxes(QCPAxis* timeAxis, QCPAxis* valueAxis);

class SeriesChart {
public:
    explicit SeriesChart(QCustomPlot* plot);

    /// Clears the plot and draws the view; the view is copied and kept.
    void draw(const SeriesView& view);
    const SeriesView& view() const { return m_view; }

    /// Replaces the fitted curve (and its band) without touching the rest or the visible range.
    void setFit(const std::optional<FittedCurve>& fit);

    /// Shows (or, with nullopt, hides) a shaded window with its edges.
    void setWindow(std::optional<DayIndexRange> window, const QString& label = {});
    std::optional<DayIndexRange> window() const { return m_window; }

    /// Draws preview values (per day, NaN where unchanged) over the raw bars; empty clears.
    void setPreview(const std::vector<double>& values, const QString& label = {});

    /// Shows the whole calendar (x) and all values (y).
    void resetRange();

    /// Scale the value axis to the cleaned series rather than the raw one (off by default):
    /// a raw bar the ledger lowered (a backlog spread back) then runs off the top, labelled
    /// with its value, instead of flattening the cleaned curve. Where no decision changed a
    /// day, raw and cleaned are equal and nothing changes.
    void setScaleToCleaned(bool on);
    /// Shows the given days (with a little margin).
    void focusOn(DayIndexRange days);

    /// Day index under a pixel x position (may be outside the calendar).
    int dayIndexAtPixel(double x) const;
    /// Pixel x position of a day's centre.
    double pixelOfDayIndex(int day) const;

    QCustomPlot* plot() const { return m_plot; }

    /// Puts the raw bars on a layer below the live one and the window, the fit and the preview
    /// on the live layer (buffered). Call once, before draw(); off by default.
    void useLiveLayer();
    /// The layer of what moves while dragging; nullptr unless useLiveLayer() was called.
    QCPLayer* liveLayer() const { return m_liveLayer; }
    /// Grows whenever something outside the live layer changed since the last draw.
    int fullReplotRevision() const { return m_fullReplotRevision; }

    /// The note in place of a curve for a fit that is not ok, as shown (wrapped to the plot,
    /// continuation lines indented by two spaces); empty when there is none.
    QString fitNote() const;

private:
    void resetDrawnState();
    void drawRawBars(const QVector<double>& keys);
    void drawPreviousRelease(const QVector<double>& keys);
    void drawCleanedLines(const QVector<double>& keys);
    void drawSecondMeasure(const QVector<double>& keys);
    void drawFindings();
    void drawFit();
    /// The nowcast's band and line, when the view has one (its own style, plot_style.h).
    void drawNowcast(const QVector<double>& keys);
    void rescaleValueAxis();
    void orderLiveLayer();
    void removeFitGraphs();
    void drawFitNote();

    QCustomPlot* m_plot;
    SeriesView m_view;
    QCPBars* m_preview = nullptr;
    bool m_scaleToCleaned = false;
    std::vector<QCPAbstractItem*> m_clipLabels;  // values of raw bars above the axis
    std::vector<int> m_clippedDays;              // the days m_clipLabels label
    void labelClippedBars(int first, int last, double top);
    QCPGraph* m_fitLow = nullptr;  // the band's lower edge (filled up to m_fitHigh)
    QCPGraph* m_fitHigh = nullptr;
    QCPGraph* m_fitMid = nullptr;
    QCPItemText* m_fitNote = nullptr;  // why a fit that is not ok has no curve
    QCPLayer* m_barsLayer = nullptr;
    QCPLayer* m_liveLayer = nullptr;
    int m_fullReplotRevision = 0;
    QCPItemRect* m_windowRect = nullptr;
    QCPItemStraightLine* m_windowStart = nullptr;
    QCPItemStraightLine* m_windowEnd = nullptr;
    std::optional<DayIndexRange> m_window;
};

}  // namespace siftwave::widgets
