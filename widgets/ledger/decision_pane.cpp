#include "widgets/ledger/decision_pane.h"

#include <QComboBox>
#include <QCoreApplication>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QLocale>
#include <QPushButton>
#include <QScrollArea>
#include <QSignalBlocker>
#include <QSpinBox>
#include <QVBoxLayout>

#include <algorithm>
#include <limits>

namespace siftwave::widgets {

namespace {
QString count(std::int64_t value) {
    return QLocale::c().toString(static_cast<qlonglong>(value));
}
}  // namespace

DecisionPane::DecisionPane(QWidget* parent)
    : QWidget(parent),
      m_title(new QLabel(this)),
      m_method(new QComboBox(this)),
      m_excess(new QSpinBox(this)),
      m_excessLabel(new QLabel(tr("Counts to move"), this)),
      m_windowLabel(new QLabel(this)),
      m_preview(new QLabel(this)),
      m_check(new QLabel(this)),
      m_reason(new QLineEdit(this)),
      m_apply(new QPushButton(tr("Apply"), this)),
      m_cancel(new QPushButton(tr("Discard"), this)) {
    m_title->setObjectName(QStringLiteral("decisionTitle"));
    m_title->setWordWrap(true);
    m_method->setObjectName(QStringLiteral("decisionMethod"));
    m_excess->setObjectName(QStringLiteral("decisionExcess"));
    m_excess->setRange(0, std::numeric_limits<int>::max());
    m_excess->setGroupSeparatorShown(true);
    m_excess->setToolTip(tr("How many counts are moved off the day onto the window's days"));
    m_preview->setObjectName(QStringLiteral("decisionPreview"));
    m_preview->setWordWrap(true);
    m_preview->setTextInteractionFlags(Qt::TextSelectableByMouse);
    m_check->setObjectName(QStringLiteral("decisionCheck"));
    m_check->setWordWrap(true);
    m_check->setTextInteractionFlags(Qt::TextSelectableByMouse);
    m_reason->setObjectName(QStringLiteral("decisionReason"));
    m_reason->setPlaceholderText(tr("Why: required, kept in the ledger"));
    m_apply->setObjectName(QStringLiteral("applyDecision"));
    m_apply->setToolTip(tr("Append this decision to the ledger (Ctrl+Return)"));
    m_apply->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_Return));
    m_cancel->setObjectName(QStringLiteral("discardDecision"));

    auto* form = new QFormLayout;
    form->addRow(tr("Method"), m_method);
    form->addRow(m_excessLabel, m_excess);
    form->addRow(tr("Window"), m_windowLabel);
    form->addRow(tr("Reason"), m_reason);
    auto* buttons = new QHBoxLayout;
    buttons->addStretch(1);
    buttons->addWidget(m_cancel);
    buttons->addWidget(m_apply);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addWidget(m_title);
    layout->addLayout(form);
    // The preview and the check can run long (one line per new anomaly): they scroll, so the
    // method, the reason and the buttons stay in view however short the pane is.
    auto* texts = new QWidget;
    auto* textLayout = new QVBoxLayout(texts);
    textLayout->setContentsMargins(0, 0, 0, 0);
    textLayout->addWidget(m_preview);
    textLayout->addWidget(m_check);
    textLayout->addStretch(1);
    auto* scroll = new QScrollArea(this);
    scroll->setObjectName(QStringLiteral("decisionTexts"));
    scroll->setWidget(texts);
    scroll->setWidgetResizable(true);
    scroll->setFrameShape(QFrame::NoFrame);
    scroll->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
    scroll->setMinimumHeight(3 * fontMetrics().lineSpacing());
    layout->addWidget(scroll, 1);
    layout->addLayout(buttons);

    connect(m_method, &QComboBox::currentIndexChanged, this, [this] {
        if (m_decision)
            Q_EMIT decisionEdited();
    });
    connect(m_excess, &QSpinBox::valueChanged, this, [this] {
        if (m_decision)
            Q_EMIT decisionEdited();
    });
    connect(m_reason, &QLineEdit::textChanged, this, &DecisionPane::updateApply);
    connect(m_apply, &QPushButton::clicked, this, [this] {
        if (m_apply->isEnabled())
            Q_EMIT applyRequested();
    });
    connect(m_cancel, &QPushButton::clicked, this, [this] {
        clear();
        Q_EMIT cancelled();
    });
    clear();
}

void DecisionPane::setCalendar(const TimeAxis& axis) {
    m_axis = axis;
}

