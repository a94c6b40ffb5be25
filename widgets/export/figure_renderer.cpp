#include "widgets/export/figure_renderer.h"

#include "widgets/export/svg_document.h"
#include "widgets/plot/plot_style.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"
#include "widgets/plot/transmission_chart.h"

#include <QBuffer>
#include <QFileInfo>
#include <QImage>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>
#include <QSaveFile>
#include <QSvgGenerator>

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <utility>

namespace siftwave::widgets {
namespace {

constexpr double kLogicalDpi = 96.0;
constexpr double kMmPerInch = 25.4;
constexpr double kSecondsPerDay = 86400.0;
// Room above the highest bar for the decision labels (a share of the value range).
constexpr double kLabelHeadroom = 1.45;

QString qs(const std::string& s) {
    return QString::fromStdString(s);
}

QFont pageFont(double pixelSize, bool bold = false) {
    QFont font(QStringLiteral("DejaVu Sans"));
    font.setPixelSize(std::max(1, static_cast<int>(std::lround(pixelSize))));
    font.setBold(bold);
    return font;
}

void stylePlotFonts(QCustomPlot* plot, double scale) {
    const QFont tick = pageFont(10.5 * scale);
    const QFont label = pageFont(11.5 * scale);
    for (QCPAxis* axis : {plot->xAxis, plot->yAxis, plot->yAxis2}) {
        axis->setTickLabelFont(tick);
        axis->setLabelFont(label);
    }
    plot->legend->setFont(pageFont(10 * scale));
    plot->setBackground(Qt::white);
}

QCPItemText* addLabel(QCustomPlot* plot, double key, double yRatio, const QString& text,
                      Qt::Alignment alignment, double scale) {
    auto* label = new QCPItemText(plot);
    label->setClipToAxisRect(true);
    label->position->setTypeX(QCPItemPosition::ptPlotCoords);
    label->position->setTypeY(QCPItemPosition::ptAxisRectRatio);
    label->position->setCoords(key, yRatio);
    label->setPositionAlignment(alignment);
    label->setText(text);
    label->setFont(pageFont(10 * scale));
    label->setColor(plot_style::kInk);
    label->setBrush(QBrush(QColor(255, 255, 255, 235)));
    label->setPen(QPen(plot_style::kInk, 0.8));
    const int pad = std::max(1, static_cast<int>(std::lround(2 * scale)));
    label->setPadding(QMargins(pad + 1, pad, pad + 1, pad));
    label->setSelectable(false);
    return label;
}

Qt::Alignment alignmentFor(double key, const QCPRange& x) {
    const double share = (key - x.lower) / x.size();
    const Qt::Alignment h = share > 0.72   ? Qt::AlignRight
                            : share < 0.28 ? Qt::AlignLeft
                                           : Qt::AlignHCenter;
    return h | Qt::AlignBottom;
}

// The plot key of the centre of the period (day or week) that holds `day`.
double keyOf(const report::FigureSpec& spec, Date day) {
    return plotKeyOfDate(spec.axis, day);
}

}  // namespace

std::optional<FigureFormat> figureFormatFromPath(const QString& path) {
    const QString suffix = QFileInfo(path).suffix().toLower();
    if (suffix == QLatin1String("png"))
        return FigureFormat::Png;
    if (suffix == QLatin1String("svg"))
        return FigureFormat::Svg;
    if (suffix == QLatin1String("pdf"))
        return FigureFormat::Pdf;
    return std::nullopt;
}

FigureSize FigureSize::slide() {
    return {254.0, 142.875, std::nullopt};
}

FigureSize FigureSize::halfA4() {
    return {210.0, 148.5, std::nullopt};
}

Result<FigureSize> FigureSize::parse(const QString& text, int dpi) {
    const QString t = text.trimmed().toLower();
    if (t == QLatin1String("slide"))
        return slide();
    if (t == QLatin1String("half-a4"))
        return halfA4();
    QString body = t;
    bool pixels = false;
    if (body.endsWith(QLatin1String("px"))) {
        pixels = true;
        body.chop(2);
    } else if (body.endsWith(QLatin1String("mm"))) {
        body.chop(2);
    } else {
        return makeError(
            ErrorCode::Usage,
            "size '" + text.toStdString() +
                "' is not slide, half-a4, WxHmm or WxHpx (e.g. 180x120mm, 1600x900px)");
    }
    const QStringList parts = body.split(QLatin1Char('x'));
    bool okW = false, okH = false;
    const double w = parts.size() == 2 ? parts[0].toDouble(&okW) : 0;
    const double h = parts.size() == 2 ? parts[1].toDouble(&okH) : 0;
    if (!okW || !okH || !(w > 0) || !(h > 0))
        return makeError(
            ErrorCode::Usage,
            "size '" + text.toStdString() + "' needs a positive width and height, e.g. 180x120mm");
    if (pixels) {
        if (w != std::floor(w) || h != std::floor(h) || w > 20000 || h > 20000 || w < 100 ||
            h < 100)
            return makeError(ErrorCode::Usage,
                             "a size in pixels takes whole numbers from 100 "
                             "to 20000, e.g. 1600x900px");
        FigureSize s{w / dpi * kMmPerInch, h / dpi * kMmPerInch,
                     QSize(static_cast<int>(w), static_cast<int>(h))};
        return s;
    }
    if (w < 40 || h < 30 || w > 2000 || h > 2000)
        return makeError(ErrorCode::Usage, "a size in millimetres must be 40x30mm to 2000x2000mm");
    return FigureSize{w, h, std::nullopt};
}

QSize FigureSize::pixelsAt(int dpi) const {
    if (pixels)
        return *pixels;
    return {static_cast<int>(std::lround(widthMm / kMmPerInch * dpi)),
            static_cast<int>(std::lround(heightMm / kMmPerInch * dpi))};
}

QSizeF FigureSize::logical() const {
    return {widthMm / kMmPerInch * kLogicalDpi, heightMm / kMmPerInch * kLogicalDpi};
}

namespace {

// Lifts the smoothed line and the fitted curve above the bars on a white casing, so that
// in greyscale (where the orange and the bars' grey come close) they still stand out.
void caseLines(QCustomPlot* plot, const report::FigureSpec& spec) {
    QStringList names{QString::fromStdString(spec.smoothedLabel)};
    if (spec.fit && spec.fit->notDrawn.empty())
        names << QString::fromStdString(spec.fit->label);
    std::vector<QCPGraph*> lines;
    for (int i = 0; i < plot->graphCount(); ++i)
        if (names.contains(plot->graph(i)->name()))
            lines.push_back(plot->graph(i));
    if (lines.empty())
        return;
    if (!plot->layer(QStringLiteral("casing"))) {
        plot->addLayer(QStringLiteral("casing"), plot->layer(QStringLiteral("main")),
                       QCustomPlot::limAbove);
        plot->addLayer(QStringLiteral("cased"), plot->layer(QStringLiteral("casing")),
                       QCustomPlot::limAbove);
    }
    for (QCPGraph* line : lines) {
        QCPGraph* casing = plot->addGraph(line->keyAxis(), line->valueAxis());
        casing->setData(line->data());
        QPen pen(Qt::white, line->pen().widthF() + 2.4, Qt::SolidLine, Qt::RoundCap, Qt::RoundJoin);
        casing->setPen(pen);
        casing->removeFromLegend();
        casing->setLayer(QStringLiteral("casing"));
        casing->setSelectable(QCP::stNone);
        line->setLayer(QStringLiteral("cased"));
    }
}

// SeriesChart draws the fit's band as the one graph filled to another; on a figure its legend
// entry says what the band is (FittedCurveSpec::bandLabel), and it lies above the white casing
// of the lines (caseLines) and below the curve itself: a narrow band stays visible around the
// curve instead of vanishing under its casing.
void liftFitBand(QCustomPlot* plot, const report::FigureSpec& spec) {
    if (!spec.fit)
        return;
    const QString layer = QStringLiteral("band");
    for (int i = 0; i < plot->graphCount(); ++i) {
        QCPGraph* upper = plot->graph(i);
        if (!upper->channelFillGraph())
            continue;
        upper->setName(qs(spec.fit->bandLabel));
        // On paper: a firmer wash with hairline edges, so that a narrow band still shows and
        // reads in greyscale (the light blue of the fit window is close to the screen's wash).
        QColor wash = plot_style::kVermillion;
        wash.setAlpha(80);
        upper->setBrush(QBrush(wash));
        const QPen edge(plot_style::kVermillion, 0.7);
        upper->setPen(edge);
        upper->channelFillGraph()->setPen(edge);
        if (!plot->layer(layer)) {
            if (!plot->layer(QStringLiteral("casing")))
                continue;  // no casing: the band stays where SeriesChart put it
            plot->addLayer(layer, plot->layer(QStringLiteral("casing")), QCustomPlot::limAbove);
        }
        upper->channelFillGraph()->setLayer(layer);
        upper->setLayer(layer);
    }
}

// The range of daily counts (when asked): two thin dotted lines, lighter than the curve, so it
// reads apart from the shaded confidence band in colour and in greyscale.
void addCountRange(QCustomPlot* plot, const report::FigureSpec& spec) {
    if (!spec.fit || spec.fit->countLow.empty())
        return;
    QVector<double> keys(spec.periods());
    for (int d = 0; d < spec.periods(); ++d)
        keys[d] = plotKeyOfPeriod(spec.axis, d);
    QPen pen(plot_style::kVermillion.darker(115), 1.1, Qt::DotLine, Qt::FlatCap, Qt::RoundJoin);
    for (const std::vector<double>* edge : {&spec.fit->countHigh, &spec.fit->countLow}) {
        QCPGraph* line = plot->addGraph(plot->xAxis, plot->yAxis);
        line->setData(keys, QVector<double>(edge->begin(), edge->end()), true);
        line->setPen(pen);
        line->setAdaptiveSampling(false);
        line->setSelectable(QCP::stNone);
        if (edge == &spec.fit->countHigh)
            line->setName(qs(spec.fit->countRangeLabel));
        else
            line->removeFromLegend();
    }
    double highest = 0;
    for (double v : spec.fit->countHigh)
        if (std::isfinite(v))
            highest = std::max(highest, v);
    if (highest > plot->yAxis->range().upper)
        plot->yAxis->setRangeUpper(highest * 1.02);
}

// After a ledger decision lowered a raw bar (a backlog spread back), the value axis follows the
// cleaned series, as on screen (SeriesChart::setScaleToCleaned): the highest of the cleaned and
// smoothed series, the raw bars of days without a cleaned value, the previous release (except
// on the days the ledger lowered), the fitted curve, its band up to twice the rest (a wide band
// of a poorly determined fit runs off rather than flattening the data) and the range of daily
// counts, plus 10%. The level returned is that top; a raw bar above it is cut there
// (cutRawBars). nullopt when no lowered bar rises above it: the figure keeps the raw scale, so
// a figure without a ledger (raw = cleaned) is drawn exactly as before.
std::optional<double> rawCutLevel(const report::FigureSpec& spec) {
    const auto at = [](const std::vector<double>& values, int d) {
        return d < static_cast<int>(values.size()) ? values[static_cast<std::size_t>(d)]
                                                   : std::numeric_limits<double>::quiet_NaN();
    };
    const auto lowered = [&](int d) {
        const double raw = at(spec.raw, d), cleaned = at(spec.cleaned, d);
        return !std::isnan(raw) && !std::isnan(cleaned) && cleaned < raw;
    };
    double top = 0;
    const auto take = [&top](double v) {
        if (std::isfinite(v))
            top = std::max(top, v);
    };
    for (int d = 0; d < spec.periods(); ++d) {
        if (std::isnan(at(spec.cleaned, d)))
            take(at(spec.raw, d));
        take(at(spec.cleaned, d));
        take(at(spec.smoothed, d));
        if (!lowered(d))
            take(at(spec.previous, d));
    }
    if (spec.fit) {
        for (int d = 0; d < spec.periods(); ++d)
            take(at(spec.fit->mid, d));
        double band = 0;
        for (int d = 0; d < spec.periods(); ++d)
            if (std::isfinite(at(spec.fit->high, d)))
                band = std::max(band, at(spec.fit->high, d));
        take(std::min(band, 2 * top));
        for (int d = 0; d < spec.periods(); ++d)
            take(at(spec.fit->countHigh, d));
    }
    if (!(top > 0))
        return std::nullopt;
    const double level = top * 1.1;
    for (int d = 0; d < spec.periods(); ++d)
        if (lowered(d) && at(spec.raw, d) > level)
            return level;
    return std::nullopt;
}

// Cuts the raw bars above `level` there (the previous release's line too, on those days), marks
// each cut with the usual broken-bar sign (two parallel slanted strokes with a white gap, just
// below the bar's top; common practice, no source) and labels it with its true value, beside
// the bar so that it crosses neither the decision's arrow above it nor its bracket.
void cutRawBars(QCustomPlot* plot, const report::FigureSpec& spec, double level, const QCPRange& x,
                double scale) {
    QCPBars* bars = nullptr;
    for (int i = 0; i < plot->plottableCount() && !bars; ++i)
        bars = qobject_cast<QCPBars*>(plot->plottable(i));
    if (!bars)
        return;
    std::vector<std::pair<double, double>> cut;  // plot key, true value
    for (auto it = bars->data()->begin(); it != bars->data()->end(); ++it)
        if (it->value > level) {
            cut.emplace_back(it->key, it->value);
            it->value = level;
        }
    const QString previousName = QObject::tr("Previous release (%1)").arg(qs(spec.previousLabel));
    std::vector<std::pair<double, double>> previousCut;  // plot key, previous release's value
    for (int i = 0; i < plot->graphCount(); ++i) {
        QCPGraph* previous = plot->graph(i);
        if (spec.previous.empty() || previous->name() != previousName)
            continue;
        for (auto it = previous->data()->begin(); it != previous->data()->end(); ++it) {
            const bool onCutDay = std::any_of(cut.begin(), cut.end(), [&](const auto& c) {
                return std::abs(c.first - it->key) < halfPeriodKeys(spec.axis);
            });
            if (onCutDay && it->value > level) {
                previousCut.emplace_back(it->key, it->value);
                it->value = level;
            }
        }
    }
    const double px = scale;  // logical pixels of the figure
    for (const auto& [key, value] : cut) {
        // The bar's visible top: the mark and the label hang from it in pixels.
        auto* top = new QCPItemTracer(plot);
        top->setStyle(QCPItemTracer::tsNone);
        top->position->setCoords(key, level);
        top->setSelectable(false);
        top->setObjectName(QStringLiteral("raw-cut-top"));
        const auto stroke = [&](double dy, const QPen& pen) {
            auto* line = new QCPItemLine(plot);
            line->setClipToAxisRect(true);
            for (QCPItemPosition* p : {line->start, line->end}) {
                p->setParentAnchor(top->position);
                p->setType(QCPItemPosition::ptAbsolute);
            }
            line->start->setCoords(-7 * px, (dy + 5) * px);
            line->end->setCoords(7 * px, (dy - 1) * px);
            line->setPen(pen);
            line->setSelectable(false);
        };
        stroke(6, QPen(Qt::white, 4.2 * px, Qt::SolidLine, Qt::FlatCap));
        stroke(3.4, QPen(plot_style::kInk, 1.0 * px, Qt::SolidLine, Qt::FlatCap));
        stroke(8.6, QPen(plot_style::kInk, 1.0 * px, Qt::SolidLine, Qt::FlatCap));

        QString text =
            QObject::tr("raw %1, bar cut").arg(qs(report::groupedCount(std::llround(value))));
        for (const auto& [previousKey, previousValue] : previousCut)
            if (std::abs(previousKey - key) < halfPeriodKeys(spec.axis) && previousValue != value)
                text += QObject::tr(" (previous release %1)")
                            .arg(qs(report::groupedCount(std::llround(previousValue))));
        const bool right = (key - x.lower) / x.size() > 0.72;
        auto* label = new QCPItemText(plot);
        label->setClipToAxisRect(true);
        label->position->setParentAnchor(top->position);
        label->position->setType(QCPItemPosition::ptAbsolute);
        label->position->setCoords((right ? -9 : 9) * px, 0);
        label->setPositionAlignment((right ? Qt::AlignRight : Qt::AlignLeft) | Qt::AlignVCenter);
        label->setText(text);
        label->setFont(pageFont(10 * scale, true));
        label->setColor(plot_style::kInk);
        label->setBrush(QBrush(QColor(255, 255, 255, 215)));
        label->setPadding(QMargins(2, 1, 2, 1));
        label->setSelectable(false);
        label->setObjectName(QStringLiteral("raw-cut"));
    }
}

// Sets the value axis: up to the cut level when a raw bar the ledger lowered is cut (it does
// not set the scale: rawCutLevel, cutRawBars), with headroom for the labels above the highest
// bar. Returns the cut level, if any.
std::optional<double> scaleValueAxis(QCustomPlot* plot, const report::FigureSpec& spec) {
    const std::optional<double> cutLevel = rawCutLevel(spec);
    if (cutLevel)
        plot->yAxis->setRange(0, *cutLevel);
    const QCPRange y = plot->yAxis->range();
    plot->yAxis->setRange(0, std::max(y.upper * kLabelHeadroom, 10.0));
    return cutLevel;
}

// Excluded ranges: grey hatching over the days, labelled at the top.
void addExcludedRanges(QCustomPlot* plot, const report::FigureSpec& spec, const QCPRange& x,
                       double scale) {
    for (const report::ExcludedRange& ex : spec.excluded) {
        auto* rect = new QCPItemRect(plot);
        rect->setClipToAxisRect(true);
        for (QCPItemPosition* p : {rect->topLeft, rect->bottomRight}) {
            p->setTypeX(QCPItemPosition::ptPlotCoords);
            p->setTypeY(QCPItemPosition::ptAxisRectRatio);
        }
        rect->topLeft->setCoords(keyOf(spec, ex.first) - halfPeriodKeys(spec.axis), 0.0);
        rect->bottomRight->setCoords(keyOf(spec, ex.last) + halfPeriodKeys(spec.axis), 1.0);
        rect->setBrush(QBrush(QColor(0x55, 0x55, 0x55, 110), Qt::FDiagPattern));
        rect->setPen(QPen(QColor(0x55, 0x55, 0x55), 1.0, Qt::DotLine));
        rect->setSelectable(false);
        const double mid = (keyOf(spec, ex.first) + keyOf(spec, ex.last)) / 2;
        QCPItemText* label =
            addLabel(plot, mid, 0.06, qs(ex.label), alignmentFor(mid, x) | Qt::AlignTop, scale);
        label->setPositionAlignment((alignmentFor(mid, x) & Qt::AlignHorizontal_Mask) |
                                    Qt::AlignTop);
        label->setObjectName(QStringLiteral("excluded-%1").arg(ex.sequence));
    }
}

// A bracket under a decision's label (at `labelRatio`) over the days the counts went to.
void addDecisionSpan(QCustomPlot* plot, const report::FigureSpec& spec,
                     const report::DecisionMark& mark, double labelRatio) {
    auto* span = new QCPItemLine(plot);
    span->setClipToAxisRect(true);
    for (QCPItemPosition* p : {span->start, span->end}) {
        p->setTypeX(QCPItemPosition::ptPlotCoords);
        p->setTypeY(QCPItemPosition::ptAxisRectRatio);
    }
    const double ratio = labelRatio + 0.045;
    span->start->setCoords(keyOf(spec, mark.window->first) - halfPeriodKeys(spec.axis), ratio);
    span->end->setCoords(keyOf(spec, mark.window->last) + halfPeriodKeys(spec.axis), ratio);
    span->setPen(QPen(plot_style::kInk, 1.0, Qt::DashLine));
    span->setHead(QCPLineEnding(QCPLineEnding::esBar, 6));
    span->setTail(QCPLineEnding(QCPLineEnding::esBar, 6));
    span->setSelectable(false);
    span->setObjectName(QStringLiteral("decision-span-%1").arg(mark.sequence));
}

// Decisions: a label in a band near the top, staggered so neighbours do not collide,
// with an arrow to the highest raw bar of the day(s) it is about (to its visible top
// `highestShown` when the bar is cut), and a bracket over its window, if it has one.
void addDecisionMarks(QCustomPlot* plot, const report::FigureSpec& spec, const QCPRange& x,
                      double highestShown, double scale) {
    int row = 0;
    for (const report::DecisionMark& mark : spec.decisions) {
        const double key = (keyOf(spec, mark.first) + keyOf(spec, mark.last)) / 2;
        const double labelRatio = 0.1 + 0.075 * (row++ % 3);
        QCPItemText* label =
            addLabel(plot, key, labelRatio, qs(mark.label), alignmentFor(key, x), scale);
        label->setObjectName(QStringLiteral("decision-%1").arg(mark.sequence));
        auto* arrow = new QCPItemLine(plot);
        arrow->setClipToAxisRect(true);
        // From the label's lower edge (y) straight down at the mark's day (x) to the bar.
        arrow->start->setTypeX(QCPItemPosition::ptPlotCoords);
        arrow->start->setParentAnchorY(label->bottom);
        arrow->start->setCoords(key, 0);
        arrow->end->setCoords(key, std::min(mark.anchorValue, highestShown));
        arrow->setPen(QPen(plot_style::kInk, 1.3));
        arrow->setHead(QCPLineEnding(QCPLineEnding::esSpikeArrow, 8, 10));
        arrow->setSelectable(false);
        arrow->setObjectName(QStringLiteral("decision-arrow-%1").arg(mark.sequence));
        if (mark.window)
            addDecisionSpan(plot, spec, mark, labelRatio);
    }
}

// The peak of the fit: a diamond on the curve and its date and height.
void addFitPeak(QCustomPlot* plot, const report::FigureSpec& spec, const QCPRange& x,
                double scale) {
    if (!spec.fit || !std::isfinite(spec.fit->peakValue))
        return;
    const double key = plotKeyOfDay(spec.fit->peakDate);  // a day, even inside a week
    QCPGraph* peak = plot->addGraph(plot->xAxis, plot->yAxis);
    peak->setData(QVector<double>{key}, QVector<double>{spec.fit->peakValue}, true);
    peak->setLineStyle(QCPGraph::lsNone);
    peak->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssDiamond, QPen(plot_style::kInk, 1.2),
                                          QBrush(plot_style::kVermillion), 10));
    peak->setName(QObject::tr("Peak of the fit"));
    auto* label = new QCPItemText(plot);
    label->setClipToAxisRect(true);
    label->position->setCoords(key, spec.fit->peakValue);
    label->setPositionAlignment(alignmentFor(key, x) == (Qt::AlignRight | Qt::AlignBottom)
                                    ? Qt::AlignRight | Qt::AlignBottom
                                    : Qt::AlignLeft | Qt::AlignBottom);
    label->setPadding(QMargins(8, 0, 8, 6));
    label->setObjectName(QStringLiteral("peak"));
    label->setText(QObject::tr("peak %1, %2/day")
                       .arg(qs(spec.fit->peakDate.iso()))
                       .arg(spec.fit->peakValue, 0, 'f', 0));
    label->setFont(pageFont(10 * scale, true));
    label->setColor(plot_style::kInk);
    label->setSelectable(false);
}

