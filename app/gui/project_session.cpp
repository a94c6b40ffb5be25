#include "project_session.h"

#include "siftwave/ledger/project.h"

#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QSaveFile>

namespace siftwave::gui {

namespace {
QString suffix() {
    return QString::fromLatin1(kProjectSuffix);
}

Error fileError(const QString& path, const std::string& message) {
    Error e = makeError(ErrorCode::Io, message);
    e.file = path.toStdString();
    return e;
}
}  // namespace

bool isProjectPath(const QString& path) {
    return path.endsWith(suffix(), Qt::CaseInsensitive);
}

QString withProjectSuffix(const QString& path) {
    return isProjectPath(path) ? path : path + suffix();
}

QString projectLedgerPath(const QString& projectPath) {
    const QFileInfo info(projectPath);
    QString name = info.fileName();
    if (isProjectPath(name))
        name.chop(suffix().size());
    return info.absoluteDir().filePath(name + QStringLiteral(".ledger.jsonl"));
}

std::string storedProjectPath(const QString& projectPath, const QString& file) {
    if (file.isEmpty())
        return {};
    const QDir folder = QFileInfo(projectPath).absoluteDir();
    const QString absolute = QFileInfo(file).absoluteFilePath();
    const QString relative = folder.relativeFilePath(absolute);
    if (relative.startsWith(QStringLiteral("..")) || QDir::isAbsolutePath(relative))
        return QDir::cleanPath(absolute).toStdString();
    return relative.toStdString();
}

QString resolvedProjectPath(const QString& projectPath, const std::string& stored) {
    if (stored.empty())
        return {};
    return QDir::cleanPath(QString::fromStdString(ledger::resolveProjectPath(
        QFileInfo(projectPath).absoluteFilePath().toStdString(), stored)));
}

Result<QString> adoptLedgerForProject(const QString& projectPath, const QString& currentLedger) {
    const QString target = projectLedgerPath(projectPath);
    if (!currentLedger.isEmpty() && QFileInfo(currentLedger) == QFileInfo(target))
        return target;
    QByteArray bytes;
    if (!currentLedger.isEmpty() && QFileInfo::exists(currentLedger)) {
        QFile source(currentLedger);
        if (!source.open(QIODevice::ReadOnly))
            return fileError(currentLedger,
                             "cannot read the ledger: " + source.errorString().toStdString());
        bytes = source.readAll();
    }
    if (QFileInfo::exists(target)) {
        QFile existing(target);
        if (existing.open(QIODevice::ReadOnly) && existing.readAll() == bytes)
            return target;  // the same ledger already
        return fileError(target,
                         "another ledger is already there; a ledger is never overwritten, so "
                         "choose another project name or move that file away");
    }
    if (bytes.isEmpty())
        return target;      // nothing recorded yet: the first entry creates the file
    QSaveFile out(target);  // temporary file, then rename
    if (!out.open(QIODevice::WriteOnly) || out.write(bytes) != bytes.size() || !out.commit())
        return fileError(target,
                         "cannot write the project's ledger: " + out.errorString().toStdString());
    return target;
}

}  // namespace siftwave::gui
