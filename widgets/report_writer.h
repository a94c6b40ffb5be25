#pragma once
// The briefing report on disk: HTML (one self-contained page, each figure as
// inline SVG so its text stays text) or PDF (A4, the same HTML laid out by
// QTextDocument, each figure as a high-resolution image with its caption
// printed as text beside it). The content is the core's (report/briefing.h).

#include "siftwave/report/briefing.h"
#include "siftwave/result.h"

#include <QString>

namespace siftwave::widgets {

enum class ReportFileFormat { Html, Pdf };
/// From the suffix: .html/.htm or .pdf; nullopt otherwise.
std::optional<ReportFileFormat> reportFileFormatFromPath(const QString& path);

/// Writes the report atomically (temporary file, then rename).
Status writeBriefingReport(const QString& path, const report::BriefingReport& report);

}  // namespace siftwave::widgets
