// siftwave-cli figure FILE [--ledger L] --region CODE [--region CODE ...] [--measure NAME]
//     [--fit MODEL [--method M] [--window FIRST:LAST]] --out FIG.png|FIG.svg|FIG.pdf
//     [--size slide|half-a4|WxHmm|WxHpx] [--dpi N] [--columns N] [--each]
//     [--title T] [--subtitle S] [--regions REG] [--previous FILE] [--json]
// Draws the annotated briefing figure with the workbench's plot code, headless.
#include "../commands.h"
#include "../common.h"
#include "briefing_inputs.h"

#include "siftwave/report/figure_spec.h"
#include "widgets/export/figure_renderer.h"

#include <QApplication>
#include <QDir>
#include <QFileInfo>

#include <set>

#include <cstdio>

namespace siftwave::cli {
namespace {

std::vector<FlagSpec> figureFlags() {
    std::vector<FlagSpec> specs = briefingFlagSpecs(true);
    specs.push_back(
        {"region", true, true, "CODE", "region to draw (repeat for small multiples on one page)"});
    specs.push_back({"out", true, false, "FIG", "output file: .png, .svg or .pdf"});
    specs.push_back(
        {"size", true, false, "SIZE", "slide (16:9), half-a4 (default), WxHmm or WxHpx"});
    specs.push_back({"dpi", true, false, "N", "PNG resolution (default 200)"});
    specs.push_back({"columns", true, false, "N", "small multiples: panels per row"});
    specs.push_back({"each", false, false, "",
                     "one file per region (FIG-CODE.ext) instead of small multiples"});
    specs.push_back({"title", true, false, "TEXT", "title (default: region name and measure)"});
    specs.push_back(
        {"subtitle", true, false, "TEXT", "subtitle (default: calendar, decisions, fit)"});
    specs.push_back({"previous", true, false, "FILE",
                     "the previous release: its counts drawn dotted, revised days marked"});
    specs.push_back({"json", false, false, "", "print what was written as JSON"});
    return specs;
}

void printHelp() {
    std::printf(
        "usage: siftwave-cli figure FILE [--ledger L] --region CODE [--measure NAME]\n"
        "           [--fit MODEL] --out FIG.png|FIG.svg|FIG.pdf [--size slide|half-a4|WxH]\n"
        "           [--dpi N]\n\n"
        "Draws a region's series as a briefing figure: raw bars, cleaned and smoothed lines,\n"
        "each ledger decision marked, the fit with the 95%% confidence band of the curve, its\n"
        "window and peak, and a caption with the provenance and the caution. Headless\n"
        "(offscreen platform).\n\n%s",
        formatFlags(figureFlags()).c_str());
}

int usageError(const std::string& message) {
    std::fprintf(stderr, "siftwave-cli figure: %s\n", terminalText(message).c_str());
    return kExitUsage;
}

QString pathForRegion(const QString& out, const std::string& code) {
    const QFileInfo info(out);
    QString safe;
    for (QChar c : QString::fromStdString(code))
        safe += c.isLetterOrNumber() || c == QLatin1Char('-') || c == QLatin1Char('_')
                    ? c
                    : QLatin1Char('_');
    return info.dir().filePath(info.completeBaseName() + QLatin1Char('-') + safe +
                               QLatin1Char('.') + info.suffix());
}

/// --dpi, --size and --columns into `options`; the usage error ("" when none).
std::string exportOptionsFrom(const ParsedArgs& args, widgets::FigureExportOptions& options) {
    if (auto dpi = args.optionalValue("dpi")) {
        try {
            std::size_t used = 0;
            options.dpi = std::stoi(*dpi, &used);
            if (used != dpi->size())
                throw std::invalid_argument(*dpi);
        } catch (...) {
            return "--dpi takes a whole number, not '" + *dpi + "'";
        }
        if (options.dpi < 50 || options.dpi > 1200)
            return "--dpi must be between 50 and 1200";
    }
    if (auto size = args.optionalValue("size")) {
        auto parsed = widgets::FigureSize::parse(QString::fromStdString(*size), options.dpi);
        if (!parsed)
            return parsed.error().message;
        options.size = *parsed;
    }
    if (auto columns = args.optionalValue("columns")) {
        options.columns = std::atoi(columns->c_str());
        if (options.columns < 1 || options.columns > 12)
            return "--columns takes 1 to 12";
    }
    return {};
}

/// Each region's figure as the flags ask; nullopt (the error printed) when one cannot be built.
std::optional<std::vector<report::FigureSpec>> buildFigures(const ParsedArgs& args,
                                                            const BriefingSources& sources,
                                                            const std::vector<std::string>& regions,
                                                            bool json) {
    const BriefingInputs& inputs = sources.inputs;
    // A title or subtitle names one figure: it is taken for one region, or for each in its file.
    const bool oneTitle = regions.size() == 1 || args.has("each");
    std::vector<report::FigureSpec> figures;
    for (const std::string& code : regions) {
        report::FigureRequest request;
        request.region = code;
        request.measure = args.value("measure");
        request.fit = sources.fit;
        request.title = oneTitle ? args.value("title") : "";
        request.subtitle = oneTitle ? args.value("subtitle") : "";
        request.regions = inputs.regions ? &*inputs.regions : nullptr;
        request.previous = sources.previous ? &*sources.previous : nullptr;
        request.countRange = args.has("count-range");
        request.transmission = sources.transmission;
        request.transmissionGrowthRate = sources.transmissionGrowthRate;
        auto spec = report::buildFigureSpec(inputs.drop, inputs.ledger, inputs.cleaned, request);
        if (!spec) {
            printError(spec.error(), json);
            return std::nullopt;
        }
        if (!spec->fitError.empty())
            std::fprintf(stderr, "siftwave-cli figure: %s: no fit drawn: %s\n",
                         terminalText(code).c_str(), terminalText(spec->fitError).c_str());
        figures.push_back(std::move(spec.value()));
    }
    return figures;
}

/// One file per figure (--each): FIG-CODE.ext, where codes that differ only in characters a file
/// name cannot keep (=1+2 and +1=2 both give _1_2) get -2, -3, ... so that no figure overwrites
/// another.
std::vector<QString> eachFigurePaths(const QString& out,
                                     const std::vector<report::FigureSpec>& figures) {
    std::vector<QString> paths;
    std::set<QString> used;
    for (const report::FigureSpec& f : figures) {
        QString path = pathForRegion(out, f.regionCode);
        const QFileInfo base(path);
        for (int n = 2; used.count(path.toLower()); ++n)
            path = base.dir().filePath(base.completeBaseName() + QStringLiteral("-%1.").arg(n) +
                                       base.suffix());
        used.insert(path.toLower());
        paths.push_back(path);
    }
    return paths;
}

/// Writes a page of figures to a file and notes what was written (for --json, or "wrote PATH").
class FigureWriter {
public:
    FigureWriter(const widgets::FigureExportOptions& options, bool json)
        : m_options(options), m_json(json) {}

