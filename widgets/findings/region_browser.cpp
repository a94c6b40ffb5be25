#include "widgets/findings/region_browser.h"

#include "widgets/common/compact_sort_header.h"
#include "widgets/common/item_views.h"
#include "widgets/findings/region_model.h"

#include <QHeaderView>
#include <QItemSelectionModel>
#include <QLineEdit>
#include <QSortFilterProxyModel>
#include <QTreeView>
#include <QVBoxLayout>

namespace siftwave::widgets {

RegionBrowser::RegionBrowser(RegionModel* model, QWidget* parent)
    : QWidget(parent),
      m_model(model),
      m_proxy(new QSortFilterProxyModel(this)),
      m_search(new QLineEdit(this)),
      m_view(new QTreeView(this)) {
    m_proxy->setSourceModel(m_model);
    m_proxy->setSortRole(RegionModel::SortRole);
    m_proxy->setFilterKeyColumn(-1);  // code or name
    m_proxy->setFilterCaseSensitivity(Qt::CaseInsensitive);
    m_proxy->setRecursiveFilteringEnabled(true);

    m_search->setPlaceholderText(tr("Find a region by code or name"));
    m_search->setClearButtonEnabled(true);
    m_search->setObjectName(QStringLiteral("regionSearch"));

    m_view->setObjectName(QStringLiteral("regionTree"));
    // The short count columns keep no room for a sort arrow they do not show: the name gets it.
    auto* header = new CompactSortHeader(m_view);
    header->setSectionsMovable(true);  // as QTreeView's own header
    header->setHighlightSections(false);
    header->setDefaultAlignment(Qt::AlignLeft | Qt::AlignVCenter);
    m_view->setHeader(header);
    m_view->setModel(m_proxy);
    m_view->setSortingEnabled(true);
    m_view->sortByColumn(-1, Qt::AscendingOrder);  // register order until the user sorts
    m_view->setUniformRowHeights(true);
    m_view->setAlternatingRowColors(true);
    m_view->setSelectionMode(QAbstractItemView::SingleSelection);
    m_view->setSelectionBehavior(QAbstractItemView::SelectRows);
    m_view->header()->setStretchLastSection(false);
    for (int c = 0; c < RegionModel::ColumnCount; ++c)
        m_view->header()->setSectionResizeMode(
            c, c == RegionModel::NameColumn ? QHeaderView::Stretch : QHeaderView::ResizeToContents);

    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(0, 0, 0, 0);
    layout->setSpacing(4);
    layout->addWidget(m_search);
    layout->addWidget(m_view);

    connect(m_search, &QLineEdit::textChanged, this, [this](const QString& text) {
        m_proxy->setFilterFixedString(text);
        if (!text.isEmpty())
            m_view->expandAll();
    });
    connect(m_view->selectionModel(), &QItemSelectionModel::currentRowChanged, this,
            &RegionBrowser::onCurrentChanged);
    connect(m_model, &QAbstractItemModel::modelReset, this, [this] {
        m_view->expandToDepth(0);
        const QString previous = m_current;
        m_current.clear();
        if (previous.isEmpty() || !selectRegion(previous))
            Q_EMIT regionSelected(QString());
    });
}

bool RegionBrowser::selectRegion(const QString& code) {
    // Hidden by the search: clear it so the selection is visible.
    return selectThroughFilter(m_view, m_proxy, m_model->indexOfCode(code),
                               [this] { m_search->clear(); });
}

QString RegionBrowser::currentRegion() const {
    return m_current;
}

QString RegionBrowser::firstRegionWithData() const {
    // Depth-first over the model in its own (register) order.
    std::vector<QModelIndex> stack;
    for (int r = m_model->rowCount() - 1; r >= 0; --r)
        stack.push_back(m_model->index(r, 0));
    while (!stack.empty()) {
        const QModelIndex index = stack.back();
        stack.pop_back();
        if (index.data(RegionModel::InDropRole).toBool())
            return index.data(RegionModel::CodeRole).toString();
        for (int r = m_model->rowCount(index) - 1; r >= 0; --r)
            stack.push_back(m_model->index(r, 0, index));
    }
    return {};
}

void RegionBrowser::onCurrentChanged() {
    const QModelIndex current = m_view->selectionModel()->currentIndex();
    const QString code =
        current.isValid() ? current.data(RegionModel::CodeRole).toString() : QString();
    if (code == m_current)
        return;
    m_current = code;
    Q_EMIT regionSelected(code);
}

}  // namespace siftwave::widgets
