#include "ingest/spreadsheet/xlsx_parts.h"

#include "ingest/spreadsheet/xml_stream.h"

#include <cctype>
#include <charconv>
#include <map>

namespace siftwave::ingest::detail {
namespace {

/// Relationships of a part (Part 2, 9.3): id -> target, and the target of the first of a type.
struct Relationships final : XmlHandler {
    std::map<std::string, std::string> targetOf;
    std::string typeSuffix;  // the relationship type looked for ("/officeDocument")
    std::string typed;       // its target
    std::map<std::string, std::string> typeOf;
    void start(std::string_view name, const char** a) override {
        if (name != "Relationship")
            return;
        const char* id = attribute(a, "Id");
        const char* target = attribute(a, "Target");
        const char* type = attribute(a, "Type");
        if (!id || !target)
            return;
        targetOf[id] = target;
        typeOf[id] = type ? type : "";
        if (type && typed.empty() && !typeSuffix.empty() &&
            std::string_view(type).ends_with(typeSuffix))
            typed = target;
    }
    void end(std::string_view) override {}
};

/// A relationship target as a part name: absolute ("/xl/workbook.xml") or relative to the
/// folder of the part that holds the relationship, with "../" resolved.
std::string resolvePart(const std::string& sourceFolder, const std::string& target) {
    std::string path = target.starts_with('/') ? target.substr(1) : sourceFolder + target;
    std::vector<std::string> parts;
    std::size_t from = 0;
    while (from <= path.size()) {
        const std::size_t slash = std::min(path.find('/', from), path.size());
        const std::string piece = path.substr(from, slash - from);
        if (piece == "..") {
            if (!parts.empty())
                parts.pop_back();
        } else if (!piece.empty() && piece != ".") {
            parts.push_back(piece);
        }
        from = slash + 1;
    }
    std::string out;
    for (const std::string& p : parts)
        out += (out.empty() ? "" : "/") + p;
    return out;
}

std::string folderOf(const std::string& part) {
    const std::size_t slash = part.rfind('/');
    return slash == std::string::npos ? std::string() : part.substr(0, slash + 1);
}

std::string relsOf(const std::string& part) {
    return folderOf(part) + "_rels/" + part.substr(folderOf(part).size()) + ".rels";
}

struct WorkbookPart final : XmlHandler {
    std::vector<std::pair<std::string, std::string>> sheets;  // name, relationship id
    bool date1904 = false;
    void start(std::string_view name, const char** a) override {
        if (name == "workbookPr") {
            const char* v = attribute(a, "date1904");
            date1904 = v && (std::string_view(v) == "1" || std::string_view(v) == "true");
        } else if (name == "sheet") {
            const char* sheetName = attribute(a, "name");
            const char* id = attribute(a, "id");
            if (sheetName && id)
                sheets.emplace_back(sheetName, id);
        }
    }
    void end(std::string_view) override {}
};

struct StylesPart final : XmlHandler {
    std::map<int, std::string> customFormats;
    std::vector<int> xfFormats;
    bool inCellXfs = false;
    void start(std::string_view name, const char** a) override {
        if (name == "numFmt") {
            const char* id = attribute(a, "numFmtId");
            const char* code = attribute(a, "formatCode");
            if (id && code)
                customFormats[std::atoi(id)] = code;
        } else if (name == "cellXfs") {
            inCellXfs = true;
        } else if (name == "xf" && inCellXfs) {
            const char* id = attribute(a, "numFmtId");
            xfFormats.push_back(id ? std::atoi(id) : 0);
        }
    }
    void end(std::string_view name) override {
        if (name == "cellXfs")
            inCellXfs = false;
    }
};

struct SharedStringsPart final : XmlHandler {
    std::vector<std::string>* strings;
    std::string current;
    std::size_t total = 0;
    int phonetic = 0;  // inside rPh (phonetic hints, not the text)
    void start(std::string_view name, const char**) override {
        if (name == "si")
            current.clear();
        else if (name == "rPh")
            ++phonetic;
        else if (name == "t")
            collecting = phonetic == 0;
    }
    void end(std::string_view name) override {
        if (name == "t") {
            collecting = false;
        } else if (name == "rPh") {
            --phonetic;
        } else if (name == "si") {
            total += current.size();
            if (total > kMaxSharedStringBytes)
                failure = "the workbook's shared strings hold more than 512 MiB of text";
            strings->push_back(current);
        }
    }
    void text(std::string_view t) override { current.append(t); }
};

Status readStyles(ZipArchive& archive, const std::string& part, XlsxBook& book) {
    if (part.empty() || !archive.has(part))
        return Ok{};
    StylesPart styles;
    if (Status s = parseXmlPart(archive, part, styles); !s)
        return s;
    for (int id : styles.xfFormats) {
        auto custom = styles.customFormats.find(id);
        book.dateStyle.push_back(
            isDateFormat(id, custom == styles.customFormats.end() ? "" : custom->second));
    }
    return Ok{};
}

}  // namespace

bool isDateFormat(int numFmtId, std::string_view code) {
    if (numFmtId >= 14 && numFmtId <= 22)  // 18.8.30: the built-in date and date-time formats
        return true;
    if (code.empty())
        return false;
    bool quoted = false;
    int bracket = 0;
    for (std::size_t i = 0; i < code.size(); ++i) {
        const char c = code[i];
        if (quoted) {
            quoted = c != '"';
        } else if (c == '"') {
            quoted = true;
        } else if (c == '\\' || c == '_' || c == '*') {
            ++i;  // an escaped or padding character
        } else if (c == '[') {
            ++bracket;
        } else if (c == ']') {
            bracket = bracket > 0 ? bracket - 1 : 0;
        } else if (c == ';' && bracket == 0) {
            break;  // the first section (positive numbers) decides
        } else if (bracket == 0) {
            const char l = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
            if (l == 'd' || l == 'y')
                return true;
        }
    }
    return false;
}

bool parseCellReference(std::string_view reference, std::uint32_t& column, std::uint32_t& row) {
    std::size_t i = 0;
    std::uint64_t col = 0;
    for (; i < reference.size(); ++i) {  // ASCII letters only, no locale
        const char c = reference[i];
        const char upper = c >= 'a' && c <= 'z' ? static_cast<char>(c - 'a' + 'A') : c;
        if (upper < 'A' || upper > 'Z')
            break;
        col = col * 26 + static_cast<std::uint64_t>(upper - 'A' + 1);
        if (col > kMaxSheetColumns)
            return false;
    }
    std::uint64_t r = 0;
    const auto [end, ec] =
        std::from_chars(reference.data() + i, reference.data() + reference.size(), r);
    if (i == 0 || ec != std::errc() || end != reference.data() + reference.size() || r == 0 ||
        r > kMaxSheetRows)
        return false;
    column = static_cast<std::uint32_t>(col - 1);
    row = static_cast<std::uint32_t>(r);
    return true;
}

Result<XlsxBook> readXlsxBook(ZipArchive& archive) {
    Relationships package;
    package.typeSuffix = "/officeDocument";
    if (archive.has("_rels/.rels")) {
        if (Status s = parseXmlPart(archive, "_rels/.rels", package); !s)
            return s.error();
    }
    const std::string workbookPart =
        package.typed.empty() ? std::string("xl/workbook.xml") : resolvePart("", package.typed);
    WorkbookPart workbook;
    if (Status s = parseXmlPart(archive, workbookPart, workbook); !s)
        return s.error();
    Relationships rels;
    rels.typeSuffix = "/styles";
    if (Status s = parseXmlPart(archive, relsOf(workbookPart), rels); !s)
        return s.error();
    XlsxBook book;
    book.date1904 = workbook.date1904;
    for (const auto& [name, id] : workbook.sheets) {
        auto target = rels.targetOf.find(id);
        if (target == rels.targetOf.end() || !rels.typeOf[id].ends_with("/worksheet"))
            continue;  // a chart sheet or a dialog sheet holds no cells
        book.sheetNames.push_back(name);
        book.sheetParts.push_back(resolvePart(folderOf(workbookPart), target->second));
    }
    if (Status s = readStyles(
            archive, rels.typed.empty() ? "" : resolvePart(folderOf(workbookPart), rels.typed),
            book);
        !s)
        return s.error();
    for (const auto& [id, type] : rels.typeOf) {
        if (!type.ends_with("/sharedStrings"))
            continue;
        SharedStringsPart strings;
        strings.strings = &book.sharedStrings;
        if (Status s = parseXmlPart(archive, resolvePart(folderOf(workbookPart), rels.targetOf[id]),
                                    strings);
            !s)
            return s.error();
    }
    return book;
}

}  // namespace siftwave::ingest::detail
