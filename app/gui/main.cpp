// siftwave: the workbench. With no drop on the command line it opens the
// bundled sample; with --screenshot it renders the window to a PNG and exits
// (works under QT_QPA_PLATFORM=offscreen, where there is no display).
#include "main_window.h"
#include "sample_location.h"

#include "widgets/series_plot.h"

#include <QApplication>
#include <QCommandLineParser>
#include <QFile>
#include <QFileInfo>
#include <QIcon>
#include <QPixmap>
#include <QTimer>

#include <cstdio>

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
    parser.addOption(screenshot);
    parser.addOption(select);
    parser.addOption(finding);
    parser.addPositionalArgument(
        QStringLiteral("DROP"),
        QStringLiteral("A data drop (CSV) to open; default: the bundled sample."));
    parser.process(app);

    const bool shooting = parser.isSet(screenshot);
    siftwave::gui::MainWindow::Options options;
    options.rememberLayout = !shooting;
    options.dialogs = !shooting;
    siftwave::gui::MainWindow window(options);

    QString drop = parser.positionalArguments().value(0);
    if (drop.isEmpty()) {
        drop = siftwave::gui::bundledSampleDrop();
        if (drop.isEmpty())
            std::fprintf(stderr, "siftwave: the bundled sample drop was not found (looked in %s)\n",
                         qPrintable(siftwave::gui::sampleFolders().join(QStringLiteral(", "))));
    }
    const QString region = parser.value(select);
    const QString findingId = parser.value(finding);

    int exitCode = 0;
    if (shooting) {
        const QString out = parser.value(screenshot);
        auto finishShot = [&window, &exitCode, out](bool readOk) {
            // One more turn of the event loop so docks and the plot have their final sizes.
            QTimer::singleShot(0, &window, [&window, &exitCode, out, readOk] {
                exitCode = saveScreenshot(window, out) && readOk ? 0 : 1;
                QApplication::exit(exitCode);
            });
        };
        QObject::connect(&window, &siftwave::gui::MainWindow::dropOpened, &window,
                         [&, finishShot](const QString&) {
                             if (!region.isEmpty() && !window.selectRegion(region)) {
                                 std::fprintf(stderr, "siftwave: no region %s in this drop\n",
                                              qPrintable(region));
                                 finishShot(false);
                                 return;
                             }
                             if (!findingId.isEmpty())
                                 std::fprintf(stderr,
                                              "siftwave: findings are not available in this build; "
                                              "--finding %s ignored\n",
                                              qPrintable(findingId));
                             finishShot(true);
                         });
        QObject::connect(&window, &siftwave::gui::MainWindow::dropFailed, &window,
                         [finishShot](const QString&) { finishShot(false); });
        window.resize(1440, 900);
        window.show();
        if (drop.isEmpty())
            finishShot(false);
        else
            window.openDrop(drop);
        app.exec();
        return exitCode;
    }

    window.show();
    if (!drop.isEmpty()) {
        if (!region.isEmpty())
            QObject::connect(
                &window, &siftwave::gui::MainWindow::dropOpened, &window,
                [&window, region](const QString&) { window.selectRegion(region); },
                Qt::SingleShotConnection);
        window.openDrop(drop);
    }
    return app.exec();
}
