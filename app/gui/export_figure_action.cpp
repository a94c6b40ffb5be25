#include "export_figure_action.h"

#include "main_window.h"

#include "widgets/figure_export_dialog.h"
#include "widgets/workbench.h"

#include <QAction>
#include <QMenu>

namespace siftwave::gui {

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
        widgets::FigureExportDialog::Inputs inputs;
        inputs.drop = &workbench->drop();
        // The workbench holds no ledger yet: the figure shows the raw counts and says
        // "Ledger: none". When it does, pass its Ledger and Cleaned here.
        inputs.regions = workbench->regionRegister();
        inputs.currentRegion = window->currentRegion();
        widgets::FigureExportDialog dialog(inputs, window);
        dialog.exec();
    });
}

}  // namespace siftwave::gui
