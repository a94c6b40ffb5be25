#pragma once
// One descriptor per decision kind: the one place where a kind is described.
//
// Each kind of decision.h has one DecisionKindInfo, defined beside its effect in
// core/src/ledger/effects/<kind>.cpp and listed in the table of
// core/src/ledger/decision_kinds.cpp (in DecisionKind order). Everything that
// differs between kinds is read from it:
//
//   name, help          the stable name (ledger file, command line) and decide's help
//   flags               the decide flags the kind takes besides the common ones, and
//                       which of them it cannot do without
//   parameters          what its ledger entry's "parameters" object holds
//   validate            the usage check of Decision::validate()
//   conservesTotals     decisionConservesTotals()
//   effect, checkEffect what it does to the cleaned cells, and its own rule on the result
//   marksSeries, mark   whether and how a figure of one region and measure marks it
//
// Adding a kind: see "Adding a decision kind" in DEVELOPERS.md.

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"
#include "siftwave/time_axis.h"

#include <cstdint>
#include <optional>
#include <span>
#include <string>

namespace siftwave::ledger {

namespace detail {
class EffectBuilder;  // core/src/ledger/effects/effect_support.h
}

/// A field of the "parameters" object of a ledger entry (core/src/ledger/entry_json.cpp
/// has each one's key and how it is written and read).
enum class DecisionParam {
    Region,              // "region", when not empty
    Measure,             // "measure", when not empty
    Date,                // "date", when set
    Window,              // "window" {first, last}, when set
    Excess,              // "excess"
    RedistributeMethod,  // "method": uniform, proportional, baseline, level
    BaselineWidth,       // "baseline_width", with the baseline and level methods only
    FillMethod,          // "method": zero, linear, share
    Keep,                // "keep": first, last, sum, max
    Variant,             // "variant", when not empty
    Into,                // "into", when not empty
    Entry,               // "entry": the sequence number undone
    MaxDelay,            // "max_delay": the nowcast's maximum delay in periods
    NowcastWindow,       // "nowcast_window": the nowcast's moving window in periods
    NowcastMethod,       // "method": "chain_ladder", the nowcast's method
};

/// A decide flag a kind takes ("region", "days", ...). `requiredAs` is set when the kind
/// cannot do without it: the usage message is "<kind> needs <requiredAs>".
struct DecisionFlag {
    const char* name;
    const char* requiredAs = nullptr;
};

/// What a figure of one region and measure knows when it marks an entry.
struct MarkContext {
    const LedgerEntry& entry;
    const std::string& region;
    const std::string& measure;
    const TimeAxis& axis;
    DayRange calendar;                   // the first to the last period's first day
    std::int64_t change;                 // the entry's total change on this region and measure
    std::string (*count)(std::int64_t);  // the figure's number format (report::groupedCount)
};

/// A kind's mark on a figure (report/plot_model.h turns it into a DecisionMark, or an
/// ExcludedRange when `shaded`).
struct KindMark {
    bool shaded = false;             // a shaded range of left-out cells, not a mark
    DayRange at;                     // the days it points at (clamped to the calendar later)
    std::optional<DayRange> window;  // the days the counts went to, where they went elsewhere
    std::int64_t count = 0;          // counts moved, spread, filled, merged or left out
    std::string label;               // without the "#N " tag
};

struct DecisionKindInfo {
    DecisionKind kind;
    const char* name;  // "redistribute", ...
    const char* help;  // decide --help: its flags and what it does, from the flag column on
    std::span<const DecisionFlag> flags;
    bool measureFromDrop;  // decide: --measure may be left out when the drop has one measure
    std::span<const DecisionParam> parameters;

    Status (*validate)(const Decision&);
    bool (*conservesTotals)(const Decision&);
    /// Adds to the builder what the decision does to the cleaned cells (decision.h).
    Status (*effect)(const Drop&, const Cleaned&, const Decision&, detail::EffectBuilder&);
    /// The kind's own rule on the finished effect, checked before the conservation of totals.
    Status (*checkEffect)(const Cleaned&, const Decision&, const Effect&);
    /// Whether a figure of this region and measure shows the decision.
    bool (*marksSeries)(const Decision&, const std::string& region, const std::string& measure);
    std::optional<KindMark> (*mark)(const MarkContext&);
    /// Fills what the analyst may leave to the data (nowcast_complete: now, the maximum delay
    /// and the window) before the decision is validated and recorded, so the entry names them;
    /// nullptr for the kinds that take everything from their flags.
    Status (*resolve)(const Drop&, Decision&) = nullptr;

    bool hasParameter(DecisionParam p) const;
    const DecisionFlag* flag(std::string_view name) const;  // nullptr when it takes no such flag
};

/// The descriptor of a kind.
const DecisionKindInfo& decisionKindInfo(DecisionKind kind);

/// Every kind, in DecisionKind order.
std::span<const DecisionKindInfo* const> decisionKinds();

/// The text naming the cells a decision touched, for reports and the ledger table:
///   Prose    "0412, cases, 2026-03-02"; "every region, every measure, 2026-03-01 to
///            2026-03-14"; "412 into 0412"; "entry #3"
///   Compact  "0412 cases 2026-03-02"; "2026-03-01:2026-03-14"; "412 → 0412"; ""
enum class WhereStyle { Prose, Compact };
std::string decisionWhere(const Decision& decision, WhereStyle style);

}  // namespace siftwave::ledger
