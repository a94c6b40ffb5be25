#include "siftwave/drop.h"
#include "siftwave/region_register.h"

#include <cctype>

namespace siftwave {

const char* cellStateName(CellState state) {
    switch (state) {
        case CellState::Absent:
            return "absent";
        case CellState::Reported:
            return "reported";
        case CellState::Blank:
            return "blank";
        case CellState::Unparsable:
            return "unparsable";
    }
    return "absent";
}

const char* layoutName(Layout layout) {
    switch (layout) {
        case Layout::Long:
            return "long";
        case Layout::DatesDown:
            return "dates-down";
        case Layout::DatesAcross:
            return "dates-across";
        case Layout::CaseList:
            return "case-list";
    }
    return "long";
}

std::optional<Layout> layoutFromName(std::string_view name) {
    if (name == "long")
        return Layout::Long;
    if (name == "dates-down")
        return Layout::DatesDown;
    if (name == "dates-across")
        return Layout::DatesAcross;
    if (name == "case-list")
        return Layout::CaseList;
    return std::nullopt;
}

std::string columnLetters(std::uint64_t column) {
    std::string letters;
    for (std::uint64_t n = column + 1; n > 0; n = (n - 1) / 26)
        letters.insert(letters.begin(), static_cast<char>('A' + (n - 1) % 26));
    return letters;
}

namespace {

/// A sheet name as a cell reference writes it: quoted ('Week 5'!A1) unless letters, digits
/// and '_' alone (common practice of spreadsheet formulas, no source).
std::string sheetInReference(const std::string& name) {
    bool plain = !name.empty();
    for (char c : name)
        plain = plain && (std::isalnum(static_cast<unsigned char>(c)) || c == '_' ||
                          static_cast<unsigned char>(c) >= 0x80);
    if (plain)
        return name;
    std::string out = "'";
    for (char c : name)
        out += c == '\'' ? std::string("''") : std::string(1, c);
    return out + "'";
}

}  // namespace

std::string sourcePlace(const Provenance& source, std::uint64_t line, std::uint64_t column) {
    if (line == 0)
        return {};
    if (source.format.empty()) {
        std::string out = "line " + std::to_string(line);
        if (column > 0)
            out += ", column " + std::to_string(column);
        return out;
    }
    const std::string row = std::to_string(line);
    if (column == 0)
        return sheetInReference(source.sheet) + "!" + row + ":" + row;
    return sheetInReference(source.sheet) + "!" + columnLetters(source.firstColumn + column - 1) +
           row;
}

std::optional<std::size_t> Drop::regionIndex(std::string_view code) const {
    if (m_regionLookup.size() != regionCodes.size()) {
        for (std::size_t i = 0; i < regionCodes.size(); ++i) {
            if (regionCodes[i] == code)
                return i;
        }
        return std::nullopt;
    }
    auto it = m_regionLookup.find(std::string(code));
    if (it == m_regionLookup.end())
        return std::nullopt;
    return it->second;
}

std::optional<std::size_t> Drop::measureIndex(std::string_view name) const {
    for (std::size_t i = 0; i < measures.size(); ++i) {
        if (measures[i] == name)
            return i;
    }
    return std::nullopt;
}

CellCounts Drop::countCells() const {
    CellCounts counts;
    for (const CellTable& table : tables) {
        for (std::size_t r = 0; r < table.regions(); ++r) {
            for (const Cell& c : table.series(r)) {
                switch (c.state) {
                    case CellState::Absent:
                        ++counts.absent;
                        break;
                    case CellState::Reported:
                        ++counts.reported;
                        break;
                    case CellState::Blank:
                        ++counts.blank;
                        break;
                    case CellState::Unparsable:
                        ++counts.unparsable;
                        break;
                }
            }
        }
    }
    return counts;
}

void Drop::indexRegions() {
    m_regionLookup.clear();
    m_regionLookup.reserve(regionCodes.size());
    for (std::size_t i = 0; i < regionCodes.size(); ++i)
        m_regionLookup.emplace(regionCodes[i], i);
}

const RegionEntry* RegionRegister::find(std::string_view code) const {
    if (m_lookup.size() != entries.size()) {
        for (const RegionEntry& e : entries) {
            if (e.code == code)
                return &e;
        }
        return nullptr;
    }
    auto it = m_lookup.find(std::string(code));
    return it == m_lookup.end() ? nullptr : &entries[it->second];
}

bool RegionRegister::hasHierarchy() const {
    for (const RegionEntry& e : entries) {
        if (!e.parent.empty())
            return true;
    }
    return false;
}

std::vector<std::string> RegionRegister::childrenOf(std::string_view code) const {
    std::vector<std::string> out;
    for (const RegionEntry& e : entries) {
        if (e.parent == code)
            out.push_back(e.code);
    }
    return out;
}

void RegionRegister::index() {
    m_lookup.clear();
    for (std::size_t i = 0; i < entries.size(); ++i)
        m_lookup.emplace(entries[i].code, i);
}

namespace {

constexpr std::size_t kCodesShown = 8;

/// The codes as --only-regions takes them: "A,B,C" when a few plain codes, else "@FILE" (one
/// code per line) with their count.
std::string regionsAsTyped(const std::vector<std::string>& codes) {
    bool plain = codes.size() <= kCodesShown;
    for (const std::string& c : codes)
        plain = plain && !c.empty() && c.find_first_of(", \t\"'") == std::string::npos &&
                c.front() != '@';
    if (!plain)
        return "@FILE (a file of the " + std::to_string(codes.size()) + " codes, one per line)";
    std::string out;
    for (const std::string& c : codes)
        out += (out.empty() ? "" : ",") + c;
    return out;
}

}  // namespace

std::string ReadNarrowing::asOptions() const {
    std::string out;
    auto add = [&](const std::string& option) { out += (out.empty() ? "" : " ") + option; };
    if (from)
        add("--from " + from->iso());
    if (to)
        add("--to " + to->iso());
    if (!regions.empty())
        add("--only-regions " + regionsAsTyped(regions));
    return out;
}

std::string LeftOut::describe(const ReadNarrowing& narrowing) const {
    std::vector<std::string> parts;
    // Where the rows left out by date lie: outside a range, before its first or after its last day.
    const std::string dates =
        narrowing.from && narrowing.to
            ? "outside " + narrowing.from->iso() + " to " + narrowing.to->iso()
        : narrowing.from ? "before " + narrowing.from->iso()
                         : "after " + (narrowing.to ? narrowing.to->iso() : "");
    if (rowsOutsideDates > 0)
        parts.push_back(std::to_string(rowsOutsideDates) + " " + dates);
    if (rowsOfOtherRegions > 0)
        parts.push_back(std::to_string(rowsOfOtherRegions) + " of other regions");
    std::string out;
    if (!parts.empty()) {
        out = std::to_string(rows()) + (rows() == 1 ? " data row" : " data rows") + " left out (" +
              parts[0] + (parts.size() > 1 ? ", " + parts[1] : "") + ")";
    }
    auto add = [&](const std::string& text) { out += (out.empty() ? "" : "; ") + text; };
    if (dateColumns > 0)
        add(std::to_string(dateColumns) + (dateColumns == 1 ? " date column" : " date columns") +
            " left out (outside " + dates + ")");
    if (regionColumns > 0)
        add(std::to_string(regionColumns) +
            (regionColumns == 1 ? " region column" : " region columns") +
            " left out (regions not asked for)");
    return out;
}

std::string narrowingNote(const Provenance& source) {
    if (!source.narrowing.active())
        return {};
    const std::string left = source.leftOut.describe(source.narrowing);
    std::string note = "narrowed read (" + source.narrowing.asOptions() +
                       "): " + (left.empty() ? std::string("nothing left out") : left);
    if (!source.leftOut.regionsNotFound.empty())
        note += "; " + std::to_string(source.leftOut.regionsNotFound.size()) +
                " of the codes asked for are in no row";
    return note;
}

}  // namespace siftwave
