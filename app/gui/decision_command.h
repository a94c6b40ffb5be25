#pragma once
// ApplyDecisionCommand: a ledger decision on the undo stack.
//
// redo() the first time appends the decision through Workbench::apply(); undo()
// appends a withdrawal of it; a later redo() withdraws that withdrawal, which
// restores the entry. History is never rewritten: every step is a new entry.
// If the ledger refuses a step, the command reports why and becomes obsolete.

#include "siftwave/ledger/decision.h"

#include <QString>
#include <QUndoCommand>

#include <cstdint>
#include <functional>

namespace siftwave::widgets {
class Workbench;
}

namespace siftwave::gui {

class ApplyDecisionCommand : public QUndoCommand {
public:
    using ErrorSink = std::function<void(const QString& message)>;

    ApplyDecisionCommand(widgets::Workbench* workbench, ledger::Decision decision, QString reason,
                         ErrorSink onError);

    void redo() override;
    void undo() override;

    /// The entry this command recorded (0 until it was applied).
    std::uint64_t entry() const { return m_entry; }

private:
    widgets::Workbench* m_workbench;
    ledger::Decision m_decision;
    QString m_reason;
    ErrorSink m_onError;
    std::uint64_t m_entry = 0;       // the decision's entry
    std::uint64_t m_withdrawal = 0;  // the latest withdrawal of it (0: in effect)
};

}  // namespace siftwave::gui
