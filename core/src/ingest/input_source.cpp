#include "ingest/input_source.h"

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <cstring>

namespace siftwave::ingest::detail {

TextPosition positionOf(std::string_view data, std::size_t offset) {
    TextPosition pos;
    std::size_t lineStart = 0;
    for (std::size_t i = 0; i < offset && i < data.size(); ++i) {
        if (data[i] == '\n') {
            ++pos.line;
            lineStart = i + 1;
        }
    }
    for (std::size_t i = lineStart; i < offset && i < data.size(); ++i) {
        if ((static_cast<unsigned char>(data[i]) & 0xC0) != 0x80)
            ++pos.column;
    }
    return pos;
}

std::size_t findInvalidUtf8(std::string_view data) {
    const auto* s = reinterpret_cast<const unsigned char*>(data.data());
    const std::size_t n = data.size();
    std::size_t i = 0;
    while (i < n) {
        // ASCII fast path, eight bytes at a time.
        while (i + 8 <= n) {
            std::uint64_t word;
            std::memcpy(&word, s + i, 8);
            if (word & 0x8080808080808080ull)
                break;
            i += 8;
        }
        if (i >= n)
            break;
        const unsigned char c = s[i];
        if (c < 0x80) {
            ++i;
            continue;
        }
        std::size_t len;
        std::uint32_t cp;
        if (c >= 0xC2 && c <= 0xDF) {
            len = 2;
            cp = c & 0x1Fu;
        } else if (c >= 0xE0 && c <= 0xEF) {
            len = 3;
            cp = c & 0x0Fu;
        } else if (c >= 0xF0 && c <= 0xF4) {
            len = 4;
            cp = c & 0x07u;
        } else {
            return i;  // a continuation byte without a lead, C0/C1 or F5..FF
        }
        if (i + len > n)
            return i;
        for (std::size_t k = 1; k < len; ++k) {
            if ((s[i + k] & 0xC0) != 0x80)
                return i;
            cp = (cp << 6) | (s[i + k] & 0x3Fu);
        }
        if ((len == 3 && cp < 0x800) || (len == 4 && (cp < 0x10000 || cp > 0x10FFFF)) ||
            (cp >= 0xD800 && cp <= 0xDFFF)) {
            return i;  // overlong form, surrogate or beyond Unicode
        }
        i += len;
    }
    return std::string_view::npos;
}

InputFile::~InputFile() {
    if (m_mapped)
        munmap(const_cast<char*>(m_data), m_size);
}

Status InputFile::open(const std::string& path) {
    // Non-blocking only for the open itself: a FIFO with no writer must not hang here.
    const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK);
    if (fd < 0) {
        Error e =
            makeError(ErrorCode::Io, std::string("cannot open the file: ") + std::strerror(errno));
        e.file = path;
        return e;
    }
    struct stat st {};
    if (fstat(fd, &st) == 0 && S_ISDIR(st.st_mode)) {
        ::close(fd);
        Error e = makeError(ErrorCode::Io, "this is a folder, not a file");
        e.file = path;
        return e;
    }
    if (fstat(fd, &st) == 0 && S_ISREG(st.st_mode) && st.st_size > 0) {
        void* p =
            mmap(nullptr, static_cast<std::size_t>(st.st_size), PROT_READ, MAP_PRIVATE, fd, 0);
        if (p != MAP_FAILED) {
            ::close(fd);
            m_data = static_cast<const char*>(p);
            m_size = static_cast<std::size_t>(st.st_size);
            m_mapped = true;
            madvise(p, m_size, MADV_SEQUENTIAL);
            return Ok{};
        }
    }
    // Not mappable (a pipe, a device, an empty file, ...): read it, blocking again, up to a limit
    // (a stream need not end: /dev/zero).
    if (const int flags = fcntl(fd, F_GETFL); flags >= 0)
        fcntl(fd, F_SETFL, flags & ~O_NONBLOCK);
    char buffer[1 << 16];
    for (;;) {
        if (m_fallback.size() > kMaxStreamBytes) {
            ::close(fd);
            m_fallback = std::vector<char>();
            Error e = makeError(ErrorCode::Io,
                                "this is a stream (a pipe or a device), not a regular file, and it "
                                "holds more than " +
                                    std::to_string(kMaxStreamBytes >> 20) +
                                    " MiB; save the data to a file and read that");
            e.file = path;
            return e;
        }
        const ssize_t got = ::read(fd, buffer, sizeof buffer);
        if (got < 0) {
            if (errno == EINTR)
                continue;
            const int err = errno;
            ::close(fd);
            Error e = makeError(ErrorCode::Io,
                                std::string("cannot read the file: ") + std::strerror(err));
            e.file = path;
            return e;
        }
        if (got == 0)
            break;
        // Grow by doubling, but never past the limit (plus one read), so an endless stream costs
        // about the limit in memory, not twice it (a vector's reserve is exact; a string's may
        // double again).
        const std::size_t need = m_fallback.size() + static_cast<std::size_t>(got);
        if (need > m_fallback.capacity()) {
            std::size_t target = std::max(2 * m_fallback.capacity(), need);
            if (target >= kMaxStreamBytes)
                target = kMaxStreamBytes + sizeof buffer;  // the last growth: room for one read
            m_fallback.reserve(target);
        }
        m_fallback.insert(m_fallback.end(), buffer, buffer + got);
    }
    ::close(fd);
    m_data = m_fallback.data();
    m_size = m_fallback.size();
    return Ok{};
}

