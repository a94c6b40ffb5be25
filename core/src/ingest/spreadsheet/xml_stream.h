#pragma once
// A workbook part parsed as a stream of XML events with expat (no tree is built, so a 50 MB
// sheet costs a buffer, not its size). Names are local names: the prefix before ':' is dropped
// ("x:c" and "c" alike; "table:table-cell" is "table-cell"), since the writers of workbooks
// bind the same namespaces to different prefixes. A part that declares a DTD is refused (no
// workbook has one; it is where entity expansion attacks live), and no external entity is
// ever fetched.

#include "ingest/spreadsheet/zip_archive.h"

#include <string>
#include <string_view>

namespace siftwave::ingest::detail {

/// The local name of an XML name: after the last ':'.
inline std::string_view localName(const char* name) {
    std::string_view n(name);
    const std::size_t colon = n.rfind(':');
    return colon == std::string_view::npos ? n : n.substr(colon + 1);
}

/// An attribute's value by local name, or nullptr.
inline const char* attribute(const char** attributes, std::string_view local) {
    for (const char** a = attributes; *a; a += 2) {
        if (localName(a[0]) == local)
            return a[1];
    }
    return nullptr;
}

class XmlHandler {
public:
    virtual ~XmlHandler() = default;
    virtual void start(std::string_view name, const char** attributes) = 0;
    virtual void end(std::string_view name) = 0;
    /// Character data, only while `collecting` is true.
    virtual void text(std::string_view) {}

    bool collecting = false;
    bool stop = false;    // set to end the parse early (not an error)
    std::string failure;  // set to end the parse with this error
};

/// Parses the part `name` of `archive` into `handler`. Malformed XML is an error naming the
/// part, its line and column.
Status parseXmlPart(ZipArchive& archive, std::string_view name, XmlHandler& handler);

}  // namespace siftwave::ingest::detail
