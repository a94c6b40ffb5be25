#include "widgets/report_writer.h"

#include "widgets/figure_renderer.h"

#include <QBuffer>
#include <QFileInfo>
#include <QImage>
#include <QPageLayout>
#include <QPageSize>
#include <QPdfWriter>
#include <QSaveFile>
#include <QTextDocument>
#include <QUrl>

namespace siftwave::widgets {
namespace {

// A figure in the report: half an A4 page wide, like the figures on their own.
FigureExportOptions reportFigureOptions(int dpi) {
    FigureExportOptions o;
    o.size = FigureSize{180.0, 112.0, std::nullopt};
    o.dpi = dpi;
    return o;
}

Result<QByteArray> figureBytes(const report::FigureSpec& spec, FigureFormat format, int dpi) {
    QByteArray bytes;
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::WriteOnly);
    if (Status s = writeFigures(buffer, format, {spec}, reportFigureOptions(dpi)); !s)
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
            auto svg = figureBytes(spec, FigureFormat::Svg, 96);
            if (!svg)
                return svg.error();
            // Inline: drop the XML declaration, keep the <svg> element, let it scale.
            QByteArray element = svg->mid(std::max<qsizetype>(0, svg->indexOf("<svg")));
            element.replace("<svg ", "<svg style=\"max-width:100%;height:auto\" ");
            markup.push_back(element.toStdString());
        }
        return writeBytes(path, QByteArray::fromStdString(report::briefingHtml(report, markup)));
    }

    QTextDocument document;
    std::vector<std::string> markup;
    for (std::size_t i = 0; i < report.figures.size(); ++i) {
        auto png = figureBytes(report.figures[i], FigureFormat::Png, 200);
        if (!png)
            return png.error();
        const QString name = QStringLiteral("figure-%1.png").arg(i + 1);
        document.addResource(QTextDocument::ImageResource, QUrl(name), QImage::fromData(*png));
        markup.push_back("<img src=\"" + name.toStdString() + "\" width=\"640\">");
    }
    document.setHtml(QString::fromStdString(report::briefingHtml(report, markup)));
    QByteArray bytes;
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::WriteOnly);
    {
        QPdfWriter pdf(&buffer);
        pdf.setPageLayout(QPageLayout(QPageSize(QPageSize::A4), QPageLayout::Portrait,
                                      QMarginsF(15, 15, 15, 15), QPageLayout::Millimeter));
        pdf.setTitle(QString::fromStdString(report.title));
        pdf.setCreator(QStringLiteral("Siftwave %1").arg(QLatin1String(report::siftwaveVersion())));
        document.print(&pdf);
    }
    return writeBytes(path, bytes);
}

}  // namespace siftwave::widgets
