#include "ingest/spreadsheet/zip_archive.h"

#include <zip.h>

#include <algorithm>

namespace siftwave::ingest::detail {
namespace {

std::string libzipMessage(zip_error_t* error) {
    std::string message = zip_error_strerror(error);
    zip_error_fini(error);
    return message;
}

std::string mib(std::uint64_t bytes) {
    return std::to_string(bytes >> 20) + " MiB";
}

}  // namespace

Result<std::unique_ptr<ZipArchive>> ZipArchive::open(std::string_view bytes, std::string path,
                                                     ArchiveLimits limits) {
    zip_error_t error;
    zip_error_init(&error);
    zip_source_t* source = zip_source_buffer_create(bytes.data(), bytes.size(), 0, &error);
    auto refuse = [&](std::string why) {
        Error e = makeError(ErrorCode::Syntax,
                            "the workbook's ZIP container cannot be read (" + why +
                                "); the file may be truncated or damaged: save it again, or "
                                "save the sheet as CSV (UTF-8)");
        e.file = path;
        return e;
    };
    if (!source)
        return refuse(libzipMessage(&error));
    zip* archive = zip_open_from_source(source, ZIP_RDONLY | ZIP_CHECKCONS, &error);
    if (!archive) {
        zip_source_free(source);
        return refuse(libzipMessage(&error));
    }
    zip_error_fini(&error);
    return std::unique_ptr<ZipArchive>(new ZipArchive(archive, std::move(path), limits));
}

ZipArchive::ZipArchive(zip* archive, std::string path, ArchiveLimits limits)
    : m_zip(archive), m_path(std::move(path)), m_limits(limits) {
    const zip_int64_t n = zip_get_num_entries(m_zip, 0);
    for (zip_int64_t i = 0; i < n; ++i) {
        const char* name = zip_get_name(m_zip, static_cast<zip_uint64_t>(i), ZIP_FL_ENC_GUESS);
        m_names.emplace_back(name ? name : "");
    }
}

ZipArchive::~ZipArchive() {
    zip_discard(m_zip);
}

bool ZipArchive::has(std::string_view name) const {
    return std::find(m_names.begin(), m_names.end(), name) != m_names.end();
}

std::uint64_t ZipArchive::declaredSize(std::string_view name) const {
    zip_stat_t st;
    zip_stat_init(&st);
    if (zip_stat(m_zip, std::string(name).c_str(), 0, &st) != 0 || !(st.valid & ZIP_STAT_SIZE))
        return 0;
    return st.size;
}

Error ZipArchive::fail(std::string message) const {
    Error e = makeError(ErrorCode::Syntax, std::move(message));
    e.file = m_path;
    return e;
}

Status ZipArchive::checkDeclared(std::int64_t index, std::string_view name,
                                 std::uint64_t& compressed, std::uint64_t& declared) {
    zip_stat_t st;
    zip_stat_init(&st);
    if (zip_stat_index(m_zip, static_cast<zip_uint64_t>(index), 0, &st) != 0)
        return fail("the workbook part " + std::string(name) + " cannot be read");
    if ((st.valid & ZIP_STAT_ENCRYPTION_METHOD) && st.encryption_method != ZIP_EM_NONE)
        return fail("the workbook is encrypted (its part " + std::string(name) +
                    " is password-protected); save an unprotected copy or the sheet as CSV");
    compressed = (st.valid & ZIP_STAT_COMP_SIZE) ? st.comp_size : 0;
    declared = (st.valid & ZIP_STAT_SIZE) ? st.size : m_limits.maxPartBytes;
    if (declared > m_limits.maxPartBytes || m_inflated + declared > m_limits.maxTotalBytes)
        return fail("the workbook part " + std::string(name) + " declares " + mib(declared) +
                    " unpacked, more than the " + mib(m_limits.maxPartBytes) + " per part (" +
                    mib(m_limits.maxTotalBytes) +
                    " in all) a drop may unpack to; is it a ZIP bomb?");
    if (declared > m_limits.ratioAllowance + m_limits.maxRatio * compressed)
        return fail("the workbook part " + std::string(name) + " would unpack " +
                    std::to_string(declared / std::max<std::uint64_t>(compressed, 1)) +
                    " times its packed size, more than a spreadsheet does (" +
                    std::to_string(m_limits.maxRatio) + "); it looks like a ZIP bomb");
    return Ok{};
}

Status ZipArchive::stream(std::string_view name,
                          const std::function<bool(std::string_view)>& consume) {
    const std::string part(name);
    const zip_int64_t index = zip_name_locate(m_zip, part.c_str(), 0);
    if (index < 0)
        return fail("the workbook has no part " + part + "; it is not a complete workbook");
    std::uint64_t compressed = 0, declared = 0;
    if (Status s = checkDeclared(index, part, compressed, declared); !s)
        return s;
    zip_file_t* file = zip_fopen_index(m_zip, static_cast<zip_uint64_t>(index), 0);
    if (!file)
        return fail("the workbook part " + part +
                    " cannot be opened: " + zip_error_strerror(zip_get_error(m_zip)));
    std::vector<char> buffer(std::size_t{1} << 18);
    std::uint64_t inflated = 0;
    Status result = Ok{};
    for (;;) {
        const zip_int64_t got = zip_fread(file, buffer.data(), buffer.size());
        if (got < 0) {
            result = fail("the workbook part " + part + " is damaged or truncated (" +
                          zip_error_strerror(zip_file_get_error(file)) + ")");
            break;
        }
        if (got == 0)
            break;
        inflated += static_cast<std::uint64_t>(got);
        m_inflated += static_cast<std::uint64_t>(got);
        if (inflated > declared || inflated > m_limits.maxPartBytes ||
            m_inflated > m_limits.maxTotalBytes ||
            inflated > m_limits.ratioAllowance + m_limits.maxRatio * compressed) {
            result = fail("the workbook part " + part + " unpacks to more than its declared " +
                          "size or the limits a drop may unpack to; it looks like a ZIP bomb");
            break;
        }
        if (!consume(std::string_view(buffer.data(), static_cast<std::size_t>(got))))
            break;
    }
    zip_fclose(file);
    return result;
}

Result<std::string> ZipArchive::readWhole(std::string_view name, std::size_t maxBytes) {
    std::string whole;
    bool tooBig = false;
    Status s = stream(name, [&](std::string_view piece) {
        if (whole.size() + piece.size() > maxBytes) {
            tooBig = true;
            return false;
        }
        whole.append(piece);
        return true;
    });
    if (!s)
        return s.error();
    if (tooBig)
        return fail("the workbook part " + std::string(name) + " is larger than " + mib(maxBytes) +
                    ", more than a spreadsheet's part of this kind holds");
    return whole;
}

}  // namespace siftwave::ingest::detail
