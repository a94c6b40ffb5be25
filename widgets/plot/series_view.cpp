#include "widgets/plot/series_view.h"

#include <QCoreApplication>
#include <QLocale>

#include <algorithm>
#include <cmath>

namespace siftwave::widgets {

namespace {

QString tr(const char* text) {
    return QCoreApplication::translate("SeriesView", text);
}

QString weekdayName(int isoWeekday) {
    static const char* const names[] = {"Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"};
    return tr(names[(isoWeekday - 1) % 7]);
}

QString number(double value, int decimals = 0) {
    return QLocale::c().toString(value, 'f', decimals);
}

bool has(const std::vector<double>& values, int day) {
    return day >= 0 && day < static_cast<int>(values.size()) && !std::isnan(values[day]);
}

}  // namespace

SeriesView seriesViewOf(const report::PlotModel& model) {
    const auto qs = [](const std::string& text) { return QString::fromStdString(text); };
    SeriesView view;
    view.regionCode = qs(model.regionCode);
    view.regionName = qs(model.regionName);
    view.measure = qs(model.measure);
    view.axis = model.axis;
    view.valueLabel = qs(model.valueLabel);
    view.raw = model.raw;
    view.rawState = model.rawState;
    view.sourceLine = model.sourceLine;
    view.sourcePlaces = model.sourcePlaces;
    view.cleaned = model.cleaned;
    view.smoothed = model.smoothed;
    view.smoothedLabel = qs(model.smoothedLabel);
    if (model.fit && model.fit->notDrawn.empty()) {  // no curve for a fit that is not ok
        FittedCurve curve;
        curve.label = qs(model.fit->label);
        curve.mid = model.fit->mid;
        curve.low = model.fit->low;
        curve.high = model.fit->high;
        curve.bandLabel = qs(model.fit->bandLabel);
        view.fit = std::move(curve);
    }
    if (model.fit) {
        view.fitWindow = DayIndexRange{model.axis.periodOnGrid(model.fit->windowFirst),
                                       model.axis.periodOnGrid(model.fit->windowLast)};
    }
    if (model.nowcast) {
        NowcastBand band;
        band.label = qs(model.nowcast->label);
        band.bandLabel = qs(model.nowcast->bandLabel);
        band.mid = model.nowcast->mid;
        band.low = model.nowcast->low;
        band.high = model.nowcast->high;
        view.nowcast = std::move(band);
    }
    for (const report::FindingMarkSpec& f : model.findings)
        view.findings.push_back({qs(f.id),
                                 QString::fromStdString(f.kindLabel),
                                 {f.firstPeriod, f.lastPeriod},
                                 f.severity});
    view.touchedBy.reserve(model.touchedBy.size());
    for (const std::vector<std::string>& texts : model.touchedBy) {
        QStringList list;
        for (const std::string& text : texts)
            list << qs(text);
        view.touchedBy.push_back(std::move(list));
    }
    view.previous = model.previous;
    view.previousLabel = qs(model.previousLabel);
    view.secondMeasure = qs(model.secondMeasure);
    view.secondValueLabel = qs(model.secondValueLabel);
    view.second = model.second;
    return view;
}

FittedCurve curveFromFit(const fit::FitResult& fit, const TimeAxis& axis) {
    // The numbers are the plot model's (report::fittedCurveOf); only the legend texts are the
    // screen's own, translated names.
    const report::FittedCurveSpec spec = report::fittedCurveOf(fit, axis, {}, false);
    FittedCurve curve;
    curve.label = QCoreApplication::translate("SeriesView", "%1 fit (%2)")
                      .arg(modelDisplayName(fit.model), methodDisplayName(fit.method));
    if (!spec.notDrawn.empty()) {
        // The figure's wording (report::fittedCurveOf), one reason a line.
        curve.notDrawn = QCoreApplication::translate("SeriesView", "No curve drawn: the fit is %1")
                             .arg(QString::fromLatin1(fit::fitStatusName(fit.status)));
        for (const std::string& why : fit.statusReasons)
            curve.notDrawn += QStringLiteral("\n• ") + QString::fromStdString(why);
        return curve;
    }
    curve.mid = spec.mid;
    if (spec.bandNote.empty()) {
        curve.low = spec.low;
        curve.high = spec.high;
        // The term of the exported figures ("95% confidence band of the fitted curve",
        // report/plot_model.cpp), shortened for the legend the way their caption shortens it.
        curve.bandLabel =
            QCoreApplication::translate("SeriesView", "95% confidence band of the curve");
    }
    return curve;
}

QString modelDisplayName(fit::ModelKind model) {
    switch (model) {
        case fit::ModelKind::Gumbel:
            return tr("Gumbel");
        case fit::ModelKind::Logistic:
            return tr("logistic");
        case fit::ModelKind::Richards:
            return tr("Richards");
        case fit::ModelKind::LogNormal:
            return tr("log-normal");
    }
    return QString::fromLatin1(fit::modelName(model));
}

QString methodDisplayName(fit::FitMethod method) {
    switch (method) {
        case fit::FitMethod::LeastSquares:
            return tr("least squares");
        case fit::FitMethod::Poisson:
            return tr("Poisson");
        case fit::FitMethod::NegativeBinomial:
            return tr("negative binomial");
    }
    return QString::fromLatin1(fit::methodName(method));
}

QString hoverText(const SeriesView& view, int day) {
    if (day < 0 || day >= view.periods())
        return {};
    const Date date = view.periodStart(day);
    QStringList lines;
    if (view.axis.weekly())  // "2026-W05" and the week's first and last day
        lines << QStringLiteral("<b>%1</b> %2 to %3")
                     .arg(QString::fromStdString(view.axis.periodName(day)),
                          QString::fromStdString(date.iso()),
                          QString::fromStdString(view.axis.periodEnd(day).iso()));
    else
        lines << QStringLiteral("<b>%1</b> %2")
                     .arg(QString::fromStdString(date.iso()), weekdayName(date.isoWeekday()));
    const CellState state =
        day < static_cast<int>(view.rawState.size()) ? view.rawState[day] : CellState::Absent;
    QString raw = has(view.raw, day)
                      ? number(view.raw[day])
                      : QStringLiteral("<i>%1</i>").arg(QString::fromLatin1(cellStateName(state)));
    lines << tr("Raw %1: %2").arg(view.measure, raw);
    if (has(view.cleaned, day))
        lines << tr("Cleaned: %1").arg(number(view.cleaned[day]));
    if (has(view.smoothed, day))
        lines << tr("Smoothed: %1").arg(number(view.smoothed[day], 1));
    if (view.fit && has(view.fit->mid, day)) {
        QString fitted = tr("Fitted: %1").arg(number(view.fit->mid[day], 1));
        if (has(view.fit->low, day) && has(view.fit->high, day))
            fitted += tr(", 95% confidence band %1 – %2")
                          .arg(number(view.fit->low[day], 1), number(view.fit->high[day], 1));
        lines << fitted;
    }
    if (!view.previousLabel.isEmpty()) {
        if (has(view.previous, day)) {
            QString previous = tr("Previous release: %1").arg(number(view.previous[day]));
            if (has(view.raw, day) && view.raw[day] != view.previous[day])
                previous +=
                    tr(" (revised by %1%2)")
                        .arg(view.raw[day] > view.previous[day] ? QStringLiteral("+") : QString())
                        .arg(number(view.raw[day] - view.previous[day]));
            lines << previous;
        } else {
            lines << tr("Previous release: no number");
        }
    }
    if (!view.secondMeasure.isEmpty() && has(view.second, day))
        lines << tr("Raw %1: %2").arg(view.secondMeasure, number(view.second[day]));
    const std::uint32_t line =
        day < static_cast<int>(view.sourceLine.size()) ? view.sourceLine[day] : 0;
    if (line == 0)
        lines << tr("No source row");
    else  // "Source line 14" (CSV), "Source data!14:14" (a sheet's row)
        lines << tr("Source %1")
                     .arg(QString::fromStdString(sourcePlace(view.sourcePlaces, line))
                              .toHtmlEscaped());
    if (day < static_cast<int>(view.touchedBy.size()) && !view.touchedBy[day].isEmpty()) {
        lines << tr("Ledger:");
        for (const QString& entry : view.touchedBy[day])
            lines << QStringLiteral("&nbsp;&nbsp;") + entry.toHtmlEscaped();
    }
    for (const FindingMark& mark : view.findings)
        if (day >= mark.days.first && day <= mark.days.last)
            lines << tr("Finding %1: %2").arg(mark.id, mark.label.toHtmlEscaped());
    return lines.join(QStringLiteral("<br>"));
}

}  // namespace siftwave::widgets
