// The reporting-delay view (delay_view.h).
#include "widgets/nowcast/delay_view.h"

#include "widgets/plot/plot_style.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QTableWidget>
#include <QVBoxLayout>

namespace siftwave::widgets {
namespace {

using plot_style::kBlue;

/// Where a group sits on the time axis: the last event date of a moving window (the window
/// ends there), the middle of a calendar month.
double groupKey(const nowcast::DelayGroup& g, bool window) {
    if (window)
        return plotKeyOfDay(g.last);
    return (plotKeyOfDay(g.first) + plotKeyOfDay(g.last)) / 2.0;
}

QString number(double v) {
    return QString::number(v, 'f', v == std::floor(v) ? 0 : 1);
}

QCPGraph* addGraph(QCustomPlot* plot, const QPen& pen, const QString& name) {
    QCPGraph* g = plot->addGraph();
    g->setPen(pen);
    g->setName(name);
    return g;
}

/// A band between two quantiles: the lower edge hidden from the legend, the upper filled to it.
void addBand(QCustomPlot* plot, const QVector<double>& keys, const QVector<double>& lo,
             const QVector<double>& hi, const QColor& fill, const QString& name) {
    QCPGraph* lower = addGraph(plot, Qt::NoPen, QString());
    lower->setData(keys, lo, true);
    lower->removeFromLegend();
    QCPGraph* upper = addGraph(plot, Qt::NoPen, name);
    upper->setData(keys, hi, true);
    upper->setBrush(fill);
    upper->setChannelFillGraph(lower);
}

}  // namespace

DelayView::DelayView(QWidget* parent)
    : QWidget(parent),
      m_grouping(new QComboBox(this)),
      m_summary(new QLabel(this)),
      m_plot(new QCustomPlot(this)),
      m_table(new QTableWidget(this)) {
    m_grouping->addItem(tr("4-week windows, weekly"), 0);
    m_grouping->addItem(tr("Calendar months"), 1);
    m_grouping->setToolTip(tr("How the cases are grouped by their event date"));
    m_summary->setWordWrap(true);
    m_summary->setTextInteractionFlags(Qt::TextSelectableByMouse);
    styleTimeAxes(m_plot->xAxis, m_plot->yAxis);
    m_plot->yAxis->setLabel(tr("Delay, days (report − event)"));
    m_plot->legend->setVisible(true);
    m_plot->legend->setFont(font());
    m_plot->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignRight);
    m_plot->setMinimumHeight(180);
    m_table->setColumnCount(8);
    m_table->setHorizontalHeaderLabels({tr("From"), tr("To"), tr("Cases"), tr("5%"), tr("25%"),
                                        tr("Median"), tr("75%"), tr("95%")});
    m_table->verticalHeader()->setVisible(false);
    m_table->setEditTriggers(QAbstractItemView::NoEditTriggers);
    m_table->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
    auto* top = new QHBoxLayout;
    top->addWidget(new QLabel(tr("Group by"), this));
    top->addWidget(m_grouping);
    top->addStretch(1);
    auto* layout = new QVBoxLayout(this);
    layout->addLayout(top);
    layout->addWidget(m_summary);
    layout->addWidget(m_plot, 3);
    layout->addWidget(m_table, 2);
    connect(m_grouping, &QComboBox::currentIndexChanged, this, [this] { refresh(); });
    clear();
}

void DelayView::showDelays(const Drop& drop, std::optional<std::size_t> region) {
    m_drop = &drop;
    m_region = region;
    refresh();
}

void DelayView::clear() {
    m_drop = nullptr;
    m_report.reset();
    m_summary->setText(
        tr("Open a case list (one row per case with its event and report dates) "
           "to see its reporting delays."));
    m_plot->clearGraphs();
    m_plot->replot();
    m_table->setRowCount(0);
}

