#pragma once
// SVG documents that are always well-formed XML, whatever text a drop holds.
//
// QSvgGenerator escapes the text it draws, but (Qt 6.4) writes the <title> and
// <desc> it is given raw, and passes control characters through into text
// nodes, where XML 1.0 does not allow them (section 2.2, production [2] Char).
// finishSvg() therefore takes the generator's output with an empty title and
// description, makes it parse (characters XML forbids become U+FFFD), reads it
// with an XML parser and writes it again with an XML writer, adding the title,
// the description and, for an inline figure, the root's style. No text
// replacement on markup: what reaches the output is either an element the
// generator wrote or escaped text.

#include "siftwave/result.h"

#include <QByteArray>
#include <QString>

namespace siftwave::widgets {

enum class SvgTarget {
    File,        // a document of its own: XML declaration, then the <svg> element
    InlineHtml,  // the <svg> element alone, scaling to the width of an HTML page
};

/// `generated`: QSvgGenerator's output, written with an empty title and description.
/// An error when it does not parse even after the forbidden characters were replaced.
Result<QByteArray> finishSvg(const QByteArray& generated, const QString& title,
                             const QString& description, SvgTarget target);

/// `text` with every character XML 1.0 forbids (C0 controls but tab, line feed and
/// carriage return; U+FFFE, U+FFFF; lone surrogates) replaced by U+FFFD.
QString xmlSafeText(const QString& text);

}  // namespace siftwave::widgets
