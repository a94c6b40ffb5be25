#include "siftwave/result.h"

namespace siftwave {

const char* errorCodeName(ErrorCode code) {
    switch (code) {
        case ErrorCode::Io:
            return "io";
        case ErrorCode::Encoding:
            return "encoding";
        case ErrorCode::Syntax:
            return "syntax";
        case ErrorCode::Ambiguous:
            return "ambiguous";
        case ErrorCode::InvalidValue:
            return "invalid_value";
        case ErrorCode::Layout:
            return "layout";
        case ErrorCode::Usage:
            return "usage";
        case ErrorCode::Integrity:
            return "integrity";
        case ErrorCode::Conservation:
            return "conservation";
        case ErrorCode::NotFound:
            return "not_found";
        case ErrorCode::Numerical:
            return "numerical";
        case ErrorCode::Conflict:
            return "conflict";
    }
    return "unknown";
}

std::string Error::describe() const {
    std::string out;
    if (!file.empty() && !cell.empty()) {
        out += file + ": " + cell + ": ";
    } else if (!file.empty()) {
        out += file;
        if (line > 0) {
            out += ':' + std::to_string(line);
            if (column > 0)
                out += ':' + std::to_string(column);
        }
        out += ": ";
    } else if (line > 0) {
        out += "line " + std::to_string(line);
        if (column > 0)
            out += ", column " + std::to_string(column);
        out += ": ";
    }
    out += message;
    // The place, unless the message already names it ("region '9999' is not in the drop").
    const bool regionNamed =
        !region.empty() && message.find("'" + region + "'") != std::string::npos;
    if ((!region.empty() && !regionNamed) || !date.empty()) {
        out += " (";
        if (!region.empty() && !regionNamed)
            out += "region " + region;
        if (!region.empty() && !regionNamed && !date.empty())
            out += ", ";
        if (!date.empty())
            out += date;
        out += ')';
    }
    return out;
}

}  // namespace siftwave
