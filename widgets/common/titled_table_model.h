#pragma once
// TitledTableModel: a table model whose columns are a fixed list of titles; the models of
// the findings, the ledger and the plain text tables build on it and add their rows.

#include <QAbstractTableModel>
#include <QStringList>

namespace siftwave::widgets {

class TitledTableModel : public QAbstractTableModel {
    Q_OBJECT

public:
    /// One column per title, in order.
    explicit TitledTableModel(QStringList titles, QObject* parent = nullptr);

    int columnCount(const QModelIndex& parent = {}) const override;
    /// The column's title (horizontal header, display role); nothing else.
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

protected:
    /// The rows are read anew (what they show changed as a whole).
    void resetRows() {
        beginResetModel();
        endResetModel();
    }

private:
    QStringList m_titles;
};

}  // namespace siftwave::widgets
