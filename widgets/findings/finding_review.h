#pragma once
// FindingReview: the ranked findings with filters (kind, severity, state) and the
// review loop's actions: decide the selected finding (preview its suggested
// decision), or go to the next open one.

#include <QString>
#include <QWidget>

class QComboBox;
class QPushButton;
class QSortFilterProxyModel;
class QTableView;

namespace siftwave::widgets {

class FindingModel;

class FindingReview : public QWidget {
    Q_OBJECT

public:
    explicit FindingReview(FindingModel* model, QWidget* parent = nullptr);

    bool selectFinding(const QString& id);
    QString currentFinding() const;
    /// Selects the next open finding after the current one (in the shown order).
    bool selectNextOpen();
    QTableView* view() const { return m_view; }
    void setFilters(const QString& kind, const QString& severity, const QString& state);

Q_SIGNALS:
    void findingSelected(const QString& id);
    /// The analyst wants to decide this finding (preview its suggestion).
    void decideRequested(const QString& id);

private:
    void rebuildKindFilter();

    FindingModel* m_model;
    class Filter;
    Filter* m_proxy;
    QComboBox* m_kind;
    QComboBox* m_severity;
    QComboBox* m_state;
    QTableView* m_view;
    QPushButton* m_decide;
    QPushButton* m_next;
};

}  // namespace siftwave::widgets
