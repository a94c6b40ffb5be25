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

/// The application's names, icon and style sheet.
void describeApplication(QApplication& app) {
    QApplication::setOrganizationName(QStringLiteral("Siftwave"));
    QApplication::setApplicationName(QStringLiteral("siftwave"));
    QApplication::setApplicationDisplayName(QStringLiteral("Siftwave"));
    QApplication::setApplicationVersion(QStringLiteral("0.1.0"));
    QApplication::setWindowIcon(QIcon(QStringLiteral(":/siftwave/icons/siftwave.svg")));
    QApplication::setDesktopFileName(QStringLiteral("siftwave"));
    app.setStyleSheet(loadStyleSheet());
}

/// What the command line asks for.
struct StartRequest {
    bool shooting = false;   // --screenshot: render to `screenshotPath` and exit
    QString screenshotPath;  // the PNG to write
    QString drop;            // the drop to open (may be empty)
    QString projectPath;     // the project to open instead of a drop (may be empty)
    QString previousPath;    // the previous release to open after the drop
    QString region;          // --select
    QString findingId;       // --finding
};

/// Reads the command line; --help, --version and a bad option print and exit here.
StartRequest parseCommandLine(QApplication& app) {
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

    StartRequest request;
    request.shooting = parser.isSet(screenshot);
    request.screenshotPath = parser.value(screenshot);
    request.drop = parser.positionalArguments().value(0);
    request.projectPath = parser.value(project);
    request.previousPath = parser.value(previous);
    request.region = parser.value(select);
    request.findingId = parser.value(finding);
    return request;
}

/// A project given as DROP opens as a project; with neither, the bundled sample opens.
void chooseWhatToOpen(StartRequest& request) {
    if (request.projectPath.isEmpty() && siftwave::gui::isProjectPath(request.drop))
        std::swap(request.projectPath, request.drop);
    if (request.drop.isEmpty() && request.projectPath.isEmpty()) {
        request.drop = siftwave::gui::bundledSampleDrop();
        if (request.drop.isEmpty())
            std::fprintf(stderr, "siftwave: the bundled sample drop was not found (looked in %s)\n",
                         qPrintable(siftwave::gui::sampleFolders().join(QStringLiteral(", "))));
    }
}

/// The start-up sequence: open the drop, then the previous release, then select; then
/// (with --screenshot) render and exit. Each step runs when the one before reported back.
class StartUp {
public:
    StartUp(siftwave::gui::MainWindow& window, const StartRequest& request)
        : m_window(window), m_request(request) {}

    /// Chains the steps to the window's signals, shows the window and opens what was asked for.
    void run() {
        if (!m_request.projectPath.isEmpty())
            chainProjectSteps();
        else
            chainDropSteps();
        if (m_request.shooting)
            m_window.resize(1440, 900);
        m_window.show();
        if (!m_request.projectPath.isEmpty())
            m_window.openProject(m_request.projectPath);
        else if (m_request.drop.isEmpty())
            finish(false);
        else
            m_window.openDrop(m_request.drop);
    }

    /// The exit code of a --screenshot run (0: written and every step succeeded).
    int exitCode() const { return m_exitCode; }

private:
    using MainWindow = siftwave::gui::MainWindow;

    /// A project brings its own previous release and selection; --select and --finding
    /// still apply on top.
    void chainProjectSteps() {
        QObject::connect(
            &m_window, &MainWindow::projectOpened, &m_window,
            [this](const QString&) { afterScan(); }, Qt::SingleShotConnection);
        QObject::connect(&m_window, &MainWindow::projectFailed, &m_window,
                         [this](const QString&) { finish(false); });
    }

    /// The drop, then the previous release (when given), then the selection.
    void chainDropSteps() {
        QObject::connect(
            &m_window, &MainWindow::dropOpened, &m_window,
            [this](const QString&) {
                if (m_request.previousPath.isEmpty()) {
                    afterScan();
                    return;
                }
                QObject::connect(
                    &m_window, &MainWindow::previousOpened, &m_window,
                    [this](const QString&) { afterScan(); }, Qt::SingleShotConnection);
                m_window.openPreviousRelease(m_request.previousPath);
            },
            Qt::SingleShotConnection);
        QObject::connect(&m_window, &MainWindow::dropFailed, &m_window,
                         [this](const QString&) { finish(false); });
    }

    /// Findings are only there once the (last) scan has finished.
    void afterScan() {
        QObject::connect(
            &m_window, &MainWindow::scanFinished, &m_window, [this] { selectAndFinish(); },
            Qt::SingleShotConnection);
    }

    /// Selects the region and focuses the finding asked for, then finishes.
    void selectAndFinish() {
        bool ok = true;
        if (!m_request.region.isEmpty() && !m_window.selectRegion(m_request.region)) {
            std::fprintf(stderr, "siftwave: no region %s in this drop\n",
                         qPrintable(m_request.region));
            ok = false;
        }
        if (!m_request.findingId.isEmpty() && !m_window.focusFinding(m_request.findingId)) {
            std::fprintf(stderr, "siftwave: no finding %s in this drop\n",
                         qPrintable(m_request.findingId));
            ok = false;
        }
        finish(ok);
    }

    /// With --screenshot: writes it and exits (code 1 when it or a step failed).
    void finish(bool ok) {
        if (!m_request.shooting)
            return;
        // One more turn of the event loop so docks and the plot have their final sizes.
        QTimer::singleShot(0, &m_window, [this, ok] {
            m_exitCode = saveScreenshot(m_window, m_request.screenshotPath) && ok ? 0 : 1;
            QApplication::exit(m_exitCode);
        });
    }

    siftwave::gui::MainWindow& m_window;
    const StartRequest& m_request;
    int m_exitCode = 0;
};

}  // namespace

int main(int argc, char** argv) {
    Q_INIT_RESOURCE(siftwave);  // the resources live in the static siftwave_app library
    QApplication app(argc, argv);
    describeApplication(app);
    StartRequest request = parseCommandLine(app);

    siftwave::gui::MainWindow::Options options;
    options.rememberLayout = !request.shooting;
    options.dialogs = !request.shooting;
    siftwave::gui::MainWindow window(options);
    chooseWhatToOpen(request);

    StartUp startUp(window, request);
    startUp.run();
    const int status = app.exec();
    return request.shooting ? startUp.exitCode() : status;
}
