#pragma once
// RegionBrowser: a search box over a sortable tree of the drop's regions.
// Typing filters by code or name (a parent stays visible while a child matches);
// the current row is the selected region.

#include <QString>
#include <QWidget>

class QLineEdit;
class QSortFilterProxyModel;
class QTreeView;

namespace siftwave::widgets {

class RegionModel;

class RegionBrowser : public QWidget {
    Q_OBJECT

public:
    explicit RegionBrowser(RegionModel* model, QWidget* parent = nullptr);

    /// Makes the region with this code current; false when there is none.
    bool selectRegion(const QString& code);
    QString currentRegion() const;
    /// The first region (in tree order) that the drop has rows for; empty when none.
    QString firstRegionWithData() const;

    QTreeView* view() const { return m_view; }
    QLineEdit* searchBox() const { return m_search; }

Q_SIGNALS:
    /// The current region changed (code verbatim; empty when nothing is selected).
    void regionSelected(const QString& code);

private:
    void onCurrentChanged();

    RegionModel* m_model;
    QSortFilterProxyModel* m_proxy;
    QLineEdit* m_search;
    QTreeView* m_view;
    QString m_current;
};

}  // namespace siftwave::widgets
