#include "siftwave/drop.h"
#include "siftwave/region_register.h"

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

}  // namespace siftwave