void DecisionPane::begin(const ledger::Decision& decision, const QString& title,
                         const QString& reason) {
    m_decision = decision;
    m_title->setText(title);
    const QSignalBlocker block(m_method);
    m_method->clear();
    switch (decision.kind) {
        case ledger::DecisionKind::Redistribute:
            for (ledger::RedistributeMethod m :
                 {ledger::RedistributeMethod::Uniform, ledger::RedistributeMethod::Proportional,
                  ledger::RedistributeMethod::Baseline, ledger::RedistributeMethod::Level})
                m_method->addItem(QString::fromLatin1(ledger::redistributeMethodName(m)),
                                  static_cast<int>(m));
            m_method->setCurrentIndex(
                m_method->findData(static_cast<int>(decision.redistributeMethod)));
            break;
        case ledger::DecisionKind::FillMissing:
            for (ledger::FillMethod m :
                 {ledger::FillMethod::Zero, ledger::FillMethod::Linear, ledger::FillMethod::Share})
                m_method->addItem(QString::fromLatin1(ledger::fillMethodName(m)),
                                  static_cast<int>(m));
            m_method->setCurrentIndex(m_method->findData(static_cast<int>(decision.fillMethod)));
            break;
        case ledger::DecisionKind::ResolveDuplicate:
            for (ledger::DuplicateRule m :
                 {ledger::DuplicateRule::First, ledger::DuplicateRule::Last,
                  ledger::DuplicateRule::Sum, ledger::DuplicateRule::Max})
                m_method->addItem(QString::fromLatin1(ledger::duplicateRuleName(m)),
                                  static_cast<int>(m));
            m_method->setCurrentIndex(m_method->findData(static_cast<int>(decision.duplicateRule)));
            break;
        default:
            m_method->addItem(QString::fromLatin1(ledger::decisionKindName(decision.kind)), -1);
            break;
    }
    m_method->setEnabled(m_method->count() > 1);
    {
        const QSignalBlocker blockExcess(m_excess);
        const bool redistribute = decision.kind == ledger::DecisionKind::Redistribute;
        m_excess->setValue(static_cast<int>(
            std::clamp<std::int64_t>(decision.excess, 0, std::numeric_limits<int>::max())));
        m_excess->setVisible(redistribute);
        m_excessLabel->setVisible(redistribute);
        m_excess->setEnabled(redistribute);
    }
    m_reason->setText(reason);
    m_reason->setEnabled(true);
    m_cancel->setEnabled(true);
    m_windowLabel->setText(decision.window ? QString::fromStdString(decision.window->iso())
                                                 .replace(QLatin1Char(':'), QStringLiteral(" … "))
                                           : tr("(none)"));
    m_previewOk = false;
    updateApply();
}

void DecisionPane::clear() {
    m_decision.reset();
    m_title->setText(tr("<i>No decision in preparation. Pick a finding and press Decide.</i>"));
    const QSignalBlocker block(m_method);
    m_method->clear();
    m_method->setEnabled(false);
    {
        const QSignalBlocker blockExcess(m_excess);
        m_excess->setValue(0);
        m_excess->setVisible(false);
        m_excessLabel->setVisible(false);
    }
    m_windowLabel->clear();
    m_preview->clear();
    m_check->clear();
    m_reason->clear();
    m_reason->setEnabled(false);
    m_cancel->setEnabled(false);
    m_previewOk = false;
    updateApply();
}

ledger::Decision DecisionPane::decision() const {
    ledger::Decision d = m_decision.value_or(ledger::Decision{});
    const int method = m_method->currentData().toInt();
    if (method >= 0) {
        if (d.kind == ledger::DecisionKind::Redistribute)
            d.redistributeMethod = static_cast<ledger::RedistributeMethod>(method);
        if (d.kind == ledger::DecisionKind::FillMissing)
            d.fillMethod = static_cast<ledger::FillMethod>(method);
        if (d.kind == ledger::DecisionKind::ResolveDuplicate)
            d.duplicateRule = static_cast<ledger::DuplicateRule>(method);
    }
    if (d.kind == ledger::DecisionKind::Redistribute)
        d.excess = m_excess->value();
    return d;
}

std::optional<DayIndexRange> DecisionPane::window() const {
    if (!m_decision || !m_decision->window)
        return std::nullopt;
    return DayIndexRange{m_axis.periodOnGrid(m_decision->window->first),
                         m_axis.periodOnGrid(m_decision->window->last)};
}

void DecisionPane::setWindow(DayIndexRange window) {
    if (!m_decision || !m_decision->window)
        return;
    ledger::DayRange range{m_axis.periodStart(window.first), m_axis.periodStart(window.last)};
    // A redistribution spreads over periods before the dump's; keep the window there.
    if (m_decision->kind == ledger::DecisionKind::Redistribute && m_decision->date &&
        range.last >= *m_decision->date)
        range.last = m_axis.periodStart(m_axis.periodOnGrid(*m_decision->date) - 1);
    if (range.last < range.first)
        range.first = range.last;
    m_decision->window = range;
    m_windowLabel->setText(
        QString::fromStdString(range.iso()).replace(QLatin1Char(':'), QStringLiteral(" … ")));
    Q_EMIT decisionEdited();
}

