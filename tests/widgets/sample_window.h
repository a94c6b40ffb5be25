#pragma once
// The main window on the bundled sample drop, as the workflow tests start it.

#include "main_window.h"

#include <QApplication>
#include <QDir>
#include <QFile>
#include <QSignalSpy>
#include <QSize>
#include <QStandardPaths>
#include <QString>
#include <QTest>

#include <memory>

namespace siftwave::testing {

struct SampleWindowOptions {
    bool dialogs = false;         // MainWindow::Options::dialogs
    QSize size;                   // invalid: the window's own size
    bool waitForExposed = false;  // wait until the window is on screen (for mouse events)
};

/// A new main window, shown, that keeps its ledgers in `ledgerFolder`, remembers no layout and
/// asks nothing (`dialogs` off unless said); `size` invalid: the window's own size.
inline std::unique_ptr<gui::MainWindow> makeTestWindow(const QString& ledgerFolder,
                                                       QSize size = QSize(1300, 850),
                                                       bool dialogs = false) {
    gui::MainWindow::Options options;
    options.rememberLayout = false;
    options.dialogs = dialogs;
    options.ledgerFolder = ledgerFolder;
    auto window = std::make_unique<gui::MainWindow>(options);
    if (size.isValid())
        window->resize(size);
    window->show();
    return window;
}

/// Opens samples/quenmara_current.csv in a new main window that keeps its ledgers in
/// `ledgerFolder` (emptied first) and remembers no layout; returns the window once the scan has
/// finished, or nullptr when it is not exposed or the scan does not finish within 30 s.
inline std::unique_ptr<gui::MainWindow> openSampleWindow(const QString& ledgerFolder,
                                                         SampleWindowOptions o = {}) {
    QStandardPaths::setTestModeEnabled(true);
    QDir(ledgerFolder).removeRecursively();
    QDir().mkpath(ledgerFolder);
    auto window = makeTestWindow(ledgerFolder, o.size, o.dialogs);
    if (o.waitForExposed && !QTest::qWaitForWindowExposed(window.get()))
        return nullptr;
    QSignalSpy scanned(window.get(), &gui::MainWindow::scanFinished);
    window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
    if (!scanned.wait(30000))
        return nullptr;
    return window;
}

}  // namespace siftwave::testing

/// Styles the application as the workbench does (resources/style.qss), for tests that measure
/// the layout; false when the style sheet is not in the resources. (Q_INIT_RESOURCE cannot be
/// used inside a namespace.)
inline bool applyWorkbenchStyle() {
    Q_INIT_RESOURCE(siftwave);
    QFile style(QStringLiteral(":/siftwave/style.qss"));
    if (!style.open(QIODevice::ReadOnly))
        return false;
    qApp->setStyleSheet(QString::fromUtf8(style.readAll()));
    return true;
}
