#pragma once
// FigureSpec: what one exported figure shows: the region's PlotModel (plot_model.h: the raw,
// cleaned and smoothed counts, the previous release, the fitted curve with its own uncertainty,
// the decision marks and excluded ranges, all decided there, as on screen) plus the figure's own
// texts: title, subtitle and caption.
//
// buildFigureSpec() builds the PlotModel with buildPlotModel() and adds those texts. Nothing here
// is typed by hand: every annotation comes from an entry or the fit, so a figure cannot disagree
// with the audit trail. The widgets layer draws it (widgets/export/figure_renderer.h); the report
// (briefing.h) lists it.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/report/caption.h"
#include "siftwave/report/plot_model.h"
#include "siftwave/result.h"

#include <string>
#include <vector>

namespace siftwave::report {

struct FigureSpec : PlotModel {
    std::string title;
    std::string subtitle;
    CaptionFacts caption;
    std::vector<std::string> captionLines;
};

/// What to plot (PlotRequest: region, measure, register, previous release, fit) and the
/// figure's own texts.
struct FigureRequest : PlotRequest {
    std::string title;       // empty: "<name> (<code>): daily <measure>"
    std::string subtitle;    // empty: the calendar, the decisions and the fit in one line
    std::string exportDate;  // empty: today (UTC)
};

/// The figure of one region and measure. `cleaned` is replay(drop, ledger).
/// Errors: usage (request), not_found (region or measure not in the drop).
/// A fit that fails is not an error: the figure is drawn without it and
/// `fitError` says why.
Result<FigureSpec> buildFigureSpec(const Drop& drop, const ledger::Ledger& ledger,
                                   const ledger::Cleaned& cleaned, const FigureRequest& request);

}  // namespace siftwave::report
