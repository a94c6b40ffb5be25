#pragma once
// The transmission panel of the shown region: recomputes the growth rate and R_t of the cleaned
// series (core transmission.h, the same call as `siftwave-cli transmission`) whenever the
// region, the measure, the ledger (a decision applied or withdrawn) or the panel's settings
// change, and shows them in the panel under the series plot. Keeps the options it used, so that
// an exported figure shows the same panel.

#include "siftwave/ledger/project.h"
#include "siftwave/transmission/transmission.h"
#include "widgets_fwd.h"

#include <QObject>
#include <QString>

#include <optional>

namespace siftwave::gui {

class TransmissionController : public QObject {
    Q_OBJECT

public:
    TransmissionController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                           widgets::TransmissionPanel* panel, widgets::TransmissionPane* pane,
                           QObject* parent = nullptr);

    /// Recomputes the panel for `region` (the plot's measure and calendar).
    void refresh(const QString& region);
    /// The options of the panel shown (nullopt when the settings are invalid or no drop is open).
    const std::optional<transmission::TransmissionOptions>& options() const { return m_options; }
    /// Shows a project's transmission settings and measure (keys "transmission.*" of its extra
    /// map; a project without them gets the defaults).
    void restoreChoices(const ledger::ProjectFile& project);
    /// Writes the settings and the measure shown into a project.
    void storeChoices(ledger::ProjectFile& project) const;
    /// How long the last refresh took on the GUI thread (milliseconds).
    double lastRefreshMilliseconds() const { return m_lastMs; }

private:
    widgets::Workbench* m_workbench;
    widgets::SeriesPlot* m_plot;
    widgets::TransmissionPanel* m_panel;
    widgets::TransmissionPane* m_pane;
    std::optional<transmission::TransmissionOptions> m_options;
    double m_lastMs = 0;
};

}  // namespace siftwave::gui
