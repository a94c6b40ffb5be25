// Hostile names in the exports: region codes, register names and the drop's file name that
// hold markup, entities, CDATA ends and control characters reach the SVG figure and the
// HTML briefing as text only. Every SVG parses as XML 1.0 (checked with Qt's XML parser);
// no element outside the SVG vocabulary the renderer draws, and no event attribute,
// survives in the SVG or in the HTML page.
//
// The attack strings are those of the reliability issue and of the OWASP Cross Site
// Scripting Prevention Cheat Sheet (rule #1, escape before inserting into element content).
#include "siftwave/ingest/ingest.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/briefing.h"
#include "siftwave/report/figure_spec.h"
#include "widgets/export/figure_renderer.h"
#include "widgets/export/report_writer.h"
#include "widgets/export/svg_document.h"

#include "siftwave/fit/batch.h"
#include "siftwave/fit/fit_export.h"

#include <QDir>
#include <QFile>
#include <QProcess>
#include <QRegularExpression>
#include <QSet>
#include <QTemporaryDir>
#include <QTest>
#include <QXmlStreamReader>

#include <string>
#include <vector>

using namespace siftwave;

namespace {

// Codes as a CSV field can carry them (quoted, doubled quotes). Control characters other
// than tab, LF and CR are in the codes too: XML 1.0 forbids them (section 2.2).
const std::vector<std::string> kHostileCodes = {
    "<script>alert(1)</script>",
    "\"><svg onload=alert(1)>",
    "Trinidad & Tobago",
    "]]><img src=x onerror=alert(2)>",
    "bell\x07"
    "esc\x1b[31m",
    "=1+2",
    "+1=2",
    "@SUM(A1)",
    "-3",
    "\ttab",
};

std::string csvField(const std::string& s) {
    std::string out = "\"";
    for (char c : s)
        out += c == '"' ? std::string("\"\"") : std::string(1, c);
    return out + "\"";
}

// A small wave per hostile region, 60 days.
std::string hostileDropText() {
    std::string text = "date,region,cases\n";
    for (int d = 0; d < 60; ++d) {
        const Date day = Date::fromYmd(2026, 3, 1).value() + d;
        for (std::size_t r = 0; r < kHostileCodes.size(); ++r) {
            const int x = d - 30;
            const int count =
                5 + static_cast<int>(200.0 / (1.0 + x * x / 40.0)) + static_cast<int>(r);
            text +=
                day.iso() + "," + csvField(kHostileCodes[r]) + "," + std::to_string(count) + "\n";
        }
    }
    return text;
}

// Every element name the renderer's SVG may hold (what QSvgGenerator writes).
const QSet<QString> kSvgElements = {
    QStringLiteral("svg"),
    QStringLiteral("title"),
    QStringLiteral("desc"),
    QStringLiteral("defs"),
    QStringLiteral("g"),
    QStringLiteral("path"),
    QStringLiteral("rect"),
    QStringLiteral("text"),
    QStringLiteral("polyline"),
    QStringLiteral("polygon"),
    QStringLiteral("line"),
    QStringLiteral("circle"),
    QStringLiteral("ellipse"),
    QStringLiteral("image"),
    QStringLiteral("clipPath"),
    QStringLiteral("linearGradient"),
    QStringLiteral("radialGradient"),
    QStringLiteral("stop"),
    QStringLiteral("tspan"),
};

// Parses `xml` completely; fails the test with the parser's message when it is not XML, or
// when an element outside the SVG set or an event attribute (on...) appears.
void checkSvgIsInert(const QByteArray& xml, const QString& what) {
    QXmlStreamReader in(xml);
    int elements = 0;
    while (!in.atEnd()) {
        if (in.readNext() != QXmlStreamReader::StartElement)
            continue;
        ++elements;
        QVERIFY2(kSvgElements.contains(in.name().toString()),
                 qPrintable(what + QStringLiteral(": element <") + in.name().toString() + u'>'));
        for (const QXmlStreamAttribute& a : in.attributes())
            QVERIFY2(!a.name().toString().toLower().startsWith(QStringLiteral("on")),
                     qPrintable(what + QStringLiteral(": attribute ") + a.name().toString()));
    }
    QVERIFY2(!in.hasError(),
             qPrintable(what + QStringLiteral(": ") + in.errorString() +
                        QStringLiteral(" at line ") + QString::number(in.lineNumber())));
    QVERIFY(elements > 10);
}

QByteArray readAll(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        return {};
    return f.readAll();
}

}  // namespace

class HostileExportTest : public QObject {
    Q_OBJECT

private:
    QTemporaryDir m_dir;
    Drop m_drop;
    RegionRegister m_register;

