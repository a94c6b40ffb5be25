#pragma once
// What the views of records (the findings and ledger tables, the region tree) share.

#include <functional>

class QAbstractItemView;
class QModelIndex;
class QSortFilterProxyModel;
class QTableView;

namespace siftwave::widgets {

/// Whole rows selected one at a time, read-only, no row numbers, rows one text line high,
/// alternating row colours, and columns sized to their content from the first rows only
/// (measuring every row of a big drop or a long ledger costs seconds). Call it after setModel();
/// per-column resize modes go after it.
void setUpRecordTable(QTableView* view);

/// Makes `source` (an index of the proxy's source model) the view's current, selected row and
/// scrolls to it; when the proxy filters it out, `showAll` (clearing the filters) runs first.
/// False when `source` is not valid.
bool selectThroughFilter(QAbstractItemView* view, const QSortFilterProxyModel* proxy,
                         const QModelIndex& source, const std::function<void()>& showAll);

}  // namespace siftwave::widgets
