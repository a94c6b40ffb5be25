#pragma once
// SheetChooser: which sheet of a workbook drop is read, when the workbook holds more than one
// table with dates (Provenance::datedSheets). Hidden for a CSV drop and for a workbook with one
// such sheet. Choosing another sheet asks for the drop to be read again with it; the chooser
// never reads anything itself.

#include "siftwave/drop.h"

#include <QWidget>

class QComboBox;
class QLabel;

namespace siftwave::widgets {

class SheetChooser : public QWidget {
    Q_OBJECT
public:
    explicit SheetChooser(QWidget* parent = nullptr);

    /// Shows the sheets of `source` worth choosing, the one read selected; hides itself when
    /// there is nothing to choose.
    void showSheetsOf(const Provenance& source);
    /// Hides the chooser (no drop, or a CSV drop).
    void clear();
    /// The sheet shown as read ("" when there is nothing to choose).
    QString currentSheet() const;

Q_SIGNALS:
    /// The analyst picked another sheet (never emitted by showSheetsOf()).
    void sheetChosen(const QString& sheet);

private:
    QLabel* m_label;
    QComboBox* m_sheets;
    QString m_read;  // the sheet the open drop was read from
};

}  // namespace siftwave::widgets