    /// The briefing of every hostile region, titled `title`, written to `path` (HTML or PDF).
    Status writeHostileBriefing(const QString& path, const std::string& title) const {
        const ledger::Cleaned cleaned(m_drop);
        const ledger::Ledger ledger;
        report::BriefingRequest request;
        request.regionRegister = &m_register;
        request.exportDate = "2026-12-04";
        request.regions = kHostileCodes;
        request.title = title;
        Result<report::BriefingReport> briefing =
            report::buildBriefing(m_drop, ledger, cleaned, request);
        if (!briefing)
            return briefing.error();
        return widgets::writeBriefingReport(path, *briefing);
    }

private Q_SLOTS:
    void initTestCase() {
        QVERIFY(m_dir.isValid());
        // The drop's file name is hostile too (it reaches titles, captions and the report).
        Result<Drop> drop = ingest::parseDrop(hostileDropText(), "<b>drop</b> & \"x\".csv");
        QVERIFY2(drop.ok(), drop.ok() ? "" : drop.error().describe().c_str());
        m_drop = std::move(*drop);
        QCOMPARE(m_drop.regionCodes.size(), kHostileCodes.size());
        for (const std::string& code : kHostileCodes)
            QVERIFY2(m_drop.regionIndex(code).has_value(), code.c_str());
        // A register that names the first region with markup (the repro).
        const QString reg = m_dir.filePath(QStringLiteral("regions.csv"));
        QFile f(reg);
        QVERIFY(f.open(QIODevice::WriteOnly));
        std::string text = "code,name,parent,population\n";
        text += csvField(kHostileCodes[0]) + "," + csvField("<img src=x onerror=alert(1)>") +
                ",,1000\n";
        text += csvField(kHostileCodes[2]) + ",Trinidad & Tobago <i>&amp;</i>,,2000\n";
        f.write(text.data(), static_cast<qint64>(text.size()));
        f.close();
        Result<RegionRegister> r = ingest::readRegister(reg.toStdString());
        QVERIFY2(r.ok(), r.ok() ? "" : r.error().describe().c_str());
        m_register = std::move(*r);
    }

    void everySvgFigureOfAHostileRegionIsInertXml() {
        const ledger::Cleaned cleaned(m_drop);
        const ledger::Ledger ledger;
        for (const std::string& code : kHostileCodes) {
            report::FigureRequest request;
            request.region = code;
            request.regions = &m_register;
            request.exportDate = "2026-12-04";
            request.fit = fit::FitOptions{};
            Result<report::FigureSpec> spec =
                report::buildFigureSpec(m_drop, ledger, cleaned, request);
            QVERIFY2(spec.ok(), spec.ok() ? "" : spec.error().describe().c_str());
            const QString path = m_dir.filePath(QStringLiteral("figure.svg"));
            const Status s = widgets::exportFigures(path, {*spec}, widgets::FigureExportOptions{});
            QVERIFY2(s.ok(), s.ok() ? "" : s.error().describe().c_str());
            checkSvgIsInert(readAll(path), QString::fromStdString(code));
        }
    }

