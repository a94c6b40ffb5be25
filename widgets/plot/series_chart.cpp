#include "widgets/plot/series_chart.h"

#include "widgets/plot/plot_style.h"
#include "widgets/plot/qcustomplot_include.h"

#include <QFontMetrics>
#include <QLocale>

#include <algorithm>
#include <cmath>

namespace siftwave::widgets {

namespace {

constexpr double kSecondsPerDay = 86400.0;

QVector<double> keysOf(const SeriesView& view) {
    QVector<double> keys(view.periods());
    for (int d = 0; d < view.periods(); ++d)
        keys[d] = plotKeyOfPeriod(view.axis, d);
    return keys;
}

QVector<double> toVector(const std::vector<double>& values, int days) {
    QVector<double> out(days, std::numeric_limits<double>::quiet_NaN());
    for (int d = 0; d < days && d < static_cast<int>(values.size()); ++d)
        out[d] = values[d];
    return out;
}

QCPGraph* addLine(QCustomPlot* plot, QCPAxis* valueAxis, const QVector<double>& keys,
                  const QVector<double>& values, const QPen& pen, const QString& name) {
    QCPGraph* graph = plot->addGraph(plot->xAxis, valueAxis);
    graph->setData(keys, values, true);
    graph->setPen(pen);
    graph->setName(name);
    graph->setAdaptiveSampling(true);
    return graph;
}

double maxIn(const std::vector<double>& values, int first, int last) {
    double best = 0;
    for (int d = std::max(first, 0); d <= last && d < static_cast<int>(values.size()); ++d)
        if (!std::isnan(values[d]))
            best = std::max(best, values[d]);
    return best;
}

}  // namespace

double plotKeyOfDay(Date day) {
    return static_cast<double>(day.serial) * kSecondsPerDay;
}

Date dayOfPlotKey(double key) {
    return Date{static_cast<std::int32_t>(std::lround(key / kSecondsPerDay))};
}

double plotKeyOfPeriod(const TimeAxis& axis, int period) {
    return plotKeyOfDay(axis.periodStart(period)) + (axis.periodDays() - 1) * 0.5 * kSecondsPerDay;
}

double plotKeyOfDate(const TimeAxis& axis, Date day) {
    return plotKeyOfPeriod(axis, axis.periodOnGrid(day));
}

double halfPeriodKeys(const TimeAxis& axis) {
    return 0.5 * kSecondsPerDay * axis.periodDays();
}

int periodOfPlotKey(const TimeAxis& axis, double key) {
    return static_cast<int>(
        std::lround((key - plotKeyOfPeriod(axis, 0)) / (kSecondsPerDay * axis.periodDays())));
}

void styleTimeAxes(QCPAxis* timeAxis, QCPAxis* valueAxis) {
    auto ticker = QSharedPointer<QCPAxisTickerDateTime>::create();
    ticker->setDateTimeFormat(QStringLiteral("yyyy-MM-dd"));
    ticker->setDateTimeSpec(Qt::UTC);
    ticker->setTickCount(6);
    timeAxis->setTicker(ticker);
    timeAxis->setTickLabelRotation(0);
    valueAxis->setNumberFormat(QStringLiteral("gb"));
    valueAxis->grid()->setSubGridVisible(false);
    timeAxis->grid()->setPen(QPen(QColor(0xE3, 0xE5, 0xE8), 0, Qt::SolidLine));
    valueAxis->grid()->setPen(QPen(QColor(0xE3, 0xE5, 0xE8), 0, Qt::SolidLine));
}

SeriesChart::SeriesChart(QCustomPlot* plot) : m_plot(plot) {
    styleTimeAxes(m_plot->xAxis, m_plot->yAxis);
    m_plot->legend->setVisible(true);
    m_plot->legend->setBrush(QBrush(QColor(255, 255, 255, 220)));
    m_plot->legend->setBorderPen(QPen(QColor(0xB0, 0xB4, 0xBA)));
    m_plot->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignLeft);
    m_plot->setNotAntialiasedElements(QCP::aeNone);
    QObject::connect(m_plot->xAxis, qOverload<const QCPRange&>(&QCPAxis::rangeChanged), m_plot,
                     [this](const QCPRange&) { rescaleValueAxis(); });
}

