#include "widgets/ledger/ledger_view.h"

#include "widgets/common/item_views.h"
#include "widgets/common/workbench.h"

#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/ledger/replay.h"

#include <QFileInfo>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QItemSelectionModel>
#include <QLabel>
#include <QLocale>
#include <QPushButton>
#include <QStyle>
#include <QTableView>
#include <QVBoxLayout>

namespace siftwave::widgets {
namespace {

/// "ana", "unknown key 1a2b3c4d5e6f7a8b" or "—" (unsigned).
QString signerText(const std::vector<ledger::SignatureCheck>& signers, int row) {
    if (row < 0 || row >= static_cast<int>(signers.size()))
        return {};
    const ledger::SignatureCheck& c = signers[static_cast<std::size_t>(row)];
    switch (c.state) {
        case ledger::SignatureState::Trusted:
            return QString::fromStdString(c.holder);
        case ledger::SignatureState::UnknownKey:
            return LedgerModel::tr("unknown key %1").arg(QString::fromStdString(c.keyId));
        case ledger::SignatureState::Unsigned:
            break;
    }
    return QStringLiteral("—");
}

}  // namespace

LedgerModel::LedgerModel(Workbench* workbench, QObject* parent)
    : TitledTableModel({tr("#"), tr("Time (UTC)"), tr("Author"), tr("Signed by"), tr("Decision"),
                        tr("Where"), tr("Moved"), tr("Reason"), tr("State")},
                       parent),
      m_workbench(workbench) {
    connect(m_workbench, &Workbench::dropChanged, this, &LedgerModel::resetRows);
    connect(m_workbench, &Workbench::ledgerChanged, this, &LedgerModel::resetRows);
}

int LedgerModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : static_cast<int>(m_workbench->ledger().entries.size());
}

QVariant LedgerModel::data(const QModelIndex& index, int role) const {
    const auto& entries = m_workbench->ledger().entries;
    if (!index.isValid() || index.row() >= static_cast<int>(entries.size()))
        return {};
    const ledger::LedgerEntry& e = entries[index.row()];
    const ledger::Decision& d = e.decision;
    const bool inEffect = m_workbench->cleaned().inEffect(e.sequence);
    if (role == SequenceRole)
        return static_cast<qulonglong>(e.sequence);
    if (role == Qt::ToolTipRole) {
        const QString chain = tr("entry %1 · hash %2 · previous %3")
                                  .arg(e.sequence)
                                  .arg(QString::fromStdString(e.hash.substr(0, 16)),
                                       QString::fromStdString(e.previousHash.substr(0, 16)));
        // The reason in full, where a narrow dock cuts its column.
        if (index.column() == ReasonColumn)
            return QStringLiteral("%1\n%2").arg(QString::fromStdString(e.reason), chain);
        return chain;
    }
    if (role != Qt::DisplayRole)
        return {};
    switch (index.column()) {
        case SequenceColumn:
            return static_cast<qulonglong>(e.sequence);
        case TimeColumn:
            return QString::fromStdString(e.timestamp);
        case AuthorColumn:
            return QString::fromStdString(e.author);
        case SignedColumn:
            return signerText(m_workbench->signers(), index.row());
        case KindColumn:
            if (d.kind == ledger::DecisionKind::Withdraw)
                return tr("withdraw #%1").arg(d.target);
            return QString::fromLatin1(ledger::decisionKindName(d.kind))
                .replace(QLatin1Char('_'), QLatin1Char(' '));
        case WhereColumn:
            return QString::fromStdString(ledger::decisionWhere(d, ledger::WhereStyle::Compact))
                .trimmed();
        case MovedColumn: {
            // The totals the entry moved: "conserved" or the net change, and how many cells.
            const std::int64_t net = e.effect.netChange();
            const QString cells =
                tr("%n cell(s)", nullptr, static_cast<int>(e.effect.cells.size()));
            if (net == 0)
                return tr("%1, totals kept").arg(cells);
            return tr("%1, total %2%3")
                .arg(cells, net > 0 ? QStringLiteral("+") : QString())
                .arg(net);
        }
        case ReasonColumn:
            return QString::fromStdString(e.reason);
        case StateColumn:
            return inEffect ? tr("in effect") : tr("withdrawn");
    }
    return {};
}

