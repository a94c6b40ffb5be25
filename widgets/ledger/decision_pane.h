#pragma once
// DecisionPane: one decision being prepared, previewed, then applied.
//
// It starts from a finding's suggested decision (or a bar picked on the plot),
// lets the analyst change the method and the window (also by dragging the
// window's edges on the plot), shows what the core's preview says it would do
// — the cells it changes and the region total before and after — and what a scan after
// it would newly find (a plateau, a new spike, a wave the counts did not have), and asks for
// the reason, prefilled from the finding's evidence, editable and required.
// Apply emits applyRequested(); the window applies through Workbench::apply().

#include "siftwave/date.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/result.h"
#include "siftwave/scan/backlog.h"
#include "siftwave/scan/decision_check.h"
#include "siftwave/scan/finding.h"
#include "widgets/plot/series_view.h"

#include <QWidget>

#include <optional>

class QComboBox;
class QLabel;
class QLineEdit;
class QPushButton;
class QSpinBox;

namespace siftwave::widgets {

class DecisionPane : public QWidget {
    Q_OBJECT

public:
    explicit DecisionPane(QWidget* parent = nullptr);

    /// The drop's calendar (for day indices on the plot).
    void setCalendar(const TimeAxis& axis);
    /// Starts preparing `decision`; `reason` is the draft shown in the reason field.
    void begin(const ledger::Decision& decision, const QString& title, const QString& reason);
    void clear();
    bool isActive() const { return m_decision.has_value(); }

    /// The decision with the chosen method, counts to move and window.
    ledger::Decision decision() const;
    /// The decision's window in day indices, when it has one.
    std::optional<DayIndexRange> window() const;
    void setWindow(DayIndexRange window);

    /// Shows the core's preview (or why it refuses) for `region` and `measure`.
    void showPreview(const Result<ledger::Effect>& effect);
    /// Shows what a scan after the decision would newly find (nullopt: nothing to check, as
    /// when the preview failed). A check that finds something is a warning, not a refusal: the
    /// analyst may still apply, having seen it.
    void showCheck(const std::optional<Result<scan::DecisionCheck>>& check);
    QString checkText() const;
    /// The preview allows Apply (the core accepted it).
    bool previewOk() const { return m_previewOk; }

    QString reason() const;
    void setReason(const QString& reason);
    QString previewText() const;

Q_SIGNALS:
    /// The method or the window changed: preview again.
    void decisionEdited();
    void applyRequested();
    void cancelled();

private:
    void updateApply();

    std::optional<ledger::Decision> m_decision;
    TimeAxis m_axis;
    bool m_previewOk = false;
    QLabel* m_title;
    QComboBox* m_method;
    QSpinBox* m_excess;  // redistribute: the counts to move
    QLabel* m_excessLabel;
    QLabel* m_windowLabel;
    QLabel* m_preview;
    QLabel* m_check;  // what the decision would newly make look wrong
    QLineEdit* m_reason;
    QPushButton* m_apply;
    QPushButton* m_cancel;
};

/// A draft reason from a finding: what it is, where, and its evidence in numbers.
QString reasonDraftFor(const scan::Finding& finding, const ledger::Decision& decision);

/// A draft reason for a redistribution of a day picked on the plot: the day, what was reported
/// and the core's backlog estimate (or, when there is none, why not).
QString reasonDraftForPickedDay(const ledger::Decision& decision, std::int64_t reported,
                                const scan::BacklogEstimate* estimate, const QString& noEstimate);

}  // namespace siftwave::widgets