// The marks (items and graphs from `itemsBefore` and `graphsBefore` on) go on a layer above
// every line (the window and findings items SeriesChart made stay below).
void raiseMarks(QCustomPlot* plot, int itemsBefore, int graphsBefore) {
    const QString marksLayer = QStringLiteral("annotations");
    if (!plot->layer(marksLayer))
        plot->addLayer(marksLayer, plot->layer(plot->layerCount() - 1), QCustomPlot::limAbove);
    for (int i = itemsBefore; i < plot->itemCount(); ++i)
        plot->item(i)->setLayer(marksLayer);
    for (int i = graphsBefore; i < plot->graphCount(); ++i)
        plot->graph(i)->setLayer(marksLayer);
}

}  // namespace

void annotateFigure(SeriesChart& chart, const report::FigureSpec& spec) {
    QCustomPlot* plot = chart.plot();
    const double scale = 1.0;
    caseLines(plot, spec);
    liftFitBand(plot, spec);
    const int itemsBefore = plot->itemCount();
    const int graphsBefore = plot->graphCount();
    addCountRange(plot, spec);
    const std::optional<double> cutLevel = scaleValueAxis(plot, spec);
    const double top = plot->yAxis->range().upper;
    const QCPRange x = plot->xAxis->range();
    if (cutLevel)
        cutRawBars(plot, spec, *cutLevel, x, scale);
    // Where an arrow may end: the top of the plot, or the visible top of a cut bar.
    const double highestShown = cutLevel ? *cutLevel : top;
    addExcludedRanges(plot, spec, x, scale);
    addDecisionMarks(plot, spec, x, highestShown, scale);
    addFitPeak(plot, spec, x, scale);
    raiseMarks(plot, itemsBefore, graphsBefore);
}

