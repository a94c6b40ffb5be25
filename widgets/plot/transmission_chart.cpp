#include "widgets/plot/transmission_chart.h"

#include "widgets/plot/plot_style.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace siftwave::widgets {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Per period: the value, lower and upper of the chosen measure (NaN without an estimate).
struct Columns {
    QVector<double> keys, mid, low, high;
};

Columns columnsOf(const transmission::TransmissionResult& result, TransmissionMeasure m) {
    Columns c;
    const int n = static_cast<int>(result.rows.size());
    c.keys.resize(n);
    c.mid.fill(kNaN, n);
    c.low.fill(kNaN, n);
    c.high.fill(kNaN, n);
    for (int i = 0; i < n; ++i) {
        const auto& row = result.rows[static_cast<std::size_t>(i)];
        c.keys[i] = plotKeyOfPeriod(result.axis, row.period);
        if (m == TransmissionMeasure::ReproductionNumber) {
            if (row.reproduction.ok() && row.reproduction.hasPosterior()) {
                c.mid[i] = row.reproduction.mean;
                c.low[i] = row.reproduction.lower;
                c.high[i] = row.reproduction.upper;
            }
        } else if (row.growth.ok()) {
            c.mid[i] = row.growth.r.value;
            c.low[i] = row.growth.r.lower;
            c.high[i] = row.growth.r.upper;
        }
    }
    return c;
}

QPen linePen(TransmissionMeasure m) {
    return QPen(
        m == TransmissionMeasure::ReproductionNumber ? plot_style::kBlue : plot_style::kBluishGreen,
        1.8, Qt::SolidLine, Qt::RoundCap, Qt::RoundJoin);
}

QBrush bandBrush(TransmissionMeasure m) {
    QColor c = m == TransmissionMeasure::ReproductionNumber ? plot_style::kSkyBlue
                                                            : plot_style::kBluishGreen;
    c.setAlpha(70);
    return QBrush(c);
}

// The value range: R from 0 to the highest upper bound (at most 4, at least 1.5, so that the
// line R = 1 is always in view and an early, wide interval does not flatten the rest); r
// symmetric around 0, at most +-0.5 per day.
std::pair<double, double> rangeOf(const Columns& c, TransmissionMeasure m) {
    double top = 0.0;
    for (int i = 0; i < c.high.size(); ++i) {
        if (std::isfinite(c.high[i]))
            top = std::max(top, m == TransmissionMeasure::ReproductionNumber
                                    ? c.high[i]
                                    : std::max(std::abs(c.high[i]), std::abs(c.low[i])));
    }
    if (m == TransmissionMeasure::ReproductionNumber)
        return {0.0, std::clamp(top, 1.5, 4.0) * 1.05};
    const double half = std::clamp(top, 0.05, 0.5) * 1.05;
    return {-half, half};
}

// Long reasons on lines of at most `width` characters (a plot text item does not wrap).
QString wrapped(const QString& text, int width) {
    QString out;
    int lineLength = 0;
    for (const QString& word : text.split(QLatin1Char(' '))) {
        if (lineLength > 0 && lineLength + 1 + word.size() > width) {
            out += QLatin1Char('\n');
            lineLength = 0;
        } else if (lineLength > 0) {
            out += QLatin1Char(' ');
            ++lineLength;
        }
        out += word;
        lineLength += static_cast<int>(word.size());
    }
    return out;
}

}  // namespace

QString transmissionMeasureName(TransmissionMeasure measure) {
    return measure == TransmissionMeasure::ReproductionNumber ? QStringLiteral("R_t (Cori et al.)")
                                                              : QStringLiteral("Growth rate r(t)");
}

TransmissionChart::TransmissionChart(QCustomPlot* plot, QCPAxisRect* rect)
    : m_plot(plot), m_rect(rect) {
    styleTimeAxes(rect->axis(QCPAxis::atBottom), rect->axis(QCPAxis::atLeft));
}

