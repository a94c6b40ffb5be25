#include "widgets/transmission/transmission_pane.h"

#include <QCheckBox>
#include <QDoubleSpinBox>
#include <QFileDialog>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QPushButton>
#include <QSpinBox>
#include <QVBoxLayout>

namespace siftwave::widgets {
namespace {

QDoubleSpinBox* daysBox(double minimum, double maximum, double value, const char* name) {
    auto* box = new QDoubleSpinBox;
    box->setObjectName(QString::fromLatin1(name));
    box->setRange(minimum, maximum);
    box->setDecimals(2);
    box->setSingleStep(0.1);
    box->setValue(value);
    return box;
}

}  // namespace

TransmissionPane::TransmissionPane(QWidget* parent)
    : QWidget(parent),
      m_window(new QSpinBox),
      m_siMean(daysBox(1.0, 100.0, 1.0, "siMean")),
      m_siSd(daysBox(0.1, 100.0, 2.0, "siSd")),
      m_siFile(new QLineEdit),
      m_chooseFile(new QPushButton(tr("Choose…"))),
      m_clearFile(new QPushButton(tr("Clear"))),
      m_priorMean(daysBox(0.1, 100.0, 5.0, "priorMean")),
      m_priorSd(daysBox(0.1, 100.0, 5.0, "priorSd")),
      m_weekday(new QCheckBox(tr("Weekday terms in r (daily, window ≥ 14)"))) {
    setObjectName(QStringLiteral("transmissionPane"));
    m_window->setObjectName(QStringLiteral("transmissionWindow"));
    m_window->setRange(2, 1000);  // 2 is shown as "auto" (a window needs 3 periods)
    m_window->setSpecialValueText(tr("auto (7 days, 4 weeks)"));
    m_window->setValue(2);
    m_siMean->setSpecialValueText(tr("not set"));
    m_siMean->setSuffix(tr(" d"));
    m_siSd->setSuffix(tr(" d"));
    m_siFile->setObjectName(QStringLiteral("siFile"));
    m_siFile->setReadOnly(true);
    m_siFile->setPlaceholderText(tr("or a day,weight file"));
    m_weekday->setObjectName(QStringLiteral("weekdayTerms"));

    auto* fileRow = new QHBoxLayout;
    fileRow->addWidget(m_siFile, 1);
    fileRow->addWidget(m_chooseFile);
    fileRow->addWidget(m_clearFile);
    auto* form = new QFormLayout;
    form->addRow(tr("Window"), m_window);
    form->addRow(tr("Serial interval mean"), m_siMean);
    form->addRow(tr("Serial interval sd"), m_siSd);
    form->addRow(tr("Serial interval file"), fileRow);
    form->addRow(tr("Prior mean of R"), m_priorMean);
    form->addRow(tr("Prior sd of R"), m_priorSd);
    form->addRow(m_weekday);
    auto* help = new QLabel(
        tr("R_t by Cori et al. (2013): gamma prior, window ending on each period; no R where "
           "the posterior CV is above 0.3. The serial interval is in days; weekly counts use it "
           "as whole weeks and are refused when most of it falls within one week."));
    help->setWordWrap(true);
    help->setStyleSheet(QStringLiteral("color: #555;"));
    auto* layout = new QVBoxLayout(this);
    layout->addLayout(form);
    layout->addWidget(help);
    layout->addStretch(1);

    const auto changed = [this] { Q_EMIT optionsChanged(); };
    connect(m_window, &QSpinBox::valueChanged, this, changed);
    for (QDoubleSpinBox* box : {m_siMean, m_siSd, m_priorMean, m_priorSd})
        connect(box, &QDoubleSpinBox::valueChanged, this, changed);
    connect(m_weekday, &QCheckBox::toggled, this, changed);
    connect(m_chooseFile, &QPushButton::clicked, this, &TransmissionPane::chooseFile);
    connect(m_clearFile, &QPushButton::clicked, this, [this] { setSerialIntervalFile({}); });
}

Result<transmission::TransmissionOptions> TransmissionPane::options(Cadence cadence) const {
    auto o = transmission::TransmissionOptions::forCadence(cadence);
    if (m_window->value() > 2)
        o.setWindow(m_window->value());
    o.cori.priorMean = m_priorMean->value();
    o.cori.priorSd = m_priorSd->value();
    o.growth.weekdayTerms = m_weekday->isChecked();
    if (!m_siFile->text().isEmpty()) {
        auto si = transmission::readSerialIntervalFile(m_siFile->text().toStdString());
        if (!si)
            return si.error();
        o.serialInterval = std::move(si.value());
    } else if (m_siMean->value() > m_siMean->minimum()) {
        auto si = transmission::discretisedGamma(m_siMean->value(), m_siSd->value());
        if (!si)
            return si.error();
        o.serialInterval = std::move(si.value());
    }
    if (Status s = o.validate(cadence); !s)
        return s.error();
    return o;
}

TransmissionPane::Choices TransmissionPane::choices() const {
    Choices c;
    c.window = m_window->value() > 2 ? m_window->value() : 0;
    c.siMean = m_siMean->value() > m_siMean->minimum() ? m_siMean->value() : 0.0;
    c.siSd = m_siSd->value();
    c.siFile = m_siFile->text();
    c.priorMean = m_priorMean->value();
    c.priorSd = m_priorSd->value();
    c.weekday = m_weekday->isChecked();
    return c;
}

void TransmissionPane::setChoices(const Choices& c) {
    {
        const QSignalBlocker block(this);  // one optionsChanged() for all of them
        setWindow(c.window);
        m_siSd->setValue(c.siSd);
        m_siMean->setValue(c.siMean > 1.0 ? c.siMean : m_siMean->minimum());
        m_siFile->setText(c.siFile);
        setPrior(c.priorMean, c.priorSd);
        setWeekdayTerms(c.weekday);
    }
    Q_EMIT optionsChanged();
}

void TransmissionPane::setSerialInterval(double meanDays, double sdDays) {
    {
        const QSignalBlocker block(this);  // one optionsChanged() for both values
        m_siFile->clear();
        m_siSd->setValue(sdDays);
        m_siMean->setValue(meanDays > 1.0 ? meanDays : m_siMean->minimum());
    }
    Q_EMIT optionsChanged();
}

void TransmissionPane::setSerialIntervalFile(const QString& path) {
    m_siFile->setText(path);
    Q_EMIT optionsChanged();
}

void TransmissionPane::setWindow(int periods) {
    m_window->setValue(periods >= 3 ? periods : 2);
}

void TransmissionPane::setPrior(double mean, double sd) {
    m_priorMean->setValue(mean);
    m_priorSd->setValue(sd);
}

void TransmissionPane::setWeekdayTerms(bool on) {
    m_weekday->setChecked(on);
}

void TransmissionPane::chooseFile() {
    const QString path =
        QFileDialog::getOpenFileName(this, tr("Serial interval (day,weight)"), QString(),
                                     tr("CSV files (*.csv);;All files (*)"));
    if (!path.isEmpty())
        setSerialIntervalFile(path);
}

}  // namespace siftwave::widgets
