#pragma once
// File > Export figure… (figures and reports, see widgets/figure_export_dialog.h).
// Kept in its own file so the main window needs one line: addExportFigureAction().

class QMenu;

namespace siftwave::gui {

class MainWindow;

/// Adds "Export figure…" (Ctrl+Shift+E) to `menu`; it opens the dialog on the
/// current drop and region, and is disabled while no drop is open.
void addExportFigureAction(MainWindow* window, QMenu* menu);

}  // namespace siftwave::gui
