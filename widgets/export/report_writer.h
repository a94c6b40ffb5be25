#pragma once
// The briefing report on disk: HTML (one self-contained page, each figure as
// inline SVG so its text stays text) or PDF (A4, the same HTML laid out by
// QTextDocument and paginated, each figure painted into the flow as vectors by
// the figure renderer, see figure_text_object.h: no raster image, text kept as
// text, fonts embedded; a page number in the footer). The content is the core's
// (report/briefing.h).

#include "siftwave/report/briefing.h"
#include "siftwave/result.h"

#include <QByteArray>
#include <QString>

namespace siftwave::widgets {

enum class ReportFileFormat { Html, Pdf };
/// From the suffix: .html/.htm or .pdf; nullopt otherwise.
std::optional<ReportFileFormat> reportFileFormatFromPath(const QString& path);

/// The report as an A4 PDF (see the header comment).
Result<QByteArray> briefingPdf(const report::BriefingReport& report);

/// Writes the report atomically (temporary file, then rename).
Status writeBriefingReport(const QString& path, const report::BriefingReport& report);

}  // namespace siftwave::widgets
