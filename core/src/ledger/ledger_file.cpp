#include "siftwave/ledger/ledger_file.h"

#include "ledger/file_io.h"

#include <fcntl.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>
#include <cerrno>
#include <cstring>
#include <filesystem>

namespace siftwave::ledger {
namespace {

/// A ledger line is a JSON object: it starts with '{' (after blanks) and is text without NULs.
bool looksLikeEntryLine(std::string_view line) {
    if (line.find('\0') != std::string_view::npos)
        return false;
    const std::size_t first = line.find_first_not_of(" \t\r");
    return first == std::string_view::npos || line[first] == '{';
}

}  // namespace

Result<Ledger> parseLedger(std::string_view bytes, const std::string& displayPath) {
    Ledger ledger;
    std::size_t pos = 0;
    std::uint64_t lineNumber = 0;
    while (pos < bytes.size()) {
        ++lineNumber;
        const std::size_t end = bytes.find('\n', pos);
        const bool torn = end == std::string_view::npos;
        const std::string_view line = bytes.substr(pos, torn ? std::string_view::npos : end - pos);
        if (!line.empty() && !looksLikeEntryLine(line)) {
            // Not a cut-short entry but another kind of file (a drop, a report, a binary file):
            // say so, rather than advising to delete the line.
            Error e = makeError(ErrorCode::Syntax,
                                "this is not a ledger file: line " + std::to_string(lineNumber) +
                                    " is not a JSON entry (a ledger is JSON Lines, one entry per "
                                    "line, as siftwave-cli decide writes it); check the path");
            e.file = displayPath;
            e.line = lineNumber;
            return e;
        }
        if (torn) {
            Error e = makeError(
                ErrorCode::Integrity,
                "the last line is incomplete (no line end): a write was interrupted. The entry on "
                "it "
                "was never completed; remove that line to continue, then make the decision again");
            e.file = displayPath;
            e.line = lineNumber;
            return e;
        }
        auto entry = parseEntryLine(line, lineNumber);
        if (!entry) {
            Error e = entry.error();
            e.file = displayPath;
            e.line = lineNumber;
            e.message = "entry " + std::to_string(lineNumber) + ": " + e.message;
            return e;
        }
        ledger.entries.push_back(std::move(*entry));
        pos = end + 1;
    }
    if (auto s = verifyChain(ledger); !s) {
        Error e = s.error();
        e.file = displayPath;
        return e;
    }
    return ledger;
}

Result<Ledger> readLedgerFile(const std::string& path) {
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec)) {
        Error e = makeError(ErrorCode::Io,
                            "this is a folder, not a ledger file; name the ledger "
                            "file itself (e.g. decisions.jsonl)");
        e.file = path;
        return e;
    }
    if (!std::filesystem::exists(path, ec)) {
        Error e = makeError(ErrorCode::NotFound,
                            "no ledger file here; check the path (siftwave-cli decide starts a new "
                            "ledger with the first decision)");
        e.file = path;
        return e;
    }
    auto bytes = detail::readWholeFile(path);
    if (!bytes)
        return bytes.error();
    return parseLedger(*bytes, path);
}

Status appendLedgerEntry(const std::string& path, const LedgerEntry& entry) {
    auto line = entryLine(entry);
    if (!line)
        return line.error();
    std::string bytes = *line + "\n";
    auto fail = [&](const char* what) { return detail::ioError(path, what); };
    std::error_code ec;
    const bool created = !std::filesystem::exists(path, ec);
    const int fd = ::open(path.c_str(), O_RDWR | O_APPEND | O_CREAT | O_CLOEXEC, 0644);
    if (fd < 0)
        return fail("cannot open the ledger for appending");
    // One writer at a time, and only onto the entry this one was made after: under the
    // lock, the file must end exactly at the entry's predecessor.
    if (::flock(fd, LOCK_EX) != 0) {
        Error e = fail("cannot lock the ledger");
        ::close(fd);
        return e;
    }
    std::string current;
    for (char buffer[65536];;) {
        const ssize_t n = ::pread(fd, buffer, sizeof buffer, static_cast<off_t>(current.size()));
        if (n < 0 && errno == EINTR)
            continue;
        if (n < 0) {
            Error e = fail("cannot read the ledger");
            ::close(fd);
            return e;
        }
        if (n == 0)
            break;
        current.append(buffer, static_cast<std::size_t>(n));
    }
    Result<Ledger> onDisk = parseLedger(current, path);
    if (!onDisk) {
        ::close(fd);
        return onDisk.error();
    }
    if (onDisk->entries.size() + 1 != entry.sequence || onDisk->headHash() != entry.previousHash) {
        ::close(fd);
        Error e = makeError(ErrorCode::Conflict,
                            "the ledger changed since it was read (it now has " +
                                std::to_string(onDisk->entries.size()) +
                                " entries; this is entry " + std::to_string(entry.sequence) +
                                "); nothing was appended: read it again and redo the decision");
        e.file = path;
        return e;
    }
    if (!detail::writeAll(fd, bytes)) {
        Error e = fail("cannot append to the ledger");
        ::close(fd);
        return e;
    }
    if (::fsync(fd) != 0) {
        Error e = fail("cannot flush the ledger to disk");
        ::close(fd);
        return e;
    }
    if (::close(fd) != 0)
        return fail("cannot close the ledger");
    if (created) {
        std::filesystem::path folder = std::filesystem::path(path).parent_path();
        if (folder.empty())
            folder = ".";
        detail::syncFolder(folder.string());
    }
    return Ok{};
}

}  // namespace siftwave::ledger
