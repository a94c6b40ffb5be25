#include "widgets/common/text_table_model.h"

#include <QFont>

namespace siftwave::widgets {

TextTableModel::TextTableModel(QStringList headers, QObject* parent)
    : TitledTableModel(std::move(headers), parent) {}

void TextTableModel::setRows(QVector<Row> rows) {
    beginResetModel();
    m_rows = std::move(rows);
    endResetModel();
}

QString TextTableModel::text(int row, int column) const {
    if (row < 0 || row >= m_rows.size())
        return {};
    return m_rows[row].cells.value(column);
}

int TextTableModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : static_cast<int>(m_rows.size());
}

QVariant TextTableModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid() || index.row() >= m_rows.size())
        return {};
    const Row& row = m_rows[index.row()];
    switch (role) {
        case Qt::DisplayRole:
            return row.cells.value(index.column());
        case SortRole:
            if (index.column() < row.sortKeys.size() && row.sortKeys[index.column()].isValid())
                return row.sortKeys[index.column()];
            return row.cells.value(index.column());
        case Qt::ToolTipRole:
            return row.toolTip.isEmpty() ? QVariant() : QVariant(row.toolTip);
        case Qt::FontRole:
            if (row.emphasised) {
                QFont font;
                font.setBold(true);
                return font;
            }
            return {};
        case Qt::TextAlignmentRole:
            if (index.column() > 0 && !m_textColumns.contains(index.column()))
                return QVariant::fromValue(Qt::AlignRight | Qt::AlignVCenter);
            return {};
    }
    return {};
}

}  // namespace siftwave::widgets
