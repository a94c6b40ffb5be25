#pragma once
// The one error channel of the core library.
//
// Bad data is a value, not an exception: every core function that can fail on
// input returns Result<T>, which holds either a T or an Error. Programmer
// errors (broken invariants) trip an assertion instead. No exception crosses
// the core API.

#include <cassert>
#include <cstdint>
#include <string>
#include <utility>
#include <variant>

namespace siftwave {

enum class ErrorCode {
    Io,            // file cannot be opened, read or written
    Encoding,      // invalid UTF-8 and the like
    Syntax,        // malformed CSV, JSON line, ...
    Ambiguous,     // the reader refuses to guess (e.g. day/month order)
    InvalidValue,  // a well-formed value that is not allowed (2026-02-30)
    Layout,        // the columns cannot be mapped to roles
    Usage,         // an option or parameter is wrong
    Integrity,     // hash mismatch, broken chain, torn ledger line
    Conservation,  // a decision would break a total or make a count negative
    NotFound,      // region, measure or entry id does not exist
    Numerical,     // a solver could not proceed
    Conflict,      // another writer changed the file first (e.g. appended a ledger entry)
};

/// Short stable name of an error code ("syntax", "integrity", ...).
const char* errorCodeName(ErrorCode code);

struct Error {
    ErrorCode code = ErrorCode::InvalidValue;
    // One sentence for a person: what is wrong and, where possible, what to do.
    std::string message;
    std::string file;          // empty when not about a file
    std::uint64_t line = 0;    // 1-based; 0 when unknown
    std::uint64_t column = 0;  // 1-based; 0 when unknown
    std::string region;        // verbatim code, when about one region
    std::string date;          // ISO 8601, when about one day
    // A spreadsheet's cell or row ("data!C14", "data!14:14"): the place, in place of line and
    // column, when the problem is in a spreadsheet.
    std::string cell;

    /// "file:line:column: message" with the parts that are known.
    std::string describe() const;
};

/// Either a value or an Error. A minimal std::expected for C++20.
template <class T>
class [[nodiscard]] Result {
public:
    Result(T value) : m_data(std::in_place_index<0>, std::move(value)) {}
    Result(Error error) : m_data(std::in_place_index<1>, std::move(error)) {}

    bool ok() const { return m_data.index() == 0; }
    explicit operator bool() const { return ok(); }

    T& value() & {
        assert(ok());
        return std::get<0>(m_data);
    }
    const T& value() const& {
        assert(ok());
        return std::get<0>(m_data);
    }
    T&& value() && {
        assert(ok());
        return std::get<0>(std::move(m_data));
    }
    T* operator->() { return &value(); }
    const T* operator->() const { return &value(); }
    T& operator*() & { return value(); }
    const T& operator*() const& { return value(); }

    const Error& error() const {
        assert(!ok());
        return std::get<1>(m_data);
    }

private:
    std::variant<T, Error> m_data;
};

/// Result of an operation that yields nothing but may fail.
struct Ok {};
using Status = Result<Ok>;

inline Error makeError(ErrorCode code, std::string message) {
    Error e;
    e.code = code;
    e.message = std::move(message);
    return e;
}

}  // namespace siftwave
