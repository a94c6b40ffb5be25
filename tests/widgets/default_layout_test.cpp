// The main window's first arrangement at its default size, styled as the application styles it
// (resources/style.qss): the Findings table shows all seven columns whole — the measure of each
// finding among them — and enough rows to work from; the region names are not cut.
#include "sample_window.h"

#include <QApplication>
#include <QFile>
#include <QHeaderView>
#include <QScrollBar>
#include <QTableView>
#include <QTemporaryDir>
#include <QTest>
#include <QTreeView>
#include <algorithm>
#include <functional>

#include "widgets/findings/finding_model.h"
#include "widgets/findings/region_model.h"

namespace {

// The widest text of a column over the model's rows (display role), in the view's font.
int widestText(const QAbstractItemView& view, int column) {
    const QAbstractItemModel* model = view.model();
    int widest = 0;
    for (int row = 0; row < model->rowCount(); ++row)
        widest = std::max(widest, view.fontMetrics().horizontalAdvance(
                                      model->index(row, column).data().toString()));
    return widest;
}

}  // namespace

class DefaultLayoutTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void initTestCase() { QVERIFY(applyWorkbenchStyle()); }

    void theFindingsTableShowsEveryColumnWholeAtTheDefaultSize() {
        QTemporaryDir ledgers;
        QVERIFY(ledgers.isValid());
        auto window = siftwave::testing::openSampleWindow(ledgers.path(), {false, QSize(), true});
        QVERIFY(window);
        QCOMPARE(window->size(), QSize(1360, 860));  // MainWindow's own default
        auto* table = window->findChild<QTableView*>(QStringLiteral("findingTable"));
        QVERIFY(table);
        QVERIFY(table->model()->rowCount() >= 10);  // the sample's planted problems
        QVERIFY(table->isVisible());
        QCoreApplication::processEvents();

        QHeaderView* header = table->horizontalHeader();
        QCOMPARE(header->count(), static_cast<int>(siftwave::widgets::FindingModel::ColumnCount));
        // Nothing to scroll sideways: every column lies inside the visible part of the table...
        QCOMPARE(table->horizontalScrollBar()->maximum(), 0);
        for (int c = 0; c < header->count(); ++c) {
            const QString name = table->model()->headerData(c, Qt::Horizontal).toString();
            QVERIFY2(header->sectionViewportPosition(c) + header->sectionSize(c) <=
                         table->viewport()->width(),
                     qPrintable(name));
            // ... and is as wide as its widest text, so nothing is elided.
            QVERIFY2(header->sectionSize(c) >= widestText(*table, c), qPrintable(name));
        }
        // Enough rows to work from without scrolling at every step.
        const int rowHeight = table->verticalHeader()->defaultSectionSize();
        QVERIFY2(table->viewport()->height() / rowHeight >= 6,
                 qPrintable(QString::number(table->viewport()->height() / rowHeight)));

        // The region names are whole too (the count columns keep no room for a sort arrow).
        auto* tree = window->findChild<QTreeView*>(QStringLiteral("regionTree"));
        QVERIFY(tree);
        const int name = siftwave::widgets::RegionModel::NameColumn;
        int widestName = 0;
        std::function<void(const QModelIndex&)> walk = [&](const QModelIndex& parent) {
            for (int row = 0; row < tree->model()->rowCount(parent); ++row) {
                const QModelIndex index = tree->model()->index(row, name, parent);
                widestName = std::max(
                    widestName, tree->fontMetrics().horizontalAdvance(index.data().toString()));
                walk(tree->model()->index(row, 0, parent));
            }
        };
        walk(QModelIndex());
        QVERIFY(widestName > 0);
        QVERIFY2(
            tree->header()->sectionSize(name) >= widestName,
            qPrintable(
                QStringLiteral("%1 < %2").arg(tree->header()->sectionSize(name)).arg(widestName)));
    }
};

QTEST_MAIN(DefaultLayoutTest)
#include "default_layout_test.moc"