    bool write(const QString& path, const std::vector<report::FigureSpec>& page) {
        if (Status s = widgets::exportFigures(path, page, m_options); !s) {
            printError(s.error(), m_json);
            return false;
        }
        const QSize px = m_options.size.pixelsAt(m_options.dpi);
        nlohmann::json entry = {{"path", path.toStdString()},
                                {"width_mm", m_options.size.widthMm},
                                {"height_mm", m_options.size.heightMm}};
        if (widgets::figureFormatFromPath(path) == widgets::FigureFormat::Png) {
            entry["width_px"] = px.width();
            entry["height_px"] = px.height();
            entry["dpi"] = m_options.dpi;
        }
        nlohmann::json codes = nlohmann::json::array();
        for (const auto& f : page)
            codes.push_back(f.regionCode);
        entry["regions"] = codes;
        m_written.push_back(entry);
        if (!m_json)
            std::printf("wrote %s\n", terminalText(path.toStdString()).c_str());
        return true;
    }
    const nlohmann::json& written() const { return m_written; }

private:
    const widgets::FigureExportOptions& m_options;
    bool m_json;
    nlohmann::json m_written = nlohmann::json::array();
};

}  // namespace

int runFigure(int argc, char** argv, int first) {
    const std::vector<FlagSpec> specs = figureFlags();
    std::string error;
    auto args = parseArgs(argc, argv, first, specs, error);
    if (!args)
        return usageError(error);
    if (args->has("help")) {
        printHelp();
        return kExitOk;
    }
    const bool json = args->has("json");
    if (args->positional.size() != 1)
        return usageError("expects one data file (FILE)");
    const std::vector<std::string> regions = args->values("region");
    if (regions.empty())
        return usageError("--region CODE is required");
    if (!args->has("out"))
        return usageError("--out FIG.png|FIG.svg|FIG.pdf is required");
    const QString out = QString::fromStdString(args->value("out"));
    if (!widgets::figureFormatFromPath(out))
        return usageError("--out must end in .png, .svg or .pdf");
    widgets::FigureExportOptions options;
    if (std::string bad = exportOptionsFrom(*args, options); !bad.empty())
        return usageError(bad);

    int exitCode = kExitOk;
    const std::optional<BriefingSources> sources =
        loadBriefingSources(*args, "figure", false, false, exitCode);
    if (!sources)
        return exitCode;
    const std::optional<std::vector<report::FigureSpec>> figures =
        buildFigures(*args, *sources, regions, json);
    if (!figures)
        return kExitBadInput;

    const auto app = startOffscreenApplication();
    FigureWriter writer(options, json);
    if (args->has("each") && figures->size() > 1) {
        const std::vector<QString> paths = eachFigurePaths(out, *figures);
        for (std::size_t i = 0; i < paths.size(); ++i)
            if (!writer.write(paths[i], {(*figures)[i]}))
                return kExitBadInput;
    } else if (!writer.write(out, *figures)) {
        return kExitBadInput;
    }
    if (json)
        printJson({{"figures", writer.written()}});
    return kExitOk;
}

}  // namespace siftwave::cli