void DelayView::refresh() {
    if (!m_drop)
        return;
    if (!m_drop->caseList) {
        const Drop* keep = m_drop;
        clear();
        m_drop = keep;
        m_summary->setText(
            tr("This drop holds counts, not cases: it has no report dates. A "
               "release history gives the nowcast without them."));
        return;
    }
    nowcast::DelayOptions options;
    options.grouping = m_grouping->currentData().toInt() == 0
                           ? nowcast::DelayOptions::Grouping::MovingWindow
                           : nowcast::DelayOptions::Grouping::Month;
    Result<nowcast::DelayReport> report = nowcast::delayDistribution(*m_drop, m_region, options);
    if (!report) {
        m_report.reset();
        m_summary->setText(QString::fromStdString(report.error().describe()));
        return;
    }
    m_report = std::move(*report);
    const nowcast::DelaySummary& s = m_report->overall;
    m_summary->setText(
        tr("%1 cases, reported up to %2: median delay %3 days (25-75%: %4-%5, 5-95%: %6-%7), "
           "mean %8, longest %9. Grey: groups whose long delays cannot have been reported yet "
           "(right-truncated, biased short).")
            .arg(s.cases)
            .arg(QString::fromStdString(m_report->lastReport.iso()), number(s.median),
                 number(s.q25), number(s.q75), number(s.q05), number(s.q95), number(s.mean))
            .arg(s.max) +
        (m_report->casesLeftOut > 0 ? tr(" %1 cases without a usable report date are left out.")
                                          .arg(m_report->casesLeftOut)
                                    : QString()));
    drawPlot(*m_report);
    fillTable(*m_report);
}

void DelayView::drawPlot(const nowcast::DelayReport& report) {
    m_plot->clearGraphs();
    const bool window = m_grouping->currentData().toInt() == 0;
    QVector<double> keys, q05, q25, median, q75, q95, openKeys, openMedian;
    for (const nowcast::DelayGroup& g : report.groups) {
        if (g.summary.cases == 0)
            continue;
        const double key = groupKey(g, window);
        if (g.truncated) {
            openKeys << key;
            openMedian << g.summary.median;
            continue;
        }
        keys << key;
        q05 << g.summary.q05;
        q25 << g.summary.q25;
        median << g.summary.median;
        q75 << g.summary.q75;
        q95 << g.summary.q95;
    }
    QColor outer = kBlue, inner = kBlue;
    outer.setAlpha(40);
    inner.setAlpha(90);
    addBand(m_plot, keys, q05, q95, outer, tr("5-95% of delays"));
    addBand(m_plot, keys, q25, q75, inner, tr("25-75%"));
    QCPGraph* mid = addGraph(m_plot, QPen(kBlue, 2), tr("Median delay"));
    mid->setData(keys, median, true);
    mid->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssDisc, 5));
    if (!openKeys.isEmpty()) {
        QCPGraph* open = addGraph(m_plot, QPen(QColor(0x8C, 0x92, 0x9B), 2, Qt::DashLine),
                                  tr("Median, right-truncated"));
        open->setData(openKeys, openMedian, true);
        open->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssCircle, 5));
    }
    m_plot->rescaleAxes();
    const double pad = 3.5 * 86400.0;
    m_plot->xAxis->setRange(m_plot->xAxis->range().lower - pad, m_plot->xAxis->range().upper + pad);
    m_plot->yAxis->setRange(0, std::max(1.0, report.overall.q95 * 1.25 + 1));
    m_plot->replot();
}

void DelayView::fillTable(const nowcast::DelayReport& report) {
    m_table->setRowCount(static_cast<int>(report.groups.size()));
    int row = 0;
    for (const nowcast::DelayGroup& g : report.groups) {
        const nowcast::DelaySummary& s = g.summary;
        const QStringList cells = {
            QString::fromStdString(g.first.iso()),
            QString::fromStdString(g.last.iso()) + (g.truncated ? tr(" (truncated)") : QString()),
            QString::number(s.cases),
            s.cases ? number(s.q05) : QString(),
            s.cases ? number(s.q25) : QString(),
            s.cases ? number(s.median) : QString(),
            s.cases ? number(s.q75) : QString(),
            s.cases ? number(s.q95) : QString()};
        for (int c = 0; c < cells.size(); ++c) {
            auto* item = new QTableWidgetItem(cells[c]);
            if (g.truncated)
                item->setForeground(QColor(0x8C, 0x92, 0x9B));
            m_table->setItem(row, c, item);
        }
        ++row;
    }
}

}  // namespace siftwave::widgets
