#include "siftwave/report/plot_model.h"

#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/report/caption.h"
#include "siftwave/report/count_band.h"
#include "siftwave/series/daily.h"
#include "siftwave/series/smoothing.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace siftwave::report {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The total change an entry made to this region and measure.
std::int64_t totalChangeOf(const ledger::LedgerEntry& entry, const std::string& region,
                           const std::string& measure) {
    std::int64_t change = 0;
    for (const ledger::TotalChange& t : entry.effect.totals)
        if (t.region == region && t.measure == measure)
            change += t.change();
    return change;
}

double highestRaw(const PlotModel& model, Date first, Date last) {
    double best = 0;
    for (int i = std::max(0, first - model.axis.first());
         i < model.periods() && model.periodStart(i) <= last; ++i)
        if (!std::isnan(model.raw[i]))
            best = std::max(best, model.raw[i]);
    return best;
}

ledger::DayRange clampToCalendar(ledger::DayRange r, const PlotModel& model) {
    const Date last = model.periodStart(std::max(model.periods() - 1, 0));
    return {std::clamp(r.first, model.axis.first(), last),
            std::clamp(r.last, model.axis.first(), last)};
}

// Each kind's mark comes from its descriptor (siftwave/ledger/decision_kinds.h).
void addMarks(PlotModel& model, const ledger::Ledger& ledger, const ledger::Cleaned& cleaned) {
    const ledger::DayRange calendar{model.axis.first(),
                                    model.periodStart(std::max(model.periods() - 1, 0))};
    for (const ledger::LedgerEntry& entry : ledger.entries) {
        const ledger::Decision& d = entry.decision;
        const ledger::DecisionKindInfo& kind = ledger::decisionKindInfo(d.kind);
        if (!cleaned.inEffect(entry.sequence) ||
            !kind.marksSeries(d, model.regionCode, model.measure))
            continue;
        const std::int64_t change = totalChangeOf(entry, model.regionCode, model.measure);
        const std::optional<ledger::KindMark> kindMark = kind.mark(ledger::MarkContext{
            entry, model.regionCode, model.measure, model.axis, calendar, change, groupedCount});
        if (!kindMark)
            continue;
        const std::string label = "#" + std::to_string(entry.sequence) + " " + kindMark->label;
        const ledger::DayRange at = clampToCalendar(kindMark->at, model);
        if (kindMark->shaded) {
            model.excluded.push_back(
                ExcludedRange{entry.sequence, at.first, at.last, kindMark->count, label});
            continue;
        }
        DecisionMark mark;
        mark.sequence = entry.sequence;
        mark.kind = d.kind;
        mark.first = at.first;
        mark.last = at.last;
        mark.window = kindMark->window;
        mark.count = kindMark->count;
        mark.label = label;
        mark.anchorValue = highestRaw(model, at.first, at.last);
        model.decisions.push_back(mark);
    }
}

std::string capitalised(std::string text) {
    if (!text.empty() && text[0] >= 'a' && text[0] <= 'z')
        text[0] = static_cast<char>(text[0] - 'a' + 'A');
    return text;
}

constexpr char kCurveBandLabel[] = "95% confidence band of the fitted curve";
constexpr char kCountRangeLabel[] = "95% range of daily counts around the fit";

// The previous release's raw counts aligned by date on the model's calendar.
void addPrevious(PlotModel& model, const Drop& previous) {
    const auto region = previous.regionIndex(model.regionCode);
    const auto measure = previous.measureIndex(model.measure);
    if (!region || !measure)
        return;
    model.previous.assign(model.periods(), kNaN);
    const auto cells = previous.series(*measure, *region);
    for (int d = 0; d < model.periods(); ++d)
        if (const auto at = previous.periodOf(model.periodStart(d)); at && cells[*at].reported())
            model.previous[d] = cells[*at].value;
    model.previousLabel = fileNameOf(previous.source.path);
}