namespace {

QRectF textRect(const QCPItemText* label) {
    return QRectF(label->topLeft->pixelPosition(), label->bottomRight->pixelPosition())
        .normalized();
}

// The marks of a laid-out plot that separateLabels may move, and what they must stay clear of.
struct PlotMarks {
    QRectF area;  // the axis rect in pixels
    std::vector<QCPItemText*> decisions, cuts, excluded;
    QCPItemText* peak = nullptr;
    std::vector<QCPItemLine*> spans;  // the decisions' brackets
    std::vector<QRectF> columns;      // the cut bars' tops with their broken-bar marks
};

// Sorts the plot's items into the marks separateLabels works on, by their object names.
PlotMarks collectPlotMarks(QCustomPlot* plot) {
    PlotMarks marks;
    marks.area = plot->axisRect()->rect();
    for (int i = 0; i < plot->itemCount(); ++i) {
        QCPAbstractItem* item = plot->item(i);
        const QString name = item->objectName();
        if (auto* text = qobject_cast<QCPItemText*>(item)) {
            if (name.startsWith(QLatin1String("decision-")))
                marks.decisions.push_back(text);
            else if (name == QLatin1String("raw-cut"))
                marks.cuts.push_back(text);
            else if (name.startsWith(QLatin1String("excluded-")))
                marks.excluded.push_back(text);
            else if (name == QLatin1String("peak"))
                marks.peak = text;
        } else if (auto* line = qobject_cast<QCPItemLine*>(item);
                   line && name.startsWith(QLatin1String("decision-span-"))) {
            marks.spans.push_back(line);
        } else if (auto* top = qobject_cast<QCPItemTracer*>(item);
                   top && name == QLatin1String("raw-cut-top")) {
            // A cut bar's top with its broken-bar mark: no label lies across it.
            const QPointF at = top->position->pixelPosition();
            marks.columns.emplace_back(at.x() - 8, at.y() - 2, 16, 24);
        }
    }
    return marks;
}

// A decision label comes down (with its bracket) by what it needs to be inside the plot
// and clear of the excluded ranges' labels and of the decision labels placed before it.
void lowerDecisionLabels(const PlotMarks& marks) {
    const QRectF& area = marks.area;
    std::vector<const QCPItemText*> settled(marks.excluded.begin(), marks.excluded.end());
    for (QCPItemText* label : marks.decisions) {
        QRectF box = textRect(label);
        double down = std::max(0.0, area.top() + 2 - box.top());
        for (bool moved = true; moved;) {
            moved = false;
            for (const QCPItemText* other : settled) {
                const QRectF o = textRect(other);
                if (o.intersects(box.translated(0, down))) {
                    down = o.bottom() + 2 - box.top();
                    moved = true;
                }
            }
        }
        settled.push_back(label);
        if (down <= 0 || area.height() <= 0)
            continue;
        const double shift = down / area.height();  // positions in axis-rect ratios
        const QString span = QStringLiteral("decision-span-") +
                             label->objectName().mid(QStringLiteral("decision-").size());
        label->position->setCoords(label->position->key(), label->position->value() + shift);
        for (QCPItemLine* line : marks.spans)
            if (line->objectName() == span)
                for (QCPItemPosition* p : {line->start, line->end})
                    p->setCoords(p->key(), p->value() + shift);
    }
}

// Turns a label to the other side of its position (left for right), keeping its vertical side.
void turnLabel(QCPItemText* label) {
    const Qt::Alignment a = label->positionAlignment();
    label->setPositionAlignment(((a & Qt::AlignLeft) ? Qt::AlignRight : Qt::AlignLeft) |
                                (a & Qt::AlignVertical_Mask));
}

// A peak label that a narrow panel would cut at its edge turns to the other side of its
// diamond, or else stands centred above it, where it fits (any figure: this only ever
// moves a label that is cut off).
void keepPeakLabelInside(const PlotMarks& marks) {
    QCPItemText* peak = marks.peak;
    const auto across = [&](const QRectF& r) {
        return r.left() < marks.area.left() || r.right() > marks.area.right();
    };
    if (!peak || !across(textRect(peak)))
        return;
    const Qt::Alignment first = peak->positionAlignment();
    turnLabel(peak);
    if (across(textRect(peak))) {
        peak->setPositionAlignment(Qt::AlignHCenter | (first & Qt::AlignVertical_Mask));
        if (across(textRect(peak)))
            peak->setPositionAlignment(first);
    }
}

// Whether `r` lies inside the plot, clear of the cut bars' tops and of every label but `self`.
bool isFreePlace(const PlotMarks& marks, const QRectF& r, const QCPItemText* self) {
    const QRectF& area = marks.area;
    if (r.top() < area.top() || r.bottom() > area.bottom() || r.left() < area.left() ||
        r.right() > area.right())
        return false;
    for (const QRectF& column : marks.columns)
        if (column.intersects(r))
            return false;
    for (const std::vector<QCPItemText*>* group : {&marks.decisions, &marks.cuts, &marks.excluded})
        for (const QCPItemText* other : *group)
            if (other != self && textRect(other).intersects(r))
                return false;
    return !(marks.peak && marks.peak != self && textRect(marks.peak).intersects(r));
}

// Moves a cut bar's label to the first free place beside its bar top: beside it, then just
// below it, above it, further below; each on the first side, then the other; each first as it
// is, then with the peak label turned round. With no free place it stays as first drawn.
void placeCutLabel(const PlotMarks& marks, QCPItemText* label) {
    QCPItemText* peak = marks.peak;
    const QPointF original = label->position->coords();  // pixels from the bar top
    const Qt::Alignment originalAlignment = label->positionAlignment();
    const bool startRight = original.x() > 0;
    const double gap = std::abs(original.x());
    const double h = textRect(label).height();
    for (const double dy : {0.0, 0.6 * h, -0.6 * h, 1.2 * h}) {
        for (const bool right : {startRight, !startRight}) {
            label->position->setCoords(right ? gap : -gap, dy);
            label->setPositionAlignment((right ? Qt::AlignLeft : Qt::AlignRight) |
                                        Qt::AlignVCenter);
            for (int turned = 0; turned < (peak ? 2 : 1); ++turned) {
                if (turned)
                    turnLabel(peak);
                if (isFreePlace(marks, textRect(label), label) &&
                    (!turned || isFreePlace(marks, textRect(peak), peak)))
                    return;
                if (turned)
                    turnLabel(peak);
            }
        }
    }
    label->position->setCoords(original);
    label->setPositionAlignment(originalAlignment);
}

// The peak label turns round when it lies across a cut bar or its label and the other side is
// free; then each cut bar's label that overlaps something takes the first free place.
void placeCutLabels(const PlotMarks& marks) {
    QCPItemText* peak = marks.peak;
    if (peak && !isFreePlace(marks, textRect(peak), peak)) {
        turnLabel(peak);
        if (!isFreePlace(marks, textRect(peak), peak))
            turnLabel(peak);
    }
    for (QCPItemText* label : marks.cuts)
        if (!isFreePlace(marks, textRect(label), label))
            placeCutLabel(marks, label);
}

// Once the plot is laid out (a label's size in pixels is known only then), the marks of a short
// plot (a report's figure, a small-multiples panel) are moved apart where they would overlap:
// a decision label that would stick out of the top comes down inside (with its bracket; its
// arrow hangs from it), and the label of a cut bar (cutRawBars) takes the first free place
// beside its bar top, the fit's peak label turning to the other side of its diamond when that
// frees one. Nothing moves where nothing overlaps, so a roomy figure keeps its layout, and a
// figure without a ledger (no decision, no cut bar) is never touched.
void separateLabels(QCustomPlot* plot) {
    const PlotMarks marks = collectPlotMarks(plot);
    lowerDecisionLabels(marks);
    keepPeakLabelInside(marks);
    if (!marks.cuts.empty())
        placeCutLabels(marks);
}

// Caption lines wrapped into `width`; returns the height used (or needed when painter is null).
double paintCaption(QPainter* painter, const std::vector<std::string>& lines, const QRectF& box,
                    double fontPx) {
    const QFont font = pageFont(fontPx);
    const QFontMetricsF metrics(font);
    double y = box.top();
    for (std::size_t i = 0; i < lines.size(); ++i) {
        const bool caution = i + 1 == lines.size();
        QFont f = font;
        f.setBold(caution);
        const QFontMetricsF m(f);
        const QRectF bounds =
            m.boundingRect(QRectF(box.left(), y, box.width(), 1e6), Qt::TextWordWrap, qs(lines[i]));
        if (painter) {
            painter->setFont(f);
            painter->setPen(caution ? plot_style::kInk : QColor(0x44, 0x44, 0x44));
            painter->drawText(QRectF(box.left(), y, box.width(), bounds.height() + 2),
                              Qt::TextWordWrap | Qt::AlignLeft | Qt::AlignTop, qs(lines[i]));
        }
        y += bounds.height() + metrics.leading();
    }
    return y - box.top();
}

struct PanelLayout {
    double titlePx = 17;
    double subtitlePx = 11.5;
    double scale = 1.0;     // of the plot's fonts
    bool ownLegend = true;  // false: the page draws one legend for all panels
};

// One entry of a small-multiples page's shared legend: a plottable's name and look.
struct LegendEntry {
    QString name;
    bool bars = false;
    QPen pen;
    QBrush brush;
    QCPScatterStyle scatter;
    QCPGraph::LineStyle lineStyle = QCPGraph::lsLine;
};

// The entries of a plot's legend not yet in `entries` (by name), in the legend's order.
void appendLegendEntries(QCustomPlot* plot, std::vector<LegendEntry>& entries) {
    for (int i = 0; i < plot->legend->itemCount(); ++i) {
        auto* item = qobject_cast<QCPPlottableLegendItem*>(plot->legend->item(i));
        if (!item || item->plottable()->name().isEmpty())
            continue;
        const QCPAbstractPlottable* p = item->plottable();
        if (std::any_of(entries.begin(), entries.end(),
                        [&](const LegendEntry& e) { return e.name == p->name(); }))
            continue;
        LegendEntry e;
        e.name = p->name();
        e.pen = p->pen();
        e.brush = p->brush();
        if (const auto* graph = qobject_cast<const QCPGraph*>(p)) {
            e.scatter = graph->scatterStyle();
            e.lineStyle = graph->lineStyle();
        } else {
            e.bars = qobject_cast<const QCPBars*>(p) != nullptr;
        }
        entries.push_back(e);
    }
}

// The legend entries a figure's plot would show (the plot built as paintPanel builds it).
void collectLegendEntries(const report::FigureSpec& spec, double scale,
                          std::vector<LegendEntry>& entries) {
    QCustomPlot plot;
    plot.setAttribute(Qt::WA_DontShowOnScreen);
    stylePlotFonts(&plot, scale);
    SeriesChart chart(&plot);
    chart.draw(seriesViewOf(spec));
    annotateFigure(chart, spec);
    appendLegendEntries(&plot, entries);
}

// A plot that holds only a legend of `entries`, `width` wide, as many entries per row as fit
// whole; its height is the legend's.
std::unique_ptr<QCustomPlot> legendOnlyPlot(const std::vector<LegendEntry>& entries, int width,
                                            double scale) {
    auto plot = std::make_unique<QCustomPlot>();
    plot->setAttribute(Qt::WA_DontShowOnScreen);
    stylePlotFonts(plot.get(), scale);
    for (const LegendEntry& e : entries) {
        QCPAbstractPlottable* p = nullptr;
        if (e.bars) {
            p = new QCPBars(plot->xAxis, plot->yAxis);
        } else {
            QCPGraph* graph = plot->addGraph();
            graph->setScatterStyle(e.scatter);
            graph->setLineStyle(e.lineStyle);
            p = graph;
        }
        p->setPen(e.pen);
        p->setBrush(e.brush);
        p->setName(e.name);
    }
    for (QCPAxis* axis : plot->axisRect()->axes())
        axis->setVisible(false);
    plot->legend->setVisible(true);
    plot->axisRect()->insetLayout()->take(plot->legend);
    plot->plotLayout()->take(plot->axisRect());
    plot->plotLayout()->simplify();
    plot->plotLayout()->addElement(0, 0, plot->legend);
    plot->legend->setBorderPen(Qt::NoPen);
    plot->legend->setBrush(Qt::NoBrush);
    plot->legend->setMargins(QMargins(8, 2, 8, 0));
    for (int columns = std::max<int>(1, static_cast<int>(entries.size())); columns >= 1;
         --columns) {
        plot->legend->setWrap(columns);
        plot->legend->setFillOrder(QCPLegend::foColumnsFirst, true);
        if (plot->legend->minimumOuterSizeHint().width() <= width)
            break;
    }
    const int height = plot->legend->minimumOuterSizeHint().height();
    plot->resize(width, height);
    plot->setViewport(QRect(0, 0, width, height));
    return plot;
}

// The transmission panel (PlotModel::transmission): an axis rect under the plot's, on the same
// days, its left and right edges held to the plot's by a margin group, drawn by the workbench's
// own TransmissionChart. Before the legend's row when the plot has one.
void addTransmissionPanel(QCustomPlot* plot, const report::FigureSpec& spec, double scale) {
    if (!spec.transmission)
        return;
    auto* rect = new QCPAxisRect(plot);
    plot->plotLayout()->insertRow(1);
    plot->plotLayout()->addElement(1, 0, rect);
    plot->plotLayout()->setRowStretchFactor(0, 3.0);
    plot->plotLayout()->setRowStretchFactor(1, 1.3);
    auto* group = new QCPMarginGroup(plot);
    plot->axisRect()->setMarginGroup(QCP::msLeft | QCP::msRight, group);
    rect->setMarginGroup(QCP::msLeft | QCP::msRight, group);
    for (QCPAxis* axis : rect->axes()) {
        axis->setTickLabelFont(pageFont(10.5 * scale));
        axis->setLabelFont(pageFont(11.5 * scale));
    }
    TransmissionChart chart(plot, rect);
    chart.draw(&*spec.transmission, spec.transmissionGrowthRate
                                        ? TransmissionMeasure::GrowthRate
                                        : TransmissionMeasure::ReproductionNumber);
    rect->axis(QCPAxis::atBottom)->setRange(plot->xAxis->range());
}

// Title, subtitle and the annotated plot into `panel`.
FigureGeometry paintPanel(QCPPainter& painter, const QRectF& panel, const report::FigureSpec& spec,
                          const PanelLayout& layout) {
    double y = panel.top();
    painter.setPen(plot_style::kInk);
    const QFont titleFont = pageFont(layout.titlePx, true);
    painter.setFont(titleFont);
    const QRectF titleBounds = QFontMetricsF(titleFont).boundingRect(
        QRectF(panel.left(), y, panel.width(), 1e6), Qt::TextWordWrap, qs(spec.title));
    painter.drawText(QRectF(panel.left(), y, panel.width(), titleBounds.height() + 2),
                     Qt::TextWordWrap | Qt::AlignLeft | Qt::AlignTop, qs(spec.title));
    y += titleBounds.height() + 2;
    const QFont subtitleFont = pageFont(layout.subtitlePx);
    painter.setFont(subtitleFont);
    painter.setPen(QColor(0x44, 0x44, 0x44));
    const QRectF subBounds = QFontMetricsF(subtitleFont)
                                 .boundingRect(QRectF(panel.left(), y, panel.width(), 1e6),
                                               Qt::TextWordWrap, qs(spec.subtitle));
    painter.drawText(QRectF(panel.left(), y, panel.width(), subBounds.height() + 2),
                     Qt::TextWordWrap | Qt::AlignLeft | Qt::AlignTop, qs(spec.subtitle));
    y += subBounds.height() + 6;

    const QRectF plotRect(panel.left(), y, panel.width(), std::max(40.0, panel.bottom() - y));
    const int w = static_cast<int>(std::floor(plotRect.width()));
    const int h = static_cast<int>(std::floor(plotRect.height()));

    auto plot = std::make_unique<QCustomPlot>();
    plot->setAttribute(Qt::WA_DontShowOnScreen);
    plot->resize(w, h);
    plot->setViewport(QRect(0, 0, w, h));  // a widget never shown gets no resize event
    stylePlotFonts(plot.get(), layout.scale);
    SeriesChart chart(plot.get());
    chart.draw(seriesViewOf(spec));
    annotateFigure(chart, spec);
    // On paper the legend goes under the plot, in rows, so it hides no data or label; on a page
    // of small multiples the page has one legend for all panels.
    if (!layout.ownLegend) {
        plot->legend->setVisible(false);
    } else if (plot->axisRect()->insetLayout()->take(plot->legend)) {
        plot->axisRect()->insetLayout()->simplify();
        plot->plotLayout()->addElement(1, 0, plot->legend);
        plot->plotLayout()->setRowStretchFactor(1, 0.001);
        plot->plotLayout()->setRowSpacing(0);
        plot->legend->setBorderPen(Qt::NoPen);
        plot->legend->setBrush(Qt::NoBrush);
        plot->legend->setMargins(QMargins(8, 2, 8, 0));
        // As many entries per row as fit whole (a squeezed column cuts its text), at least 2:
        // a small-multiples panel gives up plot height rather than show cut legend entries.
        const int fewest = 2;
        for (int columns = 4; columns >= fewest; --columns) {
            plot->legend->setWrap(columns);
            plot->legend->setFillOrder(QCPLegend::foColumnsFirst, true);
            if (plot->legend->minimumOuterSizeHint().width() <= w)
                break;
        }
    }
    addTransmissionPanel(plot.get(), spec, layout.scale);
    plot->replot(QCustomPlot::rpImmediateRefresh);
    separateLabels(plot.get());

    FigureGeometry geometry;
    const QRect axisRect = plot->axisRect()->rect();
    geometry.axisRect = QRectF(axisRect).translated(plotRect.topLeft());
    geometry.xLower = plot->xAxis->range().lower;
    geometry.xUpper = plot->xAxis->range().upper;
    geometry.yLower = plot->yAxis->range().lower;
    geometry.yUpper = plot->yAxis->range().upper;
    for (int i = 0; i < plot->itemCount(); ++i)
        if (const auto* text = qobject_cast<const QCPItemText*>(plot->item(i));
            text && !text->text().isEmpty())
            geometry.labels.push_back(
                {text->text(), textRect(text).translated(plotRect.topLeft())});

    painter.save();
    painter.translate(plotRect.topLeft());
    plot->toPainter(&painter, w, h);
    painter.restore();
    return geometry;
}

}  // namespace

