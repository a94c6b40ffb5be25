#include "siftwave/report/figure_spec.h"

#include "siftwave/report/count_band.h"
#include "siftwave/series/daily.h"
#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>

namespace siftwave::report {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The total change an entry made to this region and measure.
std::int64_t totalChangeOf(const LedgerEntry& entry, const std::string& region,
                           const std::string& measure) {
    std::int64_t change = 0;
    for (const TotalChange& t : entry.effect.totals)
        if (t.region == region && t.measure == measure)
            change += t.change();
    return change;
}

// The days of this region and measure whose cells the entry changed.
std::optional<DayRange> changedDays(const LedgerEntry& entry, const std::string& region,
                                    const std::string& measure) {
    std::optional<DayRange> range;
    for (const CellChange& c : entry.effect.cells) {
        if (c.region != region || c.measure != measure)
            continue;
        if (!range)
            range = DayRange{c.date, c.date};
        range->first = std::min(range->first, c.date);
        range->last = std::max(range->last, c.date);
    }
    return range;
}

bool aboutThisSeries(const Decision& d, const std::string& region, const std::string& measure) {
    switch (d.kind) {
        case DecisionKind::Withdraw:
            return false;
        case DecisionKind::MergeCodes:
            return d.into == region;
        case DecisionKind::Exclude:
        case DecisionKind::Accept:
            return (d.region.empty() || d.region == region) &&
                   (d.measure.empty() || d.measure == measure);
        default:
            return d.region == region && d.measure == measure;
    }
}

double highestRaw(const FigureSpec& spec, Date first, Date last) {
    double best = 0;
    for (int i = std::max(0, first - spec.axis.first());
         i < spec.periods() && spec.periodStart(i) <= last; ++i)
        if (!std::isnan(spec.raw[i]))
            best = std::max(best, spec.raw[i]);
    return best;
}

DayRange clampToCalendar(DayRange r, const FigureSpec& spec) {
    const Date last = spec.periodStart(std::max(spec.periods() - 1, 0));
    return {std::clamp(r.first, spec.axis.first(), last),
            std::clamp(r.last, spec.axis.first(), last)};
}

void addMarks(FigureSpec& spec, const Ledger& ledger, const Cleaned& cleaned) {
    const DayRange calendar{spec.axis.first(), spec.periodStart(std::max(spec.periods() - 1, 0))};
    for (const LedgerEntry& entry : ledger.entries) {
        const Decision& d = entry.decision;
        if (!cleaned.inEffect(entry.sequence) || !aboutThisSeries(d, spec.regionCode, spec.measure))
            continue;
        const std::string tag = "#" + std::to_string(entry.sequence) + " ";
        const std::int64_t change = totalChangeOf(entry, spec.regionCode, spec.measure);
        if (d.kind == DecisionKind::Exclude) {
            const DayRange r = clampToCalendar(d.window.value_or(calendar), spec);
            ExcludedRange ex{entry.sequence, r.first, r.last, -change, {}};
            ex.label = tag + "excluded (" + groupedCount(-change) + ")";
            spec.excluded.push_back(ex);
            continue;
        }
        DecisionMark mark;
        mark.sequence = entry.sequence;
        mark.kind = d.kind;
        DayRange at = calendar;
        switch (d.kind) {
            case DecisionKind::Redistribute:
                at = DayRange{*d.date, *d.date};
                mark.window = d.window;
                mark.count = d.excess;
                mark.label = tag + groupedCount(d.excess) + " moved to earlier " +
                             spec.axis.unitPlural();
                break;
            case DecisionKind::SpreadNegative: {
                at = DayRange{*d.date, *d.date};
                const auto& cell = entry.effect.cells;
                std::int64_t negative = 0;
                for (const CellChange& c : cell)
                    if (c.region == spec.regionCode && c.measure == spec.measure &&
                        c.date == *d.date)
                        negative = c.before.value;
                mark.count = -negative;
                mark.label = tag + "negative " + groupedCount(negative) + " spread back";
                break;
            }
            case DecisionKind::FillMissing:
                at = *d.window;
                mark.count = change;
            {
                // The periods the window covers (a date anywhere in a week selects it).
                const int periods = spec.axis.periodOnGrid(d.window->last) -
                                    spec.axis.periodOnGrid(d.window->first) + 1;
                mark.label = tag + std::to_string(periods) + " " +
                             (periods == 1 ? spec.axis.unitName() : spec.axis.unitPlural()) +
                             " filled (" + groupedCount(change) + ")";
            }
                break;
            case DecisionKind::ResolveDuplicate:
                at = DayRange{*d.date, *d.date};
                mark.count = change;
                mark.label = tag + "duplicate resolved";
                break;
            case DecisionKind::MergeCodes:
                at = changedDays(entry, spec.regionCode, spec.measure).value_or(calendar);
                mark.count = change;
                mark.label = tag + d.variant + " merged in (+" + groupedCount(change) + ")";
                break;
            case DecisionKind::Accept:
                at = d.window.value_or(calendar);
                mark.label = tag + "accepted as reported";
                break;
            default:
                continue;
        }
        at = clampToCalendar(at, spec);
        mark.first = at.first;
        mark.last = at.last;
        mark.anchorValue = highestRaw(spec, at.first, at.last);
        spec.decisions.push_back(mark);
    }
}

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

std::string capitalised(std::string text) {
    if (!text.empty() && text[0] >= 'a' && text[0] <= 'z')
        text[0] = static_cast<char>(text[0] - 'a' + 'A');
    return text;
}

constexpr char kCurveBandLabel[] = "95% confidence band of the fitted curve";
constexpr char kCountRangeLabel[] = "95% range of daily counts around the fit";

// What the caption says about the bands (figure_renderer draws the confidence band shaded
// and the range of daily counts as dotted lines).
std::string bandsDescription(const FittedCurveSpec& curve) {
    std::string text = curve.bandNote.empty()
                           ? std::string(
                                 "shaded: pointwise 95% confidence band of the curve "
                                 "(delta method), not a range for daily counts")
                           : curve.bandNote;
    if (!curve.countLow.empty())
        text += "; dotted: 95% range of daily counts if the fit were their mean";
    return text;
}

FittedCurveSpec curveOf(const fit::FitResult& result, const FigureSpec& spec, bool countRange) {
    FittedCurveSpec curve;
    curve.result = result;
    curve.label =
        capitalised(fit::modelName(result.model)) + " fit (" + fit::methodName(result.method) + ")";
    curve.bandLabel = kCurveBandLabel;
    curve.mid.assign(spec.periods(), kNaN);
    curve.low.assign(spec.periods(), kNaN);
    curve.high.assign(spec.periods(), kNaN);
    const int offset = spec.axis.periodOnGrid(result.seriesFirstDay);  // in periods
    // Calendar index of series period `first + i`, or -1 off the calendar.
    auto dayOf = [&](int seriesDay) {
        const int day = offset + seriesDay;
        return day >= 0 && day < spec.periods() ? day : -1;
    };
    // The wave and its confidence band over the fit window only: not a forecast.
    auto band = fit::curveBand(result, result.first, result.last);
    if (band) {
        for (std::size_t i = 0; i < band->fitted.size(); ++i) {
            const int day = dayOf(band->first + static_cast<int>(i));
            if (day < 0)
                continue;
            curve.mid[day] = band->fitted[i];
            if (i < band->lower.size() && i < band->upper.size()) {
                curve.low[day] = band->lower[i];
                curve.high[day] = band->upper[i];
            }
        }
        if (band->lower.empty())
            curve.bandNote = "no confidence band: the fit's parameter covariance is not available";
    } else {
        for (std::size_t i = 0; i < result.fitted.size(); ++i)
            if (const int day = dayOf(result.first + static_cast<int>(i)); day >= 0)
                curve.mid[day] = result.fitted[i];
        curve.bandNote = "no confidence band: " + band.error().message;
    }
    if (countRange) {
        curve.countRangeLabel = kCountRangeLabel;
        curve.countLow.assign(spec.periods(), kNaN);
        curve.countHigh.assign(spec.periods(), kNaN);
        const CountBand counts = countBand(result, spec.cleaned);
        for (std::size_t i = 0; i < counts.low.size(); ++i)
            if (const int day = dayOf(result.first + static_cast<int>(i)); day >= 0) {
                curve.countLow[day] = counts.low[i];
                curve.countHigh[day] = counts.high[i];
            }
    }
    curve.windowFirst = result.windowFirst();
    curve.windowLast = result.windowLast();
    curve.peakDate = result.dateOf(result.derived.peakDay.value);
    curve.peakValue = result.derived.peakIncidence.value;
    return curve;
}

// The previous release's raw counts aligned by date on the spec's calendar.
void addPrevious(FigureSpec& spec, const Drop& previous) {
    const auto region = previous.regionIndex(spec.regionCode);
    const auto measure = previous.measureIndex(spec.measure);
    if (!region || !measure)
        return;
    spec.previous.assign(spec.periods(), kNaN);
    const auto cells = previous.series(*measure, *region);
    for (int d = 0; d < spec.periods(); ++d)
        if (const auto at = previous.periodOf(spec.periodStart(d)); at && cells[*at].reported())
            spec.previous[d] = cells[*at].value;
    spec.previousLabel = fileNameOf(previous.source.path);
}

}  // namespace