// "#<seq> <kind>[, withdrawn] (<author>): <reason>" for each entry that changed a cell.
void addTouchedBy(PlotModel& model, const ledger::Ledger& ledger, const ledger::Cleaned& cleaned,
                  std::size_t measure, std::size_t region) {
    model.touchedBy.assign(model.periods(), {});
    for (int d = 0; d < model.periods(); ++d)
        for (std::uint64_t sequence : cleaned.touchedBy(measure, region, d)) {
            if (sequence == 0 || sequence > ledger.entries.size())
                continue;
            const ledger::LedgerEntry& e = ledger.entries[sequence - 1];
            std::string text = "#";
            text += std::to_string(sequence);
            text += ' ';
            text += ledger::decisionKindName(e.decision.kind);
            if (!cleaned.inEffect(sequence))
                text += ", withdrawn";
            text += " (";
            text += e.author;
            text += "): ";
            text += e.reason;
            model.touchedBy[d].push_back(std::move(text));
        }
}

// The findings on this region and measure, in periods of the axis.
void addFindings(PlotModel& model, std::span<const scan::Finding> findings) {
    for (const scan::Finding& f : findings) {
        if (!f.region || *f.region != model.regionCode || !f.first || !f.last)
            continue;
        if (f.measure && *f.measure != model.measure)
            continue;
        FindingMarkSpec mark;
        mark.id = f.id;
        mark.kindLabel = scan::findingKindName(f.kind);
        mark.firstPeriod = model.axis.periodOnGrid(*f.first);
        mark.lastPeriod = model.axis.periodOnGrid(*f.last);
        mark.severity = f.severity == scan::Severity::Critical  ? 2
                        : f.severity == scan::Severity::Warning ? 1
                                                                : 0;
        model.findings.push_back(std::move(mark));
    }
}

}  // namespace

std::string groupedCount(std::int64_t value) {
    const bool negative = value < 0;
    std::string digits = std::to_string(negative ? -value : value);
    for (int i = static_cast<int>(digits.size()) - 3; i > 0; i -= 3)
        digits.insert(static_cast<std::size_t>(i), ",");
    return negative ? "-" + digits : digits;
}

std::string valueAxisLabel(const TimeAxis& axis, const std::string& measure) {
    return std::string(axis.adjective()) + " " + measure;
}

FittedCurveSpec fittedCurveOf(const fit::FitResult& result, const TimeAxis& axis,
                              const std::vector<double>& cleaned, bool countRange) {
    FittedCurveSpec curve;
    curve.result = result;
    curve.label =
        capitalised(fit::modelName(result.model)) + " fit (" + fit::methodName(result.method) + ")";
    curve.bandLabel = kCurveBandLabel;
    curve.mid.assign(axis.periods(), kNaN);
    curve.low.assign(axis.periods(), kNaN);
    curve.high.assign(axis.periods(), kNaN);
    curve.windowFirst = result.windowFirst();
    curve.windowLast = result.windowLast();
    if (result.status != fit::FitStatus::Ok) {
        // A failed fit draws nothing: its numbers must not look like a wave on paper.
        curve.notDrawn =
            std::string("no curve drawn: the fit is ") + fit::fitStatusName(result.status);
        for (std::size_t i = 0; i < result.statusReasons.size(); ++i)
            curve.notDrawn += (i == 0 ? " (" : "; ") + result.statusReasons[i];
        if (!result.statusReasons.empty())
            curve.notDrawn += ")";
        curve.peakValue = kNaN;
        return curve;
    }
    const int offset = axis.periodOnGrid(result.seriesFirstDay);  // in periods
    // Calendar index of series period `first + i`, or -1 off the calendar.
    auto dayOf = [&](int seriesDay) {
        const int day = offset + seriesDay;
        return day >= 0 && day < axis.periods() ? day : -1;
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
        curve.countLow.assign(axis.periods(), kNaN);
        curve.countHigh.assign(axis.periods(), kNaN);
        const CountBand counts = countBand(result, cleaned);
        for (std::size_t i = 0; i < counts.low.size(); ++i)
            if (const int day = dayOf(result.first + static_cast<int>(i)); day >= 0) {
                curve.countLow[day] = counts.low[i];
                curve.countHigh[day] = counts.high[i];
            }
    }
    curve.peakDate = result.dateOf(result.derived.peakDay.value);
    curve.peakValue = result.derived.peakIncidence.value;
    return curve;
}

