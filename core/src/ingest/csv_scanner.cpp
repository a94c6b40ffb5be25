#include "ingest/csv_scanner.h"

#include <algorithm>
#include <cstring>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace siftwave::ingest::detail {

CsvScanner::CsvScanner(std::string_view data, char delimiter, std::size_t start,
                       std::uint64_t firstLine)
    : m_begin(data.data()),
      m_pos(data.data() + start),
      m_end(data.data() + data.size()),
      m_delimiter(delimiter),
      m_line(firstLine) {}

void CsvScanner::loadBlock(const char* base) {
    m_blockBase = base;
    std::uint64_t delimiters = 0, lfs = 0, crs = 0, quotes = 0;
#if defined(__SSE2__)
    if (base + 64 <= m_end) {
        const __m128i delimiter = _mm_set1_epi8(m_delimiter);
        const __m128i lf = _mm_set1_epi8('\n');
        const __m128i cr = _mm_set1_epi8('\r');
        const __m128i quote = _mm_set1_epi8('"');
        auto bits = [](__m128i hit, int k) {
            return static_cast<std::uint64_t>(static_cast<std::uint16_t>(_mm_movemask_epi8(hit)))
                   << (16 * k);
        };
        for (int k = 0; k < 4; ++k) {
            const __m128i v = _mm_loadu_si128(reinterpret_cast<const __m128i*>(base + 16 * k));
            delimiters |= bits(_mm_cmpeq_epi8(v, delimiter), k);
            lfs |= bits(_mm_cmpeq_epi8(v, lf), k);
            crs |= bits(_mm_cmpeq_epi8(v, cr), k);
            quotes |= bits(_mm_cmpeq_epi8(v, quote), k);
        }
    } else
#endif
    {
        const std::size_t n = static_cast<std::size_t>(std::min<std::ptrdiff_t>(64, m_end - base));
        for (std::size_t i = 0; i < n; ++i) {
            const std::uint64_t bit = std::uint64_t{1} << i;
            const char c = base[i];
            delimiters |= c == m_delimiter ? bit : 0;
            lfs |= c == '\n' ? bit : 0;
            crs |= c == '\r' ? bit : 0;
            quotes |= c == '"' ? bit : 0;
        }
    }
    m_blockMask = delimiters | lfs | crs | quotes;
    // For the plain records: a CR right before an LF ends the field and the line (RFC 4180,
    // section 2, rule 1: CR LF); any other CR, and one on the block's last byte (its LF
    // would be in the next block), is left to the full scanner, as are quotes.
    const std::uint64_t crlf = crs & (lfs >> 1);
    const std::uint64_t loneLf = lfs & ~(crlf << 1);
    m_fieldEndMask = delimiters | loneLf | crlf;
    m_lineEndMask = loneLf | crlf;
    m_crlfMask = crlf;
    m_unusualMask = quotes | (crs & ~crlf);
}

bool CsvScanner::nextPlain(CsvRecord& record) {
    const char* p = m_pos;
    const char* base = m_begin + ((static_cast<std::size_t>(p - m_begin)) & ~std::size_t{63});
    if (base != m_blockBase) {
        if (base + 64 > m_end)
            return false;
        loadBlock(base);
    }
    const unsigned offset = static_cast<unsigned>(p - base);
    std::uint64_t ends = m_fieldEndMask & (~std::uint64_t{0} << offset);
    std::uint64_t unusual = m_unusualMask & (~std::uint64_t{0} << offset);
    std::vector<CsvField>& fields = record.fields;
    std::size_t count = 0;
    const char* start = p;
    for (;;) {
        if (ends == 0) {
            // The record goes on into the next block (it must have no unusual byte left here).
            if (unusual != 0 || base + 128 > m_end)
                return false;
            base += 64;
            loadBlock(base);
            ends = m_fieldEndMask;
            unusual = m_unusualMask;
            continue;
        }
        const std::uint64_t upToEnd = ends ^ (ends - 1);  // bits up to the next field end
        if (unusual & upToEnd)
            return false;  // a quote or CR in this field: the full scanner reads it
        const unsigned at = static_cast<unsigned>(__builtin_ctzll(ends));
        const char* q = base + at;
        if (count == fields.size())
            fields.emplace_back();
        CsvField& f = fields[count++];
        f.text = std::string_view(start, static_cast<std::size_t>(q - start));
        f.quoted = false;
        start = q + 1;
        if ((m_lineEndMask >> at) & 1) {
            start += (m_crlfMask >> at) & 1;  // the LF after a CR
            break;
        }
        ends &= ends - 1;
    }
    fields.resize(count);
    record.line = m_line;
    record.offset = position();
    record.strayQuote = false;
    ++m_line;
    m_pos = start;
    return true;
}

