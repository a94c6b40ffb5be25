#include "siftwave/ledger/project.h"

#include "ledger/file_io.h"
#include "siftwave/sha256.h"

#include <nlohmann/json.hpp>

#include <filesystem>
#include <limits>
#include <stdexcept>

namespace siftwave::ledger {

using nlohmann::json;

namespace {

/// A whole-number field in T's range, or `fallback` when absent. Anything else throws
/// std::invalid_argument (parseProjectFile turns it into a message): json's own conversion of a
/// float such as 7.8e35 to an integer is undefined behaviour (found by fuzz_project).
template <typename T>
T wholeNumber(const json& obj, const char* key, T fallback) {
    const auto it = obj.find(key);
    if (it == obj.end())
        return fallback;
    const auto bad = [&] {
        return std::invalid_argument(std::string("\"") + key +
                                     "\" must be a whole number in range");
    };
    if (!it->is_number_integer())
        throw bad();
    if (it->is_number_unsigned()) {
        const std::uint64_t v = it->get<std::uint64_t>();
        if (v > static_cast<std::uint64_t>(std::numeric_limits<T>::max()))
            throw bad();
        return static_cast<T>(v);
    }
    const std::int64_t v = it->get<std::int64_t>();
    if (v < static_cast<std::int64_t>(std::numeric_limits<T>::min()) ||
        (v > 0 &&
         static_cast<std::uint64_t>(v) > static_cast<std::uint64_t>(std::numeric_limits<T>::max())))
        throw bad();
    return static_cast<T>(v);
}

json optionalDate(const std::optional<Date>& d) {
    return d ? json(d->iso()) : json(nullptr);
}

Error projectError(const std::string& path, std::string message) {
    Error e = makeError(ErrorCode::Syntax, std::move(message));
    e.file = path;
    return e;
}

}  // namespace

Status ProjectFile::validate() const {
    if (dropPath.empty())
        return makeError(ErrorCode::Usage, "the project needs the drop's path");
    if (ledgerPath.empty())
        return makeError(ErrorCode::Usage, "the project needs the ledger's path");
    if (!isSha256Hex(dropSha256))
        return makeError(ErrorCode::Usage, "the drop's SHA-256 must be 64 lower-case hex digits");
    if (!previousDropPath.empty() && !isSha256Hex(previousDropSha256)) {
        return makeError(ErrorCode::Usage,
                         "the previous drop's SHA-256 must be 64 lower-case hex digits");
    }
    if (!ledgerHeadHash.empty() && !isSha256Hex(ledgerHeadHash)) {
        return makeError(ErrorCode::Usage, "the ledger head hash must be 64 lower-case hex digits");
    }
    if (fit.smoothingDays < 1)
        return makeError(ErrorCode::Usage, "the smoothing width must be at least 1 day");
    for (const ProjectRelease& r : releaseHistory) {
        if (r.path.empty() || !isSha256Hex(r.sha256))
            return makeError(ErrorCode::Usage,
                             "each release of the history needs a path and a SHA-256 of 64 "
                             "lower-case hex digits");
    }
    return Ok{};
}

Status writeProjectFile(const std::string& path, const ProjectFile& p) {
    if (auto s = p.validate(); !s)
        return s;
    json drop{{"path", p.dropPath}, {"sha256", p.dropSha256}};
    if (!p.dropSheet.empty())
        drop["sheet"] = p.dropSheet;
    json j{{"format", "siftwave-project"},
           {"version", 1},
           {"drop", drop},
           {"previous_drop", p.previousDropPath.empty() ? json(nullptr)
                                                        : json{{"path", p.previousDropPath},
                                                               {"sha256", p.previousDropSha256}}},
           {"register", p.registerPath.empty() ? json(nullptr) : json{{"path", p.registerPath}}},
           {"ledger",
            {{"path", p.ledgerPath},
             {"entries", p.ledgerEntries},
             {"head_hash", p.ledgerHeadHash.empty() ? genesisHash() : p.ledgerHeadHash}}},
           {"view",
            {{"region", p.view.region},
             {"measure", p.view.measure},
             {"second_measure", p.view.secondMeasure},
             {"visible_first", optionalDate(p.view.visibleFirst)},
             {"visible_last", optionalDate(p.view.visibleLast)}}},
           {"fit",
            {{"model", p.fit.model},
             {"method", p.fit.method},
             {"window_first", optionalDate(p.fit.windowFirst)},
             {"window_last", optionalDate(p.fit.windowLast)},
             {"smoothing_days", p.fit.smoothingDays}}},
           {"extra", p.extra}};
    if (!p.releaseHistory.empty()) {
        json history = json::array();
        for (const ProjectRelease& r : p.releaseHistory)
            history.push_back({{"path", r.path}, {"sha256", r.sha256}});
        j["release_history"] = std::move(history);
    }
    std::string text;
    try {
        text = j.dump(2, ' ', false, json::error_handler_t::strict) + "\n";
    } catch (const std::exception& ex) {
        Error e = makeError(ErrorCode::Encoding,
                            std::string("the project holds text that is not UTF-8: ") + ex.what());
        e.file = path;
        return e;
    }
    return detail::writeFileAtomically(path, text);
}

Result<ProjectFile> readProjectFile(const std::string& path) {
    auto bytes = detail::readWholeFile(path);
    if (!bytes)
        return bytes.error();
    return parseProjectFile(*bytes, path);
}

Result<ProjectFile> parseProjectFile(std::string_view bytes, const std::string& path) {
    json j = json::parse(bytes.begin(), bytes.end(), nullptr, false);
    if (j.is_discarded() || !j.is_object())
        return projectError(path, "the project file is not a JSON object");
    // Checked by type first: json::value() throws when a field has another type (a fuzzed
    // file with "format": {...} ended the program).
    const auto format = j.find("format");
    if (format == j.end() || !format->is_string() || *format != "siftwave-project") {
        return projectError(path,
                            "not a Siftwave project file (no \"format\": \"siftwave-project\")");
    }
    const auto version = j.find("version");
    if (version == j.end() || !version->is_number_integer() || *version != 1)
        return projectError(path, "unsupported project file version");
    ProjectFile p;
    try {
        auto date = [&](const json& obj, const char* key) -> Result<std::optional<Date>> {
            if (!obj.contains(key) || obj.at(key).is_null())
                return std::optional<Date>();
            auto d = Date::fromIso(obj.at(key).get<std::string>());
            if (!d)
                return projectError(path, std::string("\"") + key + "\" is not an ISO 8601 date");
            return std::optional<Date>(*d);
        };
        const json& drop = j.at("drop");
        p.dropPath = drop.at("path").get<std::string>();
        p.dropSha256 = drop.at("sha256").get<std::string>();
        if (drop.contains("sheet") && !drop.at("sheet").is_null())
            p.dropSheet = drop.at("sheet").get<std::string>();
        if (j.contains("previous_drop") && !j.at("previous_drop").is_null()) {
            p.previousDropPath = j.at("previous_drop").at("path").get<std::string>();
            p.previousDropSha256 = j.at("previous_drop").at("sha256").get<std::string>();
        }
        if (j.contains("register") && !j.at("register").is_null()) {
            p.registerPath = j.at("register").at("path").get<std::string>();
        }
        const json& ledger = j.at("ledger");
        p.ledgerPath = ledger.at("path").get<std::string>();
        p.ledgerEntries = wholeNumber(ledger, "entries", std::uint64_t{0});
        p.ledgerHeadHash = ledger.value("head_hash", genesisHash());
        if (j.contains("view")) {
            const json& v = j.at("view");
            p.view.region = v.value("region", std::string());
            p.view.measure = v.value("measure", std::string());
            p.view.secondMeasure = v.value("second_measure", std::string());
            auto a = date(v, "visible_first");
            if (!a)
                return a.error();
            p.view.visibleFirst = *a;
            auto b = date(v, "visible_last");
            if (!b)
                return b.error();
            p.view.visibleLast = *b;
        }
        if (j.contains("fit")) {
            const json& f = j.at("fit");
            p.fit.model = f.value("model", p.fit.model);
            p.fit.method = f.value("method", p.fit.method);
            p.fit.smoothingDays = wholeNumber(f, "smoothing_days", p.fit.smoothingDays);
            auto a = date(f, "window_first");
            if (!a)
                return a.error();
            p.fit.windowFirst = *a;
            auto b = date(f, "window_last");
            if (!b)
                return b.error();
            p.fit.windowLast = *b;
        }
        if (j.contains("extra"))
            p.extra = j.at("extra").get<std::map<std::string, std::string>>();
        if (j.contains("release_history")) {
            const json& history = j.at("release_history");
            if (!history.is_array())
                return projectError(path, "\"release_history\" must be a list of releases");
            for (const json& r : history) {
                if (!r.is_object() || !r.contains("path") || !r.at("path").is_string() ||
                    !r.contains("sha256") || !r.at("sha256").is_string())
                    return projectError(path,
                                        "each release of \"release_history\" needs a "
                                        "\"path\" and a \"sha256\" (text)");
                p.releaseHistory.push_back(
                    {r.at("path").get<std::string>(), r.at("sha256").get<std::string>()});
            }
        }
    } catch (const std::exception& ex) {
        return projectError(path, std::string("malformed project file: ") + ex.what());
    }
    if (auto s = p.validate(); !s) {
        Error e = s.error();
        e.code = ErrorCode::Syntax;
        e.file = path;
        return e;
    }
    return p;
}

std::string resolveProjectPath(const std::string& projectPath, const std::string& relative) {
    namespace fs = std::filesystem;
    if (relative.empty() || fs::path(relative).is_absolute())
        return relative;
    return (fs::path(projectPath).parent_path() / relative).lexically_normal().string();
}

Status checkLedgerHead(const ProjectFile& project, const Ledger& ledger) {
    if (project.ledgerEntries == 0)
        return Ok{};
    if (ledger.entries.size() < project.ledgerEntries) {
        Error e = makeError(ErrorCode::Integrity, "the ledger has " +
                                                      std::to_string(ledger.entries.size()) +
                                                      " entries but the project recorded " +
                                                      std::to_string(project.ledgerEntries) +
                                                      "; entries were removed from its end");
        e.file = project.ledgerPath;
        return e;
    }
    if (ledger.entries[project.ledgerEntries - 1].hash != project.ledgerHeadHash) {
        Error e = makeError(ErrorCode::Integrity,
                            "entry " + std::to_string(project.ledgerEntries) +
                                " is not the one the project recorded; the ledger was replaced");
        e.file = project.ledgerPath;
        e.line = project.ledgerEntries;
        return e;
    }
    return Ok{};
}

}  // namespace siftwave::ledger
