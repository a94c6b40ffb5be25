#pragma once
// TextTableModel: a read-only table of already formatted cells, for panes that
// show one core result (a fit's parameters, its derived quantities, a model
// comparison). The pane formats the core's numbers; the model only holds them
// for the view. Numeric columns sort by the number stored in SortRole.

#include "widgets/common/titled_table_model.h"

#include <QStringList>
#include <QVariant>
#include <QVector>

#include <utility>

namespace siftwave::widgets {

class TextTableModel : public TitledTableModel {
    Q_OBJECT

public:
    static constexpr int SortRole = Qt::UserRole;

    struct Row {
        QStringList cells;
        QVector<QVariant> sortKeys;  // optional, per column
        QString toolTip;
        bool emphasised = false;  // shown in bold (e.g. the chosen model)
    };

    explicit TextTableModel(QStringList headers, QObject* parent = nullptr);

    void setRows(QVector<Row> rows);
    /// Columns shown left-aligned (text); the others after the first are right-aligned (numbers).
    void setTextColumns(QVector<int> columns) { m_textColumns = std::move(columns); }
    const QVector<Row>& rows() const { return m_rows; }
    /// The text of one cell, or empty.
    QString text(int row, int column) const;

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;

private:
    QVector<Row> m_rows;
    QVector<int> m_textColumns;
};

}  // namespace siftwave::widgets
