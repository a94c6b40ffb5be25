#include "widgets/export/figure_export_dialog.h"

#include "siftwave/report/figure_spec.h"
#include "widgets/export/figure_renderer.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDialogButtonBox>
#include <QDir>
#include <QDoubleSpinBox>
#include <QFileDialog>
#include <QFileInfo>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QMessageBox>
#include <QPushButton>
#include <QSpinBox>

namespace siftwave::widgets {

FigureExportDialog::FigureExportDialog(Inputs inputs, QWidget* parent)
    : QDialog(parent), m_inputs(std::move(inputs)) {
    Q_ASSERT(m_inputs.drop);
    if (!m_inputs.cleaned) {
        m_rawCleaned = ledger::Cleaned(*m_inputs.drop);
        m_inputs.cleaned = &m_rawCleaned;
    }
    if (!m_inputs.ledger)
        m_inputs.ledger = &m_noLedger;
    setWindowTitle(tr("Export figure"));
    fillRegionList();
    createPageControls();
    createFitControls();
    layOutForm();
}

// The drop's regions (with their names when a register is known), the current one selected.
void FigureExportDialog::fillRegionList() {
    m_regionList = new QListWidget;
    m_regionList->setSelectionMode(QAbstractItemView::ExtendedSelection);
    for (const std::string& code : m_inputs.drop->regionCodes) {
        QString text = QString::fromStdString(code);
        if (m_inputs.regions)
            if (const RegionEntry* e = m_inputs.regions->find(code))
                text += QStringLiteral("  ") + QString::fromStdString(e->name);
        auto* item = new QListWidgetItem(text, m_regionList);
        item->setData(Qt::UserRole, QString::fromStdString(code));
        item->setSelected(QString::fromStdString(code) == m_inputs.currentRegion);
    }
}

// The page: small multiples or not, title, subtitle, size (a preset or custom) and resolution.
void FigureExportDialog::createPageControls() {
    m_onePage = new QCheckBox(tr("Several regions: small multiples on one page"));
    m_onePage->setChecked(true);
    m_title = new QLineEdit;
    m_title->setPlaceholderText(tr("Default: region name and measure"));
    m_subtitle = new QLineEdit;
    m_subtitle->setPlaceholderText(tr("Default: calendar, decisions and fit"));
    m_size = new QComboBox;
    m_size->addItems({tr("Slide, 16:9 (254 × 142.9 mm)"), tr("Half A4 (210 × 148.5 mm)"),
                      tr("Custom, millimetres"), tr("Custom, pixels")});
    m_size->setCurrentIndex(1);
    m_width = new QDoubleSpinBox;
    m_height = new QDoubleSpinBox;
    for (QDoubleSpinBox* box : {m_width, m_height}) {
        box->setRange(40, 20000);
        box->setDecimals(1);
        box->setEnabled(false);
    }
    m_width->setValue(210);
    m_height->setValue(148.5);
    connect(m_size, &QComboBox::currentIndexChanged, this, [this](int index) {
        m_width->setEnabled(index >= 2);
        m_height->setEnabled(index >= 2);
    });
    m_dpi = new QSpinBox;
    m_dpi->setRange(50, 1200);
    m_dpi->setValue(200);
    m_dpi->setSuffix(tr(" dpi (PNG)"));
}

// The fit drawn in the figure, and whether the range of daily counts goes with it.
void FigureExportDialog::createFitControls() {
    m_fit = new QComboBox;
    m_fit->addItem(tr("No fit"));
    for (fit::ModelKind kind : fit::kAllModels)
        m_fit->addItem(
            tr("%1, least squares, largest wave").arg(QString::fromLatin1(fit::modelName(kind))));
    m_countRange = new QCheckBox(tr("Also the 95% range of daily counts around the fit (dotted)"));
    m_countRange->setToolTip(
        tr("The shaded band is the fitted curve's own 95% confidence band. "
           "The dotted lines show where daily counts would fall if the "
           "curve were their mean."));
}

// The output file line: the path and a button that browses for it.
QHBoxLayout* FigureExportDialog::pathRow() {
    m_path = new QLineEdit(QDir::home().filePath(QStringLiteral("figure.png")));
    auto* browseButton = new QPushButton(tr("Browse…"));
    connect(browseButton, &QPushButton::clicked, this, &FigureExportDialog::browse);
    auto* row = new QHBoxLayout;
    row->addWidget(m_path, 1);
    row->addWidget(browseButton);
    return row;
}

// The dialog as one form, from the regions down to the file and the Export and Cancel buttons.
void FigureExportDialog::layOutForm() {
    auto* sizeRow = new QHBoxLayout;
    sizeRow->addWidget(m_width);
    sizeRow->addWidget(new QLabel(QStringLiteral("×")));
    sizeRow->addWidget(m_height);
    QHBoxLayout* path = pathRow();
    auto* form = new QFormLayout(this);
    form->addRow(tr("Regions"), m_regionList);
    form->addRow(QString(), m_onePage);
    form->addRow(tr("Title"), m_title);
    form->addRow(tr("Subtitle"), m_subtitle);
    form->addRow(tr("Size"), m_size);
    form->addRow(tr("Custom size"), sizeRow);
    form->addRow(tr("Resolution"), m_dpi);
    form->addRow(tr("Fit"), m_fit);
    form->addRow(QString(), m_countRange);
    form->addRow(tr("File (.png, .svg, .pdf)"), path);
    auto* buttons = new QDialogButtonBox(QDialogButtonBox::Ok | QDialogButtonBox::Cancel);
    buttons->button(QDialogButtonBox::Ok)->setText(tr("Export"));
    connect(buttons, &QDialogButtonBox::accepted, this, &FigureExportDialog::accept);
    connect(buttons, &QDialogButtonBox::rejected, this, &QDialog::reject);
    form->addRow(buttons);
}

void FigureExportDialog::browse() {
    const QString path = QFileDialog::getSaveFileName(this, tr("Export figure"), m_path->text(),
                                                      tr("Figures (*.png *.svg *.pdf)"));
    if (!path.isEmpty())
        m_path->setText(path);
}

void FigureExportDialog::accept() {
    auto written = exportFigures();
    if (!written) {
        QMessageBox::warning(this, tr("Export figure"),
                             QString::fromStdString(written.error().describe()));
        return;
    }
    QDialog::accept();
}

Result<QStringList> FigureExportDialog::exportFigures() {
    QStringList codes;
    for (int i = 0; i < m_regionList->count(); ++i)  // in the drop's order
        if (m_regionList->item(i)->isSelected())
            codes << m_regionList->item(i)->data(Qt::UserRole).toString();
    if (codes.isEmpty())
        return makeError(ErrorCode::Usage, "choose at least one region");
    FigureExportOptions options;
    options.dpi = m_dpi->value();
    switch (m_size->currentIndex()) {
        case 0:
            options.size = FigureSize::slide();
            break;
        case 1:
            options.size = FigureSize::halfA4();
            break;
        default: {
            const QString unit =
                m_size->currentIndex() == 2 ? QStringLiteral("mm") : QStringLiteral("px");
            auto size = FigureSize::parse(
                QStringLiteral("%1x%2%3").arg(m_width->value()).arg(m_height->value()).arg(unit),
                options.dpi);
            if (!size)
                return size.error();
            options.size = *size;
        }
    }
    std::vector<report::FigureSpec> specs;
    for (const QString& code : codes) {
        report::FigureRequest request;
        request.region = code.toStdString();
        request.measure = m_inputs.measure.toStdString();
        request.regions = m_inputs.regions;
        request.previous = m_inputs.previous;
        if (codes.size() == 1 || !m_onePage->isChecked()) {
            request.title = m_title->text().toStdString();
            request.subtitle = m_subtitle->text().toStdString();
        }
        if (m_fit->currentIndex() > 0) {
            fit::FitOptions fitOptions = fit::FitOptions::forCadence(m_inputs.drop->axis.cadence());
            fitOptions.model = fit::kAllModels[static_cast<std::size_t>(m_fit->currentIndex() - 1)];
            request.fit = fitOptions;
        }
        request.countRange = m_countRange->isChecked();
        request.transmission = m_inputs.transmission;
        request.transmissionGrowthRate = m_inputs.transmissionGrowthRate;
        auto spec =
            report::buildFigureSpec(*m_inputs.drop, *m_inputs.ledger, *m_inputs.cleaned, request);
        if (!spec)
            return spec.error();
        specs.push_back(std::move(spec.value()));
    }
    const QString path = m_path->text();
    QStringList written;
    if (specs.size() > 1 && !m_onePage->isChecked()) {
        const QFileInfo info(path);
        for (const report::FigureSpec& spec : specs) {
            const QString one = info.dir().filePath(info.completeBaseName() + QLatin1Char('-') +
                                                    QString::fromStdString(spec.regionCode) +
                                                    QLatin1Char('.') + info.suffix());
            if (Status s = widgets::exportFigures(one, {spec}, options); !s)
                return s.error();
            written << one;
        }
        return written;
    }
    if (Status s = widgets::exportFigures(path, specs, options); !s)
        return s.error();
    written << path;
    return written;
}

void FigureExportDialog::setOutputPath(const QString& path) {
    m_path->setText(path);
}

void FigureExportDialog::setRegions(const QStringList& codes) {
    for (int i = 0; i < m_regionList->count(); ++i) {
        QListWidgetItem* item = m_regionList->item(i);
        item->setSelected(codes.contains(item->data(Qt::UserRole).toString()));
    }
}

void FigureExportDialog::setSmallMultiples(bool onePage) {
    m_onePage->setChecked(onePage);
}

void FigureExportDialog::setSizePreset(int index) {
    m_size->setCurrentIndex(index);
}

void FigureExportDialog::setCustomSize(double width, double height) {
    m_width->setValue(width);
    m_height->setValue(height);
}

void FigureExportDialog::setDpi(int dpi) {
    m_dpi->setValue(dpi);
}

void FigureExportDialog::setTitle(const QString& title) {
    m_title->setText(title);
}

void FigureExportDialog::setFitModel(int index) {
    m_fit->setCurrentIndex(index);
}

void FigureExportDialog::setCountRange(bool shown) {
    m_countRange->setChecked(shown);
}

}  // namespace siftwave::widgets
