#include "siftwave/report/figure_spec.h"

#include "siftwave/ledger/nowcast_completion.h"
#include "siftwave/nowcast/nowcast.h"

#include <algorithm>
#include <cctype>

namespace siftwave::report {
namespace {

std::string defaultTitle(const FigureSpec& spec) {
    const std::string who = spec.regionName.empty()
                                ? "Region " + spec.regionCode
                                : spec.regionName + " (" + spec.regionCode + ")";
    std::string cadence = spec.axis.adjective();
    cadence[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(cadence[0])));
    return who + ": " + cadence + " " + spec.measure;
}

std::string defaultSubtitle(const FigureSpec& spec) {
    const int last = std::max(spec.periods() - 1, 0);
    // Weeks by their names (2026-W05), days by their dates.
    std::string s = "Reported " + spec.axis.periodName(0) + " to " + spec.axis.periodName(last);
    const std::size_t marks = spec.decisions.size() + spec.excluded.size();
    s += marks == 0 ? "; no ledger decision on this series"
                    : "; " + std::to_string(marks) +
                          (marks == 1 ? " ledger decision" : " ledger decisions") + " applied";
    if (spec.fit)
        s += "; " + spec.fit->label + ", window " + spec.fit->windowFirst.iso() + " to " +
             spec.fit->windowLast.iso();
    return s;
}

// What the caption says about the bands (figure_renderer draws the confidence band shaded
// and the range of daily counts as dotted lines).
std::string bandsDescription(const FittedCurveSpec& curve) {
    if (!curve.notDrawn.empty())
        return curve.notDrawn;
    std::string text = curve.bandNote.empty()
                           ? std::string(
                                 "shaded: pointwise 95% confidence band of the curve "
                                 "(delta method), not a range for daily counts")
                           : curve.bandNote;
    if (!curve.countLow.empty())
        text += "; dotted: 95% range of daily counts if the fit were their mean";
    return text;
}

// The transmission panel's caption line (what it shows, the settings, the refusal when R_t
// was refused) and its caution after the fit's.
void addTransmissionCaption(FigureSpec& spec) {
    const transmission::TransmissionResult& t = *spec.transmission;
    std::string what =
        spec.transmissionGrowthRate
            ? "growth rate r per day (Poisson regression over the window), shaded: 95% CI"
            : "R_t (Cori et al. 2013, posterior mean), shaded: 95% credible interval, dashed: "
              "R = 1";
    if (!spec.transmissionGrowthRate && !t.refusal.empty())
        what += "; no R_t: " + t.refusal;
    spec.caption.transmission = what + "; " + t.settingsBrief();
    spec.caption.caution += std::string(" ") + transmission::caution;
}

}  // namespace

Result<FigureSpec> buildFigureSpec(const Drop& drop, const ledger::Ledger& ledger,
                                   const ledger::Cleaned& cleaned, const FigureRequest& request) {
    // A case list's last periods are incomplete: its figure shows their nowcast, as the
    // workbench does, and the caption carries the nowcast's caution.
    PlotRequest plot = request;
    if (drop.caseList && !plot.nowcast && !plot.nowcastResult)
        plot.nowcast = nowcast::NowcastOptions{};
    Result<PlotModel> model = buildPlotModel(drop, ledger, cleaned, plot);
    if (!model)
        return model.error();
    FigureSpec spec;
    static_cast<PlotModel&>(spec) = std::move(model).value();
    spec.title = request.title.empty() ? defaultTitle(spec) : request.title;
    spec.subtitle = request.subtitle.empty() ? defaultSubtitle(spec) : request.subtitle;
    spec.caption =
        captionFacts(drop, ledger, spec.fit ? &spec.fit->result : nullptr, request.exportDate);
    if (spec.fit)
        spec.caption.bands = bandsDescription(*spec.fit);
    if (spec.transmission)
        addTransmissionCaption(spec);
    if (auto note =
            ledger::nowcastCompletionNote(drop, ledger, cleaned, spec.regionCode, spec.measure))
        spec.caption.nowcastCompleted = *note;
    if (spec.nowcast || !spec.caption.nowcastCompleted.empty())
        spec.caption.caution += std::string(" ") + nowcast::kNowcastCaution;
    spec.captionLines = captionLines(spec.caption);
    return spec;
}

}  // namespace siftwave::report
