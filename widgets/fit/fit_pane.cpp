#include "widgets/fit/fit_pane.h"

#include "widgets/common/text_table_model.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDateEdit>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QRadioButton>
#include <QSignalBlocker>
#include <QSortFilterProxyModel>
#include <QTabWidget>
#include <QTableView>
#include <QVBoxLayout>

#include <cmath>

namespace siftwave::widgets {

namespace {

QDate toQDate(Date day) {
    return QDate(day.year(), day.month(), day.day());
}

Date fromQDate(const QDate& date) {
    return Date::fromYmd(date.year(), date.month(), date.day()).value_or(Date{});
}

QString number(double value, int decimals) {
    if (!std::isfinite(value))
        return QStringLiteral("–");
    return QLocale::c().toString(value, 'f', decimals);
}

/// Decimals that show about three significant digits.
int decimalsFor(double value) {
    const double magnitude = std::abs(value);
    if (!std::isfinite(magnitude) || magnitude >= 100)
        return 0;
    if (magnitude >= 10)
        return 1;
    if (magnitude >= 1)
        return 2;
    return 3;
}

QString interval(const fit::Estimate& e, int decimals) {
    if (!std::isfinite(e.lower) || !std::isfinite(e.upper))
        return QStringLiteral("–");
    return QStringLiteral("%1 – %2").arg(number(e.lower, decimals), number(e.upper, decimals));
}

QTableView* makeTable(TextTableModel* model, QWidget* parent) {
    auto* view = new QTableView(parent);
    auto* proxy = new QSortFilterProxyModel(view);
    proxy->setSourceModel(model);
    proxy->setSortRole(TextTableModel::SortRole);
    view->setModel(proxy);
    view->setSortingEnabled(false);
    view->verticalHeader()->hide();
    view->horizontalHeader()->setStretchLastSection(false);
    view->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
    view->horizontalHeader()->setSectionResizeMode(0, QHeaderView::Stretch);
    view->setSelectionBehavior(QAbstractItemView::SelectRows);
    view->setEditTriggers(QAbstractItemView::NoEditTriggers);
    view->setAlternatingRowColors(true);
    view->setWordWrap(false);
    view->verticalHeader()->setDefaultSectionSize(view->fontMetrics().height() + 6);
    return view;
}

}  // namespace

FitPane::FitPane(QWidget* parent)
    : QWidget(parent),
      m_model(new QComboBox(this)),
      m_method(new QComboBox(this)),
      m_weekday(new QCheckBox(tr("weekday factors"), this)),
      m_auto(new QRadioButton(tr("automatic"), this)),
      m_wave(new QComboBox(this)),
      m_manual(new QRadioButton(tr("days"), this)),
      m_from(new QDateEdit(this)),
      m_to(new QDateEdit(this)),
      m_summary(new QLabel(this)),
      m_parameters(new TextTableModel({tr("Parameter"), tr("Estimate"), tr("95% interval")}, this)),
      m_derived(new TextTableModel({tr("Quantity"), tr("Estimate"), tr("95% interval")}, this)),
      m_comparison(
          new TextTableModel({tr("Model"), tr("AICc"), tr("ΔAICc"), tr("R²"), tr("Note")}, this)),
      m_caution(new QLabel(QString::fromUtf8(fit::caution), this)) {
    fillChoices();
    setUpWindowAndText();
    layOut();
    connectControls();
    m_weekday->setEnabled(false);
    onWindowModeChanged();
    clear(tr("No region selected."));
}

// The model, method and wave choices, each item carrying its core value.
void FitPane::fillChoices() {
    m_model->setObjectName(QStringLiteral("fitModel"));
    for (fit::ModelKind kind : fit::kAllModels)
        m_model->addItem(QString::fromLatin1(fit::modelName(kind)), static_cast<int>(kind));
    m_model->addItem(tr("lowest AICc"), -1);
    m_model->setItemText(0, tr("Gumbel"));
    m_model->setItemText(1, tr("logistic"));
    m_model->setItemText(2, tr("Richards"));
    m_model->setItemText(3, tr("log-normal"));
    m_method->setObjectName(QStringLiteral("fitMethod"));
    m_method->addItem(tr("least squares on the 7-day mean"),
                      static_cast<int>(fit::FitMethod::LeastSquares));
    m_method->addItem(tr("Poisson, daily counts"), static_cast<int>(fit::FitMethod::Poisson));
    m_method->addItem(tr("negative binomial, daily counts"),
                      static_cast<int>(fit::FitMethod::NegativeBinomial));
    m_weekday->setToolTip(tr("Likelihood fits: one reporting factor per weekday"));
    m_wave->addItem(tr("largest wave"), static_cast<int>(fit::WaveChoice::Largest));
    m_wave->addItem(tr("latest wave"), static_cast<int>(fit::WaveChoice::Latest));
}

// The window controls (automatic by default) and the text lines, named for the tests.
void FitPane::setUpWindowAndText() {
    m_auto->setChecked(true);
    m_auto->setObjectName(QStringLiteral("fitWindowAuto"));
    m_manual->setObjectName(QStringLiteral("fitWindowManual"));
    m_from->setObjectName(QStringLiteral("fitWindowFrom"));
    m_to->setObjectName(QStringLiteral("fitWindowTo"));
    for (QDateEdit* edit : {m_from, m_to}) {
        edit->setDisplayFormat(QStringLiteral("yyyy-MM-dd"));
        edit->setCalendarPopup(true);
    }
    m_summary->setObjectName(QStringLiteral("fitSummary"));
    m_summary->setWordWrap(true);
    m_summary->setTextInteractionFlags(Qt::TextSelectableByMouse);
    m_caution->setObjectName(QStringLiteral("cautionLine"));
    m_caution->setWordWrap(true);
}

// The choices in a form: model, method, weekday factors, and the window (a wave or days).
QFormLayout* FitPane::optionsForm() {
    auto* autoRow = new QHBoxLayout;
    autoRow->addWidget(m_auto);
    autoRow->addWidget(m_wave, 1);
    auto* daysRow = new QHBoxLayout;
    daysRow->addWidget(m_manual);
    daysRow->addWidget(m_from, 1);
    daysRow->addWidget(new QLabel(QStringLiteral("–"), this));
    daysRow->addWidget(m_to, 1);
    auto* windowRows = new QVBoxLayout;
    windowRows->addLayout(autoRow);
    windowRows->addLayout(daysRow);
    auto* form = new QFormLayout;
    form->addRow(tr("Model"), m_model);
    form->addRow(tr("Method"), m_method);
    form->addRow(QString(), m_weekday);
    form->addRow(tr("Window"), windowRows);
    return form;
}

// The result tables in tabs: parameters, derived quantities (shown first), model comparison.
QTabWidget* FitPane::resultTabs() {
    auto* tabs = new QTabWidget(this);
    tabs->addTab(makeTable(m_parameters, tabs), tr("Parameters"));
    tabs->addTab(makeTable(m_derived, tabs), tr("Derived"));
    QTableView* comparison = makeTable(m_comparison, tabs);
    comparison->setSortingEnabled(true);
    tabs->addTab(comparison, tr("Compare models"));
    tabs->setCurrentIndex(1);
    return tabs;
}

// The pane from top to bottom: the choices, the summary, the tables, the caution line.
void FitPane::layOut() {
    QFormLayout* form = optionsForm();
    QTabWidget* tabs = resultTabs();
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addLayout(form);
    layout->addWidget(m_summary);
    layout->addWidget(tabs, 1);
    layout->addWidget(m_caution);
}

// A changed choice asks for a refit (days only when they are in use); weekday factors are
// offered only for likelihood fits of daily data.
void FitPane::connectControls() {
    for (QComboBox* box : {m_model, m_method, m_wave})
        connect(box, &QComboBox::currentIndexChanged, this, [this] { Q_EMIT optionsChanged(); });
    connect(m_weekday, &QCheckBox::toggled, this, [this] { Q_EMIT optionsChanged(); });
    connect(m_auto, &QRadioButton::toggled, this, &FitPane::onWindowModeChanged);
    for (QDateEdit* edit : {m_from, m_to})
        connect(edit, &QDateEdit::dateChanged, this, [this] {
            if (m_manual->isChecked())
                Q_EMIT optionsChanged();
        });
    connect(m_method, &QComboBox::currentIndexChanged, this, [this] {
        m_weekday->setEnabled(!m_axis.weekly() &&
                              m_method->currentData().toInt() !=
                                  static_cast<int>(fit::FitMethod::LeastSquares));
    });
}

void FitPane::onWindowModeChanged() {
    const bool manual = m_manual->isChecked();
    m_from->setEnabled(manual);
    m_to->setEnabled(manual);
    m_wave->setEnabled(!manual);
    Q_EMIT optionsChanged();
}

fit::FitOptions FitPane::options() const {
    // The cadence's defaults (smoothing, wave detection), then the pane's choices.
    fit::FitOptions options = fit::FitOptions::forCadence(m_axis.cadence());
    const int model = m_model->currentData().toInt();
    options.model = model >= 0 ? static_cast<fit::ModelKind>(model) : fit::ModelKind::Gumbel;
    options.modelChoice = model >= 0 ? fit::ModelChoice::Given : fit::ModelChoice::LowestAicc;
    options.method = static_cast<fit::FitMethod>(m_method->currentData().toInt());
    options.weekdayFactors = !m_axis.weekly() && m_weekday->isEnabled() && m_weekday->isChecked();
    options.wave = static_cast<fit::WaveChoice>(m_wave->currentData().toInt());
    if (const auto window = manualWindow())
        options.window = std::make_pair(window->first, window->last);
    return options;
}

std::optional<DayIndexRange> FitPane::manualWindow() const {
    const int periods = m_axis.periods();
    if (!m_manual->isChecked() || periods == 0)
        return std::nullopt;
    // Any day of a week picks that week.
    int first = m_axis.periodOnGrid(fromQDate(m_from->date()));
    int last = m_axis.periodOnGrid(fromQDate(m_to->date()));
    first = std::clamp(first, 0, periods - 1);
    last = std::clamp(last, first, periods - 1);
    return DayIndexRange{first, last};
}

void FitPane::setCalendar(const TimeAxis& axis) {
    const bool cadenceChanged = axis.cadence() != m_axis.cadence();
    m_axis = axis;
    if (cadenceChanged) {
        // The methods say what they fit: daily counts (LSQ on their 7-day mean) or weekly ones.
        const bool weekly = axis.weekly();
        m_method->setItemText(
            m_method->findData(static_cast<int>(fit::FitMethod::LeastSquares)),
            weekly ? tr("least squares on weekly counts") : tr("least squares on the 7-day mean"));
        m_method->setItemText(m_method->findData(static_cast<int>(fit::FitMethod::Poisson)),
                              weekly ? tr("Poisson, weekly counts") : tr("Poisson, daily counts"));
        m_method->setItemText(
            m_method->findData(static_cast<int>(fit::FitMethod::NegativeBinomial)),
            weekly ? tr("negative binomial, weekly counts")
                   : tr("negative binomial, daily counts"));
        m_manual->setText(weekly ? tr("weeks") : tr("days"));
        m_weekday->setEnabled(!weekly && m_method->currentData().toInt() !=
                                             static_cast<int>(fit::FitMethod::LeastSquares));
    }
    if (axis.periods() <= 0)
        return;
    const QSignalBlocker a(m_from), b(m_to);
    for (QDateEdit* edit : {m_from, m_to})
        edit->setDateRange(toQDate(axis.first()), toQDate(axis.lastEnd()));
}

void FitPane::setManualWindow(DayIndexRange window) {
    const QSignalBlocker a(m_from), b(m_to), c(m_auto), d(m_manual);
    m_manual->setChecked(true);
    m_from->setDate(toQDate(m_axis.periodStart(window.first)));
    m_to->setDate(toQDate(m_axis.periodEnd(window.last)));
    m_from->setEnabled(true);
    m_to->setEnabled(true);
    m_wave->setEnabled(false);
}

void FitPane::setAutomaticWindow() {
    const QSignalBlocker a(m_auto), b(m_manual);
    m_auto->setChecked(true);
    m_from->setEnabled(false);
    m_to->setEnabled(false);
    m_wave->setEnabled(true);
}

void FitPane::setChoices(std::optional<fit::ModelKind> model, fit::FitMethod method,
                         bool weekdayFactors, fit::WaveChoice wave) {
    const QSignalBlocker a(m_model), b(m_method), c(m_weekday), d(m_wave);
    m_model->setCurrentIndex(m_model->findData(model ? static_cast<int>(*model) : -1));
    m_method->setCurrentIndex(m_method->findData(static_cast<int>(method)));
    m_weekday->setChecked(weekdayFactors);
    m_weekday->setEnabled(!m_axis.weekly() && method != fit::FitMethod::LeastSquares);
    if (const int index = m_wave->findData(static_cast<int>(wave)); index >= 0)
        m_wave->setCurrentIndex(index);
}

void FitPane::showWindow(DayIndexRange window) {
    const QSignalBlocker a(m_from), b(m_to);
    m_from->setDate(toQDate(m_axis.periodStart(window.first)));
    m_to->setDate(toQDate(m_axis.periodEnd(window.last)));
}

QString FitPane::noFitText(const Error& error) {
    // The core's message is written for the command line; name the pane's controls instead of
    // the CLI's FIRST:LAST argument.
    QString message = QString::fromStdString(error.message);
    static const QString cliHint = QStringLiteral(" (give the window as FIRST:LAST)");
    const bool askedForWindow = message.contains(cliHint);
    message.remove(cliHint);
    QString text = tr("No fit: %1.").arg(message);
    if (askedForWindow)
        text += QLatin1Char(' ') + tr("Choose “days” under Window and set the days to fit.");
    return text;
}

QString FitPane::summaryText() const {
    return m_summary->text();
}

void FitPane::clear(const QString& why) {
    m_summary->setText(why);
    m_parameters->setRows({});
    m_derived->setRows({});
    m_comparison->setRows({});
}

namespace {

// The model comparison table: one row per model with its AICc, ΔAICc against the lowest
// converged AICc, R² and a note; the row of the shown fit is emphasised.
QVector<TextTableModel::Row> comparisonRows(
    const Result<fit::FitResult>& result, const std::vector<fit::ModelComparisonRow>& comparison) {
    QVector<TextTableModel::Row> rows;
    double bestAicc = INFINITY;
    for (const fit::ModelComparisonRow& row : comparison)
        if (row.fit && row.fit->summary.converged())
            bestAicc = std::min(bestAicc, row.fit->goodness.aicc);
    for (const fit::ModelComparisonRow& row : comparison) {
        TextTableModel::Row out;
        const QString name = QString::fromLatin1(fit::modelName(row.model));
        if (row.fit) {
            const fit::GoodnessOfFit& g = row.fit->goodness;
            out.cells = {name, number(g.aicc, 1), number(g.aicc - bestAicc, 1), number(g.r2, 3),
                         row.fit->summary.converged() ? QString() : FitPane::tr("not converged")};
            out.sortKeys = {name, g.aicc, g.aicc - bestAicc, g.r2, QVariant()};
            out.toolTip = QString::fromStdString(row.fit->summary.brief());
            out.emphasised = result.ok() && row.model == result->model;
        } else {
            out.cells = {name, QStringLiteral("–"), QStringLiteral("–"), QStringLiteral("–"),
                         QString::fromStdString(row.error)};
        }
        rows << out;
    }
    return rows;
}

// The status line (HTML): ok, or the status with its reasons and what to try (issue 15).
QString fitStatusText(const fit::FitResult& fit) {
    if (fit.status == fit::FitStatus::Ok)
        return FitPane::tr("Status: <b>ok</b>");
    QString text = FitPane::tr("Status: <b>%1</b> — do not brief these numbers")
                       .arg(QString::fromLatin1(fit::fitStatusName(fit.status)));
    for (const std::string& why : fit.statusReasons)
        text += QStringLiteral("<br>✗ %1").arg(QString::fromStdString(why).toHtmlEscaped());
    text += fit.status == fit::FitStatus::NoWave
                ? FitPane::tr(
                      "<br>Try another window or another wave; the counts may hold no "
                      "wave to fit.")
                : FitPane::tr(
                      "<br>Try a window that holds the wave's peak, another model or the "
                      "other method (the choices above).");
    return text;
}

// The summary line (HTML): the status, model, method, window, the solver's brief, goodness of fit,
// notes.
QString fitSummaryText(const fit::FitResult& fit) {
    QString summary = fitStatusText(fit) + QStringLiteral("<br>");
    summary += FitPane::tr("<b>%1</b>, %2, %3 to %4 (%5 %6): %7")
                   .arg(modelDisplayName(fit.model), methodDisplayName(fit.method),
                        QString::fromStdString(fit.windowFirst().iso()),
                        QString::fromStdString(fit.windowLast().iso()))
                   .arg(fit.last - fit.first + 1)
                   .arg(fit.periodDays == 7 ? FitPane::tr("weeks") : FitPane::tr("days"),
                        QString::fromStdString(fit.summary.brief()).toHtmlEscaped());
    summary += FitPane::tr("<br>R² %1 · RMSE %2 · AICc %3")
                   .arg(number(fit.goodness.r2, 3), number(fit.goodness.rmse, 1),
                        number(fit.goodness.aicc, 1));
    for (const std::string& note : fit.summary.notes)
        summary += QStringLiteral("<br>⚠ %1").arg(QString::fromStdString(note).toHtmlEscaped());
    return summary;
}

// The parameter table: each estimate with its interval, then the dispersion and the weekday
// factors when the fit has them.
QVector<TextTableModel::Row> parameterRows(const fit::FitResult& fit) {
    QVector<TextTableModel::Row> parameters;
    for (const fit::NamedEstimate& p : fit.parameters) {
        const int decimals = decimalsFor(p.estimate.value);
        parameters << TextTableModel::Row{
            {QString::fromStdString(p.name), number(p.estimate.value, decimals),
             interval(p.estimate, decimals)},
            {},
            FitPane::tr("standard error %1").arg(number(p.estimate.se, decimalsFor(p.estimate.se))),
            false};
    }
    if (fit.dispersion)
        parameters << TextTableModel::Row{
            {FitPane::tr("r (negative-binomial size)"), number(*fit.dispersion, 2), QString()},
            {},
            {},
            false};
    static const char* const weekdays[] = {"Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"};
    for (std::size_t i = 0; i < fit.weekdayFactors.size() && i < 7; ++i)
        parameters << TextTableModel::Row{{FitPane::tr("factor %1").arg(FitPane::tr(weekdays[i])),
                                           number(fit.weekdayFactors[i], 3), QString()},
                                          {},
                                          {},
                                          false};
    return parameters;
}

// The derived quantities table: peak, wave size, fraction observed, start, end, fastest
// growth, doubling time and the peak infectious load.
QVector<TextTableModel::Row> derivedRows(const fit::FitResult& fit) {
    const fit::DerivedQuantities& d = fit.derived;
    auto dateOf = [&fit](double day) {
        return std::isfinite(day) ? QString::fromStdString(fit.dateOf(day).iso())
                                  : QStringLiteral("–");
    };
    auto dateRow = [&](const QString& name, const fit::Estimate& e) {
        const QString range = std::isfinite(e.lower) && std::isfinite(e.upper)
                                  ? QStringLiteral("%1 – %2").arg(dateOf(e.lower), dateOf(e.upper))
                                  : QStringLiteral("–");
        return TextTableModel::Row{{name, dateOf(e.value), range},
                                   {},
                                   FitPane::tr("day %1 of the window, standard error %2 days")
                                       .arg(number(e.value, 1), number(e.se, 1)),
                                   false};
    };
    auto valueRow = [](const QString& name, const fit::Estimate& e, int decimals,
                       const QString& unit = {}) {
        return TextTableModel::Row{
            {name, number(e.value, decimals) + unit, interval(e, decimals)}, {}, {}, false};
    };
    QVector<TextTableModel::Row> derived;
    derived << dateRow(FitPane::tr("Peak day"), d.peakDay);
    derived << valueRow(
        fit.periodDays == 7 ? FitPane::tr("Peak per week") : FitPane::tr("Peak per day"),
        d.peakIncidence, decimalsFor(d.peakIncidence.value));
    derived << valueRow(FitPane::tr("Wave size K"), d.waveSize, 0);
    derived << TextTableModel::Row{
        {FitPane::tr("Fraction observed"),
         number(d.fractionObserved.value * 100, 1) + QStringLiteral(" %"),
         std::isfinite(d.fractionObserved.lower)
             ? QStringLiteral("%1 – %2 %")
                   .arg(number(d.fractionObserved.lower * 100, 1),
                        number(d.fractionObserved.upper * 100, 1))
             : QStringLiteral("–")},
        {},
        FitPane::tr("Cumulative fitted cases at the last day with data, as a share of K"),
        false};
    derived << dateRow(
        FitPane::tr("Start (%1 % of K)").arg(number(fit.options.startQuantile * 100, 1)),
        d.startDay);
    derived << dateRow(FitPane::tr("End (%1 % of K)").arg(number(fit.options.endQuantile * 100, 1)),
                       d.endDay);
    derived << dateRow(FitPane::tr("Fastest growth"), d.fastestGrowthDay);
    derived << valueRow(FitPane::tr("Doubling time on the observed rise (days)"),
                        d.observedDoublingTimeDays, 1);
    derived << valueRow(FitPane::tr("Model's instantaneous doubling time at its fastest growth (days)"),
                        d.doublingTimeDays, 1);
    derived << valueRow(
        FitPane::tr("Peak infectious load (%1-day cases)").arg(fit.options.infectiousWindowDays),
        d.peakInfectiousLoad, 0);
    if (d.peakInfectiousLoadPer100k)
        derived << valueRow(FitPane::tr("… per 100,000 people"), *d.peakInfectiousLoadPer100k, 1);
    return derived;
}

}  // namespace

void FitPane::showFit(const Result<fit::FitResult>& result,
                      const std::vector<fit::ModelComparisonRow>& comparison) {
    m_comparison->setRows(comparisonRows(result, comparison));
    if (!result) {
        m_summary->setText(noFitText(result.error()));
        m_parameters->setRows({});
        m_derived->setRows({});
        return;
    }
    m_summary->setText(fitSummaryText(*result));
    m_parameters->setRows(parameterRows(*result));
    m_derived->setRows(derivedRows(*result));
}

}  // namespace siftwave::widgets
