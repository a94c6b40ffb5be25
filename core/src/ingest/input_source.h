#pragma once
// The bytes of a data drop: a read-only memory map of the file (or a fallback
// buffer), its SHA-256, and the encoding checks done block by block.
//
// Memory: the reader walks the file front to back; `release(upTo)` hands the
// pages already consumed back to the kernel (madvise MADV_DONTNEED on a
// read-only private mapping), so the file's pages do not all stay resident
// while the cell tables fill. The file itself is never written.

#include "siftwave/result.h"

#include "common/sha256.h"

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ingest::detail {

/// Position of a byte as a person finds it in an editor.
struct TextPosition {
    std::uint64_t line = 1;    // 1-based
    std::uint64_t column = 1;  // 1-based, in characters (UTF-8 sequences) on that line
};
TextPosition positionOf(std::string_view data, std::size_t offset);

/// Offset of the first byte that is not part of valid UTF-8 (RFC 3629: no overlong
/// forms, no surrogates, nothing above U+10FFFF), or npos when all is valid.
std::size_t findInvalidUtf8(std::string_view data);

/// A file opened for reading: mapped when possible, else read into memory.
class InputFile {
public:
    InputFile() = default;
    ~InputFile();
    InputFile(const InputFile&) = delete;
    InputFile& operator=(const InputFile&) = delete;

    /// A regular file is mapped whatever its size; a stream that is not a regular file (a pipe,
    /// a FIFO, a device) is read into memory up to this many bytes, then refused.
    static constexpr std::size_t kMaxStreamBytes = std::size_t{512} << 20;

    /// Opens and maps (or reads) the file. A FIFO with no writer reads as empty, never blocks.
    Status open(const std::string& path);
    std::string_view bytes() const { return {m_data, m_size}; }
    bool mapped() const { return m_mapped; }
    /// Lets the kernel drop pages wholly before `offset` (a hint; data stay readable).
    void release(std::size_t offset);
    /// Forgets what was released so far (before a new pass from the start).
    void rewind() { m_released = 0; }

private:
    const char* m_data = nullptr;
    std::size_t m_size = 0;
    bool m_mapped = false;
    std::size_t m_released = 0;
    std::vector<char> m_fallback;
};

/// Walks the bytes block by block once: hashes them, checks UTF-8 and NUL bytes.
class InputChecker {
public:
    InputChecker(std::string_view data, std::string path) : m_data(data), m_path(std::move(path)) {}
    /// Checks and hashes everything before `offset` (rounded up to a block).
    Status checkUpTo(std::size_t offset);
    Status checkAll() { return checkUpTo(m_data.size()); }
    std::string sha256() { return m_sha.hexDigest(); }

private:
    std::string_view m_data;
    std::string m_path;
    std::size_t m_hashed = 0;
    std::size_t m_validated = 0;
    siftwave::detail::Sha256 m_sha;
};

}  // namespace siftwave::ingest::detail
