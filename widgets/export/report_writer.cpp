#include "widgets/export/report_writer.h"

#include "widgets/export/figure_renderer.h"
#include "widgets/export/figure_text_object.h"
#include "widgets/plot/qcustomplot_include.h"

#include <QAbstractTextDocumentLayout>
#include <QBuffer>
#include <QFileInfo>
#include <QPageLayout>
#include <QPageSize>
#include <QPdfWriter>
#include <QSaveFile>
#include <QTextBlock>
#include <QTextCursor>
#include <QTextDocument>
#include <QTextLayout>

#include <algorithm>

namespace siftwave::widgets {
namespace {

// A figure in the report: half an A4 page wide, like the figures on their own.
FigureExportOptions reportFigureOptions(int dpi) {
    FigureExportOptions o;
    o.size = FigureSize{180.0, 112.0, std::nullopt};
    o.dpi = dpi;
    return o;
}

constexpr double kDocumentDpi = 96.0;

// Where figure i goes in the report's HTML until the PDF puts the figure object there.
QString placeholderOf(std::size_t index) {
    return QStringLiteral("[[siftwave figure %1]]").arg(index + 1);
}

// The figure as an <svg> element to place in the HTML page (no XML declaration; it scales
// to the page). Written by an XML writer, never patched as text.
Result<QByteArray> inlineSvgFigure(const report::FigureSpec& spec) {
    QByteArray bytes;
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::WriteOnly);
    FigureExportOptions options = reportFigureOptions(96);
    options.svgTarget = SvgTarget::InlineHtml;
    if (Status s = writeFigures(buffer, FigureFormat::Svg, {spec}, options); !s)
        return s.error();
    return bytes;
}

Status writeBytes(const QString& path, const QByteArray& bytes) {
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly) || file.write(bytes) != bytes.size() || !file.commit()) {
        Error e = makeError(ErrorCode::Io,
                            "cannot write the report: " + file.errorString().toStdString());
        e.file = path.toStdString();
        return e;
    }
    return Ok{};
}

}  // namespace

std::optional<ReportFileFormat> reportFileFormatFromPath(const QString& path) {
    const QString suffix = QFileInfo(path).suffix().toLower();
    if (suffix == QLatin1String("html") || suffix == QLatin1String("htm"))
        return ReportFileFormat::Html;
    if (suffix == QLatin1String("pdf"))
        return ReportFileFormat::Pdf;
    return std::nullopt;
}

Status writeBriefingReport(const QString& path, const report::BriefingReport& report) {
    const auto format = reportFileFormatFromPath(path);
    if (!format)
        return makeError(ErrorCode::Usage,
                         "the report file must end in .html or .pdf: " + path.toStdString());
    if (*format == ReportFileFormat::Html) {
        std::vector<std::string> markup;
        for (const report::FigureSpec& spec : report.figures) {
            auto svg = inlineSvgFigure(spec);
            if (!svg)
                return svg.error();
            markup.push_back(svg->toStdString());
        }
        return writeBytes(path, QByteArray::fromStdString(report::briefingHtml(report, markup)));
    }

    auto pdf = briefingPdf(report);
    if (!pdf)
        return pdf.error();
    return writeBytes(path, *pdf);
}

