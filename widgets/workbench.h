#pragma once
// Workbench: the one document the window shows — the open Drop, its region
// register (when there is one) and, as the core parts land, the findings, the
// ledger and the fits. It owns no logic of its own: it keeps the core's values,
// hands them out read-only, and says when they change. Every change to the data
// will go through one door, apply(), so that undo maps to a ledger withdrawal.

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/result.h"
#include "siftwave/region_register.h"
#include "widgets/series_view.h"

#include <QObject>
#include <QString>

#include <memory>
#include <optional>
#include <vector>

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

    /// The previous release, to compare against (nullptr when none is open).
    const Drop* previousDrop() const { return m_previous.get(); }
    QString previousPath() const;
    void setPreviousDrop(std::shared_ptr<const Drop> previous);

    /// Everything the plot shows for one region: raw, cleaned, smoothed (7-day centred
    /// mean of the cleaned series), the previous release when one is open, and a second measure when `secondMeasure` >= 0.
    /// An empty view when the drop has no such region or measure.
    SeriesView seriesView(const QString& regionCode, int measure, int secondMeasure = -1) const;

    /// The cleaned daily counts of a region (NaN where there is no value); empty when unknown.
    std::vector<double> cleanedCounts(const QString& regionCode, int measure) const;
    /// The region's population from the register, when known.
    std::optional<double> population(const QString& regionCode) const;
    /// Fits one wave of the region's cleaned counts (fit::fitSeries).
    Result<fit::FitResult> fitRegion(const QString& regionCode, int measure, const fit::FitOptions& options) const;
    /// The four models on the same window and method (fit::compareModels).
    std::vector<fit::ModelComparisonRow> compareModels(const QString& regionCode, int measure,
                                                       const fit::FitOptions& options) const;

    /// Replaces the open drop (and its register, which may be null).
    void setDrop(std::shared_ptr<const Drop> drop,
                 std::shared_ptr<const RegionRegister> regionRegister);
    void close();

Q_SIGNALS:
    /// A different drop is open (or none): every view rebuilds.
    void dropChanged();
    /// A previous release was opened or closed.
    void previousChanged();

private:
    std::shared_ptr<const Drop> m_drop;
    std::shared_ptr<const RegionRegister> m_register;
    std::shared_ptr<const Drop> m_previous;
};

}  // namespace siftwave::widgets