void SeriesChart::useLiveLayer() {
    if (m_liveLayer)
        return;
    QCPLayer* main = m_plot->layer(QStringLiteral("main"));
    m_plot->addLayer(QStringLiteral("seriesBars"), main, QCustomPlot::limBelow);
    m_plot->addLayer(QStringLiteral("seriesLive"), main, QCustomPlot::limBelow);
    m_barsLayer = m_plot->layer(QStringLiteral("seriesBars"));
    m_liveLayer = m_plot->layer(QStringLiteral("seriesLive"));
    m_liveLayer->setMode(QCPLayer::lmBuffered);
    ++m_fullReplotRevision;
}

void SeriesChart::orderLiveLayer() {
    if (!m_liveLayer)
        return;
    // Within the layer, in this order: the window's shading and edges, the band, the curve,
    // the preview (setLayer appends).
    for (QCPLayerable* layerable :
         {static_cast<QCPLayerable*>(m_windowRect), static_cast<QCPLayerable*>(m_windowStart),
          static_cast<QCPLayerable*>(m_windowEnd), static_cast<QCPLayerable*>(m_fitLow),
          static_cast<QCPLayerable*>(m_fitHigh), static_cast<QCPLayerable*>(m_fitMid),
          static_cast<QCPLayerable*>(m_preview)})
        if (layerable)
            layerable->setLayer(m_liveLayer);
}

void SeriesChart::draw(const SeriesView& view) {
    m_view = view;
    resetDrawnState();
    const QVector<double> keys = keysOf(m_view);
    m_plot->yAxis->setLabel(m_view.valueLabel);
    drawRawBars(keys);
    drawFit();
    drawNowcast(keys);
    if (!m_view.previous.empty())
        drawPreviousRelease(keys);
    drawCleanedLines(keys);
    drawSecondMeasure(keys);
    drawFindings();
    if (m_view.fitWindow)
        setWindow(m_view.fitWindow, QObject::tr("fit window"));
    resetRange();
}

// Clears the plot and forgets every mark drawn on it (fit, window, preview, clip labels).
void SeriesChart::resetDrawnState() {
    m_plot->clearPlottables();
    m_plot->clearItems();
    ++m_fullReplotRevision;
    m_clipLabels.clear();
    m_clippedDays.clear();
    m_preview = nullptr;
    m_fitLow = m_fitHigh = m_fitMid = nullptr;
    m_fitNote = nullptr;
    m_windowRect = nullptr;
    m_windowStart = nullptr;
    m_windowEnd = nullptr;
    m_window.reset();
}

// Raw counts: bars only on the days a number was reported.
void SeriesChart::drawRawBars(const QVector<double>& keys) {
    auto* bars = new QCPBars(m_plot->xAxis, m_plot->yAxis);
    bars->setWidth(2 * halfPeriodKeys(m_view.axis) * 0.78);
    bars->setBrush(plot_style::rawBarBrush());
    bars->setPen(plot_style::rawBarPen());
    bars->setName(QObject::tr("Raw, as reported"));
    if (m_barsLayer)
        bars->setLayer(m_barsLayer);
    QVector<double> rawKeys, rawValues;
    for (int d = 0; d < m_view.periods(); ++d) {
        if (d >= static_cast<int>(m_view.raw.size()) || std::isnan(m_view.raw[d]))
            continue;
        rawKeys << keys[d];
        rawValues << m_view.raw[d];
    }
    bars->setData(rawKeys, rawValues, true);
}

// The previous release as a step line; where the two releases disagree, the old value is
// marked with a cross.
void SeriesChart::drawPreviousRelease(const QVector<double>& keys) {
    QCPGraph* previous = addLine(
        m_plot, m_plot->yAxis, keys, toVector(m_view.previous, m_view.periods()),
        plot_style::previousPen(), QObject::tr("Previous release (%1)").arg(m_view.previousLabel));
    previous->setLineStyle(QCPGraph::lsStepCenter);
    previous->setAdaptiveSampling(false);
    QVector<double> revisedKeys, revisedValues;
    for (int d = 0; d < m_view.periods() && d < static_cast<int>(m_view.previous.size()); ++d) {
        const double old = m_view.previous[d];
        const double now = d < static_cast<int>(m_view.raw.size()) ? m_view.raw[d] : old;
        if (std::isnan(old) || std::isnan(now) || old == now)
            continue;
        revisedKeys << keys[d];
        revisedValues << old;
    }
    if (!revisedKeys.isEmpty()) {
        QCPGraph* revised = m_plot->addGraph(m_plot->xAxis, m_plot->yAxis);
        revised->setData(revisedKeys, revisedValues, true);
        revised->setLineStyle(QCPGraph::lsNone);
        revised->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssCross, plot_style::kInk, 7));
        revised->setName(QObject::tr("Revised since (old value)"));
    }
}

