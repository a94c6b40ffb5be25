// Briefing figures and the report: sizes and DPI as asked, caption text kept as
// text in SVG and PDF, a redistributed spike marked where the data say, every
// ledger entry in the report.
#include "sample_drop.h"
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/briefing.h"
#include "siftwave/report/figure_spec.h"
#include "widgets/export/figure_export_dialog.h"
#include "widgets/export/figure_renderer.h"
#include "widgets/export/report_writer.h"
#include "widgets/plot/series_chart.h"

#include <QFile>
#include <QImage>
#include <QProcess>
#include <QRegularExpression>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QXmlStreamReader>
#include <QtEndian>

#include <cmath>

using namespace siftwave;

namespace {

const char* kCurrent = SIFTWAVE_SAMPLES_DIR "/quenmara_current.csv";
const char* kRegister = SIFTWAVE_SAMPLES_DIR "/quenmara_regions.csv";

// The sample's planted backlog (samples/manifest.json, P06): 2,444 extra cases of
// district 1301 reported on 2026-08-24, held back from 2026-08-03..2026-08-23.
constexpr std::int64_t kExcess = 2444;

struct Fixture {
    Drop drop;
    RegionRegister regions;
    ledger::Ledger ledger;
    ledger::Cleaned cleaned;
};

// Records one decision through the ledger's door; a refusal stops the test program.
void record(Fixture& f, const ledger::Decision& d, const std::string& reason, const char* time) {
    auto entry = ledger::draftEntry(f.drop, f.ledger, f.cleaned, d,
                                    ledger::EntryMeta{"tester", time, reason});
    if (!entry)
        qFatal("draftEntry refused: %s", entry.error().describe().c_str());
    if (Status s = ledger::applyEntry(f.drop, f.cleaned, *entry); !s)
        qFatal("applyEntry refused: %s", s.error().describe().c_str());
    f.ledger.entries.push_back(*entry);
}

Fixture sampleWithDecisions(bool decisions) {
    Fixture f;
    f.drop = ingest::readDrop(kCurrent).value();
    f.regions = ingest::readRegister(kRegister).value();
    f.cleaned = ledger::Cleaned(f.drop);
    if (!decisions)
        return f;
    const ledger::Decision backlog = testing::sampleBacklogDecision();  // excess kExcess
    record(f, backlog, "three weeks held back, sent on 24 August", "2026-12-01T09:00:00Z");
    ledger::Decision exclude;
    exclude.kind = ledger::DecisionKind::Exclude;
    exclude.region = "1301";
    exclude.measure = "cases";
    exclude.window = ledger::DayRange{*Date::fromIso("2026-03-01"), *Date::fromIso("2026-03-07")};
    record(f, exclude, "test week of the new lab system", "2026-12-01T09:05:00Z");
    ledger::Decision accept;
    accept.kind = ledger::DecisionKind::Accept;
    accept.region = "1304";
    accept.measure = "cases";
    record(f, accept, "looked at, kept as reported", "2026-12-01T09:10:00Z");
    ledger::Decision withdraw;
    withdraw.kind = ledger::DecisionKind::Withdraw;
    withdraw.target = 3;
    record(f, withdraw, "accepted the wrong district", "2026-12-01T09:12:00Z");
    return f;
}

report::FigureSpec specOf(const Fixture& f, const std::string& region, bool fitIt) {
    report::FigureRequest request;
    request.region = region;
    request.measure = "cases";
    request.regions = &f.regions;
    request.exportDate = "2026-12-01";
    if (fitIt) {
        fit::FitOptions options;
        options.window = std::make_pair(100, 200);
        request.fit = options;
    }
    return report::buildFigureSpec(f.drop, f.ledger, f.cleaned, request).value();
}

// Whitespace runs as one space; compatibility forms (the "fi" ligature a PDF may hold) as
// their letters (Unicode normalisation form KC).
QString normalised(QString text) {
    text = text.normalized(QString::NormalizationForm_KC);
    return text.replace(QRegularExpression(QStringLiteral("\\s+")), QStringLiteral(" "));
}

// Text of every <text>/<tspan> element of an SVG, read as XML.
QString svgText(const QString& path) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return {};
    QXmlStreamReader xml(&file);
    QString text;
    int depth = 0;
    while (!xml.atEnd()) {
        xml.readNext();
        if (xml.isStartElement() && xml.name() == QLatin1String("text"))
            ++depth;
        else if (xml.isEndElement() && xml.name() == QLatin1String("text")) {
            --depth;
            text += QLatin1Char(' ');
        } else if (xml.isCharacters() && depth > 0)
            text += xml.text();
    }
    return xml.hasError() ? QStringLiteral("XML ERROR: ") + xml.errorString() : normalised(text);
}

