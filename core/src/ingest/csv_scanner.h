#pragma once
// An RFC 4180 record scanner that works in place over a byte buffer.
//
// RFC 4180, section 2: records end in CRLF (we also accept LF alone); fields
// are separated by the delimiter; a field may be enclosed in double quotes, and
// then may hold delimiters, line breaks and quotes (a quote written twice, "").
// Unquoted fields are returned as views into the buffer; only a quoted field
// with a doubled quote is copied (into a per-record scratch string), so a
// record costs no allocation in the common case.
//
// Line numbers are physical lines (1-based): a record whose quoted field holds
// a line break spans several lines, and `CsvRecord::line` is the first one.

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

struct CsvField {
    std::string_view text;  // the field's content, quotes removed and "" unescaped
    bool quoted = false;
};

struct CsvRecord {
    std::vector<CsvField> fields;
    std::uint64_t line = 0;   // physical line where the record starts
    std::size_t offset = 0;   // byte offset of the record's first byte
    bool strayQuote = false;  // an unquoted field holds a '"' (kept as data)

    /// A record that is just an empty line.
    bool isEmptyLine() const {
        return fields.size() == 1 && fields[0].text.empty() && !fields[0].quoted;
    }
};

struct CsvSyntaxError {
    std::string message;
    std::uint64_t line = 0;
    std::uint64_t column = 0;  // 1-based field number
    std::size_t offset = 0;    // byte offset where the problem is
};

class CsvScanner {
public:
    /// Scans `data` from byte `start`; `firstLine` is the line number at `start`.
    CsvScanner(std::string_view data, char delimiter, std::size_t start = 0,
               std::uint64_t firstLine = 1);

    /// Reads the next record. Returns false at the end of the data or on a syntax
    /// error (then `failed()` is true and `error()` says what and where).
    bool next(CsvRecord& record);

    bool failed() const { return m_failed; }
    const CsvSyntaxError& error() const { return m_error; }
    /// Byte offset of the next unread byte.
    std::size_t position() const { return static_cast<std::size_t>(m_pos - m_begin); }
    std::uint64_t line() const { return m_line; }

private:
    /// First byte at or after `p` that is the delimiter, LF, CR or '"' (m_end if none).
    const char* findSpecial(const char* p) {
        for (;;) {
            if (p >= m_end)
                return m_end;
            const auto offset = static_cast<std::size_t>(p - m_blockBase);
            if (p < m_blockBase || offset >= 64) {
                loadBlock(m_begin + ((static_cast<std::size_t>(p - m_begin)) & ~std::size_t{63}));
                continue;
            }
            const std::uint64_t bits = m_blockMask >> offset;
            if (bits)
                return p + __builtin_ctzll(bits);
            p = m_blockBase + 64;
        }
    }
    /// Computes the bit masks of special bytes in the 64 bytes at `base`.
    void loadBlock(const char* base);
    /// The common record, read from the bit masks alone: no quote, no CR other than
    /// the one of a CR LF, and its line end before the last 64 bytes of the data.
    /// False (nothing consumed) otherwise: next() then reads it byte by byte.
    bool nextPlain(CsvRecord& record);
    bool fail(std::string message, std::uint64_t line, std::size_t column, const char* at);

    const char* m_begin;
    const char* m_pos;
    const char* m_end;
    char m_delimiter;
    std::uint64_t m_line;
    const char* m_blockBase = nullptr;  // the 64-byte block whose special bytes the masks mark
    std::uint64_t m_blockMask = 0;      // delimiter, LF, CR or quote
    std::uint64_t m_fieldEndMask = 0;   // delimiter, LF, or the CR of a CR LF
    std::uint64_t m_lineEndMask = 0;    // LF, or the CR of a CR LF
    std::uint64_t m_crlfMask = 0;       // the CR of a CR LF
    std::uint64_t m_unusualMask = 0;    // quote, or a CR not followed by LF in the block
    std::string m_scratch;
    struct Pending {
        std::size_t field;
        std::size_t offset;
        std::size_t length;
    };
    std::vector<Pending> m_pending;
    bool m_failed = false;
    CsvSyntaxError m_error;
};

/// Human name of a delimiter: "comma", "semicolon", "tab", "pipe" or the character.
std::string delimiterName(char delimiter);

}  // namespace siftwave::ingest::detail
