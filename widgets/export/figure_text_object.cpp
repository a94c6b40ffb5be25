#include "widgets/export/figure_text_object.h"

#include "widgets/export/figure_renderer.h"
#include "widgets/plot/qcustomplot_include.h"

#include <QAbstractTextDocumentLayout>
#include <QPainter>
#include <QTextCursor>
#include <QTextDocument>

namespace siftwave::widgets {

FigureTextObject::FigureTextObject(const std::vector<report::FigureSpec>& figures, QSizeF size,
                                   QObject* parent)
    : QObject(parent), m_figures(figures), m_size(size) {}

void FigureTextObject::registerWith(QTextDocument& document) {
    document.documentLayout()->registerHandler(kObjectType, this);
}

bool FigureTextObject::insertFigure(QTextDocument& document, const QString& placeholder,
                                    int index) {
    QTextCursor cursor = document.find(placeholder, 0, QTextDocument::FindCaseSensitively);
    if (cursor.isNull())
        return false;
    QTextCharFormat format;
    format.setObjectType(kObjectType);
    format.setProperty(kFigureIndex, index);
    cursor.insertText(QString(QChar::ObjectReplacementCharacter), format);  // replaces it
    return true;
}

QTextBlock FigureTextObject::blockOf(const QTextDocument& document, int index) {
    for (QTextBlock block = document.begin(); block.isValid(); block = block.next())
        for (auto it = block.begin(); !it.atEnd(); ++it) {
            const QTextCharFormat format = it.fragment().charFormat();
            if (format.objectType() == kObjectType &&
                format.property(kFigureIndex).toInt() == index)
                return block;
        }
    return {};
}

QSizeF FigureTextObject::intrinsicSize(QTextDocument*, int, const QTextFormat&) {
    return m_size;
}

void FigureTextObject::drawObject(QPainter* painter, const QRectF& rect, QTextDocument*, int,
                                  const QTextFormat& format) {
    const int index = format.property(kFigureIndex).toInt();
    const bool known = index >= 0 && index < static_cast<int>(m_figures.size());
    if (!known || !m_painter || static_cast<QPainter*>(m_painter) != painter) {
        painter->save();
        painter->setPen(QPen(Qt::gray, 1, Qt::DashLine));
        painter->drawRect(rect);
        painter->drawText(rect, Qt::AlignCenter, tr("Figure %1").arg(index + 1));
        painter->restore();
        return;
    }
    m_painter->save();
    m_painter->translate(rect.topLeft());
    paintFigure(*m_painter, QRectF(QPointF(0, 0), rect.size()),
                m_figures[static_cast<std::size_t>(index)]);
    m_painter->restore();
}

}  // namespace siftwave::widgets
