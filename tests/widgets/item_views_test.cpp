// What the record views share (widgets/common/item_views.h, titled_table_model.h): the table
// set-up, selecting a row through a filter that hides it, and columns from a list of titles.
#include "widgets/common/item_views.h"
#include "widgets/common/titled_table_model.h"

#include <QHeaderView>
#include <QItemSelectionModel>
#include <QSortFilterProxyModel>
#include <QStandardItemModel>
#include <QTableView>
#include <QTest>

using siftwave::widgets::TitledTableModel;

namespace {

// Rows a, b, c in one column.
void fillLetters(QStandardItemModel& model) {
    for (const char* letter : {"a", "b", "c"})
        model.appendRow(new QStandardItem(QString::fromLatin1(letter)));
}

// A model with rows only to read the titles of.
class TwoRows : public TitledTableModel {
public:
    TwoRows() : TitledTableModel({QStringLiteral("Code"), QStringLiteral("Name")}) {}
    int rowCount(const QModelIndex& parent = {}) const override { return parent.isValid() ? 0 : 2; }
    QVariant data(const QModelIndex&, int) const override { return {}; }
};

}  // namespace

class ItemViewsTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void aRowHiddenByTheFilterIsShownAgainAndSelected() {
        QStandardItemModel source;
        fillLetters(source);
        QSortFilterProxyModel proxy;
        proxy.setSourceModel(&source);
        proxy.setFilterFixedString(QStringLiteral("a"));
        QTableView view;
        view.setModel(&proxy);
        int cleared = 0;
        const auto showAll = [&] {
            ++cleared;
            proxy.setFilterFixedString(QString());
        };
        QVERIFY(siftwave::widgets::selectThroughFilter(&view, &proxy, source.index(2, 0), showAll));
        QCOMPARE(cleared, 1);
        QCOMPARE(view.selectionModel()->currentIndex().data().toString(), QStringLiteral("c"));
        QVERIFY(view.selectionModel()->isRowSelected(view.selectionModel()->currentIndex().row()));
        // A visible row is selected without touching the filter.
        QVERIFY(siftwave::widgets::selectThroughFilter(&view, &proxy, source.index(0, 0), showAll));
        QCOMPARE(cleared, 1);
        QCOMPARE(view.selectionModel()->currentIndex().data().toString(), QStringLiteral("a"));
    }

    void anInvalidIndexSelectsNothing() {
        QStandardItemModel source;
        fillLetters(source);
        QSortFilterProxyModel proxy;
        proxy.setSourceModel(&source);
        QTableView view;
        view.setModel(&proxy);
        int cleared = 0;
        QVERIFY(!siftwave::widgets::selectThroughFilter(&view, &proxy, QModelIndex(),
                                                        [&] { ++cleared; }));
        QCOMPARE(cleared, 0);
        QVERIFY(!view.selectionModel()->currentIndex().isValid());
    }

    void aRecordTableSelectsWholeRowsOneAtATimeAndIsReadOnly() {
        QStandardItemModel source;
        fillLetters(source);
        QTableView view;
        view.setModel(&source);
        siftwave::widgets::setUpRecordTable(&view);
        QCOMPARE(view.selectionBehavior(), QAbstractItemView::SelectRows);
        QCOMPARE(view.selectionMode(), QAbstractItemView::SingleSelection);
        QCOMPARE(view.editTriggers(), QAbstractItemView::NoEditTriggers);
        QVERIFY(view.verticalHeader()->isHidden());
        QVERIFY(view.alternatingRowColors());
        QCOMPARE(view.horizontalHeader()->sectionResizeMode(0), QHeaderView::ResizeToContents);
        QCOMPARE(view.horizontalHeader()->resizeContentsPrecision(), 200);
    }

    void theColumnsAreTheTitlesAndTheHeaderShowsOnlyThem() {
        const TwoRows model;
        QCOMPARE(model.columnCount(), 2);
        QCOMPARE(model.columnCount(model.index(0, 0)), 0);
        QCOMPARE(model.headerData(1, Qt::Horizontal).toString(), QStringLiteral("Name"));
        QVERIFY(!model.headerData(2, Qt::Horizontal).isValid());
        QVERIFY(!model.headerData(-1, Qt::Horizontal).isValid());
        QVERIFY(!model.headerData(0, Qt::Vertical).isValid());
        QVERIFY(!model.headerData(0, Qt::Horizontal, Qt::ToolTipRole).isValid());
    }
};

QTEST_MAIN(ItemViewsTest)
#include "item_views_test.moc"
