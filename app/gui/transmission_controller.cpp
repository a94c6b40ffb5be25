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

namespace {

double numberOr(const ledger::ProjectFile& project, const char* key, double fallback) {
    const auto it = project.extra.find(key);
    if (it == project.extra.end())
        return fallback;
    bool ok = false;
    const double v = QString::fromStdString(it->second).toDouble(&ok);
    return ok ? v : fallback;
}

std::string text(double v) {
    return QString::number(v, 'g', 17).toStdString();
}

}  // namespace

void TransmissionController::restoreChoices(const ledger::ProjectFile& project) {
    widgets::TransmissionPane::Choices c;
    c.window = static_cast<int>(numberOr(project, "transmission.window", 0));
    c.siMean = numberOr(project, "transmission.si_mean", c.siMean);
    c.siSd = numberOr(project, "transmission.si_sd", c.siSd);
    if (const auto it = project.extra.find("transmission.si_file"); it != project.extra.end())
        c.siFile = QString::fromStdString(it->second);
    c.priorMean = numberOr(project, "transmission.prior_mean", c.priorMean);
    c.priorSd = numberOr(project, "transmission.prior_sd", c.priorSd);
    const auto weekday = project.extra.find("transmission.weekday");
    c.weekday = weekday != project.extra.end() && weekday->second == "true";
    const auto measure = project.extra.find("transmission.measure");
    m_panel->chooseMeasure(measure != project.extra.end() && measure->second == "r"
                               ? widgets::TransmissionMeasure::GrowthRate
                               : widgets::TransmissionMeasure::ReproductionNumber);
    m_pane->setChoices(c);
}

void TransmissionController::storeChoices(ledger::ProjectFile& project) const {
    const widgets::TransmissionPane::Choices c = m_pane->choices();
    project.extra["transmission.window"] = std::to_string(c.window);
    project.extra["transmission.si_mean"] = text(c.siMean);
    project.extra["transmission.si_sd"] = text(c.siSd);
    project.extra["transmission.si_file"] = c.siFile.toStdString();
    project.extra["transmission.prior_mean"] = text(c.priorMean);
    project.extra["transmission.prior_sd"] = text(c.priorSd);
    project.extra["transmission.weekday"] = c.weekday ? "true" : "false";
    project.extra["transmission.measure"] =
        m_panel->measure() == widgets::TransmissionMeasure::GrowthRate ? "r" : "R";
}

}  // namespace siftwave::gui
