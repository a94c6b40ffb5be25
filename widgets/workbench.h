#pragma once
// Workbench: the one document the window shows — the open Drop, its region
// register (when there is one) and, as the core parts land, the findings, the
// ledger and the fits. It owns no logic of its own: it keeps the core's values,
// hands them out read-only, and says when they change. Every change to the data
// will go through one door, apply(), so that undo maps to a ledger withdrawal.

#include "siftwave/drop.h"
#include "siftwave/region_register.h"
#include "widgets/series_view.h"

#include <QObject>
#include <QString>

#include <memory>

namespace siftwave::widgets {

class Workbench : public QObject {
    Q_OBJECT

public:
    explicit Workbench(QObject* parent = nullptr);

    bool hasDrop() const { return m_drop != nullptr; }
    /// The open drop; only valid when hasDrop().
    const Drop& drop() const { return *m_drop; }
    std::shared_ptr<const Drop> sharedDrop() const { return m_drop; }
    /// The region register, or nullptr when the drop came without one.
    const RegionRegister* regionRegister() const { return m_register.get(); }
    QString dropPath() const;

    /// Everything the plot shows for one region: raw, cleaned, smoothed (7-day centred
    /// mean of the cleaned series), and a second measure when `secondMeasure` >= 0.
    /// An empty view when the drop has no such region or measure.
    SeriesView seriesView(const QString& regionCode, int measure, int secondMeasure = -1) const;

    /// Replaces the open drop (and its register, which may be null).
    void setDrop(std::shared_ptr<const Drop> drop,
                 std::shared_ptr<const RegionRegister> regionRegister);
    void close();

Q_SIGNALS:
    /// A different drop is open (or none): every view rebuilds.
    void dropChanged();

private:
    std::shared_ptr<const Drop> m_drop;
    std::shared_ptr<const RegionRegister> m_register;
};

}  // namespace siftwave::widgets
