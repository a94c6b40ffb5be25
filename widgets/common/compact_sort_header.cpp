#include "widgets/common/compact_sort_header.h"

#include <QStyle>
#include <QStyleOptionHeader>

#include <algorithm>

namespace siftwave::widgets {

CompactSortHeader::CompactSortHeader(QWidget* parent) : QHeaderView(Qt::Horizontal, parent) {
    // As QTableView's own header does.
    setSectionsClickable(true);
    setHighlightSections(true);
}

QSize CompactSortHeader::sectionSizeFromContents(int logicalIndex) const {
    const QSize withArrow = QHeaderView::sectionSizeFromContents(logicalIndex);
    if (!isSortIndicatorShown() || logicalIndex == sortIndicatorSection() || !model())
        return withArrow;
    // The same measurement without the arrow (a size hint from the model is kept as it is).
    if (model()->headerData(logicalIndex, orientation(), Qt::SizeHintRole).isValid())
        return withArrow;
    QStyleOptionHeader option;
    initStyleOption(&option);
    option.section = logicalIndex;
    const QVariant font = model()->headerData(logicalIndex, orientation(), Qt::FontRole);
    option.fontMetrics = QFontMetrics(
        font.isValid() && font.canConvert<QFont>() ? font.value<QFont>() : this->font());
    option.text = model()->headerData(logicalIndex, orientation(), Qt::DisplayRole).toString();
    option.sortIndicator = QStyleOptionHeader::None;
    const QSize without =
        style()->sizeFromContents(QStyle::CT_HeaderSection, &option, QSize(), this);
    return QSize(std::min(without.width(), withArrow.width()), withArrow.height());
}

}  // namespace siftwave::widgets
