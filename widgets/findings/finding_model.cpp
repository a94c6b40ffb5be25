#include "widgets/findings/finding_model.h"

#include "widgets/common/workbench.h"
#include "widgets/plot/plot_style.h"

#include <QFont>

namespace siftwave::widgets {

FindingModel::FindingModel(Workbench* workbench, QObject* parent)
    : TitledTableModel({tr("#"), tr("Severity"), tr("Kind"), tr("Region"), tr("Measure"),
                        tr("Dates"), tr("State")},
                       parent),
      m_workbench(workbench) {
    connect(m_workbench, &Workbench::dropChanged, this, &FindingModel::resetRows);
    connect(m_workbench, &Workbench::findingsChanged, this, &FindingModel::resetRows);
    connect(m_workbench, &Workbench::ledgerChanged, this, [this] {
        if (rowCount() > 0)
            Q_EMIT dataChanged(index(0, StateColumn), index(rowCount() - 1, StateColumn));
    });
}

int FindingModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : static_cast<int>(m_workbench->findings().size());
}

int FindingModel::rowOf(const QString& id) const {
    const auto& findings = m_workbench->findings();
    for (int i = 0; i < static_cast<int>(findings.size()); ++i)
        if (QString::fromStdString(findings[i].id) == id)
            return i;
    return -1;
}

QVariant FindingModel::data(const QModelIndex& index, int role) const {
    const auto& findings = m_workbench->findings();
    if (!index.isValid() || index.row() >= static_cast<int>(findings.size()))
        return {};
    const scan::Finding& f = findings[index.row()];
    const bool decided = m_workbench->isDecided(f.id);
    switch (role) {
        case IdRole:
            return QString::fromStdString(f.id);
        case KindRole:
            return QString::fromLatin1(scan::findingKindName(f.kind));
        case SeverityRole:
            return QString::fromLatin1(scan::severityName(f.severity));
        case DecidedRole:
            return decided;
        case SortRole:
            if (index.column() == RankColumn || index.column() == SeverityColumn)
                return f.rank;
            return data(index, Qt::DisplayRole);
        case Qt::DisplayRole:
            switch (index.column()) {
                case RankColumn:
                    return f.rank;
                case SeverityColumn:
                    // Words, not only colour: readable in greyscale and with colour-vision
                    // deficiency.
                    return QString::fromLatin1(scan::severityName(f.severity));
                case KindColumn:
                    return QString::fromLatin1(scan::findingKindName(f.kind))
                        .replace(QLatin1Char('_'), QLatin1Char(' '));
                case RegionColumn:
                    return f.region ? QString::fromStdString(*f.region) : tr("(all)");
                case MeasureColumn:
                    return f.measure ? QString::fromStdString(*f.measure) : tr("(all)");
                case DaysColumn:
                    if (!f.first)
                        return QString();
                    if (!f.last || *f.last == *f.first)
                        return QString::fromStdString(f.first->iso());
                    return QStringLiteral("%1 … %2").arg(QString::fromStdString(f.first->iso()),
                                                         QString::fromStdString(f.last->iso()));
                case StateColumn:
                    return decided ? tr("decided") : tr("open");
            }
            return {};
        case Qt::ToolTipRole:
            return QStringLiteral("%1\nevidence: %2\nsuggestion: %3")
                .arg(QString::fromStdString(f.id), QString::fromStdString(f.evidence.dump()),
                     QString::fromStdString(scan::suggestionText(f)));
        case Qt::FontRole:
            if (index.column() == SeverityColumn && f.severity == scan::Severity::Critical) {
                QFont bold;
                bold.setBold(true);
                return bold;
            }
            if (decided) {
                QFont struck;
                struck.setItalic(true);
                return struck;
            }
            return {};
        case Qt::ForegroundRole:
            if (index.column() == SeverityColumn && f.severity == scan::Severity::Critical)
                return plot_style::kVermillion.darker(130);
            return {};
    }
    return {};
}

}  // namespace siftwave::widgets