void InputFile::release(std::size_t offset) {
    if (!m_mapped)
        return;
    static const std::size_t page = static_cast<std::size_t>(sysconf(_SC_PAGESIZE));
    const std::size_t upTo = (offset / page) * page;
    // Release in steps of at least 4 MiB so the system calls stay rare.
    if (upTo < m_released + (std::size_t{4} << 20) && offset < m_size)
        return;
    const std::size_t limit = offset >= m_size ? ((m_size + page - 1) / page) * page : upTo;
    if (limit > m_released) {
        madvise(const_cast<char*>(m_data) + m_released, limit - m_released, MADV_DONTNEED);
        m_released = limit;
    }
}

Status InputChecker::checkUpTo(std::size_t offset) {
    constexpr std::size_t kBlock = std::size_t{64} << 10;
    if (offset > m_data.size())
        offset = m_data.size();
    while (m_hashed < offset) {
        std::size_t blockEnd = std::min(m_data.size(), m_hashed + kBlock);
        // Hashing reads the bytes first, from memory: asking for the next piece while
        // one is hashed hides most of that wait (SHA-256 itself runs ~1.9 GB/s here).
        constexpr std::size_t kPiece = std::size_t{16} << 10;
        for (std::size_t at = m_hashed; at < blockEnd; at += kPiece) {
            const std::size_t pieceEnd = std::min(blockEnd, at + kPiece);
            const std::size_t aheadEnd = std::min(m_data.size(), pieceEnd + kPiece);
            for (std::size_t p = pieceEnd; p < aheadEnd; p += 64)
                __builtin_prefetch(m_data.data() + p);
            m_sha.update(m_data.data() + at, pieceEnd - at);
        }
        m_hashed = blockEnd;
        // Validate up to a character boundary; a sequence cut by the block end waits for the next
        // one.
        std::size_t validEnd = blockEnd;
        if (validEnd < m_data.size()) {
            int back = 0;
            while (back < 3 && validEnd > m_validated &&
                   (static_cast<unsigned char>(m_data[validEnd]) & 0xC0) == 0x80) {
                --validEnd;
                ++back;
            }
        }
        std::string_view block = m_data.substr(m_validated, validEnd - m_validated);
        const std::size_t bad = findInvalidUtf8(block);
        const void* nul = std::memchr(block.data(), 0, block.size());
        if (bad != std::string_view::npos || nul) {
            std::size_t at = bad != std::string_view::npos ? m_validated + bad : m_data.size();
            bool isNul = false;
            if (nul) {
                const std::size_t nulAt =
                    static_cast<std::size_t>(static_cast<const char*>(nul) - m_data.data());
                if (nulAt < at) {
                    at = nulAt;
                    isNul = true;
                }
            }
            const TextPosition pos = positionOf(m_data, at);
            char byteText[8];
            std::snprintf(byteText, sizeof byteText, "0x%02X",
                          static_cast<unsigned char>(m_data[at]));
            Error e = makeError(
                ErrorCode::Encoding,
                isNul ? "byte offset " + std::to_string(at) +
                            " is a NUL byte: this looks like a binary or UTF-16 file; save it as "
                            "UTF-8 CSV"
                      : "byte offset " + std::to_string(at) + " (" + byteText +
                            ") is not valid UTF-8; save the file as UTF-8 (it may be in Latin-1 or "
                            "Windows-1252)");
            e.line = pos.line;
            e.column = pos.column;
            e.file = m_path;
            return e;
        }
        m_validated = validEnd;
    }
    return Ok{};
}

}  // namespace siftwave::ingest::detail