    void theHtmlBriefingHoldsNoLiveMarkupFromNames() {
        const QString path = m_dir.filePath(QStringLiteral("brief.html"));
        const Status s = writeHostileBriefing(path, "<script>alert('title')</script>");
        QVERIFY2(s.ok(), s.ok() ? "" : s.error().describe().c_str());
        const QString page = QString::fromUtf8(readAll(path));

        // Every tag in the page is one the report writes (HTML) or one of the SVG set; an
        // escaped name shows as &lt;..., never as a tag.
        const QSet<QString> html = {
            QStringLiteral("html"),  QStringLiteral("head"),  QStringLiteral("meta"),
            QStringLiteral("title"), QStringLiteral("style"), QStringLiteral("body"),
            QStringLiteral("h1"),    QStringLiteral("h2"),    QStringLiteral("h3"),
            QStringLiteral("p"),     QStringLiteral("b"),     QStringLiteral("br"),
            QStringLiteral("table"), QStringLiteral("tr"),    QStringLiteral("th"),
            QStringLiteral("td"),    QStringLiteral("ul"),    QStringLiteral("li"),
            QStringLiteral("div"),   QStringLiteral("span"),  QStringLiteral("code"),
            QStringLiteral("small"), QStringLiteral("em"),    QStringLiteral("i")};
        const QRegularExpression tag(QStringLiteral("<(/?)([A-Za-z][A-Za-z0-9]*)([^>]*)>"));
        int svgs = 0;
        for (auto it = tag.globalMatch(page); it.hasNext();) {
            const QRegularExpressionMatch m = it.next();
            const QString name = m.captured(2);
            QVERIFY2(html.contains(name.toLower()) || kSvgElements.contains(name),
                     qPrintable(QStringLiteral("tag <") + name + u'>'));
            QVERIFY2(
                !m.captured(3).contains(QRegularExpression(
                    QStringLiteral("\\son[a-z]+\\s*="), QRegularExpression::CaseInsensitiveOption)),
                qPrintable(m.captured(0)));
            if (name == QLatin1String("svg") && m.captured(1).isEmpty())
                ++svgs;
        }
        QCOMPARE(svgs, static_cast<int>(kHostileCodes.size()));
        QVERIFY(!page.contains(QLatin1String("<script")));
        QVERIFY(!page.contains(QLatin1String("<img")));
        QVERIFY(page.contains(QLatin1String("&lt;img src=x onerror=alert(1)&gt;")));

        // Each inline figure is itself well-formed XML with nothing but SVG in it.
        const QRegularExpression svg(QStringLiteral("<svg[\\s>].*?</svg>"),
                                     QRegularExpression::DotMatchesEverythingOption);
        int parsed = 0;
        for (auto it = svg.globalMatch(page); it.hasNext(); ++parsed)
            checkSvgIsInert(it.next().captured(0).toUtf8(), QStringLiteral("inline figure"));
        QCOMPARE(parsed, static_cast<int>(kHostileCodes.size()));
    }

    // The PDF figure and briefing: the PDF parses (poppler's pdftotext, a reference reader from
    // Debian's poppler-utils), the names come back as text, and the file holds no action a viewer
    // could run: no JavaScript, launch, open or URI action (ISO 32000-1:2008, section 12.6.4).
    void thePdfBriefingParsesAndCarriesNoActions() {
        const QString path = m_dir.filePath(QStringLiteral("brief.pdf"));
        const Status s =
            writeHostileBriefing(path, "<script>alert('title')</script> /JavaScript (x) \\");
        QVERIFY2(s.ok(), s.ok() ? "" : s.error().describe().c_str());
        const QByteArray bytes = readAll(path);
        for (const char* action : {"/JavaScript", "/JS ", "/JS(", "/Launch", "/OpenAction", "/URI",
                                   "/AA", "/EmbeddedFile"})
            QVERIFY2(!bytes.contains(action), action);
        QProcess text;
        text.start(QStringLiteral("pdftotext"), {path, QStringLiteral("-")});
        QVERIFY(text.waitForFinished(60000));
        QCOMPARE(text.exitCode(), 0);
        const QString extracted = QString::fromUtf8(text.readAllStandardOutput());
        QVERIFY2(extracted.contains(QLatin1String("Trinidad & Tobago")), qPrintable(extracted));
        QVERIFY(extracted.contains(QLatin1String("<script>alert('title')</script>")));
    }

    // CSV (the fit table every CLI --csv uses): each hostile code reads back as one RFC 4180
    // field, and one that a spreadsheet would run as a formula starts with ' (OWASP, "CSV
    // Injection", owasp.org/www-community/attacks/CSV_Injection).
    void csvNeutralisesAndQuotesHostileCodes() {
        for (const std::string& code : kHostileCodes) {
            fit::RegionFit row;
            row.region = code;
            row.error = makeError(ErrorCode::Numerical, "no fit");
            const std::string line = fit::fitCsvRow(row);
            const bool formula = std::string("=+-@\t\r").find(code[0]) != std::string::npos;
            const std::string bare = (formula ? "'" : "") + code;
            const bool mustQuote = bare.find_first_of("\",\r\n") != std::string::npos;
            QVERIFY2(line.rfind(csvField(bare) + ",", 0) == 0 ||
                         (!mustQuote && line.rfind(bare + ",", 0) == 0),
                     line.c_str());
        }
    }

    void xmlForbiddenCharactersBecomeTheReplacementCharacter() {
        // XML 1.0 section 2.2: tab, LF and CR are allowed; other C0 controls and U+FFFE are not.
        const QString in = QStringLiteral("a\tb\nc") + QChar(0x01) + QChar(0x1B) + QChar(0xFFFE) +
                           QStringLiteral("d");
        const QString expected = QStringLiteral("a\tb\nc") + QChar(0xFFFD) + QChar(0xFFFD) +
                                 QChar(0xFFFD) + QStringLiteral("d");
        QCOMPARE(widgets::xmlSafeText(in), expected);
    }
};

QTEST_MAIN(HostileExportTest)
#include "hostile_export_test.moc"
