#pragma once
// The analyst's choice to work on the nowcast-completed series, as a ledger decision.
//
// A nowcast (nowcast/nowcast.h) is an estimate, not a report: the cleaned series holds it only
// when the analyst asks, through a `nowcast_complete` decision (decision.h) recorded in the
// ledger with everything a replay needs to give the same series again: the region and
// measure, "now" (the date the case list is read as of), the maximum delay D and the moving
// window in periods, and the method (the chain-ladder). Its effect adds to each period still
// estimated the reports still to come, round(nowcast - reported), derived again from the drop's
// case list at every replay (so `ledger --verify` and replay compare it like any other effect).
// The command line (`decide ... nowcast_complete`) and the workbench (Decide > Complete with
// nowcast) both build the decision with nowcastCompletion(); fits, figures and later decisions
// on the cleaned series then use the completed counts, and nowcastCompletionNote() is the
// sentence their captions and outputs carry.
//
// Caution: the completed counts assume the delays seen so far continue (nowcast::kNowcastCaution).

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <optional>
#include <string>

namespace siftwave::ledger {

/// What the analyst asks for; 0 and nullopt leave it to the data.
struct NowcastCompletionRequest {
    std::string region;       // the region code, verbatim
    std::string measure;      // "" = the drop's only measure
    std::optional<Date> now;  // default: the case list's last report date
    int maxDelay = 0;         // periods; 0: nowcast::maxDelayFromCases
    int window = 0;           // periods; 0: NowcastOptions's default for the cadence
};

/// The nowcast_complete decision with every setting named (now, maximum delay, window), checked
/// against the drop: a case list, the region and measure, now not before its last report date.
Result<Decision> nowcastCompletion(const Drop& drop, const NowcastCompletionRequest& request);

/// Fills a nowcast_complete decision's unset settings from the drop (the kind's resolve).
Status resolveNowcastCompletion(const Drop& drop, Decision& decision);

/// The sentence a fit's output or a figure's caption carries when the region and measure's
/// cleaned series is nowcast-completed by an entry in effect: "Counts from 2011-06-20 on are
/// nowcast-completed (ledger entry #3: chain-ladder as of 2011-07-04, max delay 15 days,
/// window 21 days): estimated reports still to come, not reports." nullopt when none is.
std::optional<std::string> nowcastCompletionNote(const Drop& drop, const Ledger& ledger,
                                                 const Cleaned& cleaned, const std::string& region,
                                                 const std::string& measure);

}  // namespace siftwave::ledger
