#include "ledger/file_io.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <vector>

namespace siftwave::ledger::detail {

Error ioError(const std::string& path, const std::string& what) {
    Error e = makeError(ErrorCode::Io, what + ": " + std::strerror(errno));
    e.file = path;
    return e;
}

bool writeAll(int fd, std::string_view bytes) {
    const char* data = bytes.data();
    std::size_t left = bytes.size();
    while (left > 0) {
        const ssize_t n = ::write(fd, data, left);
        if (n < 0 && errno == EINTR)
            continue;
        if (n < 0)
            return false;
        data += n;
        left -= static_cast<std::size_t>(n);
    }
    return true;
}

void syncFolder(const std::string& folder) {
    const int dirFd = ::open(folder.c_str(), O_RDONLY | O_DIRECTORY);
    if (dirFd >= 0) {
        ::fsync(dirFd);
        ::close(dirFd);
    }
}

Status writeFileAtomically(const std::string& path, std::string_view bytes) {
    namespace fs = std::filesystem;
    const fs::path target(path);
    fs::path folder = target.parent_path();
    if (folder.empty())
        folder = ".";
    std::string leaf = ".";
    leaf += target.filename().string();
    leaf += ".tmp-XXXXXX";
    std::string temp = (folder / leaf).string();
    std::vector<char> name(temp.begin(), temp.end());
    name.push_back('\0');
    const int fd = ::mkstemp(name.data());
    if (fd < 0)
        return ioError(path, "cannot create a temporary file beside it");
    const std::string tempPath(name.data());
    if (!writeAll(fd, bytes)) {
        Error e = ioError(path, "cannot write");
        ::close(fd);
        ::unlink(tempPath.c_str());
        return e;
    }
    if (::fchmod(fd, 0644) != 0 || ::fsync(fd) != 0) {
        Error e = ioError(path, "cannot flush");
        ::close(fd);
        ::unlink(tempPath.c_str());
        return e;
    }
    if (::close(fd) != 0) {
        Error e = ioError(path, "cannot close");
        ::unlink(tempPath.c_str());
        return e;
    }
    if (::rename(tempPath.c_str(), path.c_str()) != 0) {
        Error e = ioError(path, "cannot rename the temporary file into place");
        ::unlink(tempPath.c_str());
        return e;
    }
    syncFolder(folder.string());
    return Ok{};
}

Result<std::string> readWholeFile(const std::string& path) {
    std::error_code ec;
    if (!std::filesystem::exists(path, ec)) {
        Error e = makeError(ErrorCode::NotFound, "no such file");
        e.file = path;
        return e;
    }
    std::ifstream in(path, std::ios::binary);
    if (!in)
        return ioError(path, "cannot open");
    std::ostringstream buffer;
    buffer << in.rdbuf();
    if (in.bad())
        return ioError(path, "cannot read");
    return buffer.str();
}

}  // namespace siftwave::ledger::detail
