// siftwave: the workbench. With no drop on the command line it opens the
// bundled sample; with --screenshot it renders the window to a PNG and exits
// (works under QT_QPA_PLATFORM=offscreen, where there is no display).
#include "main_window.h"
#include "project_session.h"
#include "sample_location.h"

#include "widgets/plot/series_plot.h"

#include <QApplication>
#include <QCommandLineParser>
#include <QFile>
#include <QFileInfo>
#include <QIcon>
#include <QPixmap>
#include <QTimer>

#include <cstdio>
#include <utility>

namespace {

QString loadStyleSheet() {
    QFile file(QStringLiteral(":/siftwave/style.qss"));
    if (!file.open(QIODevice::ReadOnly))
        return {};
    return QString::fromUtf8(file.readAll());
}

/// Lays the window out, renders it and writes the PNG; false when it cannot be written.
bool saveScreenshot(siftwave::gui::MainWindow& window, const QString& path) {
    QApplication::processEvents();
    const QPixmap pixmap = window.grab();
    if (!pixmap.save(path, "PNG")) {
        std::fprintf(stderr, "siftwave: cannot write the screenshot %s\n", qPrintable(path));
        return false;
    }
    std::printf("%s\n", qPrintable(QFileInfo(path).absoluteFilePath()));
    return true;
}

}  // namespace

int main(int argc, char** argv) {
    Q_INIT_RESOURCE(siftwave);  // the resources live in the static siftwave_app library
    QApplication app(argc, argv);
    QApplication::setOrganizationName(QStringLiteral("Siftwave"));
    QApplication::setApplicationName(QStringLiteral("siftwave"));
    QApplication::setApplicationDisplayName(QStringLiteral("Siftwave"));
    QApplication::setApplicationVersion(QStringLiteral("0.1.0"));
    QApplication::setWindowIcon(QIcon(QStringLiteral(":/siftwave/icons/siftwave.svg")));
    QApplication::setDesktopFileName(QStringLiteral("siftwave"));
    app.setStyleSheet(loadStyleSheet());

    QCommandLineParser parser;
    parser.setApplicationDescription(
        QStringLiteral("Siftwave: a workbench for surveillance case-count releases."));
    parser.addHelpOption();
    parser.addVersionOption();
    const QCommandLineOption screenshot(
        QStringLiteral("screenshot"),
        QStringLiteral("Render the main window to FILE (PNG) and exit."), QStringLiteral("FILE"));
    const QCommandLineOption select(QStringLiteral("select"),
                                    QStringLiteral("Select the region with this code."),
                                    QStringLiteral("REGION"));
    const QCommandLineOption finding(QStringLiteral("finding"),
                                     QStringLiteral("Focus on the finding with this id."),
                                     QStringLiteral("ID"));
    const QCommandLineOption previous(
        QStringLiteral("previous"),
        QStringLiteral("Also open the previous release FILE to compare against."),
        QStringLiteral("FILE"));
    const QCommandLineOption project(
        QStringLiteral("project"),
        QStringLiteral("Open the project FILE (its drop, ledger, previous release and view)."),
        QStringLiteral("FILE"));
    parser.addOption(screenshot);
    parser.addOption(project);
    parser.addOption(previous);
    parser.addOption(select);
    parser.addOption(finding);
    parser.addPositionalArgument(
        QStringLiteral("DROP"),
        QStringLiteral("A data drop (CSV) or a project (*.siftwave.json) to open; default: the "
                       "bundled sample."));
    parser.process(app);

    const bool shooting = parser.isSet(screenshot);
    siftwave::gui::MainWindow::Options options;
    options.rememberLayout = !shooting;
    options.dialogs = !shooting;
    siftwave::gui::MainWindow window(options);
    using siftwave::gui::MainWindow;

    QString drop = parser.positionalArguments().value(0);
    QString projectPath = parser.value(project);
    if (projectPath.isEmpty() && siftwave::gui::isProjectPath(drop))
        std::swap(projectPath, drop);
    if (drop.isEmpty() && projectPath.isEmpty()) {
        drop = siftwave::gui::bundledSampleDrop();
        if (drop.isEmpty())
            std::fprintf(stderr, "siftwave: the bundled sample drop was not found (looked in %s)\n",
                         qPrintable(siftwave::gui::sampleFolders().join(QStringLiteral(", "))));
    }
    const QString previousPath = parser.value(previous);
    const QString region = parser.value(select);
    const QString findingId = parser.value(finding);
    const QString out = parser.value(screenshot);

    // The start-up sequence: open the drop, then the previous release, then select; then
    // (with --screenshot) render and exit. Each step runs when the one before reported back.
    int exitCode = 0;
    auto finish = [&](bool ok) {
        if (!shooting)
            return;
        // One more turn of the event loop so docks and the plot have their final sizes.
        QTimer::singleShot(0, &window, [&, ok] {
            exitCode = saveScreenshot(window, out) && ok ? 0 : 1;
            QApplication::exit(exitCode);
        });
    };
    auto selectAndFinish = [&] {
        bool ok = true;
        if (!region.isEmpty() && !window.selectRegion(region)) {
            std::fprintf(stderr, "siftwave: no region %s in this drop\n", qPrintable(region));
            ok = false;
        }
        if (!findingId.isEmpty() && !window.focusFinding(findingId)) {
            std::fprintf(stderr, "siftwave: no finding %s in this drop\n", qPrintable(findingId));
            ok = false;
        }
        finish(ok);
    };
    // Findings are only there once the (last) scan has finished.
    auto afterScan = [&] {
        QObject::connect(
            &window, &MainWindow::scanFinished, &window, [&] { selectAndFinish(); },
            Qt::SingleShotConnection);
    };
    if (!projectPath.isEmpty()) {
        // A project brings its own previous release and selection; --select and --finding
        // still apply on top.
        QObject::connect(
            &window, &MainWindow::projectOpened, &window, [&](const QString&) { afterScan(); },
            Qt::SingleShotConnection);
        QObject::connect(&window, &MainWindow::projectFailed, &window,
                         [&](const QString&) { finish(false); });
    } else {
        QObject::connect(
            &window, &MainWindow::dropOpened, &window,
            [&](const QString&) {
                if (previousPath.isEmpty()) {
                    afterScan();
                    return;
                }
                QObject::connect(
                    &window, &MainWindow::previousOpened, &window,
                    [&](const QString&) { afterScan(); }, Qt::SingleShotConnection);
                window.openPreviousRelease(previousPath);
            },
            Qt::SingleShotConnection);
        QObject::connect(&window, &MainWindow::dropFailed, &window,
                         [&](const QString&) { finish(false); });
    }

    if (shooting)
        window.resize(1440, 900);
    window.show();
    if (!projectPath.isEmpty())
        window.openProject(projectPath);
    else if (drop.isEmpty())
        finish(false);
    else
        window.openDrop(drop);
    const int status = app.exec();
    return shooting ? exitCode : status;
}
