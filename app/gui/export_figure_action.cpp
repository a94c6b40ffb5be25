#include "export_figure_action.h"

#include "main_window.h"
#include "transmission_controller.h"

#include "widgets/common/workbench.h"
#include "widgets/export/figure_export_dialog.h"
#include "widgets/plot/transmission_panel.h"

#include <QAction>
#include <QMenu>

namespace siftwave::gui {

widgets::FigureExportDialog::Inputs figureExportInputs(const MainWindow& window) {
    const widgets::Workbench& workbench = *window.workbench();
    widgets::FigureExportDialog::Inputs inputs;
    inputs.drop = &workbench.drop();
    // The ledger as the workbench holds it (every entry, withdrawals included) and its replay:
    // the same pair `siftwave-cli figure --ledger` reads from the file.
    inputs.ledger = &workbench.ledger();
    inputs.cleaned = &workbench.cleaned();
    inputs.regions = workbench.regionRegister();
    inputs.previous = workbench.comparedPrevious();
    inputs.currentRegion = window.currentRegion();
    // The transmission panel as the workbench shows it: r(t), or R_t once a serial interval is
    // set (a figure does not carry a panel that only says R_t needs one).
    const auto& options = window.transmissionController()->options();
    const bool growth =
        window.transmissionPanel()->measure() == widgets::TransmissionMeasure::GrowthRate;
    if (options && (growth || options->serialInterval)) {
        inputs.transmission = options;
        inputs.transmissionGrowthRate = growth;
    }
    return inputs;
}

void addExportFigureAction(MainWindow* window, QMenu* menu) {
    QAction* action = menu->addAction(QObject::tr("&Export figure…"));
    action->setObjectName(QStringLiteral("actionExportFigure"));
    action->setShortcut(QKeySequence(QStringLiteral("Ctrl+Shift+E")));
    widgets::Workbench* workbench = window->workbench();
    action->setEnabled(workbench->hasDrop());
    QObject::connect(workbench, &widgets::Workbench::dropChanged, action,
                     [action, workbench] { action->setEnabled(workbench->hasDrop()); });
    QObject::connect(action, &QAction::triggered, window, [window, workbench] {
        if (!workbench->hasDrop())
            return;
        widgets::FigureExportDialog dialog(figureExportInputs(*window), window);
        dialog.exec();
    });
}

}  // namespace siftwave::gui
