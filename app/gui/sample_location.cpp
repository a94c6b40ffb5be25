#include "sample_location.h"

#include <QCoreApplication>
#include <QDir>
#include <QFileInfo>
#include <QStringList>

namespace siftwave::gui {

QStringList sampleFolders() {
    QStringList folders;
#ifdef SIFTWAVE_SOURCE_SAMPLES_DIR
    folders << QStringLiteral(SIFTWAVE_SOURCE_SAMPLES_DIR);
#endif
    const QDir bin(QCoreApplication::applicationDirPath());
    folders << bin.filePath(QStringLiteral("../share/siftwave/samples"))
            << bin.filePath(QStringLiteral("../samples"));
    return folders;
}

QString bundledSampleDrop() {
    // The samples README names the current release; these are the names it uses,
    // newest convention first. Otherwise: the one *current*.csv file.
    const QStringList names = {QStringLiteral("current.csv"), QStringLiteral("release_current.csv"),
                               QStringLiteral("drop_current.csv")};
    for (const QString& folder : sampleFolders()) {
        const QDir dir(folder);
        if (!dir.exists())
            continue;
        for (const QString& name : names)
            if (QFileInfo::exists(dir.filePath(name)))
                return QFileInfo(dir.filePath(name)).absoluteFilePath();
        const QStringList current =
            dir.entryList({QStringLiteral("*current*.csv")}, QDir::Files, QDir::Name);
        if (!current.isEmpty())
            return QFileInfo(dir.filePath(current.front())).absoluteFilePath();
    }
    return {};
}

}  // namespace siftwave::gui
