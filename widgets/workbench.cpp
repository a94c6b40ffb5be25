#include "widgets/workbench.h"

#include "siftwave/series/smoothing.h"

#include <QCoreApplication>
#include <QFileInfo>

namespace siftwave::widgets {

Workbench::Workbench(QObject* parent) : QObject(parent) {}

QString Workbench::dropPath() const {
    return m_drop ? QString::fromStdString(m_drop->source.path) : QString();
}

SeriesView Workbench::seriesView(const QString& regionCode, int measure, int secondMeasure) const {
    if (!m_drop || measure < 0 || measure >= static_cast<int>(m_drop->measures.size()))
        return {};
    const std::optional<std::size_t> region = m_drop->regionIndex(regionCode.toStdString());
    if (!region)
        return {};
    SeriesView view = seriesViewFromDrop(*m_drop, *region, static_cast<std::size_t>(measure));
    if (m_register)
        if (const RegionEntry* entry = m_register->find(m_drop->regionCodes[*region]))
            view.regionName = QString::fromStdString(entry->name);
    view.smoothed = series::centredMovingAverage(view.cleaned, 7);
    view.smoothedLabel = QCoreApplication::translate("Workbench", "7-day centred mean");
    if (m_previous)
        addPreviousRelease(view, *m_previous,
                           QFileInfo(QString::fromStdString(m_previous->source.path)).fileName());
    if (secondMeasure >= 0 && secondMeasure < static_cast<int>(m_drop->measures.size()) &&
        secondMeasure != measure)
        addSecondMeasure(view, *m_drop, *region, static_cast<std::size_t>(secondMeasure));
    return view;
}

std::vector<double> Workbench::cleanedCounts(const QString& regionCode, int measure) const {
    if (!m_drop || measure < 0 || measure >= static_cast<int>(m_drop->measures.size())) return {};
    const std::optional<std::size_t> region = m_drop->regionIndex(regionCode.toStdString());
    if (!region) return {};
    // With no decisions recorded, the cleaned series is the raw one (replay of an empty ledger).
    return seriesViewFromDrop(*m_drop, *region, static_cast<std::size_t>(measure)).cleaned;
}

std::optional<double> Workbench::population(const QString& regionCode) const {
    if (!m_register) return std::nullopt;
    const RegionEntry* entry = m_register->find(regionCode.toStdString());
    if (!entry || !entry->population) return std::nullopt;
    return static_cast<double>(*entry->population);
}

Result<fit::FitResult> Workbench::fitRegion(const QString& regionCode, int measure,
                                            const fit::FitOptions& options) const {
    const std::vector<double> counts = cleanedCounts(regionCode, measure);
    if (counts.empty())
        return makeError(ErrorCode::NotFound, "no such region or measure in the open drop");
    return fit::fitSeries(fit::DailySeries{m_drop->firstDay, counts}, options, population(regionCode));
}

std::vector<fit::ModelComparisonRow> Workbench::compareModels(const QString& regionCode, int measure,
                                                              const fit::FitOptions& options) const {
    const std::vector<double> counts = cleanedCounts(regionCode, measure);
    if (counts.empty()) return {};
    return fit::compareModels(fit::DailySeries{m_drop->firstDay, counts}, options, population(regionCode));
}

void Workbench::setDrop(std::shared_ptr<const Drop> drop,
                        std::shared_ptr<const RegionRegister> regionRegister) {
    m_drop = std::move(drop);
    m_register = std::move(regionRegister);
    m_previous.reset();  // it was the previous release of another drop
    Q_EMIT dropChanged();
}

QString Workbench::previousPath() const {
    return m_previous ? QString::fromStdString(m_previous->source.path) : QString();
}

void Workbench::setPreviousDrop(std::shared_ptr<const Drop> previous) {
    m_previous = std::move(previous);
    Q_EMIT previousChanged();
}

void Workbench::close() {
    m_drop.reset();
    m_register.reset();
    m_previous.reset();
    Q_EMIT dropChanged();
}

}  // namespace siftwave::widgets
