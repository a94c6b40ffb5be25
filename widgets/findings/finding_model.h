#pragma once
// FindingModel: the scan's findings, ranked, with whether a ledger entry answers them.
// Columns: rank, severity, kind, region, measure, days, state.

#include "widgets/common/titled_table_model.h"

namespace siftwave::widgets {

class Workbench;

class FindingModel : public TitledTableModel {
    Q_OBJECT

public:
    enum Column {
        RankColumn,
        SeverityColumn,
        KindColumn,
        RegionColumn,
        MeasureColumn,
        DaysColumn,
        StateColumn,
        ColumnCount
    };
    enum Role {
        IdRole = Qt::UserRole + 1,  // the finding id
        KindRole,                   // "backlog_dump", ...
        SeverityRole,               // "info", "warning", "critical"
        DecidedRole,                // bool
        SortRole,
    };

    explicit FindingModel(Workbench* workbench, QObject* parent = nullptr);

    int rowCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    /// Row of the finding with this id, or -1.
    int rowOf(const QString& id) const;

private:
    Workbench* m_workbench;
};

}  // namespace siftwave::widgets
