#include "widgets/common/item_views.h"

#include <QHeaderView>
#include <QItemSelectionModel>
#include <QSortFilterProxyModel>
#include <QTableView>

namespace siftwave::widgets {

void setUpRecordTable(QTableView* view) {
    view->setSelectionBehavior(QAbstractItemView::SelectRows);
    view->setSelectionMode(QAbstractItemView::SingleSelection);
    view->setEditTriggers(QAbstractItemView::NoEditTriggers);
    view->verticalHeader()->hide();
    view->verticalHeader()->setDefaultSectionSize(view->fontMetrics().height() + 6);
    view->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
    view->horizontalHeader()->setResizeContentsPrecision(200);
    view->setAlternatingRowColors(true);
}

bool selectThroughFilter(QAbstractItemView* view, const QSortFilterProxyModel* proxy,
                         const QModelIndex& source, const std::function<void()>& showAll) {
    if (!source.isValid())
        return false;
    QModelIndex shown = proxy->mapFromSource(source);
    if (!shown.isValid()) {
        showAll();
        shown = proxy->mapFromSource(source);
    }
    view->scrollTo(shown);
    view->selectionModel()->setCurrentIndex(
        shown, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
    return true;
}

}  // namespace siftwave::widgets
