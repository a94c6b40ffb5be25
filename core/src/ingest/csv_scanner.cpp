#include "ingest/csv_scanner.h"

#include <cstring>

namespace siftwave::detail {

CsvScanner::CsvScanner(std::string_view data, char delimiter, std::size_t start,
                       std::uint64_t firstLine)
    : m_begin(data.data()),
      m_pos(data.data() + start),
      m_end(data.data() + data.size()),
      m_delimiter(delimiter),
      m_line(firstLine) {
    std::memset(m_special, 0, sizeof m_special);
    m_special[static_cast<unsigned char>(delimiter)] = true;
    m_special[static_cast<unsigned char>('\n')] = true;
    m_special[static_cast<unsigned char>('\r')] = true;
    m_special[static_cast<unsigned char>('"')] = true;
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

bool CsvScanner::next(CsvRecord& record) {
    if (m_failed || m_pos >= m_end)
        return false;
    record.fields.clear();
    record.line = m_line;
    record.offset = position();
    record.strayQuote = false;
    m_scratch.clear();
    m_pending.clear();

    const char* p = m_pos;
    const char* const end = m_end;
    for (;;) {
        const std::size_t fieldNumber = record.fields.size() + 1;
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
                    m_pending.push_back(
                        {record.fields.size(), scratchStart, m_scratch.size() - scratchStart});
                    record.fields.push_back({std::string_view(), true});
                } else {
                    record.fields.push_back(
                        {std::string_view(segment, static_cast<std::size_t>(q - segment)), true});
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
                while (p < end && !m_special[static_cast<unsigned char>(*p)])
                    ++p;
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
            record.fields.push_back(
                {std::string_view(start, static_cast<std::size_t>(p - start)), false});
        }
        // After a field: delimiter, end of line, or end of data.
        if (p >= end)
            break;
        if (*p == m_delimiter) {
            ++p;
            if (p >= end) {  // a delimiter at the very end: one more, empty field
                record.fields.push_back({std::string_view(p, 0), false});
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

}  // namespace siftwave::detail