// The cleaned and the smoothed lines, when the view has them.
void SeriesChart::drawCleanedLines(const QVector<double>& keys) {
    if (!m_view.cleaned.empty())
        addLine(m_plot, m_plot->yAxis, keys, toVector(m_view.cleaned, m_view.periods()),
                plot_style::cleanedPen(), QObject::tr("Cleaned"));
    if (!m_view.smoothed.empty())
        addLine(m_plot, m_plot->yAxis, keys, toVector(m_view.smoothed, m_view.periods()),
                plot_style::smoothedPen(),
                m_view.smoothedLabel.isEmpty() ? QObject::tr("Smoothed") : m_view.smoothedLabel);
}

// A second measure on the right axis, when the view has one; the right axis hides otherwise.
void SeriesChart::drawSecondMeasure(const QVector<double>& keys) {
    const bool second = !m_view.secondMeasure.isEmpty() && !m_view.second.empty();
    m_plot->yAxis2->setVisible(second);
    if (second) {
        addLine(m_plot, m_plot->yAxis2, keys, toVector(m_view.second, m_view.periods()),
                plot_style::secondMeasurePen(),
                QObject::tr("%1 (right axis)").arg(m_view.secondMeasure));
        m_plot->yAxis2->setLabel(m_view.secondValueLabel);
        m_plot->yAxis2->setNumberFormat(QStringLiteral("gb"));
    }
}

namespace {

// Greedy word wrap of each line of `text` to `width` pixels in `metrics`.
QString wrapToWidth(const QString& text, const QFontMetrics& metrics, int width) {
    QStringList out;
    for (const QString& paragraph : text.split(QLatin1Char('\n'))) {
        QString line;
        for (const QString& word : paragraph.split(QLatin1Char(' '))) {
            const QString longer = line.isEmpty() ? word : line + QLatin1Char(' ') + word;
            if (!line.isEmpty() && metrics.horizontalAdvance(longer) > width) {
                out << line;
                line = QStringLiteral("  ") + word;  // continuation lines indented
            } else {
                line = longer;
            }
        }
        out << line;
    }
    return out.join(QLatin1Char('\n'));
}

}  // namespace

// A fit that is not ok: no curve, and why (issue 15), at the top right of the plot, clear of the
// legend at the top left, wrapped to half the plot's width.
void SeriesChart::drawFitNote() {
    m_fitNote = new QCPItemText(m_plot);
    m_fitNote->setClipToAxisRect(true);
    m_fitNote->position->setType(QCPItemPosition::ptAxisRectRatio);
    m_fitNote->position->setCoords(0.99, 0.02);
    m_fitNote->setPositionAlignment(Qt::AlignRight | Qt::AlignTop);
    m_fitNote->setTextAlignment(Qt::AlignLeft);
    m_fitNote->setPadding(QMargins(6, 4, 6, 4));
    m_fitNote->setBrush(QBrush(QColor(255, 255, 255, 235)));
    m_fitNote->setPen(QPen(plot_style::kInk));
    m_fitNote->setColor(plot_style::kInk);
    m_fitNote->setSelectable(false);
    const int width = std::max(260, m_plot->axisRect()->width() / 2 - 20);
    m_fitNote->setText(wrapToWidth(m_view.fit->notDrawn, QFontMetrics(m_fitNote->font()), width));
    // Above the curves and the window's edges, as the legend is (a full replot redraws it).
    m_fitNote->setLayer(QStringLiteral("legend"));
}

QString SeriesChart::fitNote() const {
    return m_fitNote ? m_fitNote->text() : QString();
}