void DecisionPane::showPreview(const Result<ledger::Effect>& effect) {
    m_previewOk = effect.ok();
    if (!effect) {
        m_preview->setText(
            tr("<b>The core refuses this:</b> %1")
                .arg(QString::fromStdString(effect.error().message).toHtmlEscaped()));
        updateApply();
        return;
    }
    QString text = tr("Changes %n cell(s).", nullptr, static_cast<int>(effect->cells.size()));
    for (const ledger::TotalChange& t : effect->totals) {
        text +=
            QStringLiteral("<br>") +
            tr("%1 %2 total: %3 → %4 %5")
                .arg(QString::fromStdString(t.region), QString::fromStdString(t.measure),
                     count(t.before), count(t.after),
                     t.change() == 0 ? tr("<b>(conserved)</b>")
                                     : tr("<b>(%1%2)</b>")
                                           .arg(t.change() > 0 ? QStringLiteral("+") : QString())
                                           .arg(t.change()));
    }
    if (m_decision && m_decision->kind == ledger::DecisionKind::Redistribute)
        text += QStringLiteral("<br>") +
                tr("Moves %1 counts off %2.")
                    .arg(count(m_excess->value()), QString::fromStdString(m_decision->date->iso()));
    m_preview->setText(text);
    updateApply();
}

void DecisionPane::showCheck(const std::optional<Result<scan::DecisionCheck>>& check) {
    if (!check) {
        m_check->clear();
        return;
    }
    if (!*check) {
        m_check->setText(
            tr("<i>Could not re-scan the series after this decision: %1</i>")
                .arg(QString::fromStdString((*check).error().message).toHtmlEscaped()));
        return;
    }
    if ((*check)->clean()) {
        m_check->setText(
            tr("Check: a scan after this decision finds nothing new in the series it changes."));
        return;
    }
    QString text =
        tr("<b>Check: this decision would create what the scan flags.</b> Look at the "
           "preview on the plot before applying; another method or a longer window "
           "may avoid it.");
    for (const std::string& line : scan::describeDecisionCheck(**check, m_axis.cadence()))
        text += QStringLiteral("<br>• ") + QString::fromStdString(line).toHtmlEscaped();
    m_check->setText(text);
}

QString DecisionPane::checkText() const {
    return m_check->text();
}

QString DecisionPane::previewText() const {
    return m_preview->text();
}

QString DecisionPane::reason() const {
    return m_reason->text().trimmed();
}

void DecisionPane::setReason(const QString& reason) {
    m_reason->setText(reason);
}

void DecisionPane::updateApply() {
    const bool ready = m_decision && m_previewOk && !reason().isEmpty();
    m_apply->setEnabled(ready);
    m_apply->setToolTip(!m_decision    ? tr("Nothing to apply")
                        : !m_previewOk ? tr("The preview must succeed first")
                        : reason().isEmpty()
                            ? tr("A reason is required")
                            : tr("Append this decision to the ledger (Ctrl+Return)"));
}

QString reasonDraftFor(const scan::Finding& finding, const ledger::Decision& decision) {
    QStringList evidence;
    for (const auto& [key, text] : finding.evidence.scalars())
        evidence << QStringLiteral("%1 %2").arg(
            QString::fromStdString(key).replace(QLatin1Char('_'), QLatin1Char(' ')),
            QString::fromStdString(text));
    QString where = QString::fromStdString(finding.region.value_or(std::string()));
    if (finding.first)
        where += QStringLiteral(" ") + QString::fromStdString(finding.first->iso());
    return QCoreApplication::translate("DecisionPane", "%1 in %2 (finding %3): %4; %5 as suggested")
        .arg(QString::fromLatin1(scan::findingKindName(finding.kind))
                 .replace(QLatin1Char('_'), QLatin1Char(' ')),
             where.trimmed(), QString::fromStdString(finding.id),
             evidence.join(QStringLiteral(", ")),
             QString::fromLatin1(ledger::decisionKindName(decision.kind))
                 .replace(QLatin1Char('_'), QLatin1Char(' ')));
}

QString reasonDraftForPickedDay(const ledger::Decision& decision, std::int64_t reported,
                                const scan::BacklogEstimate* estimate, const QString& noEstimate) {
    const QString where =
        QStringLiteral("%1 %2 %3")
            .arg(QString::fromStdString(decision.region), QString::fromStdString(decision.measure),
                 decision.date ? QString::fromStdString(decision.date->iso()) : QString());
    QString evidence;
    if (estimate)
        evidence = QCoreApplication::translate(
                       "DecisionPane",
                       "reported %1, expected %2 from %3 neighbouring days (z %4), excess %5")
                       .arg(count(reported), QLocale::c().toString(estimate->expected, 'f', 1))
                       .arg(estimate->neighbours)
                       .arg(QLocale::c().toString(estimate->z, 'f', 1), count(estimate->excess));
    else
        evidence = QCoreApplication::translate("DecisionPane", "reported %1; no baseline (%2)")
                       .arg(count(reported), noEstimate);
    return QCoreApplication::translate("DecisionPane",
                                       "backlog picked on the plot in %1: %2; redistributed over "
                                       "the earlier days")
        .arg(where, evidence);
}

}  // namespace siftwave::widgets
