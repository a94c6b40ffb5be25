#pragma once
// A briefing figure inside a QTextDocument, painted as vectors.
//
// The PDF report is the report's HTML laid out by QTextDocument (so the PDF and
// the HTML say the same thing). An <img> there would be a raster image; instead
// each figure is a custom text object (QTextObjectInterface): the document
// reserves its size in the flow, and when a page is painted drawObject() paints
// the figure with the same renderer as `siftwave-cli figure` (figure_renderer.h)
// onto the PDF's own painter, so its lines stay lines and its text stays text
// (selectable, found by pdftotext, fonts embedded).
//
// QCustomPlot paints through a QCPPainter, and QTextObjectInterface hands a plain
// QPainter: the painter that paints the pages is therefore set with setPainter()
// before the pages are drawn, and drawObject() paints only when it is handed that
// same painter (anything else, e.g. a screen preview, gets a framed placeholder).

#include "siftwave/report/figure_spec.h"

#include <QObject>
#include <QSizeF>
#include <QTextBlock>
#include <QTextObjectInterface>

#include <vector>

class QCPPainter;
class QTextDocument;

namespace siftwave::widgets {

class FigureTextObject : public QObject, public QTextObjectInterface {
    Q_OBJECT
    Q_INTERFACES(QTextObjectInterface)

public:
    /// The object type registered with the document layout, and the property of the
    /// character format that holds the figure's index into `figures`.
    static constexpr int kObjectType = QTextFormat::UserObject + 17;
    static constexpr int kFigureIndex = QTextFormat::UserProperty + 17;

    /// `figures` must outlive the object; each is painted at `size` (document units).
    FigureTextObject(const std::vector<report::FigureSpec>& figures, QSizeF size,
                     QObject* parent = nullptr);

    /// Registers the object with the document's layout.
    void registerWith(QTextDocument& document);

    /// Replaces the first occurrence of `placeholder` (a whole paragraph's text or part
    /// of it) by figure `index`; false when the placeholder is not in the document.
    static bool insertFigure(QTextDocument& document, const QString& placeholder, int index);

    /// The block that holds figure `index` (invalid when there is none).
    static QTextBlock blockOf(const QTextDocument& document, int index);

    /// The painter the pages are painted with (null: none).
    void setPainter(QCPPainter* painter) { m_painter = painter; }

    QSizeF intrinsicSize(QTextDocument* document, int position, const QTextFormat& format) override;
    void drawObject(QPainter* painter, const QRectF& rect, QTextDocument* document, int position,
                    const QTextFormat& format) override;

private:
    const std::vector<report::FigureSpec>& m_figures;
    QSizeF m_size;
    QCPPainter* m_painter = nullptr;
};

}  // namespace siftwave::widgets
