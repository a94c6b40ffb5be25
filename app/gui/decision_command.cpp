#include "decision_command.h"

#include "widgets/common/workbench.h"

#include <QCoreApplication>

namespace siftwave::gui {

ApplyDecisionCommand::ApplyDecisionCommand(widgets::Workbench* workbench, ledger::Decision decision,
                                           QString reason, ErrorSink onError)
    : m_workbench(workbench),
      m_decision(std::move(decision)),
      m_reason(std::move(reason)),
      m_onError(std::move(onError)) {
    setText(QCoreApplication::translate("ApplyDecisionCommand", "%1 %2")
                .arg(QString::fromLatin1(ledger::decisionKindName(m_decision.kind)),
                     QString::fromStdString(m_decision.region)));
}

void ApplyDecisionCommand::redo() {
    Result<std::uint64_t> result =
        m_entry == 0
            ? m_workbench->apply(m_decision, m_reason)
            : m_workbench->withdraw(m_withdrawal, QCoreApplication::translate(
                                                      "ApplyDecisionCommand",
                                                      "redo in the workbench: restores entry %1")
                                                      .arg(m_entry));
    if (!result) {
        m_onError(QString::fromStdString(result.error().describe()));
        setObsolete(true);
        return;
    }
    if (m_entry == 0)
        m_entry = *result;
    m_withdrawal = 0;
}

void ApplyDecisionCommand::undo() {
    Result<std::uint64_t> result = m_workbench->withdraw(
        m_entry,
        QCoreApplication::translate("ApplyDecisionCommand", "undo in the workbench of entry %1")
            .arg(m_entry));
    if (!result) {
        m_onError(QString::fromStdString(result.error().describe()));
        setObsolete(true);
        return;
    }
    m_withdrawal = *result;
}

}  // namespace siftwave::gui
