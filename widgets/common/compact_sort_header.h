#pragma once
// CompactSortHeader: a horizontal header that keeps room for the sort arrow in the sorted
// column only. QHeaderView sizes every section as if it showed the arrow (the style adds the
// header's height and a margin, about 25 pixels), so short columns of a sortable table ("#",
// "Region", "State") grow wider than their header and contents need; in a narrow dock that
// pushes the last columns out of sight.

#include <QHeaderView>

namespace siftwave::widgets {

class CompactSortHeader : public QHeaderView {
    Q_OBJECT

public:
    explicit CompactSortHeader(QWidget* parent = nullptr);

protected:
    QSize sectionSizeFromContents(int logicalIndex) const override;
};

}  // namespace siftwave::widgets
