// The nowcast_complete decision built for the analyst, and the note its users print
// (siftwave/ledger/nowcast_completion.h).
#include "siftwave/ledger/nowcast_completion.h"

#include "siftwave/nowcast/nowcast.h"

#include <algorithm>

namespace siftwave::ledger {

Status resolveNowcastCompletion(const Drop& drop, Decision& d) {
    // A drop without a case list is refused by the effect (effects/nowcast_complete.cpp).
    if (d.measure.empty() && drop.measures.size() == 1)
        d.measure = drop.measures.front();
    if (!d.date)
        d.date = nowcast::lastReportDate(drop);
    if (d.maxDelay == 0)
        d.maxDelay = nowcast::maxDelayFromCases(drop, *d.date);
    if (d.nowcastWindow == 0)
        d.nowcastWindow = nowcast::NowcastOptions{}.window(drop.axis);
    return Ok{};
}

Result<Decision> nowcastCompletion(const Drop& drop, const NowcastCompletionRequest& request) {
    Decision d;
    d.kind = DecisionKind::NowcastComplete;
    d.region = request.region;
    d.measure = request.measure;
    d.date = request.now;
    d.maxDelay = request.maxDelay;
    d.nowcastWindow = request.window;
    if (Status s = resolveNowcastCompletion(drop, d); !s)
        return s.error();
    if (Status s = d.validate(); !s)
        return s.error();
    return d;
}

std::optional<std::string> nowcastCompletionNote(const Drop& drop, const Ledger& ledger,
                                                 const Cleaned& cleaned, const std::string& region,
                                                 const std::string& measure) {
    const LedgerEntry* latest = nullptr;
    for (const LedgerEntry& e : ledger.entries) {
        const Decision& d = e.decision;
        if (d.kind == DecisionKind::NowcastComplete && d.region == region && d.measure == measure &&
            cleaned.inEffect(e.sequence) && !e.effect.cells.empty())
            latest = &e;
    }
    if (!latest)
        return std::nullopt;
    const Decision& d = latest->decision;
    Date from = latest->effect.cells.front().date;
    for (const CellChange& c : latest->effect.cells)
        from = std::min(from, c.date);
    const char* unit = drop.axis.weekly() ? " weeks" : " days";
    return "Counts from " + from.iso() + " on are nowcast-completed (ledger entry #" +
           std::to_string(latest->sequence) + ": chain-ladder as of " + d.date->iso() +
           ", max delay " + std::to_string(d.maxDelay) + unit + ", window " +
           std::to_string(d.nowcastWindow) + unit +
           "): estimated reports still to come, not reports.";
}

}  // namespace siftwave::ledger