namespace {

// The report's HTML with a placeholder where each figure goes, without the browser margins
// around the body (the page has its margins already).
QString reportHtmlWithPlaceholders(const report::BriefingReport& report) {
    std::vector<std::string> markup;
    for (std::size_t i = 0; i < report.figures.size(); ++i)
        markup.push_back(placeholderOf(i).toStdString());
    QString html = QString::fromStdString(report::briefingHtml(report, markup));
    html.replace(QLatin1String("max-width:60em;margin:1.5em auto;"), QLatin1String("margin:0;"));
    return html;
}

// The width a figure spans: that of the lines around it (as laid out, whatever the style's
// block margins), found at the first figure's placeholder.
double figureLineWidth(const QTextDocument& document, const report::BriefingReport& report,
                       double bodyWidth) {
    double lineWidth = bodyWidth - 2 * document.documentMargin();
    if (!report.figures.empty()) {
        const QTextCursor at =
            document.find(placeholderOf(0), 0, QTextDocument::FindCaseSensitively);
        if (!at.isNull() && at.block().layout() && at.block().layout()->lineCount() > 0)
            lineWidth = std::min(lineWidth, at.block().layout()->lineAt(0).width());
    }
    return lineWidth;
}

// Puts each figure object in place of its placeholder.
Status insertFigures(QTextDocument& document, std::size_t count) {
    for (std::size_t i = 0; i < count; ++i)
        if (!FigureTextObject::insertFigure(document, placeholderOf(i), static_cast<int>(i)))
            return makeError(ErrorCode::Io,
                             "the report lost the place of figure " + std::to_string(i + 1));
    return Ok{};
}

// Each region's section (its heading, then the figure) starts a page, so that a heading
// never stays behind at the foot of the page before its figure.
void breakPageBeforeSections(QTextDocument& document, std::size_t count) {
    for (int i = 0; i < static_cast<int>(count); ++i) {
        const QTextBlock heading = FigureTextObject::blockOf(document, i).previous();
        if (heading.isValid()) {
            QTextCursor cursor(heading);
            QTextBlockFormat format = heading.blockFormat();
            format.setPageBreakPolicy(QTextFormat::PageBreak_AlwaysBefore);
            cursor.setBlockFormat(format);
        }
    }
}

// Paints the laid-out document page by page, each with a footer line of the title and the
// page number at the foot of `body` (`footer` high).
Status paintReportPages(QPdfWriter& pdf, QTextDocument& document, FigureTextObject& figures,
                        const QSizeF& body, double footer, const std::string& title) {
    QCPPainter painter;
    if (!painter.begin(&pdf))
        return makeError(ErrorCode::Io, "the report PDF could not be started");
    painter.setMode(QCPPainter::pmVectorized);
    painter.setMode(QCPPainter::pmNoCaching);
    figures.setPainter(&painter);
    const int pages = document.pageCount();
    const QFont footerFont(QStringLiteral("DejaVu Sans"), 8);
    for (int page = 0; page < pages; ++page) {
        if (page > 0 && !pdf.newPage())
            return makeError(ErrorCode::Io, "the report PDF could not start a new page");
        const double top = page * document.pageSize().height();
        painter.save();
        painter.setClipRect(QRectF(0, 0, body.width(), document.pageSize().height()));
        painter.translate(0, -top);
        QAbstractTextDocumentLayout::PaintContext context;
        context.palette.setColor(QPalette::Text, Qt::black);  // not the platform's text colour
        context.clip = QRectF(0, top, body.width(), document.pageSize().height());
        document.documentLayout()->draw(&painter, context);
        painter.restore();
        painter.setFont(footerFont);
        painter.setPen(QColor(0x55, 0x55, 0x55));
        painter.drawText(QRectF(0, body.height() - footer + 6, body.width(), footer - 6),
                         Qt::AlignRight | Qt::AlignBottom,
                         QStringLiteral("%1 \u2014 page %2 of %3")
                             .arg(QString::fromStdString(title))
                             .arg(page + 1)
                             .arg(pages));
    }
    figures.setPainter(nullptr);
    if (!painter.end())
        return makeError(ErrorCode::Io, "the report PDF could not be finished");
    return Ok{};
}

}  // namespace

Result<QByteArray> briefingPdf(const report::BriefingReport& report) {
    QByteArray bytes;
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::WriteOnly);
    QPdfWriter pdf(&buffer);
    pdf.setPageLayout(QPageLayout(QPageSize(QPageSize::A4), QPageLayout::Portrait,
                                  QMarginsF(15, 15, 15, 15), QPageLayout::Millimeter));
    // Document units = the figures' logical pixels (1/96 inch); the PDF stays vector.
    pdf.setResolution(static_cast<int>(kDocumentDpi));
    pdf.setTitle(QString::fromStdString(report.title));
    pdf.setCreator(QStringLiteral("Siftwave %1").arg(QLatin1String(report::siftwaveVersion())));

    QTextDocument document;
    document.documentLayout()->setPaintDevice(&pdf);  // fonts measured as the PDF draws them
    document.setHtml(reportHtmlWithPlaceholders(report));
    // The page body, less a footer line for the page number.
    const QSizeF body(pdf.width(), pdf.height());
    const double footer = 22;
    document.setPageSize(QSizeF(body.width(), body.height() - footer));
    // A figure in the proportions of a figure on its own (180 x 112 mm).
    const double lineWidth = figureLineWidth(document, report, body.width());
    FigureTextObject figures(report.figures, QSizeF(lineWidth, lineWidth * 112.0 / 180.0));
    figures.registerWith(document);
    if (Status inserted = insertFigures(document, report.figures.size()); !inserted)
        return inserted.error();
    breakPageBeforeSections(document, report.figures.size());
    // Lay the whole document out again: after the insertions QTextDocumentLayout has laid out
    // only part of what follows, and blocks it has not reached would print empty.
    document.markContentsDirty(0, document.characterCount());
    if (Status painted = paintReportPages(pdf, document, figures, body, footer, report.title);
        !painted)
        return painted.error();
    return bytes;
}

}  // namespace siftwave::widgets
