// File > Export figure in the workbench: a figure exported from the GUI after a decision
// was applied carries that decision (its mark on the plot) and the ledger's entry count and
// head hash in its caption, as `siftwave-cli figure --ledger` does.
#include "export_figure_action.h"
#include "main_window.h"
#include "sample_drop.h"

#include "widgets/common/workbench.h"
#include "widgets/export/figure_export_dialog.h"

#include "siftwave/report/caption.h"

#include <QAction>
#include <QApplication>
#include <QFile>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QTimer>
#include <QXmlStreamReader>

using siftwave::gui::MainWindow;

namespace {

// The text of every <text> element of an SVG, blank-separated (QSvgGenerator keeps text as text).
QString svgText(const QString& path) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return QStringLiteral("CANNOT OPEN ") + path;
    QXmlStreamReader xml(&file);
    QString text;
    int depth = 0;
    while (!xml.atEnd()) {
        xml.readNext();
        if (xml.isStartElement() && xml.name() == QLatin1String("text"))
            ++depth;
        else if (xml.isEndElement() && xml.name() == QLatin1String("text")) {
            --depth;
            text += QLatin1Char(' ');
        } else if (xml.isCharacters() && depth > 0)
            text += xml.text();
    }
    if (xml.hasError())
        return QStringLiteral("XML ERROR: ") + xml.errorString();
    return text.simplified();
}

}  // namespace

class ExportFigureActionTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_dir;
    std::unique_ptr<MainWindow> m_window;

private Q_SLOTS:
    void init() {
        QStandardPaths::setTestModeEnabled(true);
        QVERIFY(m_dir.isValid());
        QDir(m_dir.path()).removeRecursively();
        QDir().mkpath(m_dir.filePath(QStringLiteral("ledgers")));
        MainWindow::Options options;
        options.rememberLayout = false;
        options.ledgerFolder = m_dir.filePath(QStringLiteral("ledgers"));
        m_window = std::make_unique<MainWindow>(options);
        m_window->show();
        QSignalSpy scanned(m_window.get(), &MainWindow::scanFinished);
        m_window->openDrop(QStringLiteral(SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv"));
        QVERIFY(scanned.wait(30000));
    }
    void cleanup() { m_window.reset(); }

    void theDialogExportsTheWorkbenchLedger() {
        siftwave::widgets::Workbench& wb = *m_window->workbench();
        QVERIFY(wb.hasDrop());
        QVERIFY(wb.ledger().entries.empty());
        // The sample's planted backlog (samples/manifest.json, P06), spread back.
        const siftwave::ledger::Decision backlog = siftwave::testing::sampleBacklogDecision();
        auto applied = wb.apply(backlog, QStringLiteral("three weeks held back (test)"));
        QVERIFY2(applied.ok(), applied.ok() ? "" : applied.error().describe().c_str());
        QCOMPARE(wb.ledger().entries.size(), std::size_t(1));
        const QString head = QString::fromStdString(
            wb.ledger().headHash().substr(0, siftwave::report::kHashPrefixLength));
        QCOMPARE(head.size(), 12);

        // The inputs the action hands the dialog are the workbench's own.
        const auto inputs = siftwave::gui::figureExportInputs(*m_window);
        QCOMPARE(inputs.ledger, &wb.ledger());
        QCOMPARE(inputs.cleaned, &wb.cleaned());

        // Through the menu action: the dialog is modal, so drive it once it is up.
        auto* action = m_window->findChild<QAction*>(QStringLiteral("actionExportFigure"));
        QVERIFY(action && action->isEnabled());
        const QString svg = m_dir.filePath(QStringLiteral("gui-1301.svg"));
        QString exportError = QStringLiteral("the dialog never opened");
        QTimer::singleShot(0, this, [&] {
            auto* dialog = qobject_cast<siftwave::widgets::FigureExportDialog*>(
                QApplication::activeModalWidget());
            if (!dialog)
                return;
            dialog->setRegions({QStringLiteral("1301")});
            dialog->setOutputPath(svg);
            auto written = dialog->exportFigures();
            exportError =
                written.ok() ? QString() : QString::fromStdString(written.error().describe());
            dialog->reject();
        });
        action->trigger();
        QVERIFY2(exportError.isEmpty(), qPrintable(exportError));

        const QString text = svgText(svg);
        QVERIFY2(text.contains(QStringLiteral("Ledger: 1 entry, head ") + head), qPrintable(text));
        // The decision's mark (figure_spec.h: "#<seq> <n> moved to earlier days").
        QVERIFY2(text.contains(QStringLiteral("#1 2,444 moved to earlier days")), qPrintable(text));
        QVERIFY2(text.contains(QStringLiteral("1 ledger decision applied")), qPrintable(text));
        QVERIFY(!text.contains(QStringLiteral("Ledger: none")));
    }
};

QTEST_MAIN(ExportFigureActionTest)
#include "export_figure_action_test.moc"
