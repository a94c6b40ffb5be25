// The right-hand column with a decision in preparation (issue 14, step 6): the Decision pane
// below the Wave fit pane grows with the preview and the check of what the decision would
// create; the fit pane's window rows ("automatic / largest wave" and the days) must never draw
// on top of each other, at the two common screen sizes 1280x800 and 1920x1080 (common
// practice, no source). With SIFTWAVE_SHOT_DIR set, each size is also saved as a PNG to look at.

#include "sample_window.h"

#include <QApplication>
#include <QComboBox>
#include <QDateEdit>
#include <QFile>
#include <QLabel>
#include <QRadioButton>
#include <QSpinBox>
#include <QTemporaryDir>
#include <QTest>

#include "widgets/common/workbench.h"

namespace {

QRect globalRect(const QWidget* w) {
    return QRect(w->mapToGlobal(QPoint(0, 0)), w->size());
}

}  // namespace

class DecisionLayoutTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void initTestCase() { QVERIFY(applyWorkbenchStyle()); }

    void theFitPaneRowsStaySeparateBesideATallDecision_data() {
        QTest::addColumn<QSize>("size");
        QTest::newRow("1280x800") << QSize(1280, 800);
        QTest::newRow("1920x1080") << QSize(1920, 1080);
    }

    void theFitPaneRowsStaySeparateBesideATallDecision() {
        QFETCH(QSize, size);
        QTemporaryDir ledgers;
        QVERIFY(ledgers.isValid());
        auto window = siftwave::testing::openSampleWindow(ledgers.path(), {false, size, true});
        QVERIFY(window);
        // The window fits the screen: no pane's minimum holds it taller or wider.
        QCOMPARE(window->size(), size);
        // The sample's 1301 backlog (manifest P06), decided as the scan suggests: the preview and
        // the check fill the Decision pane.
        const siftwave::scan::Finding* dump = nullptr;
        for (const auto& f : window->workbench()->findings())
            if (f.kind == siftwave::scan::FindingKind::BacklogDump && f.region == "1301")
                dump = &f;
        QVERIFY(dump);
        QVERIFY(window->decideFinding(QString::fromStdString(dump->id)));
        QCoreApplication::processEvents();
        auto* check = window->findChild<QLabel*>(QStringLiteral("decisionCheck"));
        QVERIFY(check);
        QVERIFY(check->isVisible());
        QVERIFY2(check->text().startsWith(QStringLiteral("Check:")) ||
                     check->text().startsWith(QStringLiteral("<b>Check:")),
                 qPrintable(check->text()));

        if (const QByteArray dir = qgetenv("SIFTWAVE_SHOT_DIR"); !dir.isEmpty()) {
            const QString path =
                QString::fromLocal8Bit(dir) +
                QStringLiteral("/decision-%1x%2.png").arg(size.width()).arg(size.height());
            QVERIFY(window->grab().save(path));
        }

        auto* automatic = window->findChild<QRadioButton*>(QStringLiteral("fitWindowAuto"));
        auto* manual = window->findChild<QRadioButton*>(QStringLiteral("fitWindowManual"));
        auto* from = window->findChild<QDateEdit*>(QStringLiteral("fitWindowFrom"));
        auto* model = window->findChild<QComboBox*>(QStringLiteral("fitModel"));
        QVERIFY(automatic && manual && from && model);
        QVERIFY(automatic->isVisible());
        // Each row keeps at least its own height, and the rows do not overlap.
        QVERIFY2(automatic->height() >= automatic->minimumSizeHint().height(),
                 qPrintable(QString::number(automatic->height())));
        QVERIFY2(from->height() >= from->minimumSizeHint().height(),
                 qPrintable(QString::number(from->height())));
        QVERIFY(!globalRect(automatic).intersects(globalRect(manual)));
        QVERIFY(!globalRect(automatic).intersects(globalRect(from)));
        QVERIFY(!globalRect(model).intersects(globalRect(automatic)));

        // An edit re-runs the check once the edits pause (it scans the measure twice).
        auto* excess = window->findChild<QSpinBox*>(QStringLiteral("decisionExcess"));
        QVERIFY(excess);
        excess->setValue(excess->value() - 100);
        QVERIFY(check->text().isEmpty());
        QTRY_VERIFY_WITH_TIMEOUT(check->text().contains(QStringLiteral("Check:")), 5000);
    }
};

QTEST_MAIN(DecisionLayoutTest)
#include "decision_layout_test.moc"
