#pragma once
// DelayView: the reporting-delay distribution of a case list (core nowcast/delays.h), shown
// over time: per group of event dates (a moving window or a calendar month), the median delay
// with its 25-75 % and 5-95 % bands on a plot, the same figures in a table, and the overall
// quantiles above. Groups whose long delays cannot have been reported yet (right truncation)
// are drawn grey and marked in the table: their quantiles are biased short. Every number is
// the core's.

#include "siftwave/drop.h"
#include "siftwave/nowcast/delays.h"

#include <QWidget>

#include <optional>

class QComboBox;
class QCustomPlot;
class QLabel;
class QTableWidget;

namespace siftwave::widgets {

class DelayView : public QWidget {
    Q_OBJECT

public:
    explicit DelayView(QWidget* parent = nullptr);

    /// Shows the delays of `region` of a case list (nullopt: every region together); a drop
    /// without a case list shows why there is nothing to show.
    void showDelays(const Drop& drop, std::optional<std::size_t> region);
    /// Nothing open.
    void clear();

    /// The report shown (nullopt when none), for tests.
    const std::optional<nowcast::DelayReport>& report() const { return m_report; }
    QCustomPlot* customPlot() const { return m_plot; }
    QTableWidget* table() const { return m_table; }

private:
    void refresh();
    void drawPlot(const nowcast::DelayReport& report);
    void fillTable(const nowcast::DelayReport& report);

    QComboBox* m_grouping;
    QLabel* m_summary;
    QCustomPlot* m_plot;
    QTableWidget* m_table;
    const Drop* m_drop = nullptr;
    std::optional<std::size_t> m_region;
    std::optional<nowcast::DelayReport> m_report;
};

}  // namespace siftwave::widgets