std::vector<std::string> pageCaptionLines(const std::vector<report::FigureSpec>& specs) {
    if (specs.empty())
        return {};
    std::vector<std::string> lines = specs.front().captionLines;
    if (specs.size() == 1 || lines.size() < 3)
        return lines;
    std::string fits, bands;
    for (const report::FigureSpec& s : specs) {
        if (!s.fit)
            continue;
        const std::string one = s.caption.model + ", " + s.caption.method;
        if (fits.find(one) == std::string::npos)
            fits += (fits.empty() ? "" : ", ") + one;
        if (!s.caption.bands.empty() && bands.find(s.caption.bands) == std::string::npos)
            bands += "; " + s.caption.bands;
    }
    lines[2] = fits.empty() ? "Fit: none"
                            : "Fit: " + fits + " (each panel's window in its subtitle)" + bands;
    return lines;
}

FigureGeometry paintFigure(QCPPainter& painter, const QRectF& page,
                           const report::FigureSpec& spec) {
    const double margin = std::max(10.0, page.width() * 0.03);
    const QRectF inner = page.adjusted(margin, margin * 0.8, -margin, -margin * 0.8);
    const double captionPx = 10.0;
    const double captionHeight = paintCaption(nullptr, spec.captionLines, inner, captionPx);
    const QRectF captionBox(inner.left(), inner.bottom() - captionHeight, inner.width(),
                            captionHeight);
    painter.fillRect(page, Qt::white);
    const QRectF panel(inner.left(), inner.top(), inner.width(),
                       captionBox.top() - inner.top() - 8);
    FigureGeometry g = paintPanel(painter, panel, spec, PanelLayout{});
    painter.setPen(QPen(QColor(0xB0, 0xB4, 0xBA), 0.8));
    painter.drawLine(QPointF(inner.left(), captionBox.top() - 4),
                     QPointF(inner.right(), captionBox.top() - 4));
    paintCaption(&painter, spec.captionLines, captionBox, captionPx);
    return g;
}