void SeriesChart::drawFit() {
    if (m_view.fit && !m_view.fit->notDrawn.isEmpty()) {
        drawFitNote();
        return;
    }
    if (!m_view.fit || m_view.fit->mid.empty())
        return;
    const QVector<double> keys = keysOf(m_view);
    if (!m_view.fit->low.empty() && !m_view.fit->high.empty()) {
        QCPGraph* low = addLine(m_plot, m_plot->yAxis, keys,
                                toVector(m_view.fit->low, m_view.periods()), Qt::NoPen, QString());
        QCPGraph* high = addLine(
            m_plot, m_plot->yAxis, keys, toVector(m_view.fit->high, m_view.periods()), Qt::NoPen,
            m_view.fit->bandLabel.isEmpty() ? QObject::tr("Fit band") : m_view.fit->bandLabel);
        high->setBrush(plot_style::fitBandBrush());
        high->setChannelFillGraph(low);
        low->removeFromLegend();
        m_fitLow = low;
        m_fitHigh = high;
    }
    m_fitMid = addLine(m_plot, m_plot->yAxis, keys, toVector(m_view.fit->mid, m_view.periods()),
                       plot_style::fitPen(),
                       m_view.fit->label.isEmpty() ? QObject::tr("Fitted") : m_view.fit->label);
    m_fitMid->setAdaptiveSampling(false);
    orderLiveLayer();
}

void SeriesChart::drawNowcast(const QVector<double>& keys) {
    if (!m_view.nowcast || m_view.nowcast->mid.empty())
        return;
    const NowcastBand& n = *m_view.nowcast;
    QCPGraph* low =
        addLine(m_plot, m_plot->yAxis, keys, toVector(n.low, m_view.periods()), Qt::NoPen, {});
    QCPGraph* high = addLine(m_plot, m_plot->yAxis, keys, toVector(n.high, m_view.periods()),
                             Qt::NoPen, n.bandLabel);
    high->setBrush(plot_style::nowcastBandBrush());
    high->setChannelFillGraph(low);
    low->removeFromLegend();
    QCPGraph* mid = addLine(m_plot, m_plot->yAxis, keys, toVector(n.mid, m_view.periods()),
                            plot_style::nowcastPen(), n.label);
    mid->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssSquare, 5));
}

void SeriesChart::removeFitGraphs() {
    for (QCPGraph* graph : {m_fitLow, m_fitHigh, m_fitMid})
        if (graph)
            m_plot->removeGraph(graph);
    m_fitLow = m_fitHigh = m_fitMid = nullptr;
    if (m_fitNote)
        m_plot->removeItem(m_fitNote);
    m_fitNote = nullptr;
}

void SeriesChart::setFit(const std::optional<FittedCurve>& fit) {
    // The same kind of curve again (a refit while dragging): new data in the same graphs, so
    // the legend stays as it is and the live layer alone can be redrawn.
    const bool withBand = fit && !fit->low.empty() && !fit->high.empty();
    const bool sameLegend =
        fit && !fit->mid.empty() && m_fitMid &&
        m_fitMid->name() == (fit->label.isEmpty() ? QObject::tr("Fitted") : fit->label) &&
        withBand == (m_fitHigh != nullptr) &&
        (!withBand || m_fitHigh->name() ==
                          (fit->bandLabel.isEmpty() ? QObject::tr("Fit band") : fit->bandLabel));
    m_view.fit = fit;
    if (sameLegend) {
        const QVector<double> keys = keysOf(m_view);
        m_fitMid->setData(keys, toVector(fit->mid, m_view.periods()), true);
        if (withBand) {
            m_fitLow->setData(keys, toVector(fit->low, m_view.periods()), true);
            m_fitHigh->setData(keys, toVector(fit->high, m_view.periods()), true);
        }
    } else {
        const bool hadGraphs = m_fitMid != nullptr || m_fitNote != nullptr;
        removeFitGraphs();
        drawFit();
        if (hadGraphs || m_fitMid || m_fitNote)
            ++m_fullReplotRevision;  // legend entries (or the note) came or went
    }
    rescaleValueAxis();
}

void SeriesChart::drawFindings() {
    for (const FindingMark& mark : m_view.findings) {
        auto* rect = new QCPItemRect(m_plot);
        rect->setClipToAxisRect(true);
        for (QCPItemPosition* p : {rect->topLeft, rect->bottomRight}) {
            p->setTypeX(QCPItemPosition::ptPlotCoords);
            p->setTypeY(QCPItemPosition::ptAxisRectRatio);
        }
        rect->topLeft->setCoords(
            plotKeyOfPeriod(m_view.axis, mark.days.first) - halfPeriodKeys(m_view.axis), 0.965);
        rect->bottomRight->setCoords(
            plotKeyOfPeriod(m_view.axis, mark.days.last) + halfPeriodKeys(m_view.axis), 1.0);
        const QColor colour = plot_style::findingColor(mark.severity);
        rect->setBrush(QBrush(colour));
        rect->setPen(QPen(colour.darker(140), 1));
        rect->setSelectable(false);
    }
}

