#include "widgets/plot/series_plot.h"

#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"

#include <QComboBox>
#include <QElapsedTimer>
#include <QHBoxLayout>
#include <QLabel>
#include <QMenu>
#include <QMouseEvent>
#include <QResizeEvent>
#include <QSignalBlocker>
#include <QToolButton>
#include <QToolTip>
#include <QVBoxLayout>

#include <algorithm>
#include <cmath>

namespace siftwave::widgets {

namespace {
constexpr double kEdgeGrabPixels = 6.0;
}

SeriesPlot::SeriesPlot(QWidget* parent)
    : QWidget(parent),
      m_title(new QLabel(this)),
      m_measure(new QComboBox(this)),
      m_second(new QComboBox(this)),
      m_reset(new QToolButton(this)),
      m_plot(new QCustomPlot(this)),
      m_chart(std::make_unique<SeriesChart>(m_plot)) {
    m_chart->useLiveLayer();
    m_chart->setScaleToCleaned(true);
    // Whatever asked for it, a full replot brings every layer up to date.
    connect(m_plot, &QCustomPlot::afterReplot, this, [this] {
        m_paintedRevision = m_chart->fullReplotRevision();
        m_lastRepaintMs = m_plot->replotTime();
        m_lastRepaintLiveOnly = false;
    });
    m_title->setObjectName(QStringLiteral("seriesTitle"));
    m_title->setTextFormat(Qt::RichText);
    m_measure->setObjectName(QStringLiteral("measureChoice"));
    m_measure->setToolTip(tr("Measure drawn as bars and lines (left axis)"));
    m_second->setObjectName(QStringLiteral("secondMeasureChoice"));
    m_second->setToolTip(tr("A second measure drawn on the right axis"));
    m_reset->setText(tr("Reset view"));
    m_reset->setToolTip(tr("Show the whole release (Home)"));
    m_reset->setShortcut(QKeySequence(Qt::Key_Home));
    m_plot->setObjectName(QStringLiteral("seriesCanvas"));
    m_plot->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
    m_plot->axisRect()->setRangeDrag(Qt::Horizontal);
    m_plot->axisRect()->setRangeZoom(Qt::Horizontal);
    m_plot->setMouseTracking(true);
    m_plot->installEventFilter(this);
    m_plot->setMinimumSize(320, 200);
    m_plot->setContextMenuPolicy(Qt::CustomContextMenu);
    connect(m_plot, &QWidget::customContextMenuRequested, this, [this](const QPoint& pos) {
        QMenu* menu = createContextMenu(m_chart->dayIndexAtPixel(pos.x()));
        menu->setAttribute(Qt::WA_DeleteOnClose);
        menu->popup(m_plot->mapToGlobal(pos));
    });

    auto* bar = new QHBoxLayout;
    bar->setContentsMargins(6, 4, 6, 0);
    bar->addWidget(m_title, 1);
    bar->addWidget(new QLabel(tr("Measure"), this));
    bar->addWidget(m_measure);
    bar->addWidget(new QLabel(tr("and"), this));
    bar->addWidget(m_second);
    bar->addWidget(m_reset);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(0, 0, 0, 0);
    layout->setSpacing(2);
    layout->addLayout(bar);
    layout->addWidget(m_plot, 1);

    connect(m_reset, &QToolButton::clicked, this, &SeriesPlot::resetView);
    connect(m_measure, &QComboBox::currentIndexChanged, this, [this](int index) {
        if (index >= 0)
            Q_EMIT measureChosen(index);
    });
    connect(m_second, &QComboBox::currentIndexChanged, this,
            [this](int) { Q_EMIT secondMeasureChosen(secondMeasure()); });
    setMeasures({});
    updateTitle();
    showEmptyNote();
}

SeriesPlot::~SeriesPlot() = default;

void SeriesPlot::setMeasures(const QStringList& measures) {
    const QSignalBlocker blockMeasure(m_measure);
    const QSignalBlocker blockSecond(m_second);
    m_measure->clear();
    m_measure->addItems(measures);
    m_second->clear();
    m_second->addItem(tr("nothing else"), -1);
    for (int i = 0; i < measures.size(); ++i)
        m_second->addItem(measures[i], i);
    m_measure->setEnabled(measures.size() > 1);
    m_second->setEnabled(measures.size() > 1);
}

int SeriesPlot::measure() const {
    return std::max(0, m_measure->currentIndex());
}

int SeriesPlot::secondMeasure() const {
    return m_second->currentIndex() <= 0 ? -1 : m_second->currentData().toInt();
}

void SeriesPlot::chooseMeasure(int measure) {
    if (measure >= 0 && measure < m_measure->count())
        m_measure->setCurrentIndex(measure);
}

void SeriesPlot::chooseSecondMeasure(int measure) {
    const int index = m_second->findData(measure);
    m_second->setCurrentIndex(index >= 0 ? index : 0);
}

DayIndexRange SeriesPlot::visibleDays() const {
    // Half a day in from each edge: the days whose centre is on screen.
    const QCPRange range = m_plot->xAxis->range();
    const TimeAxis& axis = m_chart->view().axis;
    return DayIndexRange{periodOfPlotKey(axis, range.lower + halfPeriodKeys(axis)),
                         periodOfPlotKey(axis, range.upper - halfPeriodKeys(axis))};
}

void SeriesPlot::setVisibleDays(DayIndexRange days) {
    const SeriesView& v = m_chart->view();
    if (v.empty() || days.last < days.first)
        return;
    m_plot->xAxis->setRange(plotKeyOfPeriod(v.axis, days.first) - halfPeriodKeys(v.axis),
                            plotKeyOfPeriod(v.axis, days.last) + halfPeriodKeys(v.axis));
    m_plot->replot();
}

void SeriesPlot::setView(const SeriesView& view, const QString& regionWithoutRows) {
    m_regionWithoutRows = view.empty() ? regionWithoutRows : QString();
    // The same series drawn again (a decision applied, a scan finished): keep the time axis
    // where the analyst put it.
    const SeriesView& old = m_chart->view();
    const bool sameSeries = !old.empty() && old.regionCode == view.regionCode &&
                            old.measure == view.measure && old.axis == view.axis;
    const QCPRange keep = m_plot->xAxis->range();
    m_emptyNote = nullptr;  // draw() clears every item, the note too
    m_chart->draw(view);
    if (sameSeries)
        m_plot->xAxis->setRange(keep);
    m_windowEditable = false;
    updateTitle();
    showEmptyNote();
    m_plot->replot();
}

void SeriesPlot::showEmptyNote() {
    // Nothing to draw: say why and what to do, instead of a legend and a 1970 date axis.
    const bool empty = m_chart->view().empty();
    m_plot->legend->setVisible(!empty);
    m_plot->xAxis->setTickLabels(!empty);
    m_plot->yAxis->setTickLabels(!empty);
    if (m_emptyNote)
        m_plot->removeItem(m_emptyNote);
    m_emptyNote = nullptr;
    if (!empty)
        return;
    m_emptyNote = new QCPItemText(m_plot);
    m_emptyNote->position->setType(QCPItemPosition::ptAxisRectRatio);
    m_emptyNote->position->setCoords(0.5, 0.45);
    m_emptyNote->setPositionAlignment(Qt::AlignCenter);
    m_emptyNote->setTextAlignment(Qt::AlignCenter);
    m_emptyNote->setColor(QColor(0x55, 0x55, 0x55));
    if (!m_regionWithoutRows.isEmpty()) {
        m_emptyNote->setText(tr("%1 has no rows in this release: nothing to draw.\nRegions in grey "
                                "are in the register only; choose one in black.")
                                 .arg(m_regionWithoutRows));
    } else {
        m_emptyNote->setText(
            tr("Nothing to draw yet.\nOpen a drop (File ▸ Open drop, or drop a "
               "CSV file on the window),\nthen choose a region in Regions."));
    }
}

QString SeriesPlot::emptyNote() const {
    return m_emptyNote ? m_emptyNote->text() : QString();
}

const SeriesView& SeriesPlot::view() const {
    return m_chart->view();
}

void SeriesPlot::updateTitle() {
    const SeriesView& v = m_chart->view();
    if (v.empty()) {
        m_title->setText(m_regionWithoutRows.isEmpty()
                             ? tr("<i>No region selected</i>")
                             : tr("<b>%1</b> &nbsp;<i>no rows in this release</i>")
                                   .arg(m_regionWithoutRows.toHtmlEscaped()));
        return;
    }
    QString text = QStringLiteral("<b>%1</b>").arg(v.regionCode.toHtmlEscaped());
    if (!v.regionName.isEmpty())
        text += QStringLiteral(" &nbsp;%1").arg(v.regionName.toHtmlEscaped());
    text += QStringLiteral(" &nbsp;<span style='color:#555'>%1 – %2</span>")
                .arg(QString::fromStdString(v.axis.periodName(0)),
                     QString::fromStdString(v.axis.periodName(v.periods() - 1)));
    m_title->setText(text);
}

void SeriesPlot::setEditableWindow(std::optional<DayIndexRange> window) {
    m_windowEditable = window.has_value();
    m_chart->setWindow(window);
    // Queued: a refit while dragging sets the window again, and one repaint per event-loop
    // turn is enough (a full replot costs more than the fit itself).
    repaintLater();
}

void SeriesPlot::repaintLater() {
    if (m_repaintQueued)
        return;
    m_repaintQueued = true;
    QMetaObject::invokeMethod(
        this,
        [this] {
            m_repaintQueued = false;
            if (m_chart->fullReplotRevision() != m_paintedRevision) {
                m_plot->replot();  // afterReplot records it
                return;
            }
            QElapsedTimer clock;
            clock.start();
            m_chart->liveLayer()->replot();  // its own buffer, then one widget update
            m_lastRepaintMs = static_cast<double>(clock.nsecsElapsed()) * 1e-6;
            m_lastRepaintLiveOnly = true;
        },
        Qt::QueuedConnection);
}

std::optional<DayIndexRange> SeriesPlot::editableWindow() const {
    return m_windowEditable ? m_chart->window() : std::nullopt;
}

void SeriesPlot::setFit(const std::optional<FittedCurve>& fit) {
    m_chart->setFit(fit);
    repaintLater();
}

void SeriesPlot::setPreview(const std::vector<double>& values, const QString& label) {
    m_chart->setPreview(values, label);
    repaintLater();
}

void SeriesPlot::resetView() {
    m_chart->resetRange();
    m_plot->replot();
}

void SeriesPlot::focusOn(DayIndexRange days) {
    m_chart->focusOn(days);
    m_plot->replot();
}

void SeriesPlot::setDayPickingEnabled(bool enabled) {
    m_dayPicking = enabled;
}

QMenu* SeriesPlot::createContextMenu(int day) {
    auto* menu = new QMenu(this);
    menu->setObjectName(QStringLiteral("seriesContextMenu"));
    const SeriesView& v = m_chart->view();
    if (day >= 0 && day < v.periods()) {
        const bool hasValue = day < static_cast<int>(v.raw.size()) && !std::isnan(v.raw[day]);
        QAction* redistribute =
            menu->addAction(tr("Redistribute %1 over earlier days…")
                                .arg(QString::fromStdString(v.periodStart(day).iso())),
                            this, [this, day] { Q_EMIT redistributeDayRequested(day); });
        redistribute->setObjectName(QStringLiteral("redistributeDay"));
        redistribute->setEnabled(m_dayPicking && hasValue);
        redistribute->setStatusTip(
            m_dayPicking ? tr("Prepare a redistribution of this day's counts (also Shift+click)")
                         : tr("Finish or discard the decision in preparation first"));
        menu->addSeparator();
    }
    menu->addAction(tr("Reset view"), this, &SeriesPlot::resetView);
    return menu;
}

SeriesPlot::Edge SeriesPlot::edgeNear(double x) const {
    const std::optional<DayIndexRange> window = editableWindow();
    if (!window)
        return Edge::None;
    const double halfDay = (m_chart->pixelOfDayIndex(1) - m_chart->pixelOfDayIndex(0)) / 2;
    const double start = m_chart->pixelOfDayIndex(window->first) - halfDay;
    const double end = m_chart->pixelOfDayIndex(window->last) + halfDay;
    if (std::abs(x - start) <= kEdgeGrabPixels)
        return Edge::Start;
    if (std::abs(x - end) <= kEdgeGrabPixels)
        return Edge::End;
    return Edge::None;
}

void SeriesPlot::showHover(QMouseEvent* event) {
    const SeriesView& v = m_chart->view();
    if (v.empty() || !m_plot->axisRect()->rect().contains(event->pos())) {
        QToolTip::hideText();
        return;
    }
    const int day = m_chart->dayIndexAtPixel(event->position().x());
    QString text = hoverText(v, day);
    if (!text.isEmpty() && m_dayPicking && day < static_cast<int>(v.raw.size()) &&
        !std::isnan(v.raw[day]))
        text += tr("<br><i>Shift+click or right-click: redistribute this day</i>");
    if (text.isEmpty())
        QToolTip::hideText();
    else
        QToolTip::showText(event->globalPosition().toPoint(), text, m_plot);
}

bool SeriesPlot::eventFilter(QObject* watched, QEvent* event) {
    if (watched != m_plot)
        return QWidget::eventFilter(watched, event);
    switch (event->type()) {
        case QEvent::MouseButtonPress: {
            auto* mouse = static_cast<QMouseEvent*>(event);
            m_pressPos = mouse->pos();
            if (mouse->button() == Qt::LeftButton) {
                m_dragging = edgeNear(mouse->position().x());
                if (m_dragging != Edge::None) {
                    m_plot->setInteraction(QCP::iRangeDrag, false);
                    return true;
                }
            }
            break;
        }
        case QEvent::MouseMove: {
            auto* mouse = static_cast<QMouseEvent*>(event);
            if (m_dragging != Edge::None) {
                DayIndexRange window = *editableWindow();
                const int day = std::clamp(m_chart->dayIndexAtPixel(mouse->position().x()), 0,
                                           std::max(0, m_chart->view().periods() - 1));
                if (m_dragging == Edge::Start)
                    window.first = std::min(day, window.last);
                else
                    window.last = std::max(day, window.first);
                if (window != *editableWindow()) {
                    m_chart->setWindow(window);
                    repaintLater();
                    Q_EMIT windowChanging(window);
                }
                return true;
            }
            m_plot->setCursor(edgeNear(mouse->position().x()) != Edge::None ? Qt::SizeHorCursor
                                                                            : Qt::ArrowCursor);
            if (mouse->buttons() == Qt::NoButton)
                showHover(mouse);
            break;
        }
        case QEvent::MouseButtonRelease: {
            auto* mouse = static_cast<QMouseEvent*>(event);
            if (m_dragging != Edge::None) {
                m_dragging = Edge::None;
                m_plot->setInteraction(QCP::iRangeDrag, true);
                Q_EMIT windowChanged(*editableWindow());
                return true;
            }
            if ((mouse->pos() - m_pressPos).manhattanLength() < 4 &&
                mouse->button() == Qt::LeftButton) {
                const int day = m_chart->dayIndexAtPixel(mouse->position().x());
                if (day >= 0 && day < m_chart->view().periods()) {
                    Q_EMIT dayClicked(day);
                    if (m_dayPicking && mouse->modifiers().testFlag(Qt::ShiftModifier))
                        Q_EMIT redistributeDayRequested(day);
                }
            }
            break;
        }
        case QEvent::Leave:
            QToolTip::hideText();
            break;
        case QEvent::Resize: {
            // About one ISO date label per 120 pixels, so labels never run into each other.
            const int width = static_cast<QResizeEvent*>(event)->size().width();
            m_plot->xAxis->ticker()->setTickCount(std::clamp(width / 120, 2, 8));
            break;
        }
        default:
            break;
    }
    return QWidget::eventFilter(watched, event);
}

}  // namespace siftwave::widgets