Status PlotRequest::validate() const {
    if (region.empty())
        return makeError(ErrorCode::Usage, "a plot needs a region code");
    if (fit && !fitResult) {
        Status s = fit->validate();
        if (!s)
            return s;
    }
    return Ok{};
}

Result<PlotModel> buildPlotModel(const Drop& drop, const ledger::Ledger& ledger,
                                 const ledger::Cleaned& cleaned, const PlotRequest& request) {
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

    PlotModel model;
    model.regionCode = request.region;
    model.measure = drop.measures[*measure];
    if (request.regions)
        if (const RegionEntry* entry = request.regions->find(request.region))
            model.regionName = entry->name;
    model.axis = drop.axis;
    model.valueLabel = valueAxisLabel(model.axis, model.measure);
    model.raw = series::countsOf(drop, *measure, *region);
    model.rawState.assign(model.periods(), CellState::Absent);
    model.sourceLine.assign(model.periods(), 0);
    model.sourcePlaces.format = drop.source.format;
    model.sourcePlaces.sheet = drop.source.sheet;
    model.sourcePlaces.firstColumn = drop.source.firstColumn;
    const auto cells = drop.series(*measure, *region);
    for (int d = 0; d < model.periods() && d < static_cast<int>(cells.size()); ++d) {
        model.rawState[d] = cells[static_cast<std::size_t>(d)].state;
        model.sourceLine[d] = cells[static_cast<std::size_t>(d)].line;
    }
    model.cleaned = ledger::cleanedCounts(cleaned, *measure, *region);
    model.smoothed =
        series::centredMovingAverage(model.cleaned, series::plotSmoothingWindow(model.axis));
    model.smoothedLabel = series::plotSmoothingLabel(model.axis) + " (cleaned)";
    if (request.previous)
        addPrevious(model, *request.previous);
    if (!request.secondMeasure.empty() && request.secondMeasure != model.measure)
        if (const auto second = drop.measureIndex(request.secondMeasure)) {
            model.secondMeasure = drop.measures[*second];
            model.secondValueLabel = valueAxisLabel(model.axis, model.secondMeasure);
            model.second = series::countsOf(drop, *second, *region);
        }
    addTouchedBy(model, ledger, cleaned, *measure, *region);
    addFindings(model, request.findings);

    std::optional<fit::FitResult> result = request.fitResult;
    if (!result && request.fit) {
        std::optional<double> population;
        if (request.regions)
            if (const RegionEntry* entry = request.regions->find(request.region);
                entry && entry->population)
                population = static_cast<double>(*entry->population);
        auto fitted = fit::fitSeries({model.axis.first(), model.cleaned, model.axis.periodDays()},
                                     *request.fit, population);
        if (fitted)
            result = std::move(fitted.value());
        else
            model.fitError = fitted.error().message;
    }
    if (result)
        model.fit = fittedCurveOf(*result, model.axis, model.cleaned, request.countRange);
    if (request.transmission) {
        if (Status s = request.transmission->validate(model.axis.cadence()); !s)
            return s.error();
        model.transmission =
            transmission::estimateTransmission(model.cleaned, model.axis, *request.transmission);
        model.transmissionGrowthRate = request.transmissionGrowthRate;
    }
    std::optional<nowcast::NowcastResult> nowcastResult = request.nowcastResult;
    if (!nowcastResult && request.nowcast) {
        auto made = nowcastOfCaseList(drop, *region, *request.nowcast);
        if (made)
            nowcastResult = std::move(*made);
        else
            model.nowcastError = made.error().message;
    }
    if (nowcastResult)
        model.nowcast = nowcastSpecOf(*nowcastResult, model.axis);

    addMarks(model, ledger, cleaned);
    return model;
}

}  // namespace siftwave::report
