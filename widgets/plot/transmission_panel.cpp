#include "widgets/plot/transmission_panel.h"

#include "widgets/plot/qcustomplot_include.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QLabel>
#include <QResizeEvent>
#include <QVBoxLayout>

namespace siftwave::widgets {

TransmissionPanel::TransmissionPanel(QWidget* parent)
    : QWidget(parent), m_measure(new QComboBox), m_caution(new QLabel), m_plot(new QCustomPlot) {
    setObjectName(QStringLiteral("transmissionPanel"));
    m_measure->setObjectName(QStringLiteral("transmissionMeasure"));
    m_measure->addItem(transmissionMeasureName(TransmissionMeasure::ReproductionNumber));
    m_measure->addItem(transmissionMeasureName(TransmissionMeasure::GrowthRate));
    m_caution->setObjectName(QStringLiteral("transmissionCaution"));
    m_caution->setText(QString::fromUtf8(transmission::caution));
    m_caution->setWordWrap(true);
    m_caution->setStyleSheet(QStringLiteral("color: #555; font-size: 8pt; padding: 0 6px;"));
    m_plot->setObjectName(QStringLiteral("transmissionPlot"));
    m_plot->setMinimumHeight(150);
    m_chart = std::make_unique<TransmissionChart>(m_plot, m_plot->axisRect());

    auto* bar = new QHBoxLayout;
    bar->setContentsMargins(6, 0, 6, 0);
    bar->addWidget(new QLabel(tr("Transmission:")));
    bar->addWidget(m_measure);
    bar->addStretch(1);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(0, 2, 0, 2);
    layout->setSpacing(2);
    layout->addLayout(bar);
    layout->addWidget(m_plot, 1);
    layout->addWidget(m_caution);
    connect(m_measure, &QComboBox::currentIndexChanged, this, [this](int) { redraw(); });
    redraw();
}

TransmissionPanel::~TransmissionPanel() = default;

void TransmissionPanel::resizeEvent(QResizeEvent* event) {
    QWidget::resizeEvent(event);
    const int needed = m_caution->heightForWidth(width());
    if (needed > 0 && needed != m_caution->minimumHeight())
        m_caution->setMinimumHeight(needed);
}

void TransmissionPanel::setResult(std::optional<transmission::TransmissionResult> result,
                                  const QString& note) {
    m_result = std::move(result);
    m_note = note;
    redraw();
}

TransmissionMeasure TransmissionPanel::measure() const {
    return m_measure->currentIndex() == 1 ? TransmissionMeasure::GrowthRate
                                          : TransmissionMeasure::ReproductionNumber;
}

void TransmissionPanel::chooseMeasure(TransmissionMeasure measure) {
    m_measure->setCurrentIndex(measure == TransmissionMeasure::GrowthRate ? 1 : 0);
}

void TransmissionPanel::redraw() {
    m_chart->draw(m_result ? &*m_result : nullptr, measure(), m_note);
    m_plot->replot(QCustomPlot::rpQueuedReplot);
}

void TransmissionPanel::follow(QCustomPlot* seriesPlot) {
    connect(seriesPlot->xAxis, qOverload<const QCPRange&>(&QCPAxis::rangeChanged), this,
            [this](const QCPRange& range) {
                m_plot->xAxis->setRange(range);
                m_plot->replot(QCustomPlot::rpQueuedReplot);
            });
    connect(seriesPlot, &QCustomPlot::afterReplot, this, [this, seriesPlot] {
        // The series plot's tick count follows its width (one date label per 120 pixels); the
        // same count on the same range and width gives the same ticks, and labels that do not
        // run into each other.
        const int ticks = seriesPlot->xAxis->ticker()->tickCount();
        if (m_plot->xAxis->ticker()->tickCount() != ticks) {
            m_plot->xAxis->ticker()->setTickCount(ticks);
            m_plot->replot(QCustomPlot::rpQueuedReplot);
        }
        alignWith(seriesPlot);
    });
    m_plot->xAxis->setRange(seriesPlot->xAxis->range());
}

void TransmissionPanel::alignWith(QCustomPlot* seriesPlot) {
    // The series plot's data area in global x, then our margins to put ours at the same x.
    const QRect theirs = seriesPlot->axisRect()->rect();
    const int left = seriesPlot->mapToGlobal(QPoint(theirs.left(), 0)).x() -
                     m_plot->mapToGlobal(QPoint(0, 0)).x();
    const int right = m_plot->mapToGlobal(QPoint(m_plot->width(), 0)).x() -
                      seriesPlot->mapToGlobal(QPoint(theirs.right() + 1, 0)).x();
    QCPAxisRect* rect = m_plot->axisRect();
    const QMargins ours = rect->margins();
    if (left <= 0 || right < 0 ||
        (ours.left() == left && ours.right() == right &&
         rect->autoMargins() == (QCP::msTop | QCP::msBottom)))
        return;
    rect->setAutoMargins(QCP::msTop | QCP::msBottom);
    rect->setMargins(QMargins(left, ours.top(), right, ours.bottom()));
    m_plot->replot(QCustomPlot::rpQueuedReplot);
}

}  // namespace siftwave::widgets
