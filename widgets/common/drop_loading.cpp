#include "widgets/common/drop_loading.h"

#include <QDir>
#include <QFileInfo>

namespace siftwave::widgets {

QString registerBeside(const QString& dropPath) {
    const QFileInfo info(dropPath);
    const QDir folder = info.absoluteDir();
    auto usable = [&](const QString& path) {
        return QFileInfo::exists(path) && QFileInfo(path) != info;
    };
    // "<scenario>_current.csv" -> "<scenario>_regions.csv", then "regions.csv".
    const QString base = info.completeBaseName();
    const qsizetype underscore = base.lastIndexOf(QLatin1Char('_'));
    if (underscore > 0) {
        const QString sibling =
            folder.filePath(base.left(underscore) + QStringLiteral("_regions.csv"));
        if (usable(sibling))
            return sibling;
    }
    if (const QString regions = folder.filePath(QStringLiteral("regions.csv")); usable(regions))
        return regions;
    const QStringList candidates =
        folder.entryList({QStringLiteral("*regions*.csv"), QStringLiteral("*register*.csv")},
                         QDir::Files, QDir::Name);
    if (candidates.size() == 1 && usable(folder.filePath(candidates.front())))
        return folder.filePath(candidates.front());
    return {};
}

LoadedDrop loadDrop(const LoadRequest& request) {
    LoadedDrop loaded;
    Result<Drop> drop = readDrop(request.dropPath.toStdString(), request.options);
    if (!drop) {
        loaded.error = drop.error();
        return loaded;
    }
    loaded.drop = std::make_shared<const Drop>(std::move(drop).value());

    if (!request.withRegister)
        return loaded;
    const QString registerPath =
        request.registerPath.isEmpty() ? registerBeside(request.dropPath) : request.registerPath;
    if (!registerPath.isEmpty()) {
        Result<RegionRegister> regionRegister = readRegister(registerPath.toStdString());
        if (regionRegister)
            loaded.regionRegister =
                std::make_shared<const RegionRegister>(std::move(regionRegister).value());
        else
            loaded.registerError = regionRegister.error();
    }
    return loaded;
}

QString describeError(const Error& error) {
    return QString::fromStdString(error.describe());
}

}  // namespace siftwave::widgets
