#include "decision_controller.h"

#include "siftwave/ledger/nowcast_completion.h"
#include "siftwave/ledger/replay.h"

#include "decision_command.h"

#include "widgets/common/drop_loading.h"
#include "widgets/common/workbench.h"
#include "widgets/ledger/decision_pane.h"
#include "widgets/plot/series_plot.h"

#include "siftwave/scan/propose.h"
#include "siftwave/scan/suggested_decision.h"

#include <QInputDialog>
#include <QLineEdit>
#include <QTimer>
#include <QUndoStack>
#include <QWidget>

#include <cmath>
#include <limits>

namespace siftwave::gui {

DecisionController::DecisionController(widgets::Workbench* workbench, widgets::SeriesPlot* plot,
                                       widgets::DecisionPane* pane, bool dialogs, QWidget* window)
    : QObject(window),
      m_workbench(workbench),
      m_plot(plot),
      m_pane(pane),
      m_dialogs(dialogs),
      m_window(window),
      m_undo(new QUndoStack(this)),
      m_checkTimer(new QTimer(this)) {
    m_checkTimer->setSingleShot(true);
    m_checkTimer->setInterval(250);
    connect(m_checkTimer, &QTimer::timeout, this, &DecisionController::runCheck);
    connect(m_pane, &widgets::DecisionPane::decisionEdited, this, &DecisionController::preview);
    connect(m_pane, &widgets::DecisionPane::applyRequested, this, &DecisionController::apply);
    connect(m_pane, &widgets::DecisionPane::cancelled, this, &DecisionController::end);
}

bool DecisionController::isActive() const {
    return m_pane->isActive();
}

bool DecisionController::decideFinding(const QString& id) {
    const scan::Finding* finding = m_workbench->finding(id);
    if (!finding || !m_workbench->hasDrop())
        return false;
    const std::string measure =
        m_workbench->drop().measures.at(static_cast<std::size_t>(m_plot->measure()));
    Result<scan::Proposal> proposal = scan::proposeDecision(m_workbench->drop(), *finding, measure);
    Result<ledger::Decision> decision = proposal ? Result<ledger::Decision>(proposal->decision)
                                                 : Result<ledger::Decision>(proposal.error());
    if (!decision) {
        Q_EMIT errorOccurred(tr("No decision to prepare"),
                             widgets::describeError(decision.error()));
        return false;
    }
    Q_EMIT focusRequested(*finding);
    begin(*decision,
          tr("<b>%1</b> for %2 — finding %3")
              .arg(QString::fromLatin1(ledger::decisionKindName(decision->kind)),
                   QString::fromStdString(decision->region), id),
          widgets::reasonDraftFor(*finding, *decision));
    return true;
}

void DecisionController::begin(const ledger::Decision& decision, const QString& title,
                               const QString& reason) {
    m_pane->setCalendar(m_workbench->drop().axis);
    m_pane->begin(decision, title, reason);
    m_plot->setDayPickingEnabled(false);
    preview();
    runCheck();
    Q_EMIT decisionStarted();  // after the preview: the window sizes the pane to its texts
}

bool DecisionController::decideDay(int day) {
    const widgets::SeriesView& view = m_plot->view();
    if (!m_workbench->hasDrop() || m_pane->isActive() || view.empty() || day < 0 ||
        day >= view.periods())
        return false;
    const Date date = view.periodStart(day);
    // One rule for a picked cell, shared with `decide --excess auto` (scan/propose.h): the
    // scan's own suggestion when it flagged the cell, else its backlog estimate.
    std::vector<scan::Finding> open;
    for (const scan::Finding& f : m_workbench->findings())
        if (!m_workbench->isDecided(f.id))
            open.push_back(f);
    scan::ProposalRequest request;
    request.region = view.regionCode.toStdString();
    request.measure = view.measure.toStdString();
    request.day = date;
    request.findings = open;
    const Result<scan::Proposal> proposal = scan::proposeDecision(m_workbench->drop(), request);
    if (!proposal) {
        Q_EMIT errorOccurred(tr("Nothing to redistribute"),
                             widgets::describeError(proposal.error()));
        return false;
    }
    if (proposal->source == scan::ProposalSource::Finding)
        return decideFinding(QString::fromStdString(proposal->finding->id));
    const ledger::Decision& decision = proposal->decision;
    const scan::BacklogEstimate* estimate = proposal->estimate ? &*proposal->estimate : nullptr;
    // As from a finding: the window and the day in view, with three weeks either side.
    m_plot->focusOn(
        widgets::DayIndexRange{decision.window->first - view.axis.first() - 21, day + 21});
    begin(decision,
          tr("<b>redistribute</b> for %1 — %2 picked on the plot")
              .arg(view.regionCode, QString::fromStdString(date.iso())),
          widgets::reasonDraftForPickedDay(
              decision, proposal->reported, estimate,
              proposal->noEstimate ? widgets::describeError(*proposal->noEstimate) : QString()));
    return true;
}

bool DecisionController::decideNowcastCompletion() {
    const widgets::SeriesView& view = m_plot->view();
    if (!m_workbench->hasDrop() || m_pane->isActive() || view.empty())
        return false;
    ledger::NowcastCompletionRequest request;
    request.region = view.regionCode.toStdString();
    request.measure = view.measure.toStdString();
    const Result<ledger::Decision> decision =
        ledger::nowcastCompletion(m_workbench->drop(), request);
    Result<ledger::Effect> effect =
        decision ? ledger::previewDecision(m_workbench->drop(), m_workbench->cleaned(), *decision)
                 : Result<ledger::Effect>(decision.error());
    if (!effect) {
        Q_EMIT errorOccurred(tr("No nowcast-completed series"),
                             widgets::describeError(effect.error()));
        return false;
    }
    const ledger::Decision& d = *decision;
    const QString unit = m_workbench->drop().axis.weekly() ? tr("weeks") : tr("days");
    begin(d,
          tr("<b>nowcast_complete</b> for %1 — chain-ladder as of %2, max delay %3 %5, window "
             "%4 %5")
              .arg(view.regionCode, QString::fromStdString(d.date->iso()))
              .arg(d.maxDelay)
              .arg(d.nowcastWindow)
              .arg(unit),
          tr("Fit and brief on the counts completed by the nowcast of reports still to come "
             "(%1 more expected); they assume the reporting delays seen so far continue.")
              .arg(effect->netChange()));
    return true;
}

void DecisionController::preview() {
    if (!m_pane->isActive())
        return;
    const ledger::Decision decision = m_pane->decision();
    const Result<ledger::Effect> effect = m_workbench->preview(decision);
    m_pane->showPreview(effect);
    m_pane->showCheck(std::nullopt);
    if (effect)
        m_checkTimer->start();  // restarts: the check follows the last edit
    // Draw the cells of the shown region and measure as they would be after.
    std::vector<double> values;
    if (effect) {
        const widgets::SeriesView& view = m_plot->view();
        values.assign(static_cast<std::size_t>(view.periods()),
                      std::numeric_limits<double>::quiet_NaN());
        for (const ledger::CellChange& c : effect->cells) {
            if (QString::fromStdString(c.region) != view.regionCode ||
                QString::fromStdString(c.measure) != view.measure)
                continue;
            const int day = c.date - view.axis.first();
            if (day >= 0 && day < view.periods())
                values[static_cast<std::size_t>(day)] = static_cast<double>(c.after.counted());
        }
    }
    m_plot->setPreview(values, tr("Preview: after the decision"));
    if (const auto window = m_pane->window())
        m_plot->setEditableWindow(*window);
}

void DecisionController::runCheck() {
    m_checkTimer->stop();
    if (!m_pane->isActive())
        return;
    const ledger::Decision decision = m_pane->decision();
    if (m_workbench->preview(decision))
        m_pane->showCheck(m_workbench->checkDecision(decision));
}

bool DecisionController::apply() {
    if (!m_pane->isActive())
        return false;
    if (m_pane->reason().isEmpty() || !m_pane->previewOk())
        return false;
    const std::uint64_t before = m_workbench->ledger().entries.size();
    bool failed = false;
    m_undo->push(new ApplyDecisionCommand(
        m_workbench, m_pane->decision(), m_pane->reason(), [this, &failed](const QString& message) {
            failed = true;
            Q_EMIT errorOccurred(tr("The ledger refused the decision"), message);
        }));
    if (failed || m_workbench->ledger().entries.size() == before)
        return false;
    discard();
    return true;
}

bool DecisionController::withdraw(std::uint64_t sequence, QString reason) {
    if (reason.trimmed().isEmpty()) {
        if (!m_dialogs)
            return false;
        bool ok = false;
        reason = QInputDialog::getText(
            m_window, tr("Withdraw entry %1").arg(sequence),
            tr("Why is entry %1 withdrawn? (required, kept in the ledger)").arg(sequence),
            QLineEdit::Normal, QString(), &ok);
        if (!ok || reason.trimmed().isEmpty())
            return false;
    }
    const Result<std::uint64_t> result = m_workbench->withdraw(sequence, reason);
    if (!result) {
        Q_EMIT errorOccurred(tr("The entry cannot be withdrawn"),
                             widgets::describeError(result.error()));
        return false;
    }
    return true;
}

void DecisionController::discard() {
    m_pane->clear();
    end();
}

void DecisionController::reset() {
    m_undo->clear();
    m_pane->clear();
}

void DecisionController::end() {
    m_plot->setDayPickingEnabled(!m_pane->isActive());
    m_plot->setPreview({});
    Q_EMIT decisionEnded();
}

}  // namespace siftwave::gui
