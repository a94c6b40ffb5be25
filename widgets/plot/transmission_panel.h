#pragma once
// TransmissionPanel: the panel under the series plot with the region's transmission estimates
// (TransmissionChart): R_t with its band and the line R = 1, or the growth rate r(t), chosen in
// its bar, with the caution (transmission::caution) beside it.
//
// Time-aligned: follow(seriesPlot) makes the panel show the days the series plot shows and
// copies its left and right margins after each of its repaints, so a date sits at the same x in
// both.

#include "siftwave/transmission/transmission.h"
#include "widgets/plot/transmission_chart.h"

#include <QWidget>

#include <memory>
#include <optional>

class QComboBox;
class QCustomPlot;
class QLabel;

namespace siftwave::widgets {

class TransmissionPanel : public QWidget {
    Q_OBJECT

public:
    explicit TransmissionPanel(QWidget* parent = nullptr);
    ~TransmissionPanel() override;

    /// Shows estimates (nullopt: none, with `note` saying why, e.g. "No region selected.").
    void setResult(std::optional<transmission::TransmissionResult> result,
                   const QString& note = {});
    const std::optional<transmission::TransmissionResult>& result() const { return m_result; }

    TransmissionMeasure measure() const;
    void chooseMeasure(TransmissionMeasure measure);

    /// Keeps the time axis aligned with `seriesPlot` (its x range and its side margins).
    void follow(QCustomPlot* seriesPlot);

    QCustomPlot* customPlot() const { return m_plot; }
    const TransmissionChart& chart() const { return *m_chart; }

protected:
    /// Keeps the caution's wrapped height as its minimum, so that a short panel never draws
    /// the caution over the plot (a splitter does not ask labels for their height at a width).
    void resizeEvent(QResizeEvent* event) override;

private:
    void redraw();
    void alignWith(QCustomPlot* seriesPlot);

    QComboBox* m_measure;
    QLabel* m_caution;
    QCustomPlot* m_plot;
    std::unique_ptr<TransmissionChart> m_chart;
    std::optional<transmission::TransmissionResult> m_result;
    QString m_note;
};

}  // namespace siftwave::widgets
