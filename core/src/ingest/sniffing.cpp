#include "ingest/sniffing.h"

#include "ingest/date_parsing.h"

#include <algorithm>
#include <map>

namespace siftwave::ingest::detail {
namespace {

bool isDigit(char c) {
    return c >= '0' && c <= '9';
}

/// "digits SEP digits" with exactly one SEP: returns the count of digits after it, or -1.
int digitsAfterSingle(std::string_view t, char sep) {
    if (!t.empty() && (t[0] == '-' || t[0] == '+'))
        t.remove_prefix(1);
    const std::size_t at = t.find(sep);
    if (at == std::string_view::npos || at == 0 || t.find(sep, at + 1) != std::string_view::npos)
        return -1;
    for (std::size_t i = 0; i < t.size(); ++i) {
        if (i != at && !isDigit(t[i]))
            return -1;
    }
    return static_cast<int>(t.size() - at - 1);
}

}  // namespace

char sniffDelimiter(std::string_view data, std::size_t start, std::size_t sampleEnd) {
    const char candidates[] = {',', ';', '\t', '|'};
    char best = ',';
    double bestScore = -1;
    for (char c : candidates) {
        CsvScanner scanner(data, c, start);
        CsvRecord record;
        std::map<std::size_t, int> counts;
        int records = 0;
        while (records < 60 && scanner.next(record)) {
            if (record.isEmptyLine())
                continue;
            ++counts[record.fields.size()];
            ++records;
            if (scanner.position() >= sampleEnd && records >= 3)
                break;
        }
        if (records == 0)
            continue;
        std::size_t modeFields = 1;
        int modeCount = 0;
        for (const auto& [fields, n] : counts) {
            if (n > modeCount || (n == modeCount && fields > modeFields)) {
                modeFields = fields;
                modeCount = n;
            }
        }
        if (modeFields < 2)
            continue;
        double score = static_cast<double>(modeCount) / records * 1000.0 +
                       static_cast<double>(modeFields) / 1000.0;
        if (scanner.failed())
            score -= 500;
        if (score > bestScore) {
            bestScore = score;
            best = c;
        }
    }
    return best;
}

bool sniffHeader(const std::vector<SampleRecord>& records, const NumberStyle& style) {
    if (records.size() < 2)
        return true;
    const SampleRecord& first = records[0];
    int evidenceFor = 0;
    int evidenceAgainst = 0;
    for (std::size_t col = 0; col < first.fields.size(); ++col) {
        const CellShape top = shapeOf(first.fields[col], style);
        if (top == CellShape::Empty)
            continue;
        int below = 0;
        int belowSame = 0;
        int belowDataLike = 0;  // numbers or dates
        int belowNumbers = 0;
        for (std::size_t r = 1; r < records.size(); ++r) {
            if (col >= records[r].fields.size())
                continue;
            const CellShape s = shapeOf(records[r].fields[col], style);
            if (s == CellShape::Empty)
                continue;
            ++below;
            if (s == top)
                ++belowSame;
            if (s != CellShape::Text)
                ++belowDataLike;
            if (s == CellShape::Integer || s == CellShape::Decimal)
                ++belowNumbers;
        }
        if (below == 0)
            continue;
        if (top == CellShape::Text && belowDataLike * 2 > below)
            ++evidenceFor;
        else if (top == CellShape::Date && belowNumbers * 2 > below)
            ++evidenceFor;
        else if (top != CellShape::Text && belowSame * 2 > below)
            ++evidenceAgainst;
    }
    if (evidenceFor > 0)
        return true;
    if (evidenceAgainst > 0)
        return false;
    return true;  // all text: a header is the common case
}

NumberStyle sniffNumberStyle(const std::vector<SampleRecord>& records, bool header) {
    int commaDecimal = 0, dotDecimal = 0, dotGroups = 0, commaGroups = 0;
    for (std::size_t r = header ? 1 : 0; r < records.size(); ++r) {
        for (const std::string& f : records[r].fields) {
            if (f.empty() || dateShapeOf(f) != DateShape::None)
                continue;
            const int afterComma = digitsAfterSingle(f, ',');
            const int afterDot = digitsAfterSingle(f, '.');
            if (afterComma >= 0)
                (afterComma == 3 ? commaGroups : commaDecimal)++;
            if (afterDot >= 0)
                (afterDot == 3 ? dotGroups : dotDecimal)++;
            const std::size_t lastComma = f.rfind(',');
            const std::size_t lastDot = f.rfind('.');
            if (lastComma != std::string::npos && lastDot != std::string::npos) {
                (lastComma > lastDot ? commaDecimal : dotDecimal)++;  // "1.234,5" vs "1,234.5"
            }
        }
    }
    NumberStyle style;
    if (commaDecimal > dotDecimal)
        style.decimalSeparator = ',';
    else if (dotDecimal > 0)
        style.decimalSeparator = '.';
    else if (dotGroups > 0 && commaGroups == 0)
        style.decimalSeparator = ',';
    return style;
}

}  // namespace siftwave::ingest::detail
