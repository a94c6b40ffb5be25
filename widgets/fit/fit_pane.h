#pragma once
// FitPane: the controls and the results of one region's wave fit.
//
// Controls: the model (one of the four, or "lowest AICc" of the comparison),
// the method (least squares on the centred average, Poisson or negative-binomial
// likelihood on the raw counts), weekday factors, and the window: automatic
// (the largest or the latest wave the core detects) or chosen days, which the
// plot's draggable window edges also set. Results, all from the core's
// FitResult: the solver's one-line summary and notes, the parameters with 95%
// intervals, the derived quantities, the model comparison, and always the caution.

#include "siftwave/date.h"
#include "siftwave/fit/fit.h"
#include "siftwave/result.h"
#include "widgets/plot/series_view.h"

#include <QWidget>

#include <optional>
#include <vector>

class QCheckBox;
class QComboBox;
class QDateEdit;
class QFormLayout;
class QLabel;
class QRadioButton;
class QTabWidget;
class QTableView;

namespace siftwave::widgets {

class TextTableModel;

class FitPane : public QWidget {
    Q_OBJECT

public:
    explicit FitPane(QWidget* parent = nullptr);

    /// The options the controls ask for (the window in day indices of the calendar; the model
    /// choice, "lowest AICc of the comparison" included, in FitOptions::modelChoice).
    fit::FitOptions options() const;
    /// The chosen window, when the window is not automatic.
    std::optional<DayIndexRange> manualWindow() const;

    /// The drop's calendar, for the date fields.
    /// The drop's periods: the window's dates, the methods' names and the cadence's defaults.
    void setCalendar(const TimeAxis& axis);
    /// Sets chosen days (e.g. dragged on the plot) without emitting optionsChanged().
    void setManualWindow(DayIndexRange window);
    /// Back to the automatic window, without emitting optionsChanged().
    void setAutomaticWindow();
    /// Sets the model (nullopt: lowest AICc), method, weekday factors and wave choice without
    /// emitting optionsChanged() (e.g. from a project file).
    void setChoices(std::optional<fit::ModelKind> model, fit::FitMethod method, bool weekdayFactors,
                    fit::WaveChoice wave);

    /// Shows the window a fit used in the date fields (automatic mode stays automatic).
    void showWindow(DayIndexRange window);
    /// Shows a fit (or why there is none) and the comparison rows (may be empty).
    void showFit(const Result<fit::FitResult>& result,
                 const std::vector<fit::ModelComparisonRow>& comparison);
    void clear(const QString& why);

    TextTableModel* parameterTable() const { return m_parameters; }
    TextTableModel* derivedTable() const { return m_derived; }
    TextTableModel* comparisonTable() const { return m_comparison; }
    QString summaryText() const;

    /// The summary line shown when no fit could be made: the core's reason, with the pane's
    /// own controls named where the core names a command-line argument.
    static QString noFitText(const Error& error);

Q_SIGNALS:
    /// The analyst changed a control: refit.
    void optionsChanged();

private:
    void fillChoices();
    void setUpWindowAndText();
    QFormLayout* optionsForm();
    QTabWidget* resultTabs();
    void layOut();
    void connectControls();
    void onWindowModeChanged();

    QComboBox* m_model;
    QComboBox* m_method;
    QCheckBox* m_weekday;
    QRadioButton* m_auto;
    QComboBox* m_wave;
    QRadioButton* m_manual;
    QDateEdit* m_from;
    QDateEdit* m_to;
    QLabel* m_summary;
    TextTableModel* m_parameters;
    TextTableModel* m_derived;
    TextTableModel* m_comparison;
    QLabel* m_caution;
    TimeAxis m_axis;
};

}  // namespace siftwave::widgets
