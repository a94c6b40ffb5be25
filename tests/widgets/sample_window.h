#pragma once
// The main window on the bundled sample drop, as the workflow tests start it.

#include "main_window.h"

#include <QDir>
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

/// Opens samples/quenmara_current.csv in a new main window that keeps its ledgers in
/// `ledgerFolder` (emptied first) and remembers no layout; returns the window once the scan has
/// finished, or nullptr when it is not exposed or the scan does not finish within 30 s.
inline std::unique_ptr<gui::MainWindow> openSampleWindow(const QString& ledgerFolder,
                                                         SampleWindowOptions o = {}) {
    QStandardPaths::setTestModeEnabled(true);
    QDir(ledgerFolder).removeRecursively();
    QDir().mkpath(ledgerFolder);
    gui::MainWindow::Options options;
    options.rememberLayout = false;
    options.dialogs = o.dialogs;
    options.ledgerFolder = ledgerFolder;
    auto window = std::make_unique<gui::MainWindow>(options);
    if (o.size.isValid())
        window->resize(o.size);
    window->show();
    if (o.waitForExposed && !QTest::qWaitForWindowExposed(window.get()))
        return nullptr;
    QSignalSpy scanned(window.get(), &gui::MainWindow::scanFinished);
    window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
    if (!scanned.wait(30000))
        return nullptr;
    return window;
}

}  // namespace siftwave::testing
