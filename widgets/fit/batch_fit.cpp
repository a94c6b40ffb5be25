#include "widgets/fit/batch_fit.h"

#include "widgets/common/text_table_model.h"

#include <QElapsedTimer>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QPushButton>
#include <QSortFilterProxyModel>
#include <QTableView>
#include <QVBoxLayout>

#include <algorithm>
#include <array>
#include <cmath>
#include <thread>

namespace siftwave::widgets {

namespace {

constexpr int kRegionColumn = 0;
constexpr int kSizedRows = 200;  // rows measured to size the columns

QString number(double value, int decimals) {
    if (!std::isfinite(value))
        return QStringLiteral("–");
    return QLocale::c().toString(value, 'f', decimals);
}

}  // namespace

BatchFitOutcome runBatchFit(const BatchFitRequest& request, BackgroundTask::Progress& progress) {
    QElapsedTimer clock;
    clock.start();
    BatchFitOutcome outcome;
    const std::size_t total = request.regions.size();
    std::vector<fit::RegionSeries> series(total);
    for (std::size_t i = 0; i < total; ++i)
        series[i] =
            fit::RegionSeries{request.regions[i],
                              fit::Series{request.firstDay, request.counts[i], request.periodDays},
                              request.populations[i]};
    // Slices big enough to keep every worker thread of the core's pool busy, small enough that
    // progress moves about fifty times and a cancel is seen within a slice.
    const unsigned threads = request.options.threads > 0
                                 ? static_cast<unsigned>(request.options.threads)
                                 : std::max(1u, std::thread::hardware_concurrency());
    const std::size_t slice = std::max<std::size_t>(4 * threads, (total + 49) / 50);
    progress.report(0, static_cast<int>(total));
    for (std::size_t first = 0; first < total; first += slice) {
        if (progress.cancelled()) {
            outcome.cancelled = true;
            break;
        }
        const std::size_t count = std::min(slice, total - first);
        std::vector<fit::RegionFit> part = fit::fitRegions(
            std::span<const fit::RegionSeries>(series.data() + first, count), request.options);
        for (fit::RegionFit& f : part)
            outcome.fits.push_back(std::move(f));
        progress.report(static_cast<int>(first + count), static_cast<int>(total));
    }
    outcome.seconds = static_cast<double>(clock.nsecsElapsed()) * 1e-9;
    return outcome;
}

BatchFitView::BatchFitView(QWidget* parent)
    : QWidget(parent),
      m_run(new QPushButton(tr("Fit every region"), this)),
      m_summary(new QLabel(this)),
      m_rows(new TextTableModel({tr("Region"), tr("Name"), tr("Peak"), tr("Wave size"),
                                 tr("Observed"), tr("R²"), tr("Status")},
                                this)),
      m_proxy(new QSortFilterProxyModel(this)),
      m_view(new QTableView(this)) {
    m_run->setObjectName(QStringLiteral("runBatchFit"));
    m_run->setToolTip(
        tr("Fit each region's largest (or latest) wave with the fit pane's model and method, "
           "in the background"));
    m_summary->setObjectName(QStringLiteral("batchFitSummary"));
    m_summary->setWordWrap(true);
    m_rows->setTextColumns({1, 6});  // name and status
    m_proxy->setSourceModel(m_rows);
    m_proxy->setSortRole(TextTableModel::SortRole);
    m_view->setObjectName(QStringLiteral("batchFitTable"));
    m_view->setModel(m_proxy);
    m_view->setSortingEnabled(true);
    m_view->sortByColumn(kRegionColumn, Qt::AscendingOrder);
    m_view->verticalHeader()->hide();
    m_view->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
    // Sized from the first rows only: measuring every row of a big drop costs seconds.
    m_view->horizontalHeader()->setResizeContentsPrecision(kSizedRows);
    m_view->horizontalHeader()->setStretchLastSection(true);
    m_view->setSelectionBehavior(QAbstractItemView::SelectRows);
    m_view->setSelectionMode(QAbstractItemView::SingleSelection);
    m_view->setEditTriggers(QAbstractItemView::NoEditTriggers);
    m_view->setAlternatingRowColors(true);
    m_view->setWordWrap(false);
    m_view->verticalHeader()->setDefaultSectionSize(m_view->fontMetrics().height() + 6);

    auto* bar = new QHBoxLayout;
    bar->addWidget(m_run);
    bar->addWidget(m_summary, 1);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addLayout(bar);
    layout->addWidget(m_view, 1);

    connect(m_run, &QPushButton::clicked, this, &BatchFitView::runRequested);
    auto activate = [this](const QModelIndex& index) {
        if (!index.isValid())
            return;
        const QModelIndex source = m_proxy->mapToSource(index);
        const QString code = m_rows->text(source.row(), kRegionColumn);
        if (!code.isEmpty())
            Q_EMIT regionActivated(code);
    };
    connect(m_view, &QTableView::clicked, this, activate);
    connect(m_view, &QTableView::activated, this, activate);
    clear(tr("Not run yet."));
}

namespace {

// The status as the table and the pane name it (fit::FitStatus, issue 15).
QString statusDisplayName(fit::FitStatus status) {
    switch (status) {
        case fit::FitStatus::Ok:
            return BatchFitView::tr("ok");
        case fit::FitStatus::NotConverged:
            return BatchFitView::tr("not converged");
        case fit::FitStatus::Implausible:
            return BatchFitView::tr("implausible");
        case fit::FitStatus::NoWave:
            return BatchFitView::tr("no wave");
    }
    return {};
}

// The row of a region whose fit failed: dashes and why, sorted after every fitted region.
TextTableModel::Row failedFitRow(const QString& code, const QString& nameText,
                                 const fit::RegionFit& r) {
    TextTableModel::Row row;
    const QString why =
        r.error ? QString::fromStdString(r.error->message) : BatchFitView::tr("no fit");
    row.cells = {code,
                 nameText,
                 QStringLiteral("–"),
                 QStringLiteral("–"),
                 QStringLiteral("–"),
                 QStringLiteral("–"),
                 statusDisplayName(fit::regionStatus(r)) + QStringLiteral(": ") + why};
    row.sortKeys = {code,
                    nameText,
                    QVariant(),
                    QVariant(),
                    QVariant(),
                    QVariant(),
                    QString::number(static_cast<int>(fit::regionStatus(r))) + why};
    row.toolTip = why;
    return row;
}

// The row of a fitted region: peak day, wave size, fraction observed, R² and status (ok first when
// sorted, then not converged, implausible, no wave), with the model, method, window, solver brief,
// the status reasons and the notes as its tip.
TextTableModel::Row fittedRow(const QString& code, const QString& nameText,
                              const fit::FitResult& f) {
    TextTableModel::Row row;
    const fit::DerivedQuantities& d = f.derived;
    QString status = statusDisplayName(f.status);
    if (!f.statusReasons.empty())
        status += QStringLiteral(": ") + QString::fromStdString(f.statusReasons.front());
    else if (!f.summary.notes.empty())
        status +=
            BatchFitView::tr(" · %n note(s)", nullptr, static_cast<int>(f.summary.notes.size()));
    const QString peak = std::isfinite(d.peakDay.value)
                             ? QString::fromStdString(f.dateOf(d.peakDay.value).iso())
                             : QStringLiteral("–");
    row.cells = {code,
                 nameText,
                 peak,
                 number(d.waveSize.value, 0),
                 number(d.fractionObserved.value * 100, 1) + QStringLiteral(" %"),
                 number(f.goodness.r2, 3),
                 status};
    row.sortKeys = {code,
                    nameText,
                    f.first + d.peakDay.value,
                    d.waveSize.value,
                    d.fractionObserved.value,
                    f.goodness.r2,
                    QString::number(static_cast<int>(f.status)) + status};
    QStringList tip;
    tip << QStringLiteral("%1 %2, %3 to %4")
               .arg(QString::fromLatin1(fit::modelName(f.model)),
                    QString::fromLatin1(fit::methodName(f.method)),
                    QString::fromStdString(f.windowFirst().iso()),
                    QString::fromStdString(f.windowLast().iso()));
    tip << QString::fromStdString(f.summary.brief());
    for (const std::string& why : f.statusReasons)
        tip << QString::fromStdString(why);
    for (const std::string& note : f.summary.notes)
        tip << QString::fromStdString(note);
    row.toolTip = tip.join(QLatin1Char('\n'));
    row.emphasised = false;
    return row;
}

// The summary line: how many regions in how long, the failed ones (the first five codes), the count
// of each status, and whether the run was cancelled.
QString batchSummaryText(const BatchFitOutcome& outcome, const QString& what,
                         const QStringList& failedCodes, const std::array<int, 4>& statuses) {
    const int failed = static_cast<int>(failedCodes.size());
    QString summary =
        BatchFitView::tr("%1: %n region(s) in %2 s", nullptr, static_cast<int>(outcome.fits.size()))
            .arg(what, number(outcome.seconds, 3));
    if (failed)
        summary += BatchFitView::tr(", %n failed", nullptr, failed) +
                   QStringLiteral(" (%1)").arg(
                       failedCodes.mid(0, 5).join(QStringLiteral(", ")) +
                       (failedCodes.size() > 5 ? QStringLiteral(", …") : QString()));
    summary += BatchFitView::tr("; %1 ok, %2 not converged, %3 implausible, %4 no wave")
                   .arg(statuses[0])
                   .arg(statuses[1])
                   .arg(statuses[2])
                   .arg(statuses[3]);
    if (outcome.cancelled)
        summary += BatchFitView::tr(" — cancelled, the rest were not fitted");
    return summary;
}

}  // namespace

void BatchFitView::setOutcome(const BatchFitOutcome& outcome,
                              const std::map<std::string, std::string>& names,
                              const QString& what) {
    QVector<TextTableModel::Row> rows;
    std::array<int, 4> statuses{};
    QStringList failedCodes;
    for (const fit::RegionFit& r : outcome.fits) {
        const QString code = QString::fromStdString(r.region);
        const auto name = names.find(r.region);
        const QString nameText =
            name == names.end() ? QString() : QString::fromStdString(name->second);
        ++statuses[static_cast<std::size_t>(fit::regionStatus(r))];
        if (!r.fit) {
            failedCodes << code;
            rows << failedFitRow(code, nameText, r);
            continue;
        }
        rows << fittedRow(code, nameText, *r.fit);
    }
    m_rows->setRows(rows);
    const QString summary = batchSummaryText(outcome, what, failedCodes, statuses);
    m_summaryText = summary;
    m_summary->setText(summary);
}

void BatchFitView::setStale(const QString& why) {
    if (m_rows->rowCount() == 0)
        return;
    m_summary->setText(tr("<b>Out of date</b> (%1): %2").arg(why.toHtmlEscaped(), m_summaryText));
}

void BatchFitView::clear(const QString& why) {
    m_rows->setRows({});
    m_summaryText = why;
    m_summary->setText(why);
}

void BatchFitView::setRunning(bool running) {
    m_run->setEnabled(!running);
    if (running)
        m_summary->setText(tr("Fitting every region…"));
}

QString BatchFitView::summaryText() const {
    return m_summary->text();
}

}  // namespace siftwave::widgets
