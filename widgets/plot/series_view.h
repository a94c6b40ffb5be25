#pragma once
// SeriesView: what SeriesChart draws, in Qt types: a report::PlotModel converted by
// seriesViewOf() (the one place a SeriesView is filled from data), drawn on screen by SeriesPlot
// and in exported figures by the figure renderer. What a plot shows (series, labels, cadence,
// overlays) is decided in core (report/plot_model.h); this computes and decides nothing. A value
// that is not there is NaN (or an empty vector), and the plot leaves it out.

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/report/plot_model.h"

#include <QString>
#include <QStringList>

#include <cstdint>
#include <optional>
#include <vector>

namespace siftwave::widgets {

/// An inclusive range of day indices into the view's calendar.
struct DayIndexRange {
    int first = 0;
    int last = 0;
    friend bool operator==(const DayIndexRange&, const DayIndexRange&) = default;
};

struct FindingMark {
    QString id;
    QString label;  // short, e.g. "backlog dump"
    DayIndexRange days;
    int severity = 1;  // 0 low, 1 medium, 2 high
};

struct FittedCurve {
    QString label;             // e.g. "Richards (Poisson ML)"
    std::vector<double> mid;   // per day of the calendar; NaN outside the curve
    std::vector<double> low;   // lower band edge, same length (may be empty)
    std::vector<double> high;  // upper band edge
    QString bandLabel;         // what the band is (legend); empty: "Fit band"
    // Not empty: the fit's status is not ok (issue 15); mid, low and high are empty and the plot
    // shows this note (the status and its reasons) where the curve would be.
    QString notDrawn;
};

/// The nowcast over the last periods (report::NowcastSpec): an estimate of reports still to
/// come, drawn in its own style with its band, never as counts.
struct NowcastBand {
    QString label;            // "Nowcast: estimate of reports still to come (...)"
    QString bandLabel;        // "95% interval of the nowcast"
    std::vector<double> mid;  // per period; NaN where nothing is estimated
    std::vector<double> low;
    std::vector<double> high;
};

struct SeriesView {
    QString regionCode;  // verbatim
    QString regionName;
    QString measure;
    TimeAxis axis;       // the periods every series below is on (daily or weekly)
    QString valueLabel;  // the value axis, e.g. "Daily cases" (PlotModel::valueLabel)

    std::vector<double> raw;                // NaN where no number was reported
    std::vector<CellState> rawState;        // per day
    std::vector<std::uint32_t> sourceLine;  // 0 where no row
    Provenance sourcePlaces;                // PlotModel::sourcePlaces, for sourcePlace()
    std::vector<double> cleaned;            // empty: not computed
    std::vector<double> smoothed;           // empty: not computed
    QString smoothedLabel;                  // e.g. "7-day centred mean"
    std::optional<FittedCurve> fit;
    std::optional<DayIndexRange> fitWindow;
    std::optional<NowcastBand> nowcast;
    std::vector<FindingMark> findings;
    // Per day: the ledger entries that changed the cell (may be empty).
    std::vector<QStringList> touchedBy;

    QString previousLabel;         // e.g. the previous release's file name; empty: none
    std::vector<double> previous;  // the previous release's raw counts, on this calendar

    QString secondMeasure;       // empty: none
    QString secondValueLabel;    // its axis, e.g. "Daily deaths"
    std::vector<double> second;  // raw counts of the second measure

    bool empty() const { return axis.periods() == 0; }
    int periods() const { return axis.periods(); }
    Date periodStart(int index) const { return axis.periodStart(index); }
};

/// The plot model in the chart's types: a conversion, nothing decided here.
SeriesView seriesViewOf(const report::PlotModel& model);

/// The workbench's live fit on the plot's axis: the wave (NaN outside the window) and its
/// pointwise 95% confidence band as report::fittedCurveOf() computes them for the plot model,
/// with the screen's legend names ("Gumbel fit (least squares)"). Without a covariance the
/// band is empty and the curve is still drawn. A fit whose status is not ok gives no curve, only
/// FittedCurve::notDrawn: why (as an exported figure's caption says it).
FittedCurve curveFromFit(const fit::FitResult& fit, const TimeAxis& axis);

/// Names for people: "Gumbel", "logistic", "Richards", "log-normal"; "least squares",
/// "Poisson", "negative binomial".
QString modelDisplayName(fit::ModelKind model);
QString methodDisplayName(fit::FitMethod method);

/// The hover text for one day: date and weekday, raw (or its state), cleaned,
/// smoothed, fitted, the source line and the ledger entries that touched the cell.
QString hoverText(const SeriesView& view, int day);

}  // namespace siftwave::widgets