void SeriesChart::setWindow(std::optional<DayIndexRange> window, const QString& label) {
    m_window = window;
    if (!window) {
        for (QCPAbstractItem* item : {static_cast<QCPAbstractItem*>(m_windowRect),
                                      static_cast<QCPAbstractItem*>(m_windowStart),
                                      static_cast<QCPAbstractItem*>(m_windowEnd)})
            if (item)
                m_plot->removeItem(item);
        m_windowRect = nullptr;
        m_windowStart = nullptr;
        m_windowEnd = nullptr;
        return;
    }
    if (!m_windowRect) {
        m_windowRect = new QCPItemRect(m_plot);
        m_windowRect->setBrush(plot_style::windowBrush());
        m_windowRect->setPen(Qt::NoPen);
        m_windowRect->setSelectable(false);
        for (QCPItemPosition* p : {m_windowRect->topLeft, m_windowRect->bottomRight}) {
            p->setTypeX(QCPItemPosition::ptPlotCoords);
            p->setTypeY(QCPItemPosition::ptAxisRectRatio);
        }
        m_windowStart = new QCPItemStraightLine(m_plot);
        m_windowEnd = new QCPItemStraightLine(m_plot);
        for (QCPItemStraightLine* edge : {m_windowStart, m_windowEnd}) {
            edge->setPen(plot_style::windowEdgePen());
            edge->setSelectable(false);
        }
        orderLiveLayer();
    }
    const double start = plotKeyOfPeriod(m_view.axis, window->first) - halfPeriodKeys(m_view.axis);
    const double end = plotKeyOfPeriod(m_view.axis, window->last) + halfPeriodKeys(m_view.axis);
    m_windowRect->topLeft->setCoords(start, 0.0);
    m_windowRect->bottomRight->setCoords(end, 1.0);
    m_windowStart->point1->setCoords(start, 0);
    m_windowStart->point2->setCoords(start, 1);
    m_windowEnd->point1->setCoords(end, 0);
    m_windowEnd->point2->setCoords(end, 1);
    m_windowRect->setObjectName(label);
}

void SeriesChart::setPreview(const std::vector<double>& values, const QString& label) {
    const QString name = label.isEmpty() ? QObject::tr("Preview") : label;
    // The same preview again with other values (its window dragged): new data in the same bars,
    // the legend unchanged.
    if (m_preview && (values.empty() || m_preview->name() != name)) {
        m_plot->removePlottable(m_preview);
        m_preview = nullptr;
        ++m_fullReplotRevision;
    }
    if (values.empty()) {
        rescaleValueAxis();
        return;
    }
    if (!m_preview) {
        m_preview = new QCPBars(m_plot->xAxis, m_plot->yAxis);
        m_preview->setWidth(halfPeriodKeys(m_view.axis));
        m_preview->setBrush(plot_style::previewBrush());
        m_preview->setPen(plot_style::previewPen());
        m_preview->setName(name);
        orderLiveLayer();
        ++m_fullReplotRevision;
    }
    QVector<double> keys, shown;
    for (int d = 0; d < m_view.periods() && d < static_cast<int>(values.size()); ++d) {
        if (std::isnan(values[d]))
            continue;
        keys << plotKeyOfPeriod(m_view.axis, d);
        shown << values[d];
    }
    m_preview->setData(keys, shown, true);
    rescaleValueAxis();
}

void SeriesChart::resetRange() {
    if (m_view.periods() == 0) {
        m_plot->xAxis->setRange(plotKeyOfDay(Date{0}), plotKeyOfDay(Date{30}));
        m_plot->yAxis->setRange(0, 10);
        return;
    }
    focusOn({0, m_view.periods() - 1});
}

void SeriesChart::focusOn(DayIndexRange days) {
    const int span = std::max(days.last - days.first, 6);
    const int margin = std::max(1, span / 10);
    m_plot->xAxis->setRange(
        plotKeyOfPeriod(m_view.axis, days.first - margin) - 1.2 * halfPeriodKeys(m_view.axis),
        plotKeyOfPeriod(m_view.axis, days.first + span + margin) +
            1.2 * halfPeriodKeys(m_view.axis));
    rescaleValueAxis();
}