std::vector<FigureGeometry> paintSmallMultiples(QCPPainter& painter, const QRectF& page,
                                                const std::vector<report::FigureSpec>& specs,
                                                int columns) {
    std::vector<FigureGeometry> out;
    if (specs.empty())
        return out;
    if (specs.size() == 1) {
        out.push_back(paintFigure(painter, page, specs.front()));
        return out;
    }
    const int n = static_cast<int>(specs.size());
    const int cols = columns > 0 ? std::min(columns, n)
                                 : static_cast<int>(std::ceil(std::sqrt(static_cast<double>(n))));
    const int rows = (n + cols - 1) / cols;
    const double margin = std::max(10.0, page.width() * 0.025);
    const QRectF inner = page.adjusted(margin, margin * 0.8, -margin, -margin * 0.8);
    const std::vector<std::string> caption = pageCaptionLines(specs);
    const double captionPx = 9.5;
    const double captionHeight = paintCaption(nullptr, caption, inner, captionPx);
    const QRectF captionBox(inner.left(), inner.bottom() - captionHeight, inner.width(),
                            captionHeight);
    painter.fillRect(page, Qt::white);
    const double gap = 12;
    PanelLayout layout;
    layout.titlePx = 13;
    layout.subtitlePx = 9.5;
    layout.scale = 0.9;
    layout.ownLegend = false;
    // One legend for the page, above the caption: each panel keeps its height for the plot,
    // and every entry is written out whole.
    std::vector<LegendEntry> entries;
    for (const report::FigureSpec& spec : specs)
        collectLegendEntries(spec, layout.scale, entries);
    const int legendWidth = static_cast<int>(std::floor(inner.width()));
    const std::unique_ptr<QCustomPlot> legend = legendOnlyPlot(entries, legendWidth, layout.scale);
    const double legendTop = captionBox.top() - 8 - legend->height();
    const double cellW = (inner.width() - gap * (cols - 1)) / cols;
    const double cellH = (legendTop - 4 - inner.top() - gap * (rows - 1)) / rows;
    for (int i = 0; i < n; ++i) {
        const QRectF cell(inner.left() + (i % cols) * (cellW + gap),
                          inner.top() + (i / cols) * (cellH + gap), cellW, cellH);
        out.push_back(paintPanel(painter, cell, specs[static_cast<std::size_t>(i)], layout));
    }
    painter.save();
    painter.translate(inner.left(), legendTop);
    legend->toPainter(&painter, legendWidth, legend->height());
    painter.restore();
    painter.setPen(QPen(QColor(0xB0, 0xB4, 0xBA), 0.8));
    painter.drawLine(QPointF(inner.left(), captionBox.top() - 4),
                     QPointF(inner.right(), captionBox.top() - 4));
    paintCaption(&painter, caption, captionBox, captionPx);
    return out;
}

