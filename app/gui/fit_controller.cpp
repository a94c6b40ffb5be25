#include "fit_controller.h"

#include "widgets/common/workbench.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/ledger/decision_pane.h"
#include "widgets/plot/series_plot.h"

#include <QElapsedTimer>
#include <QLoggingCategory>

#include <string>
#include <vector>

namespace siftwave::gui {

// QT_LOGGING_RULES="siftwave.refit.debug=true" prints how long each refit takes.
Q_LOGGING_CATEGORY(lcRefit, "siftwave.refit", QtWarningMsg)

FitController::FitController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                             widgets::FitPane* pane, const widgets::DecisionPane* decisions,
                             QObject* parent)
    : QObject(parent), m_workbench(workbench), m_plot(plot), m_pane(pane), m_decisions(decisions) {}

void FitController::refit(const QString& region, bool compare) {
    QElapsedTimer clock;
    clock.start();
    refitNow(region, compare);
    m_lastRefitMs = static_cast<double>(clock.nsecsElapsed()) * 1e-6;
    qCDebug(lcRefit, "refit %s: %.2f ms (the plot's last repaint, %s, took %.1f ms)",
            compare ? "with comparison" : "one model", m_lastRefitMs,
            m_plot->lastRepaintWasLiveOnly() ? "its live layer only" : "every layer",
            m_plot->lastRepaintMs());
}

void FitController::refitNow(const QString& region, bool compare) {
    m_fit.reset();
    const widgets::SeriesView& view = m_plot->view();
    if (!m_workbench->hasDrop() || view.empty()) {
        m_pane->clear(m_workbench->hasDrop() && !region.isEmpty()
                          ? tr("No fit: %1 has no rows in this release.").arg(region)
                          : tr("No region selected."));
        m_plot->setFit(std::nullopt);
        m_plot->setEditableWindow(std::nullopt);
        return;
    }
    const int measure = m_plot->measure();
    // The model choice (including the lowest AICc) is the fit's own: FitOptions::modelChoice.
    const fit::ComparedFit compared =
        m_workbench->fitRegion(region, measure, m_pane->options(), compare);
    const Result<fit::FitResult>& result = compared.fit;
    const std::vector<fit::ModelComparisonRow>& rows = compared.comparison;
    m_pane->setCalendar(view.axis);
    m_pane->showFit(result, rows);
    if (result.ok()) {
        m_fit = result.value();
        m_plot->setFit(widgets::curveFromFit(*m_fit, view.axis));
        if (!m_decisions->isActive())
            m_plot->setEditableWindow(widgets::DayIndexRange{m_fit->first, m_fit->last});
        m_pane->showWindow(widgets::DayIndexRange{m_fit->first, m_fit->last});
    } else {
        m_plot->setFit(std::nullopt);
        if (const auto window = m_pane->manualWindow()) {
            m_plot->setEditableWindow(*window);
        } else {
            m_plot->setEditableWindow(std::nullopt);
            // No wave found: the (disabled) day fields show the span that was searched, not
            // the window of the region fitted before.
            if (view.periods() > 0)
                m_pane->showWindow(widgets::DayIndexRange{0, view.periods() - 1});
        }
    }
}

void FitController::windowDragged(const QString& region, widgets::DayIndexRange window,
                                  bool finished) {
    m_pane->setManualWindow(window);
    // While dragging: one model, no comparison, so the curve follows the hand; on release:
    // everything.
    refit(region, finished);
}

void FitController::restoreChoices(const ledger::ProjectFile& project, const TimeAxis& axis) {
    const std::optional<fit::ModelKind> model = fit::modelFromName(project.fit.model);
    const auto extra = [&project](const char* key) {
        const auto it = project.extra.find(key);
        return it == project.extra.end() ? std::string() : it->second;
    };
    m_pane->setChoices(
        project.fit.model == "best" ? std::nullopt
                                    : std::optional(model.value_or(fit::ModelKind::Gumbel)),
        fit::methodFromName(project.fit.method).value_or(fit::FitMethod::LeastSquares),
        extra("fit.weekday_factors") == "true",
        extra("fit.wave") == "latest" ? fit::WaveChoice::Latest : fit::WaveChoice::Largest);
    m_pane->setCalendar(axis);
    if (project.fit.windowFirst && project.fit.windowLast)
        m_pane->setManualWindow(widgets::DayIndexRange{*project.fit.windowFirst - axis.first(),
                                                       *project.fit.windowLast - axis.first()});
    else
        m_pane->setAutomaticWindow();
}

void FitController::storeChoices(ledger::ProjectFile& project, const Drop& drop) const {
    const fit::FitOptions options = m_pane->options();
    project.fit.model = options.modelChoice == fit::ModelChoice::LowestAicc
                            ? "best"
                            : fit::modelName(options.model);
    project.fit.method = fit::methodName(options.method);
    if (const auto window = m_pane->manualWindow()) {
        project.fit.windowFirst = drop.periodStart(window->first);
        project.fit.windowLast = drop.periodStart(window->last);
    }
    project.fit.smoothingDays = options.smoothingWindow;
    project.extra["fit.weekday_factors"] = options.weekdayFactors ? "true" : "false";
    project.extra["fit.wave"] = options.wave == fit::WaveChoice::Latest ? "latest" : "largest";
}

}  // namespace siftwave::gui