bool CsvScanner::fail(std::string message, std::uint64_t line, std::size_t column, const char* at) {
    m_failed = true;
    m_error.message = std::move(message);
    m_error.line = line;
    m_error.column = column;
    m_error.offset = static_cast<std::size_t>(at - m_begin);
    m_pos = m_end;
    return false;
}

// Left long on purpose (about 115 lines; issue 20 allows it with the reason beside it): this is
// RFC 4180's state machine over one moving pointer. A quoted field, an unquoted field and what
// follows a field (delimiter, line end, end of data) all advance `p`, the field count and the
// scratch copy of quoted text, and each case may end the record or fail at the byte it stands
// on; as steps they would pass all of that by reference, per field, for every record of a
// quoted file, and the reader would have to follow `p` through four functions to see where a
// record ends. The common record (no quote, no lone CR) never gets here: nextPlain reads it.
bool CsvScanner::next(CsvRecord& record) {
    if (m_failed || m_pos >= m_end)
        return false;
    if (nextPlain(record))
        return true;
    // Fields are assigned over the previous record's slots: no allocation per record.
    std::vector<CsvField>& fields = record.fields;
    std::size_t count = 0;
    auto put = [&](const char* data, std::size_t size, bool quoted) {
        if (count == fields.size())
            fields.emplace_back();
        CsvField& f = fields[count++];
        f.text = std::string_view(data, size);
        f.quoted = quoted;
    };
    record.line = m_line;
    record.offset = position();
    record.strayQuote = false;
    m_scratch.clear();
    m_pending.clear();

    const char* p = m_pos;
    const char* const end = m_end;
    for (;;) {
        const std::size_t fieldNumber = count + 1;
        if (p < end && *p == '"') {
            // RFC 4180, section 2, rules 5-7: a quoted field; "" stands for one quote.
            const std::uint64_t openLine = m_line;
            const char* open = p;
            ++p;
            const char* segment = p;
            bool copied = false;
            std::size_t scratchStart = m_scratch.size();
            for (;;) {
                const char* q = static_cast<const char*>(
                    std::memchr(p, '"', static_cast<std::size_t>(end - p)));
                const char* stop = q ? q : end;
                for (const char* s = p; s < stop; ++s) {
                    if (*s == '\n')
                        ++m_line;
                }
                if (!q) {
                    return fail("a quoted field opened here is never closed (a '\"' is missing)",
                                openLine, fieldNumber, open);
                }
                if (q + 1 < end && q[1] == '"') {
                    if (!copied) {
                        copied = true;
                        scratchStart = m_scratch.size();
                    }
                    m_scratch.append(segment, static_cast<std::size_t>(q + 1 - segment));
                    p = q + 2;
                    segment = p;
                    continue;
                }
                if (copied) {
                    m_scratch.append(segment, static_cast<std::size_t>(q - segment));
                    m_pending.push_back({count, scratchStart, m_scratch.size() - scratchStart});
                    put(nullptr, 0, true);
                } else {
                    put(segment, static_cast<std::size_t>(q - segment), true);
                }
                p = q + 1;
                break;
            }
            if (p < end && *p != m_delimiter && *p != '\n' &&
                !(*p == '\r' && p + 1 < end && p[1] == '\n') && !(*p == '\r' && p + 1 == end)) {
                return fail(
                    "unexpected text after the closing quote of a quoted field (a quote inside a "
                    "quoted field must be written twice, \"\")",
                    m_line, fieldNumber, p);
            }
        } else {
            const char* start = p;
            for (;;) {
                p = findSpecial(p);
                if (p < end && *p == '"') {
                    record.strayQuote = true;  // a quote inside an unquoted field is kept as data
                    ++p;
                    continue;
                }
                if (p < end && *p == '\r' && !(p + 1 == end || p[1] == '\n')) {
                    ++p;  // a lone CR that does not end the line is data
                    continue;
                }
                break;
            }
            put(start, static_cast<std::size_t>(p - start), false);
        }
        // After a field: delimiter, end of line, or end of data.
        if (p >= end)
            break;
        if (*p == m_delimiter) {
            ++p;
            if (p >= end) {  // a delimiter at the very end: one more, empty field
                put(p, 0, false);
                break;
            }
            continue;
        }
        if (*p == '\r')
            ++p;  // CR LF (RFC 4180, section 2, rule 1) or a final CR
        if (p < end && *p == '\n')
            ++p;
        ++m_line;
        break;
    }
    fields.resize(count);
    for (const Pending& pending : m_pending) {
        record.fields[pending.field].text =
            std::string_view(m_scratch.data() + pending.offset, pending.length);
    }
    m_pos = p;
    return true;
}

std::string delimiterName(char delimiter) {
    switch (delimiter) {
        case ',':
            return "comma";
        case ';':
            return "semicolon";
        case '\t':
            return "tab";
        case '|':
            return "pipe";
    }
    return std::string(1, delimiter);
}

}  // namespace siftwave::ingest::detail