namespace {

Error figureNotDrawn() {
    return makeError(ErrorCode::Io, "the figure could not be drawn");
}

// PNG: laid out at 96 logical dpi, then scaled to the pixels of `options.dpi`.
Status writePng(QIODevice& device, const std::vector<report::FigureSpec>& specs,
                const FigureExportOptions& options, std::vector<FigureGeometry>& painted) {
    const QSize pixels = options.size.pixelsAt(options.dpi);
    QImage image(pixels, QImage::Format_ARGB32_Premultiplied);
    image.fill(Qt::white);
    const int logicalDpm = static_cast<int>(std::lround(kLogicalDpi / 0.0254));
    image.setDotsPerMeterX(logicalDpm);
    image.setDotsPerMeterY(logicalDpm);
    const double scale = options.dpi / kLogicalDpi;
    const QRectF logicalPage(QPointF(0, 0),
                             QSizeF(pixels.width() / scale, pixels.height() / scale));
    {
        QCPPainter painter(&image);
        painter.setRenderHint(QPainter::Antialiasing);
        painter.setRenderHint(QPainter::TextAntialiasing);
        painter.scale(scale, scale);
        painted = paintSmallMultiples(painter, logicalPage, specs, options.columns);
    }
    const int dpm = static_cast<int>(std::lround(options.dpi / 0.0254));
    QImage rgb = image.convertToFormat(QImage::Format_RGB32);
    rgb.setDotsPerMeterX(dpm);
    rgb.setDotsPerMeterY(dpm);
    if (!rgb.save(&device, "PNG"))
        return figureNotDrawn();
    return Ok{};
}

// Paints the figures on a vector device (SVG, PDF); false when the painter could not finish.
bool paintVectorized(QPaintDevice* target, const QRectF& page,
                     const std::vector<report::FigureSpec>& specs, int columns,
                     std::vector<FigureGeometry>& painted) {
    QCPPainter painter(target);
    painter.setMode(QCPPainter::pmVectorized);
    painter.setMode(QCPPainter::pmNoCaching);
    painted = paintSmallMultiples(painter, page, specs, columns);
    return painter.end();
}

// SVG: drawn into memory with no title or description, then written again through an
// XML writer (svg_document.h): the file is well-formed XML whatever the names hold.
Status writeSvg(QIODevice& device, const std::vector<report::FigureSpec>& specs,
                const FigureExportOptions& options, std::vector<FigureGeometry>& painted) {
    const QSizeF logical = options.size.logical();
    const QRectF page(QPointF(0, 0), logical);
    QByteArray generated;
    QBuffer buffer(&generated);
    buffer.open(QIODevice::WriteOnly);
    QSvgGenerator svg;
    svg.setOutputDevice(&buffer);
    svg.setResolution(static_cast<int>(kLogicalDpi));
    svg.setSize(QSize(static_cast<int>(std::lround(logical.width())),
                      static_cast<int>(std::lround(logical.height()))));
    svg.setViewBox(page);
    if (!paintVectorized(&svg, page, specs, options.columns, painted))
        return figureNotDrawn();
    std::string description;
    for (const std::string& line : pageCaptionLines(specs))
        description += line + "\n";
    Result<QByteArray> finished =
        finishSvg(generated, qs(specs.front().title), qs(description), options.svgTarget);
    if (!finished)
        return finished.error();
    if (device.write(*finished) != finished->size())
        return figureNotDrawn();
    return Ok{};
}

// PDF: one page of the figure's size in millimetres, titled with the first figure's title.
Status writePdf(QIODevice& device, const std::vector<report::FigureSpec>& specs,
                const FigureExportOptions& options, std::vector<FigureGeometry>& painted) {
    const QRectF page(QPointF(0, 0), options.size.logical());
    QPdfWriter pdf(&device);
    pdf.setPageSize(QPageSize(QSizeF(options.size.widthMm, options.size.heightMm),
                              QPageSize::Millimeter, QString(), QPageSize::ExactMatch));
    pdf.setPageMargins(QMarginsF(0, 0, 0, 0));
    pdf.setResolution(static_cast<int>(kLogicalDpi));
    pdf.setTitle(qs(specs.front().title));
    pdf.setCreator(QStringLiteral("Siftwave %1").arg(QLatin1String(report::siftwaveVersion())));
    if (!paintVectorized(&pdf, page, specs, options.columns, painted))
        return figureNotDrawn();
    return Ok{};
}

}  // namespace

