// The sheet chooser: a workbook with two sheets of dates opens on the first (as the CLI does),
// offers the other in the status bar, reads it as another drop with its own ledger, and a saved
// project reopens the sheet it was read from. A CSV drop shows no chooser.
#include "main_window.h"
#include "sample_window.h"

#include "widgets/common/workbench.h"

#include "siftwave/ledger/project.h"
#include "support/zip_builder.h"

#include <QComboBox>
#include <QFile>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTemporaryDir>
#include <QTest>

using siftwave::gui::MainWindow;

namespace {

std::unique_ptr<MainWindow> makeWindow(const QString& ledgers) {
    return siftwave::testing::makeTestWindow(ledgers);
}

QComboBox* sheetBox(MainWindow& window) {
    return window.findChild<QComboBox*>(QStringLiteral("sheetChooserBox"));
}

bool chooserShown(MainWindow& window) {
    QWidget* chooser = window.findChild<QWidget*>(QStringLiteral("sheetChooser"));
    return chooser && chooser->isVisibleTo(&window);
}

}  // namespace

class SheetChooserTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_folder;
    QString m_ledgers;
    QString m_book;

private Q_SLOTS:
    void initTestCase() {
        QStandardPaths::setTestModeEnabled(true);
        QVERIFY(m_folder.isValid());
        m_ledgers = m_folder.filePath(QStringLiteral("ledgers"));
        QDir().mkpath(m_ledgers);
        // A notes sheet, then the tables "north" and "south" (tests/support/zip_builder.h).
        m_book = m_folder.filePath(QStringLiteral("two districts.xlsx"));
        QFile out(m_book);
        QVERIFY(out.open(QIODevice::WriteOnly));
        const std::string bytes = siftwave::testing::makeTwoTableXlsx(28);
        out.write(bytes.data(), static_cast<qint64>(bytes.size()));
    }

    void aWorkbookWithTwoTablesOpensOnTheFirstAndOffersTheOther() {
        auto window = makeWindow(m_ledgers);
        QSignalSpy opened(window.get(), &MainWindow::dropOpened);
        window->openDrop(m_book);
        QVERIFY(opened.wait(30000));
        siftwave::widgets::Workbench& wb = *window->workbench();
        QCOMPARE(wb.drop().source.sheet, std::string("north"));
        QVERIFY(chooserShown(*window));
        QComboBox* box = sheetBox(*window);
        QVERIFY(box);
        QCOMPARE(box->count(), 2);
        QCOMPARE(box->currentText(), QStringLiteral("north"));
        // The sheets of one file share its SHA-256: each has a ledger of its own.
        QVERIFY(wb.ledgerPath().endsWith(QStringLiteral("-sheet2.jsonl")));
        QVERIFY(window->windowTitle().contains(QStringLiteral("[north]")));
        if (const QByteArray dir = qgetenv("SIFTWAVE_SCREENSHOT_DIR"); !dir.isEmpty())
            window->grab().save(QString::fromLocal8Bit(dir) + QStringLiteral("/sheet_chooser.png"));

        box->setCurrentIndex(1);
        Q_EMIT box->activated(1);  // as the analyst's pick
        QVERIFY(opened.wait(30000));
        QCOMPARE(wb.drop().source.sheet, std::string("south"));
        QCOMPARE(wb.drop().regionCodes, (std::vector<std::string>{"S1"}));
        QCOMPARE(box->currentText(), QStringLiteral("south"));
        QVERIFY(wb.ledgerPath().endsWith(QStringLiteral("-sheet3.jsonl")));

        const QString project = m_folder.filePath(QStringLiteral("south"));
        QVERIFY(window->saveProject(project));
        const auto onDisk = siftwave::ledger::readProjectFile(
            (project + QStringLiteral(".siftwave.json")).toStdString());
        QVERIFY(onDisk.ok());
        QCOMPARE(onDisk->dropSheet, std::string("south"));
        window.reset();

        auto again = makeWindow(m_ledgers);
        QSignalSpy reopened(again.get(), &MainWindow::projectOpened);
        again->openProject(project + QStringLiteral(".siftwave.json"));
        QVERIFY(reopened.wait(30000));
        QCOMPARE(again->workbench()->drop().source.sheet, std::string("south"));
        QCOMPARE(sheetBox(*again)->currentText(), QStringLiteral("south"));
    }

    void aCsvDropShowsNoChooser() {
        auto window = makeWindow(m_ledgers);
        QSignalSpy opened(window.get(), &MainWindow::dropOpened);
        window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(opened.wait(30000));
        QVERIFY(!chooserShown(*window));
        QVERIFY(window->workbench()->ledgerPath().endsWith(
            QString::fromStdString(window->workbench()->drop().source.sha256) +
            QStringLiteral(".jsonl")));
    }
};

QTEST_MAIN(SheetChooserTest)
#include "sheet_chooser_test.moc"
