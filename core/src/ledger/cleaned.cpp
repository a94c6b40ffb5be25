#include "siftwave/ledger/cleaned.h"

#include <limits>

namespace siftwave::ledger {

const char* cleanedStateName(CleanedState state) {
    switch (state) {
        case CleanedState::Reported:
            return "reported";
        case CleanedState::Filled:
            return "filled";
        case CleanedState::Absent:
            return "absent";
        case CleanedState::Blank:
            return "blank";
        case CleanedState::Unparsable:
            return "unparsable";
        case CleanedState::Excluded:
            return "excluded";
        case CleanedState::Merged:
            return "merged";
    }
    return "absent";
}

std::optional<CleanedState> cleanedStateFromName(std::string_view name) {
    for (auto s :
         {CleanedState::Reported, CleanedState::Filled, CleanedState::Absent, CleanedState::Blank,
          CleanedState::Unparsable, CleanedState::Excluded, CleanedState::Merged}) {
        if (name == cleanedStateName(s))
            return s;
    }
    return std::nullopt;
}

CleanedState cleanedStateOf(CellState raw) {
    switch (raw) {
        case CellState::Reported:
            return CleanedState::Reported;
        case CellState::Absent:
            return CleanedState::Absent;
        case CellState::Blank:
            return CleanedState::Blank;
        case CellState::Unparsable:
            return CleanedState::Unparsable;
    }
    return CleanedState::Absent;
}

Cleaned::Cleaned(const Drop& drop)
    : m_measures(drop.measures.size()),
      m_regions(drop.regionCodes.size()),
      m_days(drop.periods()),
      m_cells(m_measures * m_regions * static_cast<std::size_t>(drop.periods())),
      m_totals(m_measures * m_regions, 0) {
    for (std::size_t m = 0; m < m_measures; ++m) {
        for (std::size_t r = 0; r < m_regions; ++r) {
            std::int64_t sum = 0;
            for (std::int32_t d = 0; d < m_days; ++d) {
                const Cell& raw = drop.cell(m, r, d);
                CleanedCell& c = m_cells[index(m, r, d)];
                c.state = cleanedStateOf(raw.state);
                c.value = raw.reported() ? raw.value : 0;
                sum += c.counted();
            }
            m_totals[m * m_regions + r] = sum;
        }
    }
}

std::span<const std::uint64_t> Cleaned::touchedBy(std::size_t measure, std::size_t region,
                                                  std::int32_t day) const {
    auto it = m_touches.find(index(measure, region, day));
    if (it == m_touches.end())
        return {};
    return it->second;
}

bool Cleaned::inEffect(std::uint64_t sequence) const {
    if (sequence == 0 || sequence > m_inEffect.size())
        return false;
    return m_inEffect[sequence - 1];
}

std::vector<double> cleanedCounts(const Cleaned& cleaned, std::size_t measure, std::size_t region) {
    const auto cells = cleaned.series(measure, region);
    std::vector<double> counts(cells.size(), std::numeric_limits<double>::quiet_NaN());
    for (std::size_t d = 0; d < cells.size(); ++d)
        if (cells[d].hasValue())
            counts[d] = static_cast<double>(cells[d].value);
    return counts;
}

}  // namespace siftwave::ledger