QString runTool(const QString& tool, const QStringList& args) {
    QProcess p;
    p.start(tool, args);
    if (!p.waitForFinished(30000) || p.exitCode() != 0)
        return QStringLiteral("TOOL FAILED: ") + QString::fromLocal8Bit(p.readAllStandardError());
    return QString::fromUtf8(p.readAllStandardOutput());
}

bool isInk(QRgb c) {
    return qRed(c) < 100 && qGreen(c) < 100 && qBlue(c) < 100;
}

// The raw bars' grey (fill #C9CDD3, edge #8C929B, plot_style.h): a little bluer than red,
// between ink and background; the ink of labels, arrows and brackets is neutral (#222222).
bool isBarGrey(QRgb c) {
    const int blueOverRed = qBlue(c) - qRed(c);
    return blueOverRed >= 5 && blueOverRed <= 30 && qGray(c) > 110 && qGray(c) < 225;
}

// A figure exported as a 300 dpi half-A4 PNG, with the linear maps of its axes into the image.
struct PixelFigure {
    QImage image;
    widgets::FigureGeometry geometry;
    double px = 300.0 / 96.0;  // image pixels per logical pixel

    int xOfDay(const QDate& day) const {
        const double key = QDateTime(day, QTime(0, 0), Qt::UTC).toSecsSinceEpoch();
        const widgets::FigureGeometry& g = geometry;
        return static_cast<int>(
            std::lround(px * (g.axisRect.left() +
                              (key - g.xLower) / (g.xUpper - g.xLower) * g.axisRect.width())));
    }
    int yOfValue(double value) const {
        const widgets::FigureGeometry& g = geometry;
        return static_cast<int>(
            std::lround(px * (g.axisRect.bottom() -
                              (value - g.yLower) / (g.yUpper - g.yLower) * g.axisRect.height())));
    }
};

}  // namespace

class FigureExportTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void initTestCase() {
        QVERIFY(m_dir.isValid());
        // To look at the figures: SIFTWAVE_KEEP_TEST_FILES=1 keeps them (the folder is printed).
        if (qEnvironmentVariableIsSet("SIFTWAVE_KEEP_TEST_FILES")) {
            m_dir.setAutoRemove(false);
            qInfo("figures in %s", qPrintable(m_dir.path()));
        }
    }

    void pngHasTheRequestedPixelsAndDpi() {
        const Fixture f = sampleWithDecisions(true);
        widgets::FigureExportOptions options;
        options.size = widgets::FigureSize::halfA4();
        options.dpi = 150;
        const QString path = m_dir.filePath(QStringLiteral("half.png"));
        QVERIFY(widgets::exportFigures(path, {specOf(f, "1301", false)}, options).ok());

        // PNG (ISO/IEC 15948, W3C PNG 2nd ed.): the IHDR chunk follows the 8-byte signature;
        // width and height are big-endian at bytes 16..23; pHYs holds pixels per metre.
        QFile file(path);
        QVERIFY(file.open(QIODevice::ReadOnly));
        const QByteArray bytes = file.readAll();
        QCOMPARE(bytes.left(8), QByteArray("\x89PNG\r\n\x1a\n", 8));
        QCOMPARE(bytes.mid(12, 4), QByteArray("IHDR"));
        const auto u32 = [&](int at) {
            return qFromBigEndian<quint32>(reinterpret_cast<const uchar*>(bytes.constData() + at));
        };
        // 210 mm x 148.5 mm at 150 dpi: 210 / 25.4 * 150 = 1240.2 -> 1240; 148.5 -> 877.0.
        QCOMPARE(u32(16), 1240u);
        QCOMPARE(u32(20), 877u);
        const int phys = bytes.indexOf("pHYs");
        QVERIFY(phys > 0);
        // 150 dpi = 150 / 0.0254 = 5905.5 -> 5906 pixels per metre, unit byte 1 (metre).
        QCOMPARE(u32(phys + 4), 5906u);
        QCOMPARE(u32(phys + 8), 5906u);
        QCOMPARE(static_cast<int>(bytes[phys + 12]), 1);
        QImage image(path);
        QCOMPARE(image.size(), QSize(1240, 877));
        QCOMPARE(image.dotsPerMeterX(), 5906);
    }

    void sizesInPixelsAndTheSlidePresetAreKept() {
        const Fixture f = sampleWithDecisions(false);
        widgets::FigureExportOptions options;
        options.dpi = 120;
        options.size = widgets::FigureSize::parse(QStringLiteral("1600x900px"), 120).value();
        const QString px = m_dir.filePath(QStringLiteral("px.png"));
        QVERIFY(widgets::exportFigures(px, {specOf(f, "KV", false)}, options).ok());
        QCOMPARE(QImage(px).size(), QSize(1600, 900));

        options.size = widgets::FigureSize::slide();
        options.dpi = 96;
        const QString slide = m_dir.filePath(QStringLiteral("slide.png"));
        QVERIFY(widgets::exportFigures(slide, {specOf(f, "KV", false)}, options).ok());
        // 10 x 5.625 inches at 96 dpi: 960 x 540, 16:9.
        QCOMPARE(QImage(slide).size(), QSize(960, 540));

        QVERIFY(!widgets::FigureSize::parse(QStringLiteral("12x"), 96).ok());
        QVERIFY(!widgets::FigureSize::parse(QStringLiteral("-5x20mm"), 96).ok());
        QCOMPARE(widgets::FigureSize::parse(QStringLiteral("180x120mm"), 96)->widthMm, 180.0);
    }

    void svgKeepsTheCaptionAsText() {
        const Fixture f = sampleWithDecisions(true);
        const report::FigureSpec spec = specOf(f, "1301", true);
        widgets::FigureExportOptions options;
        const QString path = m_dir.filePath(QStringLiteral("fig.svg"));
        QVERIFY(widgets::exportFigures(path, {spec}, options).ok());
        const QString text = svgText(path);
        QVERIFY2(!text.startsWith(QStringLiteral("XML ERROR")), qPrintable(text));
        const QString sha = QString::fromStdString(f.drop.source.sha256.substr(0, 12));
        QVERIFY2(text.contains(sha), qPrintable(text.left(2000)));
        QVERIFY2(text.contains(QString::fromLatin1(fit::caution)), qPrintable(text.right(1500)));
        QVERIFY(text.contains(QStringLiteral("2,444 moved to earlier days")));
        QVERIFY(text.contains(QStringLiteral("head ") +
                              QString::fromStdString(f.ledger.headHash().substr(0, 12))));
        // The legend and the caption say which band is drawn: the curve's own, not the counts'.
        QVERIFY2(text.contains(QStringLiteral("95% confidence band of the fitted curve")),
                 qPrintable(text));
        QVERIFY(
            text.contains(QStringLiteral("shaded: pointwise 95% confidence band of the curve")));
        QVERIFY(!text.contains(QStringLiteral("range of daily counts")));
        QVERIFY(!text.contains(QStringLiteral("Fit band")));

        // With the range of daily counts asked for, both are named.
        report::FigureRequest request;
        request.region = "1301";
        request.regions = &f.regions;
        request.exportDate = "2026-12-01";
        request.fit = fit::FitOptions{};
        request.fit->window = std::make_pair(100, 200);
        request.countRange = true;
        const report::FigureSpec both =
            report::buildFigureSpec(f.drop, f.ledger, f.cleaned, request).value();
        const QString bothPath = m_dir.filePath(QStringLiteral("fig-count-range.svg"));
        QVERIFY(widgets::exportFigures(bothPath, {both}, options).ok());
        const QString bothText = svgText(bothPath);
        QVERIFY(bothText.contains(QStringLiteral("95% confidence band of the fitted curve")));
        QVERIFY2(bothText.contains(QStringLiteral("95% range of daily counts around the fit")),
                 qPrintable(bothText));
        QVERIFY(bothText.contains(QStringLiteral("dotted: 95% range of daily counts")));
    }

    void pdfHasTheCaptionAsTextAndEmbeddedFonts() {
        if (QStandardPaths::findExecutable(QStringLiteral("pdftotext")).isEmpty())
            QFAIL(
                "pdftotext (Debian's poppler-utils) is needed: bash tools/workbench.sh installs "
                "it");
        const Fixture f = sampleWithDecisions(true);
        widgets::FigureExportOptions options;
        options.size = widgets::FigureSize::slide();
        const QString path = m_dir.filePath(QStringLiteral("fig.pdf"));
        QVERIFY(widgets::exportFigures(path, {specOf(f, "1301", true)}, options).ok());
        const QString text =
            normalised(runTool(QStringLiteral("pdftotext"), {path, QStringLiteral("-")}));
        QVERIFY2(text.contains(QString::fromStdString(f.drop.source.sha256.substr(0, 12))),
                 qPrintable(text));
        QVERIFY2(text.contains(QString::fromLatin1(fit::caution)), qPrintable(text));
        // pdffonts: one row per font after two header lines; the "emb" column says yes.
        const QStringList fonts = runTool(QStringLiteral("pdffonts"), {path})
                                      .split(QLatin1Char('\n'), Qt::SkipEmptyParts);
        QVERIFY2(fonts.size() >= 3, qPrintable(fonts.join(QLatin1Char('\n'))));
        for (int i = 2; i < fonts.size(); ++i)
            QVERIFY2(fonts[i].contains(QStringLiteral(" yes ")), qPrintable(fonts[i]));
        // pdfinfo: 254 x 142.875 mm = 720 x 405 pt (1 pt = 1/72 inch).
        const QString info = runTool(QStringLiteral("pdfinfo"), {path});
        QVERIFY2(
            info.contains(QRegularExpression(QStringLiteral("Page size:\\s+720(\\.0+)? x 405"))),
            qPrintable(info));
    }

    // After the redistribution the axis follows the cleaned series: the dump bar (2,643) is cut
    // below the decision's label, says its true value beside it, and the arrow ends on its
    // visible top, inside the plot.
    void theRedistributedSpikeIsCutAndTheArrowEndsOnItsVisibleTop() {
        const Fixture f = sampleWithDecisions(true);
        const report::FigureSpec spec = specOf(f, "1301", false);
        const int dumpIndex = *Date::fromIso("2026-08-24") - spec.axis.first();
        const double raw = spec.raw[static_cast<std::size_t>(dumpIndex)];
        QCOMPARE(raw, 2643.0);  // samples/manifest.json, P06 "reported"
        const PixelFigure fig = exportForPixels(spec, QStringLiteral("spike-cut.png"));
        QVERIFY(!fig.image.isNull());
        const widgets::FigureGeometry& g = fig.geometry;

        // The axis is not scaled to the raw spike: 2,643 lies above the plot's top.
        QVERIFY2(g.yUpper < raw / 2, qPrintable(QString::number(g.yUpper)));
        const int x = fig.xOfDay(QDate(2026, 8, 24));
        const int axisTop = static_cast<int>(std::ceil(fig.px * g.axisRect.top()));
        const int axisBottom = static_cast<int>(std::floor(fig.px * g.axisRect.bottom()));
        QVERIFY(fig.yOfValue(raw) < axisTop);

        // The bar's visible top: the first of 8 bar-grey pixels in a row, from the top down.
        int barTop = -1;
        for (int y = axisTop; y < axisBottom - 8 && barTop < 0; ++y) {
            bool run = true;
            for (int k = 0; k < 8 && run; ++k)
                run = isBarGrey(fig.image.pixel(x, y + k));
            if (run)
                barTop = y;
        }
        QVERIFY2(barTop > 0, "no bar in the dump day's column");
        // Inside the plot, with room above it for the arrow, and above every cleaned value:
        // the cut bar still stands out from the wave.
        double highestCleaned = 0;
        for (double v : spec.cleaned)
            if (!std::isnan(v))
                highestCleaned = std::max(highestCleaned, v);
        QVERIFY2(barTop > axisTop + 40 * fig.px,
                 qPrintable(QStringLiteral("%1 %2").arg(barTop).arg(axisTop)));
        QVERIFY2(barTop < fig.yOfValue(highestCleaned),
                 qPrintable(QStringLiteral("%1 %2").arg(barTop).arg(fig.yOfValue(highestCleaned))));
        // Drawn as cut: a white gap across the bar just below its top, bar grey again below it.
        int gap = -1;
        for (int y = barTop; y < barTop + 16 * fig.px && gap < 0; ++y)
            if (qGray(fig.image.pixel(x, y)) > 235)
                gap = y;
        QVERIFY2(gap > barTop, "no cut mark across the bar");
        QVERIFY(isBarGrey(fig.image.pixel(x, static_cast<int>(barTop + 20 * fig.px))));

        // The arrow: ink in the column above the bar (from the label down), its head ending on
        // the bar's visible top. An arrow aimed at 2,643 would run up, off the plot, instead.
        int inkRows = 0, lowest = -1;
        for (int y = axisTop; y < barTop; ++y)
            for (int dx = -2; dx <= 2; ++dx)
                if (isInk(fig.image.pixel(x + dx, y))) {
                    ++inkRows;
                    lowest = std::max(lowest, y);
                    break;
                }
        QVERIFY2(inkRows > 40 * fig.px, qPrintable(QString::number(inkRows)));
        QVERIFY2(barTop - lowest >= 0 && barTop - lowest <= 10,
                 qPrintable(QStringLiteral("%1 %2").arg(lowest).arg(barTop)));
        // The true value beside the bar top: ink of the label's text right of the bar.
        int labelInk = 0;
        for (int y = static_cast<int>(barTop - 8 * fig.px); y < barTop + 8 * fig.px; ++y)
            for (int dx = static_cast<int>(10 * fig.px); dx < 100 * fig.px; ++dx)
                labelInk += isInk(fig.image.pixel(x + dx, y)) ? 1 : 0;
        QVERIFY2(labelInk > 200, qPrintable(QString::number(labelInk)));

        const QString svg = m_dir.filePath(QStringLiteral("spike-cut.svg"));
        QVERIFY(widgets::exportFigures(svg, {spec}, widgets::FigureExportOptions{}).ok());
        const QString text = svgText(svg);
        QVERIFY2(text.contains(QStringLiteral("raw 2,643, bar cut")), qPrintable(text));
        QVERIFY(text.contains(QStringLiteral("#1 2,444 moved to earlier days")));
    }

    // Without a ledger nothing is cut: the spike sets the scale, reaches its count, no arrow.
    void withoutALedgerTheSpikeSetsTheScaleAndHasNoArrow() {
        const Fixture f = sampleWithDecisions(false);
        const report::FigureSpec spec = specOf(f, "1301", false);
        const int dumpIndex = *Date::fromIso("2026-08-24") - spec.axis.first();
        const double raw = spec.raw[static_cast<std::size_t>(dumpIndex)];
        QCOMPARE(raw, 2643.0);
        const PixelFigure fig = exportForPixels(spec, QStringLiteral("spike-raw.png"));
        QVERIFY(!fig.image.isNull());
        QVERIFY2(fig.geometry.yUpper > raw, qPrintable(QString::number(fig.geometry.yUpper)));
        const int x = fig.xOfDay(QDate(2026, 8, 24));
        const int yTop = fig.yOfValue(raw);
        // The bar (with the cleaned line, equal to the raw count, up its middle) reaches the
        // count, with background beside and above it (the neighbouring days hold about 200).
        QVERIFY2(qGray(fig.image.pixel(x, yTop + 10)) < 215,
                 qPrintable(QString::number(qGray(fig.image.pixel(x, yTop + 10)))));
        QVERIFY2(qGray(fig.image.pixel(x + 14, yTop - 14)) > 220,
                 qPrintable(QString::number(qGray(fig.image.pixel(x + 14, yTop - 14)))));
        QVERIFY(qGray(fig.image.pixel(x, yTop - 14)) > 220);
        int inkRows = 0;
        for (int y = yTop - 150; y < yTop + 2; ++y)
            for (int dx = -2; dx <= 2; ++dx)
                if (isInk(fig.image.pixel(x + dx, y))) {
                    ++inkRows;
                    break;
                }
        QCOMPARE(inkRows, 0);
        const QString svg = m_dir.filePath(QStringLiteral("spike-raw.svg"));
        QVERIFY(widgets::exportFigures(svg, {spec}, widgets::FigureExportOptions{}).ok());
        QVERIFY(!svgText(svg).contains(QStringLiteral("bar cut")));
    }

    // The value axis of a figure after a ledger decision is set by the cleaned series (and the
    // fit and its band), not by the raw bar the decision lowered.
    void theValueAxisFollowsTheCleanedSeries() {
        const Fixture f = sampleWithDecisions(true);
        const auto upperOf = [this](const report::FigureSpec& spec, const QString& name) {
            std::vector<widgets::FigureGeometry> geometry;
            const QString path = m_dir.filePath(name);
            if (!widgets::exportFigures(path, {spec}, widgets::FigureExportOptions{}, &geometry)
                     .ok() ||
                geometry.size() != 1)
                return -1.0;
            return geometry.front().yUpper;
        };
        const auto highest = [](const std::vector<double>& values) {
            double best = 0;
            for (double v : values)
                if (std::isfinite(v))
                    best = std::max(best, v);
            return best;
        };
        report::FigureSpec spec = specOf(f, "1301", false);
        const double shown = std::max(highest(spec.cleaned), highest(spec.smoothed));
        const double upper = upperOf(spec, QStringLiteral("axis-cleaned.svg"));
        // Every cleaned and smoothed value is on the plot, with room above for the labels,
        // and the axis stops far below the raw dump (2,643, 5.8 times the highest cleaned day).
        QVERIFY2(upper >= shown * 1.1 && upper <= shown * 1.7,
                 qPrintable(QStringLiteral("%1 %2").arg(upper).arg(shown)));
        QVERIFY(highest(spec.raw) > 2 * upper);

        // A cleaned series half as high again (the same raw bars) lifts the axis by the same
        // factor: it follows the cleaned series.
        report::FigureSpec higher = spec;
        for (std::vector<double>* series : {&higher.cleaned, &higher.smoothed})
            for (double& v : *series)
                v *= 1.5;
        const double higherUpper = upperOf(higher, QStringLiteral("axis-cleaned-higher.svg"));
        QVERIFY2(std::abs(higherUpper / upper - 1.5) < 1e-9,
                 qPrintable(QStringLiteral("%1 %2").arg(higherUpper).arg(upper)));

        // With a fit, the curve and its confidence band are on the plot too.
        const report::FigureSpec fitted = specOf(f, "1301", true);
        QVERIFY(fitted.fit.has_value());
        const double fittedUpper = upperOf(fitted, QStringLiteral("axis-fitted.svg"));
        QVERIFY(highest(fitted.fit->high) > 0);
        QVERIFY2(
            fittedUpper >= highest(fitted.fit->high) && fittedUpper >= highest(fitted.fit->mid),
            qPrintable(QStringLiteral("%1 %2").arg(fittedUpper).arg(highest(fitted.fit->high))));
        QVERIFY(fittedUpper < 2643.0 / 2);
    }

    // The marks of a figure with a cut bar (decision label, the cut bar's value, the peak of the
    // fit) lie inside the plot and apart from each other, at the sizes a briefing uses: a
    // slide, half an A4 page, the report's 180 x 112 mm (report_writer.cpp) and two panels side
    // by side on half an A4 page.
    void theMarksOfACutFigureLieInsideThePlotApartAtBriefingSizes() {
        const Fixture f = sampleWithDecisions(true);
        const report::FigureSpec spec = specOf(f, "1301", true);
        report::FigureSpec kv = specOf(f, "KV", true);
        // A second lowered bar four days before the dump (as if another decision had spread a
        // day's excess): two cut bars whose labels must not collide.
        report::FigureSpec twoCuts = spec;
        twoCuts.raw[static_cast<std::size_t>(*Date::fromIso("2026-08-20") - spec.axis.first())] =
            1800;
        struct Case {
            const char* name;
            widgets::FigureSize size;
            std::vector<report::FigureSpec> specs;
        };
        const std::vector<Case> cases = {
            {"slide", widgets::FigureSize::slide(), {spec}},
            {"half-a4", widgets::FigureSize::halfA4(), {spec}},
            {"report", widgets::FigureSize{180.0, 112.0, std::nullopt}, {spec}},
            {"two-panels", widgets::FigureSize::halfA4(), {spec, kv}},
            {"two-cut-bars", widgets::FigureSize::halfA4(), {twoCuts}},
            {"four-panels-slide",
             widgets::FigureSize::slide(),
             {spec, kv, specOf(f, "1304", true), specOf(f, "OS", true)}},
        };
        for (const Case& c : cases) {
            widgets::FigureExportOptions options;
            options.size = c.size;
            std::vector<widgets::FigureGeometry> geometry;
            const QString path =
                m_dir.filePath(QStringLiteral("marks-%1.svg").arg(QLatin1String(c.name)));
            QVERIFY(widgets::exportFigures(path, c.specs, options, &geometry).ok());
            const widgets::FigureGeometry& g = geometry.front();  // 1301's panel
            QStringList texts;
            for (const auto& label : g.labels)
                texts << label.text;
            const QString all = texts.join(QStringLiteral(" | "));
            QVERIFY2(texts.contains(QStringLiteral("raw 2,643, bar cut")), qPrintable(all));
            QCOMPARE(texts.filter(QStringLiteral("bar cut")).size(),
                     c.name == std::string("two-cut-bars") ? 2 : 1);
            QVERIFY2(texts.contains(QStringLiteral("#1 2,444 moved to earlier days")),
                     qPrintable(all));
            QVERIFY2(all.contains(QStringLiteral("peak 2026-")), qPrintable(all));
            const QRectF plot = g.axisRect.adjusted(-0.5, -0.5, 0.5, 0.5);
            for (std::size_t i = 0; i < g.labels.size(); ++i) {
                const auto& a = g.labels[i];
                QVERIFY2(plot.contains(a.box), qPrintable(QStringLiteral("%1: '%2' leaves the plot")
                                                              .arg(QLatin1String(c.name), a.text)));
                for (std::size_t j = i + 1; j < g.labels.size(); ++j)
                    QVERIFY2(!a.box.intersects(g.labels[j].box),
                             qPrintable(QStringLiteral("%1: '%2' overlaps '%3'")
                                            .arg(QLatin1String(c.name), a.text, g.labels[j].text)));
            }
        }
    }

    // Small multiples share one legend for the page: each entry is written once, whole (not
    // cut to the width of a panel), and the panels keep their height for the plot. (The
    // fit's legend entry, "Gumbel fit (lsq)", is in every subtitle too, so it is not counted.)
    void smallMultiplesShareOneLegendWithWholeEntries() {
        const Fixture f = sampleWithDecisions(true);
        const std::vector<report::FigureSpec> specs = {
            specOf(f, "1301", true), specOf(f, "KV", true), specOf(f, "1304", true),
            specOf(f, "OS", true)};
        widgets::FigureExportOptions options;
        options.size = widgets::FigureSize::slide();
        std::vector<widgets::FigureGeometry> geometry;
        const QString path = m_dir.filePath(QStringLiteral("shared-legend.svg"));
        QVERIFY(widgets::exportFigures(path, specs, options, &geometry).ok());
        const QString text = svgText(path);
        for (const char* entry : {"Raw, as reported", "95% confidence band of the fitted curve",
                                  "Cleaned", "7-day centred mean (cleaned)", "Peak of the fit"})
            QVERIFY2(text.count(QString::fromLatin1(entry)) == 1,
                     qPrintable(QStringLiteral("%1: %2 times in %3")
                                    .arg(QLatin1String(entry))
                                    .arg(text.count(QString::fromLatin1(entry)))
                                    .arg(text)));
        // 2 x 2 panels on a 540-pixel-high slide: each plot is at least 100 logical pixels high
        // (with a legend of three rows in each panel they had about 45).
        QCOMPARE(geometry.size(), std::size_t(4));
        for (const widgets::FigureGeometry& g : geometry)
            QVERIFY2(g.axisRect.height() >= 100, qPrintable(QString::number(g.axisRect.height())));
    }

    void theReportListsEveryLedgerEntry() {
        const Fixture f = sampleWithDecisions(true);
        report::BriefingRequest request;
        request.regionRegister = &f.regions;
        request.exportDate = "2026-12-01";
        request.fit.window = std::make_pair(100, 200);
        const report::BriefingReport briefing =
            report::buildBriefing(f.drop, f.ledger, f.cleaned, request).value();
        // The regions the entries in effect touched: 1301 (the accept of 1304 is withdrawn).
        QCOMPARE(briefing.figures.size(), std::size_t(1));
        QCOMPARE(briefing.ledger.size(), f.ledger.entries.size());

        const QString html = m_dir.filePath(QStringLiteral("brief.html"));
        QVERIFY(widgets::writeBriefingReport(html, briefing).ok());
        QFile file(html);
        QVERIFY(file.open(QIODevice::ReadOnly));
        const QString page = QString::fromUtf8(file.readAll());
        const QString pdf = m_dir.filePath(QStringLiteral("brief.pdf"));
        QVERIFY(widgets::writeBriefingReport(pdf, briefing).ok());
        const QString pdfText =
            normalised(runTool(QStringLiteral("pdftotext"), {pdf, QStringLiteral("-")}));
        for (const ledger::LedgerEntry& e : f.ledger.entries) {
            const QString reason = QString::fromStdString(e.reason);
            const QString hash = QString::fromStdString(e.hash.substr(0, 12));
            QVERIFY2(page.contains(reason), qPrintable(reason));
            QVERIFY2(page.contains(hash), qPrintable(hash));
            QVERIFY2(pdfText.contains(reason),
                     qPrintable(reason + QStringLiteral(" | ") + pdfText.left(3000)));
        }
        // The reconciliation row of 1301: raw total, cleaned total lower by the excluded week.
        QVERIFY(pdfText.contains(QStringLiteral("Reconciliation")));
        QVERIFY(page.contains(QStringLiteral("withdrawn")));
        QVERIFY(page.contains(QString::fromLatin1(fit::caution)));
    }

    void theReportPdfDrawsItsFiguresAsVectors() {
        const Fixture f = sampleWithDecisions(true);
        report::BriefingRequest request;
        request.regionRegister = &f.regions;
        request.exportDate = "2026-12-01";
        request.regions = {"1301", "KV"};
        const report::BriefingReport briefing =
            report::buildBriefing(f.drop, f.ledger, f.cleaned, request).value();
        QCOMPARE(briefing.figures.size(), std::size_t(2));
        const QString pdf = m_dir.filePath(QStringLiteral("vector-brief.pdf"));
        QVERIFY(widgets::writeBriefingReport(pdf, briefing).ok());
        const QString text =
            normalised(runTool(QStringLiteral("pdftotext"), {pdf, QStringLiteral("-")}));
        QVERIFY2(!text.startsWith(QStringLiteral("TOOL FAILED")), qPrintable(text));

        // Text that only the figures hold (the report prints no caption paragraph beside a
        // figure): the legend, the caption block's source line, a decision's mark, the peak.
        QCOMPARE(text.count(QStringLiteral("7-day centred mean (cleaned)")), 2);
        const QString source = QStringLiteral("Source: quenmara_current.csv, ");
        QCOMPARE(text.count(source), 2);
        QVERIFY(text.contains(QStringLiteral("#1 2,444 moved to earlier days")));
        QVERIFY(text.contains(QStringLiteral("Daily cases")));  // the y axis of each plot
        QVERIFY2(text.contains(QRegularExpression(QStringLiteral("peak 2026-\\d\\d-\\d\\d, "))),
                 qPrintable(text.left(3000)));

        // Every ledger entry (with its reason) and the reconciliation of the shown regions.
        for (const ledger::LedgerEntry& e : f.ledger.entries)
            QVERIFY2(text.contains(QString::fromStdString(e.reason)), e.reason.c_str());
        QVERIFY(text.contains(QStringLiteral("Reconciliation")));
        // Table rows read across with -layout (pdftotext's default may read a table by columns).
        const QString layout = normalised(runTool(
            QStringLiteral("pdftotext"), {QStringLiteral("-layout"), pdf, QStringLiteral("-")}));
        QVERIFY(!briefing.reconciliation.empty());
        for (const ledger::ReconciliationRow& row : briefing.reconciliation) {
            const QString line =
                QStringLiteral("%1 %2 %3 %4")
                    .arg(QString::fromStdString(row.region), QString::fromStdString(row.measure),
                         QString::fromStdString(report::groupedCount(row.rawTotal)),
                         QString::fromStdString(report::groupedCount(row.cleanedTotal)));
            QVERIFY2(layout.contains(line),
                     qPrintable(line + QStringLiteral(" | ") + layout.right(1500)));
        }
        // 1301 lost the excluded test week: its cleaned total is below its raw total.
        const std::size_t r1301 = *f.drop.regionIndex("1301");
        QVERIFY(f.cleaned.total(0, r1301) < ledger::rawTotal(f.drop, 0, r1301));

        // No raster image anywhere: pdfimages -list prints its two header lines only.
        const QStringList images =
            runTool(QStringLiteral("pdfimages"), {QStringLiteral("-list"), pdf})
                .split(QLatin1Char('\n'), Qt::SkipEmptyParts);
        QVERIFY2(images.size() == 2 && images[0].startsWith(QStringLiteral("page")),
                 qPrintable(images.join(QLatin1Char('\n'))));
        // Every font embedded (pdffonts: two header lines, then one row per font).
        const QStringList fonts =
            runTool(QStringLiteral("pdffonts"), {pdf}).split(QLatin1Char('\n'), Qt::SkipEmptyParts);
        QVERIFY2(fonts.size() >= 3, qPrintable(fonts.join(QLatin1Char('\n'))));
        for (int i = 2; i < fonts.size(); ++i)
            QVERIFY2(fonts[i].contains(QStringLiteral(" yes ")), qPrintable(fonts[i]));
        // A4 pages (210 x 297 mm = 595.28 x 841.89 pt), more than one of them.
        const QString info = runTool(QStringLiteral("pdfinfo"), {pdf});
        QVERIFY2(info.contains(
                     QRegularExpression(QStringLiteral("Page size:\\s+595(\\.\\d+)? x 84[12]"))),
                 qPrintable(info));
        const QRegularExpressionMatch pages =
            QRegularExpression(QStringLiteral("Pages:\\s+(\\d+)")).match(info);
        QVERIFY(pages.hasMatch() && pages.captured(1).toInt() >= 2);
        QVERIFY(text.contains(QStringLiteral("page 1 of ") + pages.captured(1)));
    }

    void theExportDialogWritesSmallMultiplesOrOneFilePerRegion() {
        const Fixture f = sampleWithDecisions(true);
        widgets::FigureExportDialog::Inputs inputs;
        inputs.drop = &f.drop;
        inputs.ledger = &f.ledger;
        inputs.cleaned = &f.cleaned;
        inputs.regions = &f.regions;
        inputs.currentRegion = QStringLiteral("1301");
        widgets::FigureExportDialog dialog(inputs);
        dialog.setRegions({QStringLiteral("1301"), QStringLiteral("1304"), QStringLiteral("KV")});
        dialog.setSizePreset(3);  // custom pixels
        dialog.setCustomSize(1500, 1000);
        dialog.setDpi(150);
        const QString page = m_dir.filePath(QStringLiteral("multiples.png"));
        dialog.setOutputPath(page);
        auto written = dialog.exportFigures();
        QVERIFY2(written.ok(), written.ok() ? "" : written.error().message.c_str());
        QCOMPARE(*written, QStringList{page});
        QCOMPARE(QImage(page).size(), QSize(1500, 1000));

        dialog.setSmallMultiples(false);
        dialog.setSizePreset(0);  // slide
        dialog.setOutputPath(m_dir.filePath(QStringLiteral("each.svg")));
        written = dialog.exportFigures();
        QVERIFY(written.ok());
        QCOMPARE(written->size(), 3);
        for (const QString& one : *written) {
            QVERIFY2(QFile::exists(one), qPrintable(one));
            QVERIFY(svgText(one).contains(QString::fromLatin1(fit::caution)));
        }
        // One file per region, named after it, in the drop's order (KV is the sample's first code).
        QVERIFY(written->at(0).endsWith(QStringLiteral("each-KV.svg")));
        QVERIFY(written->at(1).endsWith(QStringLiteral("each-1301.svg")));
        QVERIFY(written->at(2).endsWith(QStringLiteral("each-1304.svg")));

        dialog.setRegions({});
        QVERIFY(!dialog.exportFigures().ok());
    }

private:
    PixelFigure exportForPixels(const report::FigureSpec& spec, const QString& name) {
        widgets::FigureExportOptions options;
        options.dpi = 300;
        PixelFigure fig;
        std::vector<widgets::FigureGeometry> geometry;
        const QString path = m_dir.filePath(name);
        if (!widgets::exportFigures(path, {spec}, options, &geometry).ok() || geometry.size() != 1)
            return fig;
        fig.image = QImage(path);
        fig.geometry = geometry.front();
        fig.px = options.dpi / 96.0;
        return fig;
    }

    QTemporaryDir m_dir;
};

QTEST_MAIN(FigureExportTest)
#include "figure_export_test.moc"
