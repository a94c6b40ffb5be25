#pragma once
// What every decision kind's effect (effects/<kind>.cpp) shares: the builder that
// collects cell changes, finding regions, measures and periods named by text, and
// the checks on cells a decision may write.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/result.h"

#include "ledger/cleaned_access.h"

#include <cstdint>
#include <initializer_list>
#include <map>
#include <set>
#include <string>
#include <utility>

namespace siftwave::ledger::detail {

using Access = Cleaned::Access;

Error cellError(ErrorCode code, std::string message, const std::string& region = {},
                std::string date = {});

/// "day" or "week": what the drop's periods are, for messages.
std::string unit(const Drop& drop);
std::string units(const Drop& drop);

/// Collects cell changes in (measure, region, day) order and the scope of totals.
class EffectBuilder {
public:
    EffectBuilder(const Drop& drop, const Cleaned& cleaned) : m_drop(drop), m_cleaned(cleaned) {}

    const CleanedCell& current(std::size_t m, std::size_t r, std::int32_t d) const {
        auto it = m_changes.find(Access::cellIndex(m_cleaned, m, r, d));
        return it == m_changes.end() ? m_cleaned.cell(m, r, d) : it->second.second;
    }
    void set(std::size_t m, std::size_t r, std::int32_t d, CleanedCell after) {
        const std::size_t key = Access::cellIndex(m_cleaned, m, r, d);
        auto it = m_changes.find(key);
        if (it == m_changes.end()) {
            if (after == m_cleaned.cell(m, r, d))
                return;
            m_changes.emplace(key, std::make_pair(CellKey{m, r, d}, after));
        } else {
            it->second.second = after;
        }
        m_scope.insert({m, r});
    }
    void addScope(std::size_t m, std::size_t r) { m_scope.insert({m, r}); }
    bool empty() const { return m_changes.empty(); }

    Effect finish() const;

private:
    struct CellKey {
        std::size_t measure;
        std::size_t region;
        std::int32_t day;
    };
    const Drop& m_drop;
    const Cleaned& m_cleaned;
    std::map<std::size_t, std::pair<CellKey, CleanedCell>>
        m_changes;  // cell index orders by (m, r, d)
    std::set<std::pair<std::size_t, std::size_t>> m_scope;
};

Result<std::size_t> findRegion(const Drop& drop, const std::string& code);
Result<std::size_t> findMeasure(const Drop& drop, const std::string& name);

/// The period that holds `date` (any day of a week selects that week).
Result<std::int32_t> findDay(const Drop& drop, Date date, const std::string& region);

/// The (measure, region) series a decision or a recorded change names.
struct SeriesAt {
    std::size_t measure;
    std::size_t region;
};
Result<SeriesAt> findSeries(const Drop& drop, const std::string& measure,
                            const std::string& region);

struct CellAt {
    std::size_t measure;
    std::size_t region;
    std::int32_t day;
};
Result<CellAt> locate(const Drop& drop, const std::string& measure, const std::string& region,
                      Date date);

struct DaySpan {
    std::int32_t first = 0;
    std::int32_t last = -1;
};

/// The periods a range of dates selects: from the period holding its first date to the
/// one holding its last.
Result<DaySpan> findDays(const Drop& drop, const DayRange& range, const std::string& region);

/// Refuses cells that a decision may not write over: excluded or merged ones.
Status requireWritable(const Drop& drop, const CleanedCell& cell, std::size_t r, std::int32_t d);

/// The cell with `amount` added (a cell without a value becomes a filled one).
CleanedCell withAdded(const CleanedCell& cell, std::int64_t amount);

/// The non-withdraw entry a withdrawal of `target` toggles, and whether it ends up in
/// effect (effects/withdraw.cpp).
std::pair<std::uint64_t, bool> withdrawalBase(const Cleaned& cleaned, std::uint64_t target);

// What the kinds' descriptors share besides the effect (validation, rules, figure marks).

/// Usage errors of Decision::validate(): "<kind> needs a region", ... when the field is unset.
Status usageError(std::string message);
Status needRegion(const Decision& d);
Status needMeasure(const Decision& d);
Status needDate(const Decision& d);
Status needWindow(const Decision& d);
/// The first failed status of `checks`, or Ok.
Status firstFailure(std::initializer_list<Status> checks);

bool conservesAlways(const Decision&);
bool conservesNever(const Decision&);

/// Refuses an effect that makes a count negative that was not (the kinds that move counts).
Status noNewNegatives(const Cleaned& cleaned, const Decision& d, const Effect& effect);

/// The decision names exactly this region and measure.
bool namesSeries(const Decision& d, const std::string& region, const std::string& measure);
/// The same, where an empty region or measure covers every one (exclude, accept).
bool coversSeries(const Decision& d, const std::string& region, const std::string& measure);

}  // namespace siftwave::ledger::detail
