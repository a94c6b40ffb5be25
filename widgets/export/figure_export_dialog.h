#pragma once
// File > Export figure: the current region (or a chosen set) as PNG, SVG or
// PDF, one file each or small multiples on one page, at a size preset (16:9
// slide, half A4) or a custom size in millimetres or pixels, with an editable
// title and subtitle (empty = the defaults from region name and measure) and,
// optionally, a fitted curve. It draws with figure_renderer.h, the same code as
// `siftwave-cli figure`.

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"
#include "siftwave/transmission/transmission.h"

#include <QDialog>
#include <QStringList>

#include <optional>

class QCheckBox;
class QComboBox;
class QDoubleSpinBox;
class QHBoxLayout;
class QLineEdit;
class QListWidget;
class QSpinBox;

namespace siftwave::widgets {

class FigureExportDialog : public QDialog {
    Q_OBJECT

public:
    struct Inputs {
        const Drop* drop = nullptr;                // required
        const ledger::Ledger* ledger = nullptr;    // null: no decisions
        const ledger::Cleaned* cleaned = nullptr;  // replay(drop, ledger); null: the raw counts
        const RegionRegister* regions = nullptr;
        const Drop* previous = nullptr;  // the release before: drawn dotted when given
        QString currentRegion;
        QString measure;  // empty: the first
        /// The transmission panel under each figure's plot (the workbench's, as on screen);
        /// nullopt: none.
        std::optional<transmission::TransmissionOptions> transmission;
        bool transmissionGrowthRate = false;  // r(t) rather than R_t
    };

    explicit FigureExportDialog(Inputs inputs, QWidget* parent = nullptr);

    /// Writes the file(s) as the controls say; returns the paths written.
    Result<QStringList> exportFigures();

    // For tests and scripting: the controls' values.
    void setOutputPath(const QString& path);
    void setRegions(const QStringList& codes);
    void setSmallMultiples(bool onePage);
    void setSizePreset(int index);  // 0 slide, 1 half A4, 2 custom mm, 3 custom px
    void setCustomSize(double width, double height);
    void setDpi(int dpi);
    void setTitle(const QString& title);
    void setFitModel(int index);  // 0 none, 1.. the models in fit::kAllModels order
    void setCountRange(bool shown);

private:
    void fillRegionList();
    void createPageControls();
    void createFitControls();
    QHBoxLayout* pathRow();
    void layOutForm();
    void browse();
    void accept() override;

    Inputs m_inputs;
    ledger::Cleaned m_rawCleaned;  // when no Cleaned was given
    ledger::Ledger m_noLedger;
    QListWidget* m_regionList;
    QCheckBox* m_onePage;
    QLineEdit* m_title;
    QLineEdit* m_subtitle;
    QComboBox* m_size;
    QDoubleSpinBox* m_width;
    QDoubleSpinBox* m_height;
    QSpinBox* m_dpi;
    QComboBox* m_fit;
    QCheckBox* m_countRange;
    QLineEdit* m_path;
};

}  // namespace siftwave::widgets
