#pragma once
// PlotModel: everything one region's plot shows, decided once, as plain numbers and short texts.
//
// The workbench's plot (widgets/plot/series_plot.h) and every exported figure (figure_spec.h,
// widgets/export/figure_renderer.h) draw the same PlotModel: the screen converts it to what its
// chart draws and adds only what needs a pointer (hover, dragging a window, a decision preview); a
// figure adds its title, subtitle and caption. So the cadence, the labels and the overlays of a
// plot are decided here, in buildPlotModel(), and nowhere else.
//
// Every series is per period of `axis` (one value per day of a daily drop, per week of a weekly
// one), in the drop's units: counts of `measure` per period ("cases per day" or "cases per week").
// A value that is not there is NaN; a series that was not asked for is an empty vector.
//
// Decision marks, per decision kind (entries in effect only; withdrawn ones are in the ledger
// listing and in `touchedBy`, not marked):
//   redistribute      on the dump day: "#<seq> <n> moved to earlier days" (weeks), n = excess;
//                     `window` holds the days the counts went to
//   spread_negative   on the negative day: "#<seq> negative <n> spread back"
//   fill_missing      over the window: "#<seq> <d> days filled (<n>)" (weeks for weekly data)
//   resolve_duplicate on the day: "#<seq> duplicate resolved"
//   merge_codes       over the days it added to: "#<seq> <variant> merged in (+<n>)"
//   accept            over its window (or the calendar): "#<seq> accepted as reported"
//   exclude           an ExcludedRange, shaded: "#<seq> excluded (<n>)"

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/nowcast/nowcast.h"
#include "siftwave/region_register.h"
#include "siftwave/result.h"
#include "siftwave/scan/finding.h"
#include "siftwave/time_axis.h"
#include "siftwave/transmission/transmission.h"

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace siftwave::report {

/// One ledger decision in effect on the plotted region and measure (see the header comment).
struct DecisionMark {
    std::uint64_t sequence = 0;
    ledger::DecisionKind kind = ledger::DecisionKind::Accept;
    Date first;  // the day(s) the mark points at
    Date last;
    std::optional<ledger::DayRange> window;  // redistribute: the days the counts went to
    std::int64_t count = 0;                  // counts moved, spread, filled or merged
    double anchorValue = 0;                  // the highest raw count in first..last (0 when none)
    std::string label;                       // short, see the header comment
};

/// An exclude decision in effect: shaded over first..last.
struct ExcludedRange {
    std::uint64_t sequence = 0;
    Date first;
    Date last;
    std::int64_t count = 0;  // counts left out of this region and measure
    std::string label;
};

/// A scan finding on the plotted region and measure: a mark in the strip along the time axis.
struct FindingMarkSpec {
    std::string id;         // the finding's id (scan.h)
    std::string kindLabel;  // scan::findingKindName, e.g. "backlog_dump"
    int firstPeriod = 0;    // periods of `axis` it covers, inclusive
    int lastPeriod = 0;
    int severity = 1;  // 0 info, 1 warning, 2 critical
};

/// A fitted wave on the plot's axis.
struct FittedCurveSpec {
    fit::FitResult result;  // the fit itself (parameters, derived quantities, summary)
    std::string label;      // legend text, e.g. "Gumbel fit (lsq)"
    // The wave itself per period of the axis (fit::CurveBand::fitted, K f(t): no weekday
    // factors); NaN outside the fit window: no curve is drawn where nothing was fitted.
    std::vector<double> mid;
    // The curve's own uncertainty: its pointwise 95% confidence band (fit::curveBand, delta
    // method), same length; all NaN when the fit has no usable covariance (see bandNote).
    std::vector<double> low;
    std::vector<double> high;
    std::string bandLabel;  // legend text of that band
    std::string bandNote;   // why there is no band; "" when there is one
    // Why no curve is drawn: a fit whose status is not ok (fit::FitStatus, issue 15) gives no
    // curve, band, count range or peak mark, and the caption says why. "" when drawn.
    std::string notDrawn;
    // Only when PlotRequest::countRange: where 95% of the counts per period would fall if the
    // fitted incidence (weekday factors included) were their mean (count_band.h); same length,
    // NaN outside the window. Empty otherwise.
    std::vector<double> countLow;
    std::vector<double> countHigh;
    std::string countRangeLabel;  // legend text of that range
    Date windowFirst;             // the fit window, first and last day
    Date windowLast;
    Date peakDate;
    double peakValue = 0;  // cases per day or week at the peak (result.incidenceUnit())
};

/// The nowcast over the last periods (nowcast.h): drawn in its own style with its band and
/// labelled as an estimate of reports still to come, never as counts.
struct NowcastSpec {
    // Per period of the axis; NaN outside the periods still estimated with reports still
    // expected (under 99 % in by now), and where a period is under a tenth reported.
    std::vector<double> mid;
    std::vector<double> low;
    std::vector<double> high;
    std::string label;      // "Nowcast: reports still to come (chain-ladder, max delay 15 days)"
    std::string bandLabel;  // "95% interval of the nowcast"
    std::string caution;    // nowcast::kNowcastCaution
    Date now;
};

struct PlotModel {
    std::string regionCode;  // verbatim
    std::string regionName;  // from the register; empty when unknown
    std::string measure;     // the drop's name of the plotted measure, e.g. "cases"
    TimeAxis axis;           // the periods every series below is on (daily or weekly)
    std::string valueLabel;  // the value axis: "Daily cases", "Weekly cases"

    // The drop as reported, per period: the count (NaN where no number was reported), the
    // cell's state (reported, absent, suppressed, ...) and its line in the source file (0: no
    // row).
    std::vector<double> raw;
    std::vector<CellState> rawState;
    std::vector<std::uint32_t> sourceLine;
    /// What names a source line for a person (sourcePlace(): "line 14", "data!14:14"): the
    /// drop's format, sheet and first column; nothing else of the provenance is copied.
    Provenance sourcePlaces;
    std::vector<double> cleaned;   // replay(drop, ledger); NaN where the cell holds no value
    std::vector<double> smoothed;  // centred mean of `cleaned` (series::plotSmoothingWindow)
    std::string smoothedLabel;     // "7-day centred mean (cleaned)", "3-week ..."

    // The previous release's raw counts of the same region and measure, aligned by date on
    // this axis (NaN where it has no number); empty without one or when it lacks the series.
    std::vector<double> previous;
    std::string previousLabel;  // its file name; empty: none

    // A second measure's raw counts of the same region, drawn on a right-hand axis; empty: none.
    std::string secondMeasure;
    std::string secondValueLabel;  // "Daily deaths"
    std::vector<double> second;

    // Per period: the ledger entries that changed the cell, in ledger order, each as
    // "#<seq> <kind>[, withdrawn] (<author>): <reason>".
    std::vector<std::vector<std::string>> touchedBy;
    std::vector<FindingMarkSpec> findings;  // PlotRequest::findings on this region and measure

    std::optional<FittedCurveSpec> fit;  // the fitted wave, when one was asked for and worked
    std::string fitError;  // why a requested fit is missing ("" when none was asked or it worked)
    std::optional<NowcastSpec> nowcast;  // the nowcast, when one was asked for and could be made
    std::string nowcastError;            // why a requested nowcast is missing
    std::vector<DecisionMark> decisions;
    std::vector<ExcludedRange> excluded;
    // Growth rate and R_t of the cleaned series (transmission.h), drawn in a panel under the
    // series with transmission::caution; nullopt when not asked for (PlotRequest::transmission).
    std::optional<transmission::TransmissionResult> transmission;
    bool transmissionGrowthRate = false;  // the panel shows r(t) rather than R_t

    int periods() const { return axis.periods(); }
    Date periodStart(int index) const { return axis.periodStart(index); }
};

struct PlotRequest {
    std::string region;                       // verbatim code (required)
    std::string measure;                      // empty: the drop's first measure
    std::string secondMeasure;                // empty (or the plotted measure): none
    const RegionRegister* regions = nullptr;  // names and populations; may be null
    /// The release before this one: its raw counts are drawn too, and the days it differs on
    /// are marked (may be null; a region or measure it lacks draws nothing).
    const Drop* previous = nullptr;
    /// Findings of a scan of this drop; those on this region and measure become marks.
    std::span<const scan::Finding> findings;
    /// Fit the cleaned series with these options (nullopt: no fit, unless `fitResult`).
    std::optional<fit::FitOptions> fit;
    /// A fit already made on the cleaned series (e.g. the GUI's live fit); wins over `fit`.
    std::optional<fit::FitResult> fitResult;
    /// Also the 95% range of counts around the fit (count_band.h), beside the curve's
    /// confidence band. Off by default: the band a plot shows is the fit's own.
    bool countRange = false;
    /// Estimate the growth rate and R_t of the cleaned series with these options (nullopt:
    /// none). Invalid options for the drop's cadence are a usage error of buildPlotModel.
    std::optional<transmission::TransmissionOptions> transmission;
    /// The panel shows the growth rate r(t) instead of R_t.
    bool transmissionGrowthRate = false;
    /// Nowcast a case list's region at its last report date with these options (nullopt: no
    /// nowcast, unless `nowcastResult`). A drop that is not a case list gives none.
    std::optional<nowcast::NowcastOptions> nowcast;
    /// A nowcast already made (e.g. from a release history); wins over `nowcast`.
    std::optional<nowcast::NowcastResult> nowcastResult;

    /// Usage errors: no region, invalid fit options.
    Status validate() const;
};

/// The plot of one region and measure. `cleaned` is replay(drop, ledger).
/// Errors: usage (request), not_found (region or measure not in the drop).
/// A fit that fails is not an error: the model has no curve and `fitError` says why.
Result<PlotModel> buildPlotModel(const Drop& drop, const ledger::Ledger& ledger,
                                 const ledger::Cleaned& cleaned, const PlotRequest& request);

/// The fitted wave of `result` on `axis` (NaN outside its window), with its confidence band and,
/// when `countRange`, the range of counts around it computed against `cleaned` (per period of
/// `axis`). What buildPlotModel() puts in PlotModel::fit.
FittedCurveSpec fittedCurveOf(const fit::FitResult& result, const TimeAxis& axis,
                              const std::vector<double>& cleaned, bool countRange);

/// The nowcast's rows on `axis` (plot_nowcast.cpp): what buildPlotModel() puts in
/// PlotModel::nowcast.
NowcastSpec nowcastSpecOf(const nowcast::NowcastResult& result, const TimeAxis& axis);
/// The nowcast of a case list's region at the list's last report date; an error when the drop
/// is not a case list with report dates.
Result<nowcast::NowcastResult> nowcastOfCaseList(const Drop& drop, std::size_t region,
                                                 const nowcast::NowcastOptions& options);

/// "Daily cases", "Weekly deaths": the value axis of a measure on `axis`.
std::string valueAxisLabel(const TimeAxis& axis, const std::string& measure);

/// "1,234" (thousands grouped with commas; common practice in English briefings).
std::string groupedCount(std::int64_t value);

}  // namespace siftwave::report
