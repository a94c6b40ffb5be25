#pragma once
// TransmissionChart: draws a region's transmission estimates (core transmission.h) into one
// axis rect of a QCustomPlot, on the same time axis as the series chart above it (a period's
// value at plotKeyOfPeriod). The one drawing of the panel on screen (TransmissionPanel) and in
// exported figures (figure_renderer).
//
//   R_t:  the posterior mean of R (Cori et al. 2013) as a line over its 95% credible band, and
//         the line R = 1 (dashed ink);
//   r(t): the growth rate per day over its 95% confidence band, and the line r = 0.
// Periods without an estimate leave a gap; when the whole series has none (R_t refused for
// weekly counts, no serial interval) the reason is written across the rect.

#include "siftwave/transmission/transmission.h"

#include <QString>

#include <utility>
#include <vector>

class QCustomPlot;
class QCPAxisRect;
class QCPItemText;
class QCPAbstractItem;
class QCPAbstractPlottable;

namespace siftwave::widgets {

enum class TransmissionMeasure { ReproductionNumber, GrowthRate };

/// "R_t (Cori et al.)", "Growth rate r(t)".
QString transmissionMeasureName(TransmissionMeasure measure);

class TransmissionChart {
public:
    /// Draws into `rect` (its bottom and left axes) of `plot`.
    TransmissionChart(QCustomPlot* plot, QCPAxisRect* rect);

    /// Removes what the last draw() added and draws `result` (nothing, with `note` written
    /// across, when it is null).
    void draw(const transmission::TransmissionResult* result, TransmissionMeasure measure,
              const QString& note = {});
    /// The value range shown (for tests and the figure): lower, upper.
    std::pair<double, double> valueRange() const;
    /// The text written across the rect ("" when none).
    QString note() const;

private:
    void clear();
    void drawBandAndLine(const transmission::TransmissionResult& result, TransmissionMeasure m);
    void drawReferenceLine(double value);
    void setNote(const QString& text);

    QCustomPlot* m_plot;
    QCPAxisRect* m_rect;
    std::vector<QCPAbstractPlottable*> m_plottables;
    std::vector<QCPAbstractItem*> m_items;
    QCPItemText* m_note = nullptr;
};

}  // namespace siftwave::widgets
