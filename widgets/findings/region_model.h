#pragma once
// RegionModel: the regions of the open drop as a tree for the region browser.
//
// The tree follows the region register's hierarchy (parent codes); without a
// register, or one without parents, it is a flat list. Codes of the drop that
// the register does not know are listed at the top level; registered regions
// the drop has no rows for are shown too, marked as absent from this release.
// Columns: code, name, raw total, cleaned total, open findings.

#include <QAbstractItemModel>
#include <QString>

#include <optional>
#include <vector>

namespace siftwave::widgets {

class Workbench;

class RegionModel : public QAbstractItemModel {
    Q_OBJECT

public:
    enum Column {
        CodeColumn,
        NameColumn,
        RawTotalColumn,
        CleanedTotalColumn,
        OpenFindingsColumn,
        ColumnCount
    };
    enum Role {
        SortRole = Qt::UserRole,  // numbers as numbers, text as text
        CodeRole,                 // the region code, verbatim
        InDropRole,               // true when the drop has rows for the region
    };

    explicit RegionModel(Workbench* workbench, QObject* parent = nullptr);

    QModelIndex index(int row, int column, const QModelIndex& parent = {}) const override;
    QModelIndex parent(const QModelIndex& child) const override;
    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

    /// Index (column 0) of the region with this code, or an invalid index.
    QModelIndex indexOfCode(const QString& code) const;
    /// The measure whose totals are shown (an index into the drop's measures).
    void setMeasure(int measure);
    int measure() const { return m_measure; }

    /// Rebuilds from the workbench (called when the drop changes).
    void rebuild();
    /// The cleaned totals and open findings changed (a decision, a scan).
    void refreshColumns();

private:
    struct Node {
        int parent = -1;
        std::vector<int> children;
        QString code;
        QString name;
        std::optional<std::size_t> dropRegion;  // index into the drop's regions
        long long rawTotal = 0;
        std::size_t reportedDays = 0;
        int row = 0;  // position among its siblings
    };

    int nodeOf(const QModelIndex& index) const;
    const std::vector<int>& childrenOf(int node) const;
    int rowInParent(int node) const;
    void computeTotals();

    Workbench* m_workbench;
    std::vector<Node> m_nodes;
    std::vector<int> m_topLevel;
    int m_measure = 0;
};

}  // namespace siftwave::widgets
