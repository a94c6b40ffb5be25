#pragma once
// TransmissionPane: the settings of the transmission panel (core transmission.h): the window,
// the serial interval (gamma mean and sd in days, or a `day,weight` file), the gamma prior of R,
// and weekday terms in the growth regression. Every change emits optionsChanged(); the
// workbench then recomputes the panel from the cleaned series.

#include "siftwave/result.h"
#include "siftwave/time_axis.h"
#include "siftwave/transmission/transmission.h"

#include <QString>
#include <QWidget>

class QCheckBox;
class QDoubleSpinBox;
class QLabel;
class QLineEdit;
class QPushButton;
class QSpinBox;

namespace siftwave::widgets {

class TransmissionPane : public QWidget {
    Q_OBJECT

public:
    explicit TransmissionPane(QWidget* parent = nullptr);

    /// The options for a drop of this cadence: the window (auto: 7 days or 4 weeks), the
    /// serial interval (none while its mean is "not set" and no file is chosen), the prior, the
    /// weekday terms. An unreadable serial-interval file or invalid options are the error.
    Result<transmission::TransmissionOptions> options(Cadence cadence) const;

    /// What the pane shows, as a project keeps it.
    struct Choices {
        int window = 0;       // 0: auto
        double siMean = 0.0;  // <= 1: not set
        double siSd = 2.0;
        QString siFile;  // empty: none
        double priorMean = 5.0;
        double priorSd = 5.0;
        bool weekday = false;
        friend bool operator==(const Choices&, const Choices&) = default;
    };
    Choices choices() const;
    /// Shows `c` (one optionsChanged()).
    void setChoices(const Choices& c);

    /// Sets the gamma serial interval (mean <= 1: not set) or a file (clears the gamma).
    void setSerialInterval(double meanDays, double sdDays);
    void setSerialIntervalFile(const QString& path);
    void setWindow(int periods);  // 0: auto
    void setPrior(double mean, double sd);
    void setWeekdayTerms(bool on);

Q_SIGNALS:
    void optionsChanged();

private:
    void chooseFile();

    QSpinBox* m_window;
    QDoubleSpinBox* m_siMean;
    QDoubleSpinBox* m_siSd;
    QLineEdit* m_siFile;
    QPushButton* m_chooseFile;
    QPushButton* m_clearFile;
    QDoubleSpinBox* m_priorMean;
    QDoubleSpinBox* m_priorSd;
    QCheckBox* m_weekday;
};

}  // namespace siftwave::widgets