Status writeFigures(QIODevice& device, FigureFormat format,
                    const std::vector<report::FigureSpec>& specs,
                    const FigureExportOptions& options, std::vector<FigureGeometry>* geometry) {
    if (specs.empty())
        return makeError(ErrorCode::Usage, "no figure to export");
    if (options.dpi < 50 || options.dpi > 1200)
        return makeError(ErrorCode::Usage, "the DPI must be between 50 and 1200");
    std::vector<FigureGeometry> painted;
    Status written = Ok{};
    switch (format) {
        case FigureFormat::Png:
            written = writePng(device, specs, options, painted);
            break;
        case FigureFormat::Svg:
            written = writeSvg(device, specs, options, painted);
            break;
        case FigureFormat::Pdf:
            written = writePdf(device, specs, options, painted);
            break;
    }
    if (!written)
        return written;
    if (geometry)
        *geometry = std::move(painted);
    return Ok{};
}

Status exportFigures(const QString& path, const std::vector<report::FigureSpec>& specs,
                     const FigureExportOptions& options, std::vector<FigureGeometry>* geometry) {
    const auto format = figureFormatFromPath(path);
    if (!format)
        return makeError(ErrorCode::Usage,
                         "the figure file must end in .png, .svg or .pdf: " + path.toStdString());
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly)) {
        Error e = makeError(ErrorCode::Io,
                            "cannot write the figure: " + file.errorString().toStdString());
        e.file = path.toStdString();
        return e;
    }
    if (Status s = writeFigures(file, *format, specs, options, geometry); !s) {
        file.cancelWriting();
        Error e = s.error();
        e.file = path.toStdString();
        return e;
    }
    if (!file.commit()) {
        Error e = makeError(ErrorCode::Io,
                            "cannot write the figure: " + file.errorString().toStdString());
        e.file = path.toStdString();
        return e;
    }
    return Ok{};
}

}  // namespace siftwave::widgets
