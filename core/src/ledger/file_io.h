#pragma once
// Small file helpers of the ledger: atomic writes and whole-file reads.

#include "siftwave/result.h"

#include <string>
#include <string_view>

namespace siftwave::ledger::detail {

/// An Io error on `path`: "<what>: <the system's reason for errno>".
Error ioError(const std::string& path, const std::string& what);

/// Writes all of `bytes` to `fd`, again after an interrupted write; false (errno set) on failure.
bool writeAll(int fd, std::string_view bytes);

/// fsyncs `folder`, so that a file created or renamed in it lasts; best effort.
void syncFolder(const std::string& folder);

/// Writes `bytes` to a temporary file beside `path`, flushes and fsyncs it,
/// renames it over `path` and fsyncs the folder. On any failure the temporary
/// file is removed and `path` is untouched.
Status writeFileAtomically(const std::string& path, std::string_view bytes);

/// The whole file; NotFound when it does not exist, Io otherwise.
Result<std::string> readWholeFile(const std::string& path);

}  // namespace siftwave::ledger::detail
