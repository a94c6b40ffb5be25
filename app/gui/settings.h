#pragma once
// The workbench's remembered settings, behind one typed wrapper over QSettings.
// No widget spells a settings key; everything goes through these functions.

#include <QByteArray>
#include <QString>
#include <QStringList>

namespace siftwave::gui::settings {

/// How many recent files the File menu keeps.
inline constexpr int kMaxRecentFiles = 8;

QByteArray windowGeometry();
void setWindowGeometry(const QByteArray& geometry);

/// The arrangement of docks and toolbars (QMainWindow::saveState()).
QByteArray windowState();
void setWindowState(const QByteArray& state);

/// Most recent first; files that no longer exist are kept (the menu greys them out).
QStringList recentFiles();
/// Puts `path` first (once) and trims the list to kMaxRecentFiles.
void addRecentFile(const QString& path);
void clearRecentFiles();

/// The folder the open dialogs start in.
QString lastDirectory();
void setLastDirectory(const QString& folder);

}  // namespace siftwave::gui::settings
