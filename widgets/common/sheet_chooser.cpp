#include "widgets/common/sheet_chooser.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QLabel>

namespace siftwave::widgets {

SheetChooser::SheetChooser(QWidget* parent)
    : QWidget(parent), m_label(new QLabel(tr("Sheet:"))), m_sheets(new QComboBox) {
    setObjectName(QStringLiteral("sheetChooser"));
    m_sheets->setObjectName(QStringLiteral("sheetChooserBox"));
    m_sheets->setSizeAdjustPolicy(QComboBox::AdjustToContents);
    m_sheets->setToolTip(
        tr("This workbook holds several tables with dates; the drop is read from the sheet "
           "chosen here (by default the first one with dates)"));
    m_label->setBuddy(m_sheets);
    auto* layout = new QHBoxLayout(this);
    layout->setContentsMargins(0, 0, 0, 0);
    layout->addWidget(m_label);
    layout->addWidget(m_sheets);
    // `activated` is the analyst's choice only: filling the box emits nothing, so reading the
    // drop again cannot loop back here.
    connect(m_sheets, &QComboBox::activated, this, [this](int index) {
        const QString sheet = m_sheets->itemData(index).toString();
        if (sheet != m_read)
            Q_EMIT sheetChosen(sheet);
    });
    setVisible(false);
}

void SheetChooser::showSheetsOf(const Provenance& source) {
    m_read = QString::fromStdString(source.sheet);
    QStringList sheets;
    for (const std::string& name : source.datedSheets)
        sheets << QString::fromStdString(name);
    if (!m_read.isEmpty() && !sheets.contains(m_read))
        sheets.prepend(m_read);  // chosen by name although its first rows show no dates
    const QSignalBlocker quiet(m_sheets);
    m_sheets->clear();
    for (const QString& name : sheets)
        m_sheets->addItem(name, name);
    m_sheets->setCurrentIndex(static_cast<int>(sheets.indexOf(m_read)));
    setVisible(sheets.size() > 1);
}

void SheetChooser::clear() {
    m_read.clear();
    const QSignalBlocker quiet(m_sheets);
    m_sheets->clear();
    setVisible(false);
}

QString SheetChooser::currentSheet() const {
    return m_sheets->count() > 1 ? m_read : QString();
}

}  // namespace siftwave::widgets
