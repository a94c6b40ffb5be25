#pragma once
// The ZIP container of a spreadsheet (.xlsx, ECMA-376 Part 2 Open Packaging Conventions; .ods,
// ISO/IEC 26300 packages), read with libzip from bytes in memory, never unpacked to disk.
//
// Safety against zip bombs: every part is streamed in pieces and never held whole by this
// class. Before a part is opened its declared size is checked against the limits, and while it
// streams the bytes actually inflated are counted against the same limits (a declared size can
// lie): at most `maxPartBytes` per part, `maxTotalBytes` over the whole workbook, and at most
// `maxRatio` inflated bytes per compressed byte (beyond a first `ratioAllowance`, since small
// parts compress very well). libzip checks each part's CRC-32 at its end. Encrypted parts
// (PKWARE traditional or AES encryption) are refused.

#include "siftwave/result.h"

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

struct zip;

namespace siftwave::ingest::detail {

struct ArchiveLimits {
    std::uint64_t maxPartBytes = std::uint64_t{2} << 30;   // 2 GiB inflated per part
    std::uint64_t maxTotalBytes = std::uint64_t{4} << 30;  // 4 GiB inflated in all
    std::uint64_t maxRatio = 250;                          // inflated bytes per compressed byte
    std::uint64_t ratioAllowance = std::uint64_t{1} << 20;
};

class ZipArchive {
public:
    /// Opens the archive in `bytes` (which must outlive it); `path` names it in messages.
    static Result<std::unique_ptr<ZipArchive>> open(std::string_view bytes, std::string path,
                                                    ArchiveLimits limits = {});
    ~ZipArchive();
    ZipArchive(const ZipArchive&) = delete;
    ZipArchive& operator=(const ZipArchive&) = delete;

    const std::vector<std::string>& names() const { return m_names; }
    bool has(std::string_view name) const;
    /// Streams a part's inflated bytes to `consume` in pieces; `consume` returns false to stop
    /// early (not an error). Missing parts, limits passed, CRC and inflate errors are errors.
    Status stream(std::string_view name, const std::function<bool(std::string_view)>& consume);
    /// A small part whole (styles, relationships), refused beyond `maxBytes`.
    Result<std::string> readWhole(std::string_view name, std::size_t maxBytes);
    /// The unpacked size a part declares (0 when it is not there); it may lie, see stream().
    std::uint64_t declaredSize(std::string_view name) const;
    const std::string& path() const { return m_path; }
    Error fail(std::string message) const;

private:
    ZipArchive(zip* archive, std::string path, ArchiveLimits limits);
    /// The part's declared (unpacked) and compressed sizes, refused beyond the limits.
    Status checkDeclared(std::int64_t index, std::string_view name, std::uint64_t& compressed,
                         std::uint64_t& declared);

    zip* m_zip;
    std::string m_path;
    ArchiveLimits m_limits;
    std::vector<std::string> m_names;
    std::uint64_t m_inflated = 0;  // over every part streamed so far
};

}  // namespace siftwave::ingest::detail
