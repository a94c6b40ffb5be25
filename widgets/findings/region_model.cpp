#include "widgets/findings/region_model.h"

#include "widgets/common/workbench.h"

#include <QBrush>
#include <QFont>
#include <QGuiApplication>
#include <QLocale>
#include <QPalette>

#include <array>
#include <unordered_map>

namespace siftwave::widgets {

RegionModel::RegionModel(Workbench* workbench, QObject* parent)
    : QAbstractItemModel(parent), m_workbench(workbench) {
    connect(m_workbench, &Workbench::dropChanged, this, &RegionModel::rebuild);
    connect(m_workbench, &Workbench::ledgerChanged, this, &RegionModel::refreshColumns);
    connect(m_workbench, &Workbench::findingsChanged, this, &RegionModel::refreshColumns);
    rebuild();
}

void RegionModel::rebuild() {
    beginResetModel();
    m_nodes.clear();
    m_topLevel.clear();
    if (m_workbench->hasDrop()) {
        const Drop& drop = m_workbench->drop();
        if (m_measure >= static_cast<int>(drop.measures.size()))
            m_measure = 0;
        const RegionRegister* reg = m_workbench->regionRegister();
        std::unordered_map<std::string, int> nodeByCode;
        if (reg) {
            for (const RegionEntry& entry : reg->entries) {
                if (nodeByCode.count(entry.code))
                    continue;  // a repeated code: the first one counts
                Node node;
                node.code = QString::fromStdString(entry.code);
                node.name = QString::fromStdString(entry.name);
                node.dropRegion = drop.regionIndex(entry.code);
                nodeByCode.emplace(entry.code, static_cast<int>(m_nodes.size()));
                m_nodes.push_back(std::move(node));
            }
            // Link parents; a parent the register does not list (or a cycle) leaves the node at the
            // top.
            for (const RegionEntry& entry : reg->entries) {
                const int self = nodeByCode.at(entry.code);
                if (m_nodes[self].parent != -1 || entry.parent.empty())
                    continue;
                auto parent = nodeByCode.find(entry.parent);
                if (parent == nodeByCode.end() || parent->second == self)
                    continue;
                bool cycle = false;
                for (int up = parent->second; up != -1; up = m_nodes[up].parent)
                    if (up == self)
                        cycle = true;
                if (cycle)
                    continue;
                m_nodes[self].parent = parent->second;
                m_nodes[parent->second].children.push_back(self);
            }
        }
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            if (nodeByCode.count(drop.regionCodes[r]))
                continue;
            Node node;
            node.code = QString::fromStdString(drop.regionCodes[r]);
            node.dropRegion = r;
            nodeByCode.emplace(drop.regionCodes[r], static_cast<int>(m_nodes.size()));
            m_nodes.push_back(std::move(node));
        }
        for (int i = 0; i < static_cast<int>(m_nodes.size()); ++i)
            if (m_nodes[i].parent == -1)
                m_topLevel.push_back(i);
        for (int i = -1; i < static_cast<int>(m_nodes.size()); ++i) {
            const std::vector<int>& children = childrenOf(i);
            for (int row = 0; row < static_cast<int>(children.size()); ++row)
                m_nodes[children[row]].row = row;
        }
        computeTotals();
    }
    endResetModel();
}

void RegionModel::computeTotals() {
    const Drop& drop = m_workbench->drop();
    if (drop.measures.empty())
        return;
    for (Node& node : m_nodes) {
        node.rawTotal = 0;
        node.reportedDays = 0;
        if (!node.dropRegion)
            continue;
        for (const Cell& cell :
             drop.series(static_cast<std::size_t>(m_measure), *node.dropRegion)) {
            if (!cell.reported())
                continue;
            node.rawTotal += cell.value;
            ++node.reportedDays;
        }
    }
}

void RegionModel::refreshColumns() {
    // One signal per group of siblings: a view re-measures its columns on every dataChanged,
    // so one per row costs seconds on a drop with thousands of regions.
    for (int parent = -1; parent < static_cast<int>(m_nodes.size()); ++parent) {
        const std::vector<int>& children = childrenOf(parent);
        if (children.empty())
            continue;
        Q_EMIT dataChanged(
            createIndex(0, CleanedTotalColumn, static_cast<quintptr>(children.front())),
            createIndex(static_cast<int>(children.size()) - 1, OpenFindingsColumn,
                        static_cast<quintptr>(children.back())));
    }
}

void RegionModel::setMeasure(int measure) {
    if (measure == m_measure)
        return;
    m_measure = measure;
    rebuild();
}

int RegionModel::nodeOf(const QModelIndex& index) const {
    return index.isValid() ? static_cast<int>(index.internalId()) : -1;
}

const std::vector<int>& RegionModel::childrenOf(int node) const {
    return node == -1 ? m_topLevel : m_nodes[node].children;
}

int RegionModel::rowInParent(int node) const {
    return m_nodes[node].row;
}