LedgerView::LedgerView(Workbench* workbench, QWidget* parent)
    : QWidget(parent),
      m_workbench(workbench),
      m_model(new LedgerModel(workbench, this)),
      m_status(new QLabel(this)),
      m_view(new QTableView(this)),
      m_withdraw(new QPushButton(tr("Withdraw…"), this)) {
    m_status->setObjectName(QStringLiteral("chainStatusOk"));
    m_status->setTextInteractionFlags(Qt::TextSelectableByMouse);
    // Wraps rather than widening the dock; the ledger's full path is in the tooltip.
    m_status->setWordWrap(true);
    m_status->setSizePolicy(QSizePolicy::Ignored, QSizePolicy::Preferred);
    m_view->setObjectName(QStringLiteral("ledgerTable"));
    m_view->setModel(m_model);
    setUpRecordTable(m_view);
    m_view->horizontalHeader()->setSectionResizeMode(LedgerModel::ReasonColumn,
                                                     QHeaderView::Stretch);
    m_withdraw->setObjectName(QStringLiteral("withdrawEntry"));
    m_withdraw->setToolTip(tr("Append a withdrawal of the selected entry (history is kept)"));

    auto* top = new QHBoxLayout;
    top->addWidget(m_status, 1);
    top->addWidget(m_withdraw);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addLayout(top);
    layout->addWidget(m_view, 1);

    connect(m_workbench, &Workbench::ledgerChanged, this, &LedgerView::updateStatus);
    connect(m_workbench, &Workbench::dropChanged, this, &LedgerView::updateStatus);
    connect(m_withdraw, &QPushButton::clicked, this, [this] {
        if (const std::uint64_t sequence = currentEntry())
            Q_EMIT withdrawRequested(sequence);
    });
    connect(m_model, &QAbstractItemModel::modelReset, this, [this] {
        m_withdraw->setEnabled(false);
        m_view->scrollToBottom();
    });
    connect(m_view->selectionModel(), &QItemSelectionModel::currentRowChanged, this, [this] {
        const std::uint64_t sequence = currentEntry();
        m_withdraw->setEnabled(sequence > 0 && m_workbench->cleaned().inEffect(sequence));
    });
    m_withdraw->setEnabled(false);
    updateStatus();
}

void LedgerView::updateStatus() {
    if (m_workbench->ledgerPath().isEmpty()) {
        // No ledger open (no drop yet): a bare tick would read as "verified".
        m_status->setText(tr("No ledger open: open a drop, and its ledger opens with it"));
        m_status->setToolTip(QString());
        m_status->setObjectName(QStringLiteral("chainStatusNone"));
        m_status->style()->unpolish(m_status);
        m_status->style()->polish(m_status);
        return;
    }
    const bool ok = m_workbench->chainOk();
    QString text = (ok ? QStringLiteral("✔ ") : QStringLiteral("✖ ")) + m_workbench->chainStatus();
    if (!m_workbench->ledgerPath().isEmpty()) {
        // A drop's own ledger is named by its SHA-256: the first and last digits say enough.
        QString name = QFileInfo(m_workbench->ledgerPath()).fileName();
        if (name.size() > 40)
            name = name.left(12) + QStringLiteral("…") + name.right(14);
        text += QStringLiteral(" · ") + name;
    }
    m_status->setText(text);
    m_status->setToolTip(m_workbench->ledgerPath() + QStringLiteral("\n\n") +
                         m_workbench->chainScope());
    m_status->setObjectName(ok ? QStringLiteral("chainStatusOk")
                               : QStringLiteral("chainStatusBroken"));
    m_status->style()->unpolish(m_status);
    m_status->style()->polish(m_status);
}

std::uint64_t LedgerView::currentEntry() const {
    const QModelIndex current = m_view->selectionModel()->currentIndex();
    return current.isValid() ? current.data(LedgerModel::SequenceRole).toULongLong() : 0;
}

void LedgerView::selectEntry(std::uint64_t sequence) {
    if (sequence == 0 || sequence > static_cast<std::uint64_t>(m_model->rowCount()))
        return;
    m_view->selectionModel()->setCurrentIndex(
        m_model->index(static_cast<int>(sequence - 1), 0),
        QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
}

}  // namespace siftwave::widgets
