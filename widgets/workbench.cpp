#include "widgets/workbench.h"

#include "siftwave/series/smoothing.h"

#include <QCoreApplication>

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
    if (secondMeasure >= 0 && secondMeasure < static_cast<int>(m_drop->measures.size()) &&
        secondMeasure != measure)
        addSecondMeasure(view, *m_drop, *region, static_cast<std::size_t>(secondMeasure));
    return view;
}

void Workbench::setDrop(std::shared_ptr<const Drop> drop,
                        std::shared_ptr<const RegionRegister> regionRegister) {
    m_drop = std::move(drop);
    m_register = std::move(regionRegister);
    Q_EMIT dropChanged();
}

void Workbench::close() {
    m_drop.reset();
    m_register.reset();
    Q_EMIT dropChanged();
}

}  // namespace siftwave::widgets
