#pragma once
// File > Export figure… (figures and reports, see widgets/export/figure_export_dialog.h).
// Kept in its own file so the main window needs one line: addExportFigureAction().

#include "widgets/export/figure_export_dialog.h"

class QMenu;

namespace siftwave::gui {

class MainWindow;

/// What the dialog exports from the window: the open drop, the workbench's ledger and its
/// cleaned series (so the figure carries the ledger's marks, entry count and head hash, as
/// `siftwave-cli figure --ledger` does), the register and the current region.
/// Only valid while the workbench has a drop; the pointers live as long as the workbench.
widgets::FigureExportDialog::Inputs figureExportInputs(const MainWindow& window);

/// Adds "Export figure…" (Ctrl+Shift+E) to `menu`; it opens the dialog on the
/// current drop and region, and is disabled while no drop is open.
void addExportFigureAction(MainWindow* window, QMenu* menu);

}  // namespace siftwave::gui
