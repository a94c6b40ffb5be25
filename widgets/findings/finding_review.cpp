#include "widgets/findings/finding_review.h"

#include "widgets/common/compact_sort_header.h"
#include "widgets/common/item_views.h"
#include "widgets/findings/finding_model.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QItemSelectionModel>
#include <QPushButton>
#include <QSet>
#include <QSortFilterProxyModel>
#include <QTableView>
#include <QVBoxLayout>

namespace siftwave::widgets {

class FindingReview::Filter : public QSortFilterProxyModel {
public:
    using QSortFilterProxyModel::QSortFilterProxyModel;
    QString kind, severity, state;
    void apply() { invalidateFilter(); }

protected:
    bool filterAcceptsRow(int row, const QModelIndex& parent) const override {
        const QModelIndex i = sourceModel()->index(row, 0, parent);
        if (!kind.isEmpty() && i.data(FindingModel::KindRole).toString() != kind)
            return false;
        if (!severity.isEmpty() && i.data(FindingModel::SeverityRole).toString() != severity)
            return false;
        const bool decided = i.data(FindingModel::DecidedRole).toBool();
        if (state == QStringLiteral("open") && decided)
            return false;
        if (state == QStringLiteral("decided") && !decided)
            return false;
        return true;
    }
};

FindingReview::FindingReview(FindingModel* model, QWidget* parent)
    : QWidget(parent),
      m_model(model),
      m_proxy(new Filter(this)),
      m_kind(new QComboBox(this)),
      m_severity(new QComboBox(this)),
      m_state(new QComboBox(this)),
      m_view(new QTableView(this)),
      m_decide(new QPushButton(tr("Decide…"), this)),
      m_next(new QPushButton(tr("Next open"), this)) {
    m_proxy->setSourceModel(m_model);
    m_proxy->setSortRole(FindingModel::SortRole);
    m_kind->setObjectName(QStringLiteral("findingKindFilter"));
    m_severity->setObjectName(QStringLiteral("findingSeverityFilter"));
    m_state->setObjectName(QStringLiteral("findingStateFilter"));
    m_severity->addItem(tr("any severity"), QString());
    for (const char* s : {"critical", "warning", "info"})
        m_severity->addItem(tr(s), QString::fromLatin1(s));
    m_state->addItem(tr("open and decided"), QString());
    m_state->addItem(tr("open"), QStringLiteral("open"));
    m_state->addItem(tr("decided"), QStringLiteral("decided"));
    rebuildKindFilter();

    m_view->setObjectName(QStringLiteral("findingTable"));
    m_view->setHorizontalHeader(new CompactSortHeader(m_view));
    m_view->setModel(m_proxy);
    m_view->setSortingEnabled(true);
    m_view->sortByColumn(FindingModel::RankColumn, Qt::AscendingOrder);
    setUpRecordTable(m_view);
    // No stretched last column: it would claim the default section size (100 px) for "open".
    m_view->horizontalHeader()->setStretchLastSection(false);
    m_decide->setObjectName(QStringLiteral("decideFinding"));
    m_decide->setToolTip(tr("Preview the suggested decision for the selected finding (Enter)"));
    m_next->setToolTip(tr("Go to the next open finding (N)"));
    m_next->setShortcut(QKeySequence(Qt::Key_N));

    // One row of filters and actions above the table, so a short dock keeps its rows for findings.
    auto* filters = new QHBoxLayout;
    filters->addWidget(m_kind, 1);
    filters->addWidget(m_severity);
    filters->addWidget(m_state);
    filters->addSpacing(8);
    filters->addWidget(m_next);
    filters->addWidget(m_decide);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addLayout(filters);
    layout->addWidget(m_view, 1);

    auto filterChanged = [this] {
        m_proxy->kind = m_kind->currentData().toString();
        m_proxy->severity = m_severity->currentData().toString();
        m_proxy->state = m_state->currentData().toString();
        m_proxy->apply();
    };
    for (QComboBox* box : {m_kind, m_severity, m_state})
        connect(box, &QComboBox::currentIndexChanged, this, filterChanged);
    connect(m_model, &QAbstractItemModel::modelReset, this, &FindingReview::rebuildKindFilter);
    connect(m_view->selectionModel(), &QItemSelectionModel::currentRowChanged, this, [this] {
        const QString id = currentFinding();
        m_decide->setEnabled(!id.isEmpty());
        if (!id.isEmpty())
            Q_EMIT findingSelected(id);
    });
    connect(m_view, &QTableView::activated, this, [this] {
        if (!currentFinding().isEmpty())
            Q_EMIT decideRequested(currentFinding());
    });
    connect(m_decide, &QPushButton::clicked, this, [this] {
        if (!currentFinding().isEmpty())
            Q_EMIT decideRequested(currentFinding());
    });
    connect(m_next, &QPushButton::clicked, this, &FindingReview::selectNextOpen);
    m_decide->setEnabled(false);
}

void FindingReview::rebuildKindFilter() {
    const QString current = m_kind->currentData().toString();
    QStringList kinds;
    for (int r = 0; r < m_model->rowCount(); ++r) {
        const QString k = m_model->index(r, 0).data(FindingModel::KindRole).toString();
        if (!kinds.contains(k))
            kinds << k;
    }
    kinds.sort();
    const QSignalBlocker block(m_kind);
    m_kind->clear();
    m_kind->addItem(tr("every kind"), QString());
    for (const QString& k : kinds)
        m_kind->addItem(QString(k).replace(QLatin1Char('_'), QLatin1Char(' ')), k);
    m_kind->setCurrentIndex(std::max(0, m_kind->findData(current)));
}

void FindingReview::setFilters(const QString& kind, const QString& severity, const QString& state) {
    m_kind->setCurrentIndex(std::max(0, m_kind->findData(kind)));
    m_severity->setCurrentIndex(std::max(0, m_severity->findData(severity)));
    m_state->setCurrentIndex(std::max(0, m_state->findData(state)));
}

bool FindingReview::selectFinding(const QString& id) {
    const int row = m_model->rowOf(id);
    if (row < 0)
        return false;
    // Filtered out: show everything.
    return selectThroughFilter(m_view, m_proxy, m_model->index(row, 0),
                               [this] { setFilters({}, {}, {}); });
}

QString FindingReview::currentFinding() const {
    const QModelIndex current = m_view->selectionModel()->currentIndex();
    return current.isValid() ? current.data(FindingModel::IdRole).toString() : QString();
}

bool FindingReview::selectNextOpen() {
    const int start = m_view->selectionModel()->currentIndex().row();
    for (int step = 1; step <= m_proxy->rowCount(); ++step) {
        const int row = (start + step + m_proxy->rowCount()) % std::max(1, m_proxy->rowCount());
        const QModelIndex i = m_proxy->index(row, 0);
        if (i.data(FindingModel::DecidedRole).toBool())
            continue;
        m_view->selectionModel()->setCurrentIndex(
            i, QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
        return true;
    }
    return false;
}

}  // namespace siftwave::widgets
