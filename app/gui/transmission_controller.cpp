#include "transmission_controller.h"

#include "widgets/common/workbench.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/transmission_panel.h"
#include "widgets/transmission/transmission_pane.h"

#include <QElapsedTimer>

namespace siftwave::gui {

TransmissionController::TransmissionController(widgets::Workbench* workbench,
                                               widgets::SeriesPlot* plot,
                                               widgets::TransmissionPanel* panel,
                                               widgets::TransmissionPane* pane, QObject* parent)
    : QObject(parent), m_workbench(workbench), m_plot(plot), m_panel(panel), m_pane(pane) {}

void TransmissionController::refresh(const QString& region) {
    QElapsedTimer clock;
    clock.start();
    m_options.reset();
    const widgets::SeriesView& view = m_plot->view();
    if (!m_workbench->hasDrop() || view.empty()) {
        m_panel->setResult(std::nullopt, tr("No region selected."));
        return;
    }
    auto options = m_pane->options(view.axis.cadence());
    if (!options) {
        m_panel->setResult(std::nullopt,
                           tr("Transmission settings: %1")
                               .arg(QString::fromStdString(options.error().describe())));
        return;
    }
    m_options = options.value();
    const std::vector<double> counts = m_workbench->cleanedCounts(region, m_plot->measure());
    m_panel->setResult(transmission::estimateTransmission(counts, view.axis, *m_options));
    m_lastMs = static_cast<double>(clock.nsecsElapsed()) * 1e-6;
}

}  // namespace siftwave::gui
