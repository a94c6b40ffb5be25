#pragma once
// Cleaned: the values the analyst stands behind, as replay(drop, ledger) gives them.
//
// Same shape as the Drop (regions in the drop's order, measures, calendar).
// Each cell has a value and a state; the state says where the value comes
// from. Only `reported` and `filled` cells hold a value that counts in a
// total; every other state counts as 0. Each cell also lists, in order, the
// sequence numbers of the ledger entries that changed it (value or state),
// withdrawals included, so history stays visible. `accept` changes no cell and
// is therefore listed on none.

#include "siftwave/date.h"
#include "siftwave/drop.h"
#include "siftwave/ledger/decision.h"

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ledger {

enum class CleanedState : std::uint8_t {
    Reported,    // a reported value (possibly changed by entries)
    Filled,      // a day without a reported value that an entry gave a value
    Absent,      // no row and no entry gave it a value
    Blank,       // reported blank, untouched
    Unparsable,  // unparsable in the drop, untouched
    Excluded,    // left out by an exclude entry (counts 0)
    Merged,      // the cell of a variant code folded into its canonical code (counts 0)
};

/// "reported", "filled", "absent", "blank", "unparsable", "excluded", "merged".
const char* cleanedStateName(CleanedState state);
std::optional<CleanedState> cleanedStateFromName(std::string_view name);
/// The cleaned state a raw cell starts in.
CleanedState cleanedStateOf(CellState raw);

struct CleanedCell {
    std::int64_t value = 0;  // meaningful when hasValue()
    CleanedState state = CleanedState::Absent;

    bool hasValue() const {
        return state == CleanedState::Reported || state == CleanedState::Filled;
    }
    /// What the cell adds to its region's total.
    std::int64_t counted() const { return hasValue() ? value : 0; }
    friend bool operator==(const CleanedCell&, const CleanedCell&) = default;
};

/// One cell an entry changed (codes and names verbatim, so an entry reads on its own).
struct CellChange {
    std::string measure;
    std::string region;
    Date date;
    CleanedCell before;
    CleanedCell after;
    friend bool operator==(const CellChange&, const CellChange&) = default;
};

/// A region's total for one measure before and after an entry.
struct TotalChange {
    std::string measure;
    std::string region;
    std::int64_t before = 0;
    std::int64_t after = 0;
    std::int64_t change() const { return after - before; }
    friend bool operator==(const TotalChange&, const TotalChange&) = default;
};

/// What a decision does: cells in (measure, region, day) order of the drop,
/// totals in (measure, region) order. Totals cover every region and measure
/// whose cells changed, plus those the decision names.
struct Effect {
    std::vector<CellChange> cells;
    std::vector<TotalChange> totals;
    friend bool operator==(const Effect&, const Effect&) = default;
    /// Sum of the total changes (0 for the conserving kinds).
    std::int64_t netChange() const;
};

class Cleaned {
public:
    Cleaned() = default;
    /// The cleaned data of a drop before any entry: every cell as read.
    explicit Cleaned(const Drop& drop);

    std::size_t measureCount() const { return m_measures; }
    std::size_t regionCount() const { return m_regions; }
    std::int32_t days() const { return m_days; }

    const CleanedCell& cell(std::size_t measure, std::size_t region, std::int32_t day) const {
        return m_cells[index(measure, region, day)];
    }
    std::span<const CleanedCell> series(std::size_t measure, std::size_t region) const {
        return {m_cells.data() + index(measure, region, 0), static_cast<std::size_t>(m_days)};
    }
    /// Sequence numbers of the entries that changed this cell, in ledger order.
    std::span<const std::uint64_t> touchedBy(std::size_t measure, std::size_t region,
                                             std::int32_t day) const;
    /// Sum of counted() over the region's days for one measure.
    std::int64_t total(std::size_t measure, std::size_t region) const {
        return m_totals[measure * m_regions + region];
    }
    /// Number of ledger entries replayed into this state.
    std::uint64_t entryCount() const { return m_entryCount; }
    /// True when the entry (1-based sequence number) is in effect: not withdrawn,
    /// or withdrawn and restored by withdrawing the withdrawal.
    bool inEffect(std::uint64_t sequence) const;

    /// Mutation is reserved to replay (and tests of it); see replay.h.
    struct Access;

private:
    std::size_t index(std::size_t measure, std::size_t region, std::int32_t day) const {
        return (measure * m_regions + region) * static_cast<std::size_t>(m_days) +
               static_cast<std::size_t>(day);
    }

    std::size_t m_measures = 0;
    std::size_t m_regions = 0;
    std::int32_t m_days = 0;
    std::vector<CleanedCell> m_cells;
    std::vector<std::int64_t> m_totals;
    std::map<std::size_t, std::vector<std::uint64_t>> m_touches;  // cell index -> entries
    std::map<std::size_t, std::vector<std::uint64_t>> m_writers;  // cell index -> entries in effect
    std::vector<bool> m_inEffect;                                 // per entry, 0-based
    struct Applied {
        DecisionKind kind = DecisionKind::Accept;
        std::uint64_t target = 0;
        Effect effect;
    };
    std::vector<Applied> m_applied;  // per entry, 0-based
    std::uint64_t m_entryCount = 0;
};

/// A region's cleaned counts as plain doubles, one per period: the value where the cleaned
/// cell holds one, NaN elsewhere (what smoothing, fitting and plots take). The one
/// conversion of cleaned cells to numbers; series::countsOf is its raw counterpart.
std::vector<double> cleanedCounts(const Cleaned& cleaned, std::size_t measure, std::size_t region);

}  // namespace siftwave::ledger
