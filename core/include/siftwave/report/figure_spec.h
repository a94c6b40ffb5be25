#pragma once
// FigureSpec: what one exported figure shows, as plain numbers and short texts.
//
// buildFigureSpec() gathers it from the Drop, the Ledger replayed into Cleaned
// and, when asked, a fit of the cleaned series: the raw, cleaned and smoothed
// daily counts, the fitted curve with its own uncertainty (the pointwise 95%
// confidence band of the curve, fit::curveBand: delta method), optionally the
// 95% range of daily counts around it (count_band.h), the fit window and the peak, one mark per
// ledger decision in effect on this region and measure, the excluded ranges, the title, subtitle
// and caption. Nothing here is typed by hand: every annotation comes from an entry or the fit, so a
// figure cannot disagree with the audit trail. The widgets layer draws it
// (widgets/figure_renderer.h); the report (briefing.h) lists it.
//
// Marks, per decision kind (entries in effect only; withdrawn ones are in the
// report's ledger listing, not on the figure):
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
#include "siftwave/region_register.h"
#include "siftwave/report/caption.h"
#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace siftwave::report {

struct DecisionMark {
    std::uint64_t sequence = 0;
    DecisionKind kind = DecisionKind::Accept;
    Date first;  // the day(s) the mark points at
    Date last;
    std::optional<DayRange> window;  // redistribute: the days the counts went to
    std::int64_t count = 0;          // counts moved, spread, filled or merged
    double anchorValue = 0;          // the highest raw count in first..last (0 when none)
    std::string label;               // short, see the header comment
};

struct ExcludedRange {
    std::uint64_t sequence = 0;
    Date first;
    Date last;
    std::int64_t count = 0;  // counts left out of this region and measure
    std::string label;
};

struct FittedCurveSpec {
    fit::FitResult result;  // the fit itself (parameters, derived quantities, summary)
    std::string label;      // legend text, e.g. "Gumbel fit (lsq)"
    // The wave itself per calendar day (fit::CurveBand::fitted, K f(t): no weekday factors);
    // NaN outside the fit window: the figure draws no curve where nothing was fitted.
    std::vector<double> mid;
    // The curve's own uncertainty: its pointwise 95% confidence band (fit::curveBand, delta
    // method), same length; all NaN when the fit has no usable covariance (see bandNote).
    std::vector<double> low;
    std::vector<double> high;
    std::string bandLabel;  // legend text of that band
    std::string bandNote;   // why there is no band; "" when there is one
    // Only when FigureRequest::countRange: where 95% of the daily counts would fall if the
    // fitted incidence (weekday factors included) were their mean (count_band.h); same length,
    // NaN outside the window. Empty otherwise.
    std::vector<double> countLow;
    std::vector<double> countHigh;
    std::string countRangeLabel;  // legend text of that range
    Date windowFirst;
    Date windowLast;
    Date peakDate;
    double peakValue = 0;  // cases per day or week at the peak (result.incidenceUnit())
};

struct FigureSpec {
    std::string regionCode;  // verbatim
    std::string regionName;  // from the register; empty when unknown
    std::string measure;
    std::string title;
    std::string subtitle;

    TimeAxis axis;                 // the periods every series below is on (daily or weekly)
    std::vector<double> raw;       // NaN where no number was reported
    std::vector<double> cleaned;   // NaN where the cleaned cell holds no value
    std::vector<double> smoothed;  // 7-day centred mean of the cleaned series
    std::string smoothedLabel;
    // The previous release's raw counts of the same region and measure, on this calendar
    // (NaN where it has no number); empty without a previous release.
    std::vector<double> previous;
    std::string previousLabel;  // its file name

    std::optional<FittedCurveSpec> fit;
    std::string fitError;  // why a requested fit is missing ("" when none was asked or it worked)
    std::vector<DecisionMark> decisions;
    std::vector<ExcludedRange> excluded;

    CaptionFacts caption;
    std::vector<std::string> captionLines;

    int periods() const { return axis.periods(); }
    Date periodStart(int index) const { return axis.periodStart(index); }
};

struct FigureRequest {
    std::string region;   // verbatim code (required)
    std::string measure;  // empty: the drop's first measure
    /// Fit the cleaned series with these options (nullopt: no fit, unless `fitResult`).
    std::optional<fit::FitOptions> fit;
    /// A fit already made on the cleaned series (e.g. the GUI's live fit); wins over `fit`.
    std::optional<fit::FitResult> fitResult;
    /// Also draw the 95% range of daily counts around the fit (count_band.h), dotted, beside
    /// the curve's confidence band. Off by default: the band a figure shows is the fit's own.
    bool countRange = false;
    std::string title;       // empty: "<name> (<code>): daily <measure>"
    std::string subtitle;    // empty: the calendar, the decisions and the fit in one line
    std::string exportDate;  // empty: today (UTC)
    const RegionRegister* regions = nullptr;  // names and populations; may be null
    /// The release before this one: its raw counts are drawn too, and the days it
    /// differs on are marked (may be null; a region or measure it lacks draws nothing).
    const Drop* previous = nullptr;

    /// Usage errors: no region, invalid fit options.
    Status validate() const;
};

/// The figure of one region and measure. `cleaned` is replay(drop, ledger).
/// Errors: usage (request), not_found (region or measure not in the drop).
/// A fit that fails is not an error: the figure is drawn without it and
/// `fitError` says why.
Result<FigureSpec> buildFigureSpec(const Drop& drop, const Ledger& ledger, const Cleaned& cleaned,
                                   const FigureRequest& request);

/// "1,234" (thousands grouped with commas; common practice in English briefings).
std::string groupedCount(std::int64_t value);

}  // namespace siftwave::report