void SeriesChart::rescaleValueAxis() {
    if (m_view.periods() == 0)
        return;
    const QCPRange x = m_plot->xAxis->range();
    const int first = std::max(0, periodOfPlotKey(m_view.axis, x.lower));
    const int last = std::min(m_view.periods() - 1, periodOfPlotKey(m_view.axis, x.upper));
    // The raw bars count where there is no cleaned value to scale by instead.
    double rawTop = 0;
    for (int d = first; d <= last && d < static_cast<int>(m_view.raw.size()); ++d) {
        const bool cleanedThere =
            d < static_cast<int>(m_view.cleaned.size()) && !std::isnan(m_view.cleaned[d]);
        if (!std::isnan(m_view.raw[d]) && (!m_scaleToCleaned || !cleanedThere))
            rawTop = std::max(rawTop, m_view.raw[d]);
    }
    double top =
        std::max({rawTop, maxIn(m_view.cleaned, first, last), maxIn(m_view.smoothed, first, last),
                  maxIn(m_view.previous, first, last)});
    if (m_view.fit) {
        // A wide band of a poorly determined fit may run off the top rather than flatten the
        // data: it counts up to twice the highest value otherwise shown.
        top = std::max(top, maxIn(m_view.fit->mid, first, last));
        top = std::max(top, std::min(maxIn(m_view.fit->high, first, last), 2 * top));
    }
    if (m_view.nowcast) {
        // Like the fit's band: the interval counts up to twice the highest value otherwise shown.
        top = std::max(top, maxIn(m_view.nowcast->mid, first, last));
        top = std::max(top, std::min(maxIn(m_view.nowcast->high, first, last), 2 * top));
    }
    if (m_preview)
        for (auto it = m_preview->data()->constBegin(); it != m_preview->data()->constEnd(); ++it)
            if (it->key >= x.lower && it->key <= x.upper)
                top = std::max(top, it->value);
    const QCPRange before = m_plot->yAxis->range();
    const QCPRange before2 = m_plot->yAxis2->range();
    m_plot->yAxis->setRange(0, top > 0 ? top * 1.1 : 10);
    labelClippedBars(first, last, m_plot->yAxis->range().upper);
    if (m_plot->yAxis2->visible()) {
        const double top2 = maxIn(m_view.second, first, last);
        m_plot->yAxis2->setRange(0, top2 > 0 ? top2 * 1.1 : 10);
    }
    if (m_plot->yAxis->range() != before || m_plot->yAxis2->range() != before2)
        ++m_fullReplotRevision;
}

void SeriesChart::setScaleToCleaned(bool on) {
    m_scaleToCleaned = on;
    rescaleValueAxis();
}

void SeriesChart::labelClippedBars(int first, int last, double top) {
    std::vector<int> clipped;
    if (m_scaleToCleaned)
        for (int d = first; d <= last && d < static_cast<int>(m_view.raw.size()); ++d)
            if (!std::isnan(m_view.raw[d]) && m_view.raw[d] > top)
                clipped.push_back(d);
    if (clipped == m_clippedDays)
        return;  // the same labels (the raw values of the same days)
    for (QCPAbstractItem* item : m_clipLabels)
        m_plot->removeItem(item);
    m_clipLabels.clear();
    m_clippedDays = clipped;
    ++m_fullReplotRevision;
    for (const int d : clipped) {
        auto* label = new QCPItemText(m_plot);
        label->setClipToAxisRect(true);
        label->position->setTypeX(QCPItemPosition::ptPlotCoords);
        label->position->setTypeY(QCPItemPosition::ptAxisRectRatio);
        label->position->setCoords(plotKeyOfPeriod(m_view.axis, d), 0.04);
        label->setPositionAlignment(Qt::AlignLeft | Qt::AlignTop);
        label->setPadding(QMargins(3, 0, 0, 0));
        label->setText(QObject::tr("↑ raw %1").arg(QLocale::c().toString(m_view.raw[d], 'f', 0)));
        label->setColor(plot_style::kInk);
        label->setSelectable(false);
        m_clipLabels.push_back(label);
    }
}

int SeriesChart::dayIndexAtPixel(double x) const {
    return periodOfPlotKey(m_view.axis, m_plot->xAxis->pixelToCoord(x));
}

double SeriesChart::pixelOfDayIndex(int day) const {
    return m_plot->xAxis->coordToPixel(plotKeyOfPeriod(m_view.axis, day));
}

}  // namespace siftwave::widgets
