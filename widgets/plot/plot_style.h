#pragma once
// Colours and line styles of every Siftwave plot (screen and exported figures).
//
// Colours are from the Okabe-Ito palette (M. Okabe and K. Ito, "Color Universal
// Design", 2008), chosen to stay distinguishable with the common colour-vision
// deficiencies; each series also has its own line style or fill so that a
// greyscale print still tells them apart.

#include <QBrush>
#include <QColor>
#include <QPen>

namespace siftwave::widgets::plot_style {

// Okabe-Ito colours.
inline const QColor kOrange{0xE6, 0x9F, 0x00};
inline const QColor kSkyBlue{0x56, 0xB4, 0xE9};
inline const QColor kBluishGreen{0x00, 0x9E, 0x73};
inline const QColor kBlue{0x00, 0x72, 0xB2};
inline const QColor kVermillion{0xD5, 0x5E, 0x00};
inline const QColor kReddishPurple{0xCC, 0x79, 0xA7};
inline const QColor kInk{0x22, 0x22, 0x22};

/// Raw daily counts: light grey bars with a darker edge (reads the same in greyscale).
inline QBrush rawBarBrush() {
    return QBrush(QColor(0xC9, 0xCD, 0xD3));
}
inline QPen rawBarPen() {
    return QPen(QColor(0x8C, 0x92, 0x9B), 0.8);
}
/// Cleaned series: thin solid blue.
inline QPen cleanedPen() {
    return QPen(kBlue, 1.4, Qt::SolidLine, Qt::RoundCap, Qt::RoundJoin);
}
/// Smoothed series: dashed orange.
inline QPen smoothedPen() {
    return QPen(kOrange, 2.6, Qt::DashLine, Qt::FlatCap, Qt::RoundJoin);
}
/// Fitted curve: dash-dot vermillion; its band a light wash of the same colour.
inline QPen fitPen() {
    return QPen(kVermillion, 2.2, Qt::DashDotLine, Qt::FlatCap, Qt::RoundJoin);
}
inline QBrush fitBandBrush() {
    QColor c = kVermillion;
    c.setAlpha(80);
    return QBrush(c);
}
/// The nowcast (an estimate of reports still to come): reddish purple, dotted, with square
/// marks on its points; its band a hatched wash of the same colour, unlike the fit's plain wash.
inline QPen nowcastPen() {
    return QPen(kReddishPurple, 2.0, Qt::DotLine, Qt::FlatCap, Qt::RoundJoin);
}
inline QBrush nowcastBandBrush() {
    QColor c = kReddishPurple;
    c.setAlpha(110);
    return QBrush(c, Qt::BDiagPattern);
}
/// The second measure (right axis): dotted bluish green.
inline QPen secondMeasurePen() {
    return QPen(kBluishGreen, 1.8, Qt::DotLine, Qt::FlatCap, Qt::RoundJoin);
}
/// The previous release: a thin dotted grey step line; revised days get an ink cross.
inline QPen previousPen() {
    return QPen(QColor(0x55, 0x55, 0x55), 1.0, Qt::DotLine, Qt::FlatCap, Qt::MiterJoin);
}
/// Finding marks on the time axis: reddish purple, darker for higher severity.
inline QColor findingColor(int severity /* 0 low .. 2 high */) {
    return severity >= 2   ? kReddishPurple.darker(150)
           : severity == 1 ? kReddishPurple
                           : kReddishPurple.lighter(130);
}
/// A decision preview drawn over the series: sky-blue hatched bars.
inline QBrush previewBrush() {
    return QBrush(kSkyBlue, Qt::BDiagPattern);
}
inline QPen previewPen() {
    return QPen(kSkyBlue.darker(130), 1.4);
}
/// A window on the time axis (fit window, redistribution window).
inline QBrush windowBrush() {
    return QBrush(QColor(0x56, 0xB4, 0xE9, 36));
}
inline QPen windowEdgePen() {
    return QPen(kBlue, 1.5, Qt::DashLine);
}

}  // namespace siftwave::widgets::plot_style
