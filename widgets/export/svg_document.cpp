#include "widgets/export/svg_document.h"

#include <QXmlStreamReader>
#include <QXmlStreamWriter>

namespace siftwave::widgets {
namespace {

bool isXmlChar(char32_t c) {
    // XML 1.0 (Fifth Edition), section 2.2, production [2].
    return c == 0x9 || c == 0xA || c == 0xD || (c >= 0x20 && c <= 0xD7FF) ||
           (c >= 0xE000 && c <= 0xFFFD) || (c >= 0x10000 && c <= 0x10FFFF);
}

// The generator's bytes with every forbidden character replaced. The bytes are UTF-8
// (QSvgGenerator writes UTF-8); an invalid sequence decodes to U+FFFD as well.
QByteArray parseableBytes(const QByteArray& generated) {
    return xmlSafeText(QString::fromUtf8(generated)).toUtf8();
}

}  // namespace

QString xmlSafeText(const QString& text) {
    QString out;
    out.reserve(text.size());
    const QChar replacement(0xFFFD);
    for (qsizetype i = 0; i < text.size(); ++i) {
        const QChar c = text.at(i);
        if (c.isHighSurrogate() && i + 1 < text.size() && text.at(i + 1).isLowSurrogate()) {
            out += c;
            out += text.at(++i);
            continue;
        }
        out += (c.isSurrogate() || !isXmlChar(c.unicode())) ? replacement : c;
    }
    return out;
}

Result<QByteArray> finishSvg(const QByteArray& generated, const QString& title,
                             const QString& description, SvgTarget target) {
    QXmlStreamReader in(parseableBytes(generated));
    // Names as written (svg, xlink:href, xml:space), namespace declarations as attributes:
    // the output keeps the generator's default namespace instead of invented prefixes.
    in.setNamespaceProcessing(false);
    QByteArray out;
    QXmlStreamWriter w(&out);
    if (target == SvgTarget::File)
        w.writeStartDocument();
    int depth = 0;
    bool rootSeen = false;
    while (!in.atEnd()) {
        switch (in.readNext()) {
            case QXmlStreamReader::StartDocument:
            case QXmlStreamReader::EndDocument:
            case QXmlStreamReader::DTD:
            case QXmlStreamReader::Comment:
            case QXmlStreamReader::ProcessingInstruction:
            case QXmlStreamReader::NoToken:
            case QXmlStreamReader::Invalid:
                break;
            case QXmlStreamReader::StartElement:
                if (depth == 1 &&
                    (in.name() == QLatin1String("title") || in.name() == QLatin1String("desc"))) {
                    in.skipCurrentElement();  // the generator's own, empty: ours are written below
                    break;
                }
                w.writeStartElement(in.qualifiedName().toString());
                for (const QXmlStreamAttribute& a : in.attributes())
                    w.writeAttribute(a.qualifiedName().toString(), a.value().toString());
                ++depth;
                if (depth == 1 && !rootSeen) {
                    rootSeen = true;
                    if (target == SvgTarget::InlineHtml)
                        w.writeAttribute(QStringLiteral("style"),
                                         QStringLiteral("max-width:100%;height:auto"));
                    w.writeTextElement(QStringLiteral("title"), xmlSafeText(title));
                    w.writeTextElement(QStringLiteral("desc"), xmlSafeText(description));
                }
                break;
            case QXmlStreamReader::EndElement:
                w.writeEndElement();
                --depth;
                break;
            case QXmlStreamReader::Characters:
                if (depth > 0)
                    w.writeCharacters(in.text().toString());
                break;
            case QXmlStreamReader::EntityReference:
                // Only the predefined entities parse without a DTD, and the reader resolves
                // those into Characters; anything else is an error below.
                break;
        }
    }
    if (in.hasError())
        return makeError(ErrorCode::Io, "the SVG figure is not well-formed XML (line " +
                                            std::to_string(in.lineNumber()) + ", column " +
                                            std::to_string(in.columnNumber()) +
                                            "): " + in.errorString().toStdString());
    if (!rootSeen)
        return makeError(ErrorCode::Io, "the SVG figure has no <svg> element");
    if (target == SvgTarget::File)
        w.writeEndDocument();
    if (target == SvgTarget::File)
        out += '\n';
    return out;
}

}  // namespace siftwave::widgets
