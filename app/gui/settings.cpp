#include "settings.h"

#include <QSettings>

namespace siftwave::gui::settings {

namespace {
// The keys, in one place.
const QString kGeometry = QStringLiteral("window/geometry");
const QString kState = QStringLiteral("window/state");
const QString kRecent = QStringLiteral("files/recent");
const QString kLastDirectory = QStringLiteral("files/lastDirectory");
}  // namespace

QByteArray windowGeometry() {
    return QSettings().value(kGeometry).toByteArray();
}
void setWindowGeometry(const QByteArray& geometry) {
    QSettings().setValue(kGeometry, geometry);
}

QByteArray windowState() {
    return QSettings().value(kState).toByteArray();
}
void setWindowState(const QByteArray& state) {
    QSettings().setValue(kState, state);
}

QStringList recentFiles() {
    return QSettings().value(kRecent).toStringList();
}

void addRecentFile(const QString& path) {
    QStringList files = recentFiles();
    files.removeAll(path);
    files.prepend(path);
    while (files.size() > kMaxRecentFiles)
        files.removeLast();
    QSettings().setValue(kRecent, files);
}

void clearRecentFiles() {
    QSettings().remove(kRecent);
}

QString lastDirectory() {
    return QSettings().value(kLastDirectory).toString();
}
void setLastDirectory(const QString& folder) {
    QSettings().setValue(kLastDirectory, folder);
}

}  // namespace siftwave::gui::settings