std::string groupedCount(std::int64_t value) {
    const bool negative = value < 0;
    std::string digits = std::to_string(negative ? -value : value);
    for (int i = static_cast<int>(digits.size()) - 3; i > 0; i -= 3)
        digits.insert(static_cast<std::size_t>(i), ",");
    return negative ? "-" + digits : digits;
}

Status FigureRequest::validate() const {
    if (region.empty())
        return makeError(ErrorCode::Usage, "a figure needs a region code");
    if (fit && !fitResult) {
        Status s = fit->validate();
        if (!s)
            return s;
    }
    return Ok{};
}

Result<FigureSpec> buildFigureSpec(const Drop& drop, const Ledger& ledger, const Cleaned& cleaned,
                                   const FigureRequest& request) {
    if (Status s = request.validate(); !s)
        return s.error();
    const auto region = drop.regionIndex(request.region);
    if (!region) {
        Error e =
            makeError(ErrorCode::NotFound, "region '" + request.region + "' is not in the drop");
        e.region = request.region;
        e.file = drop.source.path;
        return e;
    }
    if (drop.measures.empty())
        return makeError(ErrorCode::NotFound, "the drop has no measure");
    const auto measure = request.measure.empty() ? std::optional<std::size_t>(0)
                                                 : drop.measureIndex(request.measure);
    if (!measure) {
        Error e =
            makeError(ErrorCode::NotFound, "measure '" + request.measure + "' is not in the drop");
        e.file = drop.source.path;
        return e;
    }

    FigureSpec spec;
    spec.regionCode = request.region;
    spec.measure = drop.measures[*measure];
    if (request.regions)
        if (const RegionEntry* entry = request.regions->find(request.region))
            spec.regionName = entry->name;
    spec.axis = drop.axis;
    spec.raw = series::countsOf(drop, *measure, *region);
    spec.cleaned = cleanedCounts(cleaned, *measure, *region);
    spec.smoothed =
        series::centredMovingAverage(spec.cleaned, series::plotSmoothingWindow(spec.axis));
    spec.smoothedLabel = series::plotSmoothingLabel(spec.axis) + " (cleaned)";
    if (request.previous)
        addPrevious(spec, *request.previous);

    std::optional<fit::FitResult> result = request.fitResult;
    if (!result && request.fit) {
        std::optional<double> population;
        if (request.regions)
            if (const RegionEntry* entry = request.regions->find(request.region);
                entry && entry->population)
                population = static_cast<double>(*entry->population);
        auto fitted = fit::fitSeries({spec.axis.first(), spec.cleaned, spec.axis.periodDays()},
                                     *request.fit, population);
        if (fitted)
            result = std::move(fitted.value());
        else
            spec.fitError = fitted.error().message;
    }
    if (result)
        spec.fit = curveOf(*result, spec, request.countRange);

    addMarks(spec, ledger, cleaned);
    spec.title = request.title.empty() ? defaultTitle(spec) : request.title;
    spec.subtitle = request.subtitle.empty() ? defaultSubtitle(spec) : request.subtitle;
    spec.caption = captionFacts(drop, ledger, result ? &*result : nullptr, request.exportDate);
    if (spec.fit)
        spec.caption.bands = bandsDescription(*spec.fit);
    spec.captionLines = captionLines(spec.caption);
    return spec;
}

}  // namespace siftwave::report