QModelIndex RegionModel::index(int row, int column, const QModelIndex& parent) const {
    if (column < 0 || column >= ColumnCount || row < 0)
        return {};
    const std::vector<int>& children = childrenOf(nodeOf(parent));
    if (row >= static_cast<int>(children.size()))
        return {};
    return createIndex(row, column, static_cast<quintptr>(children[row]));
}

QModelIndex RegionModel::parent(const QModelIndex& child) const {
    const int node = nodeOf(child);
    if (node == -1)
        return {};
    const int parent = m_nodes[node].parent;
    if (parent == -1)
        return {};
    return createIndex(rowInParent(parent), 0, static_cast<quintptr>(parent));
}

int RegionModel::rowCount(const QModelIndex& parent) const {
    if (parent.isValid() && parent.column() != 0)
        return 0;
    return static_cast<int>(childrenOf(nodeOf(parent)).size());
}

int RegionModel::columnCount(const QModelIndex&) const {
    return ColumnCount;
}

QVariant RegionModel::data(const QModelIndex& index, int role) const {
    const int id = nodeOf(index);
    if (id < 0)
        return {};
    const Node& node = m_nodes[id];
    const bool inDrop = node.dropRegion.has_value();
    switch (role) {
        case CodeRole:
            return node.code;
        case InDropRole:
            return inDrop;
        case Qt::DisplayRole:
            switch (index.column()) {
                case CodeColumn:
                    return node.code;
                case NameColumn:
                    return node.name;
                case RawTotalColumn:
                    return inDrop ? QLocale::c().toString(node.rawTotal) : QString();
                case CleanedTotalColumn: {
                    const auto total = m_workbench->cleanedTotal(node.code, m_measure);
                    return total ? QLocale::c().toString(static_cast<qlonglong>(*total))
                                 : QString();
                }
                case OpenFindingsColumn: {
                    const int open = m_workbench->openFindings(node.code);
                    return open > 0 ? QString::number(open) : QString();
                }
            }
            return {};
        case SortRole:
            switch (index.column()) {
                case RawTotalColumn:
                    return inDrop ? node.rawTotal : -1;
                case CleanedTotalColumn:
                    return static_cast<qlonglong>(
                        m_workbench->cleanedTotal(node.code, m_measure).value_or(-1));
                case OpenFindingsColumn:
                    return m_workbench->openFindings(node.code);
            }
            return data(index, Qt::DisplayRole);  // code and name sort by what they show
        case Qt::TextAlignmentRole:
            if (index.column() >= RawTotalColumn)
                return QVariant::fromValue(Qt::AlignRight | Qt::AlignVCenter);
            return {};
        case Qt::ForegroundRole:
            if (!inDrop)
                return QGuiApplication::palette().brush(QPalette::Disabled, QPalette::Text);
            return {};
        case Qt::FontRole:
            if (index.column() == CodeColumn) {
                QFont font;
                font.setFamilies({QStringLiteral("DejaVu Sans Mono"), QStringLiteral("monospace")});
                return font;
            }
            return {};
        case Qt::ToolTipRole:
            if (!inDrop)
                return tr("No rows for %1 in this release").arg(node.code);
            if (node.name.isEmpty() && m_workbench->regionRegister())
                return tr("%1 is not in the region register").arg(node.code);
            // The name column is narrow in the dock: the tooltip gives the name in full.
            if (!node.name.isEmpty())
                return tr("%1 %2: %3 reported days")
                    .arg(node.code, node.name)
                    .arg(node.reportedDays);
            return tr("%1: %2 reported days").arg(node.code).arg(node.reportedDays);
    }
    return {};
}

namespace {

// Each column's title and the tooltip that says what it counts, in column order.
struct ColumnHeader {
    const char* title;
    const char* toolTip;
};
constexpr std::array<ColumnHeader, RegionModel::ColumnCount> kColumnHeaders{{
    {QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Code"),
     QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel",
                       "Region code, exactly as written in the release")},
    {QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Name"),
     QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Name from the region register")},
    {QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Raw"),
     QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Total of the reported counts, as read")},
    {QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Cleaned"),
     QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel",
                       "Total after the ledger's decisions are replayed")},
    {QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Open"),
     QT_TRANSLATE_NOOP("siftwave::widgets::RegionModel", "Findings not yet decided")},
}};

}  // namespace

QVariant RegionModel::headerData(int section, Qt::Orientation orientation, int role) const {
    if (orientation != Qt::Horizontal || section < 0 || section >= ColumnCount)
        return {};
    const ColumnHeader& header = kColumnHeaders[static_cast<std::size_t>(section)];
    if (role == Qt::DisplayRole)
        return tr(header.title);
    if (role == Qt::ToolTipRole)
        return tr(header.toolTip);
    return {};
}

QModelIndex RegionModel::indexOfCode(const QString& code) const {
    for (int i = 0; i < static_cast<int>(m_nodes.size()); ++i) {
        if (m_nodes[i].code != code)
            continue;
        return createIndex(rowInParent(i), 0, static_cast<quintptr>(i));
    }
    return {};
}

}  // namespace siftwave::widgets
