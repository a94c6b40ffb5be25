#pragma once
// Figure rendering: a report::FigureSpec drawn as a briefing figure, exported
// as PNG (at a chosen DPI), SVG (text kept as text) or PDF (fonts embedded).
//
// The plot itself is the workbench's own: a SeriesChart (series_chart.h) over
// the spec's PlotModel (seriesViewOf), so an exported figure looks like the plot
// on screen. annotateFigure() adds the marks that make it a briefing figure:
// one per ledger decision (a labelled arrow to a redistributed spike, with a
// bracket over the days the counts went to; labels for the other kinds),
// shaded excluded ranges, the fit window (drawn by SeriesChart), the fitted
// curve with its band, and the peak. The page holds the title, the subtitle,
// the plot and the caption block (caption.h).
//
// Units: a page is laid out in logical pixels of 1/96 inch whatever the output,
// so a figure has the same proportions as PNG, SVG and PDF; PNG rasterises at
// the requested DPI (the file records that DPI), SVG and PDF stay vector.

#include "siftwave/report/figure_spec.h"
#include "siftwave/result.h"
#include "widgets/export/svg_document.h"
#include "widgets/plot/series_view.h"

#include <QRectF>
#include <QSize>
#include <QString>

#include <optional>
#include <vector>

class QCustomPlot;
class QCPPainter;
class QIODevice;

namespace siftwave::widgets {

class SeriesChart;

enum class FigureFormat { Png, Svg, Pdf };
/// From the file name's suffix (.png, .svg, .pdf; any case); nullopt otherwise.
std::optional<FigureFormat> figureFormatFromPath(const QString& path);

/// The physical size of a figure.
struct FigureSize {
    double widthMm = 254.0;
    double heightMm = 142.875;
    std::optional<QSize> pixels;  // set when the size was asked in pixels (PNG gets exactly these)

    /// A 16:9 slide, 10 x 5.625 inches (254 x 142.875 mm; common practice, no source).
    static FigureSize slide();
    /// Half an A4 page in landscape, 210 x 148.5 mm (A4 is 210 x 297 mm, ISO 216).
    static FigureSize halfA4();
    /// "slide", "half-a4", "WxHmm" or "WxHpx" (W, H positive numbers; px at `dpi`).
    static Result<FigureSize> parse(const QString& text, int dpi);

    /// Pixel size at a DPI (the exact pixels when asked in pixels).
    QSize pixelsAt(int dpi) const;
    /// Size in logical pixels (1/96 inch).
    QSizeF logical() const;
};

struct FigureExportOptions {
    FigureSize size = FigureSize::halfA4();
    int dpi = 200;                          // PNG resolution, 50..1200 (SVG and PDF are vector)
    int columns = 0;                        // small multiples: panels per row (0: about square)
    SvgTarget svgTarget = SvgTarget::File;  // SVG only: a file of its own, or inline in HTML
};

/// Where the plot of a painted figure lies (logical page coordinates) and what
/// its axes show, so a test can check that a mark sits where the data say.
struct FigureGeometry {
    QRectF axisRect;                // the plotting area
    double xLower = 0, xUpper = 0;  // plot keys (seconds since 1970, see plotKeyOfDay)
    double yLower = 0, yUpper = 0;  // counts
    /// The plot's text marks (decision, cut bar, peak, excluded range) as laid out: their
    /// text and box (logical page coordinates, padding included).
    struct Label {
        QString text;
        QRectF box;
    };
    std::vector<Label> labels;
};

/// Adds the spec's annotations to a plot that `chart` has drawn from the same spec.
void annotateFigure(SeriesChart& chart, const report::FigureSpec& spec);

/// Paints one figure (title, subtitle, annotated plot, caption) into `page` (logical
/// pixels of 1/96 inch in the painter's coordinates). QCustomPlot paints through a QCPPainter.
FigureGeometry paintFigure(QCPPainter& painter, const QRectF& page, const report::FigureSpec& spec);

/// Paints several figures as small multiples on one page: a panel per figure
/// (title, subtitle, plot) and one caption block for the page.
std::vector<FigureGeometry> paintSmallMultiples(QCPPainter& painter, const QRectF& page,
                                                const std::vector<report::FigureSpec>& specs,
                                                int columns = 0);

/// Writes one figure, or small multiples when `specs` has more than one, to a device.
Status writeFigures(QIODevice& device, FigureFormat format,
                    const std::vector<report::FigureSpec>& specs,
                    const FigureExportOptions& options,
                    std::vector<FigureGeometry>* geometry = nullptr);

/// Writes one figure, or small multiples when `specs` has more than one, to
/// `path` (format from its suffix), atomically. `geometry` receives each panel's.
Status exportFigures(const QString& path, const std::vector<report::FigureSpec>& specs,
                     const FigureExportOptions& options,
                     std::vector<FigureGeometry>* geometry = nullptr);

/// The caption lines of a small-multiples page (the first figure's, with one Fit line
/// for all panels).
std::vector<std::string> pageCaptionLines(const std::vector<report::FigureSpec>& specs);

}  // namespace siftwave::widgets
