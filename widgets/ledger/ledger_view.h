#pragma once
// The ledger: LedgerModel lists the entries (sequence, time, author, kind, where,
// reason, the totals they moved, in effect or withdrawn); LedgerView shows them
// with the chain verification status always visible and a Withdraw action.

#include "widgets/common/titled_table_model.h"

#include <QWidget>

#include <cstdint>

class QLabel;
class QPushButton;
class QTableView;

namespace siftwave::widgets {

class Workbench;

class LedgerModel : public TitledTableModel {
    Q_OBJECT

public:
    enum Column {
        SequenceColumn,
        TimeColumn,
        AuthorColumn,
        SignedColumn,
        KindColumn,
        WhereColumn,
        MovedColumn,
        ReasonColumn,
        StateColumn,
        ColumnCount
    };
    static constexpr int SequenceRole = Qt::UserRole + 1;

    explicit LedgerModel(Workbench* workbench, QObject* parent = nullptr);
    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;

private:
    Workbench* m_workbench;
};

class LedgerView : public QWidget {
    Q_OBJECT

public:
    explicit LedgerView(Workbench* workbench, QWidget* parent = nullptr);
    QLabel* chainStatus() const { return m_status; }
    QTableView* view() const { return m_view; }
    /// The sequence number of the selected entry, 0 when none.
    std::uint64_t currentEntry() const;
    void selectEntry(std::uint64_t sequence);

Q_SIGNALS:
    /// The analyst asked to withdraw this entry.
    void withdrawRequested(std::uint64_t sequence);

private:
    void updateStatus();

    Workbench* m_workbench;
    LedgerModel* m_model;
    QLabel* m_status;
    QTableView* m_view;
    QPushButton* m_withdraw;
};

}  // namespace siftwave::widgets