void TransmissionChart::clear() {
    for (QCPAbstractPlottable* p : m_plottables)
        m_plot->removePlottable(p);
    for (QCPAbstractItem* item : m_items)
        m_plot->removeItem(item);
    m_plottables.clear();
    m_items.clear();
    m_note = nullptr;
}

void TransmissionChart::draw(const transmission::TransmissionResult* result,
                             TransmissionMeasure measure, const QString& note) {
    clear();
    QCPAxis* valueAxis = m_rect->axis(QCPAxis::atLeft);
    valueAxis->setLabel(measure == TransmissionMeasure::ReproductionNumber
                            ? QStringLiteral("R_t, 95% CrI")
                            : QStringLiteral("r per day, 95% CI"));
    if (!result) {
        valueAxis->setRange(0, 2);
        setNote(note);
        return;
    }
    drawBandAndLine(*result, measure);
    drawReferenceLine(measure == TransmissionMeasure::ReproductionNumber ? 1.0 : 0.0);
    QString text = note;
    if (text.isEmpty() && measure == TransmissionMeasure::ReproductionNumber &&
        !result->refusal.empty())
        text = QStringLiteral("No R_t: ") + QString::fromStdString(result->refusal);
    setNote(text);
}

void TransmissionChart::drawBandAndLine(const transmission::TransmissionResult& result,
                                        TransmissionMeasure m) {
    QCPAxis* keyAxis = m_rect->axis(QCPAxis::atBottom);
    QCPAxis* valueAxis = m_rect->axis(QCPAxis::atLeft);
    const Columns c = columnsOf(result, m);
    auto graph = [&](const QVector<double>& values, const QPen& pen) {
        QCPGraph* g = m_plot->addGraph(keyAxis, valueAxis);
        g->setData(c.keys, values, true);
        g->setPen(pen);
        g->removeFromLegend();
        m_plottables.push_back(g);
        return g;
    };
    QCPGraph* low = graph(c.low, Qt::NoPen);
    QCPGraph* high = graph(c.high, Qt::NoPen);
    high->setBrush(bandBrush(m));
    high->setChannelFillGraph(low);
    graph(c.mid, linePen(m));
    const auto [lower, upper] = rangeOf(c, m);
    valueAxis->setRange(lower, upper);
}

void TransmissionChart::drawReferenceLine(double value) {
    auto* line = new QCPItemStraightLine(m_plot);
    line->setClipAxisRect(m_rect);
    line->point1->setAxes(m_rect->axis(QCPAxis::atBottom), m_rect->axis(QCPAxis::atLeft));
    line->point2->setAxes(m_rect->axis(QCPAxis::atBottom), m_rect->axis(QCPAxis::atLeft));
    line->point1->setCoords(0, value);
    line->point2->setCoords(1, value);
    line->setPen(QPen(plot_style::kInk, 1.0, Qt::DashLine));
    m_items.push_back(line);
}

void TransmissionChart::setNote(const QString& text) {
    if (text.isEmpty())
        return;
    m_note = new QCPItemText(m_plot);
    m_note->setClipAxisRect(m_rect);
    m_note->position->setType(QCPItemPosition::ptAxisRectRatio);
    m_note->position->setAxisRect(m_rect);
    m_note->position->setCoords(0.5, 0.5);
    m_note->setPositionAlignment(Qt::AlignCenter);
    m_note->setTextAlignment(Qt::AlignCenter);
    m_note->setText(wrapped(text, 90));
    m_note->setColor(plot_style::kInk);
    m_note->setBrush(QBrush(QColor(255, 255, 255, 220)));
    m_note->setPadding(QMargins(6, 3, 6, 3));
    m_items.push_back(m_note);
}

std::pair<double, double> TransmissionChart::valueRange() const {
    const QCPRange r = m_rect->axis(QCPAxis::atLeft)->range();
    return {r.lower, r.upper};
}

QString TransmissionChart::note() const {
    return m_note ? m_note->text() : QString();
}

}  // namespace siftwave::widgets
