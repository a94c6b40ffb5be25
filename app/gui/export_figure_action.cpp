#include "export_figure_action.h"

#include "main_window.h"

#include "widgets/common/workbench.h"
#include "widgets/export/figure_export_dialog.h"

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
    inputs.previous = workbench.previousDrop();
    inputs.currentRegion = window.currentRegion();
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
