#pragma once
// Decision: one cleaning act an analyst asks for, before it is recorded.
//
// A Decision names what to do (its kind), where (region, measure, days) and
// how (method, amounts). It carries no reason, author or time: those belong to
// the ledger entry that records it (see entry.h). One flat struct serves every
// kind; each field says which kinds read it, and validate() checks that the
// kind has what it needs.
//
// Decisions act on periods: the days of a daily drop, the weeks of a weekly
// one. Dates name periods: `date` and the ends of `window` select the period
// that holds them (any day of a week selects that week), and the cells they
// change are recorded under their periods' first days. "Day" below reads
// "period" for weekly data.
//
// Kinds and what they do to the cleaned cells (see replay.h for the cells):
//
//   redistribute      move `excess` counts from the dump day `date` over the
//                     earlier days `window`, split by the largest remainder
//                     method (apportion.h) with weights per `redistribute`
//                     method: uniform (equal), proportional (the values
//                     already in the window) or baseline (a centred moving
//                     average of width `baselineWidth` periods, series/smoothing.h,
//                     the dump day left out) or level (the expected level: the
//                     trend between the `baselineWidth` periods before the window
//                     and the `baselineWidth` after the dump day, their medians
//                     interpolated on the log scale, times the weekday factors on
//                     daily data, estimated on the region's cleaned series without
//                     the window and the dump day; ledger/effects/level_weights.h).
//                     level fills a gap or a deficit by what the periods should
//                     hold, not by their depressed reports. Region total
//                     unchanged; no day negative. The window must end before the
//                     dump's period.
//   spread_negative   the negative value on `date` is set to 0 and the same
//                     amount taken from the earlier days in `window` (default:
//                     every earlier day) in proportion to their positive
//                     values. Total unchanged; an error when the earlier days
//                     hold less than the correction.
//   fill_missing      the days of `window` (all without a value) are filled:
//                     zero (the fixed value 0: absent rows that are true zeros,
//                     e.g. of a tally made from a case list); linear (rounded
//                     interpolation between the days just before and after);
//                     share (the next day's catch-up value is split uniformly
//                     over the gap and that day). share and zero keep the
//                     total; linear adds counts and states the change.
//   resolve_duplicate the cell on `date` is set from its duplicate rows
//                     (Drop::duplicates): keep first, last, sum or max.
//   merge_codes       every cell of region `variant` is added into region
//                     `into` (all measures); the variant's cells become merged.
//   exclude           the cells of `region` (empty: every region), `measure`
//                     (empty: every measure) and `window` (unset: every day)
//                     are left out; the total drops by their sum.
//   accept            keeps `region` (and `measure`, `window`) as reported;
//                     changes nothing, documents that it was looked at.
//   withdraw          undoes the entry with sequence number `target`.
//   nowcast_complete  the analyst's choice to work on the nowcast-completed series of a
//                     case list (nowcast/nowcast.h): as of `date` ("now", not before the
//                     list's last report date), with `maxDelay` periods and a moving window
//                     of `nowcastWindow` periods (method: the chain-ladder), each period
//                     still estimated gets round(nowcast - reported by now) added: the
//                     reports still to come. Periods under a tenth reported are left as
//                     they are (no nowcast). The total grows by the estimate; fits, figures
//                     and later decisions on the cleaned series then use the completed
//                     counts, and captions say so (ledger/nowcast_completion.h).

#include "siftwave/date.h"
#include "siftwave/result.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace siftwave::ledger {

enum class DecisionKind {
    Redistribute,
    SpreadNegative,
    FillMissing,
    ResolveDuplicate,
    MergeCodes,
    Exclude,
    Accept,
    Withdraw,
    NowcastComplete,
};

enum class RedistributeMethod { Uniform, Proportional, Baseline, Level };
enum class FillMethod { Zero, Linear, Share };
enum class DuplicateRule { First, Last, Sum, Max };

/// An inclusive range of calendar days. A decision reads it as the periods that
/// hold its first and its last day (for weekly data: every week it touches).
struct DayRange {
    Date first;
    Date last;

    friend bool operator==(const DayRange&, const DayRange&) = default;
    int length() const { return last - first + 1; }
    bool contains(Date d) const { return first <= d && d <= last; }
    /// "YYYY-MM-DD:YYYY-MM-DD".
    std::string iso() const;
    /// Parses "FIRST:LAST" (ISO dates, FIRST <= LAST); nullopt otherwise.
    static std::optional<DayRange> fromIso(std::string_view text);
};

struct Decision {
    DecisionKind kind = DecisionKind::Accept;

    std::string region;   // all kinds but merge_codes and withdraw; exclude: empty = every region
    std::string measure;  // cell kinds (required); exclude and accept: empty = every measure
    std::optional<Date> date;        // redistribute (dump day), spread_negative, resolve_duplicate
    std::optional<DayRange> window;  // redistribute (required), spread_negative (default: every
                                     // earlier day), fill_missing (required), exclude, accept

    std::int64_t excess = 0;  // redistribute: counts to move, > 0
    RedistributeMethod redistributeMethod = RedistributeMethod::Uniform;
    int baselineWidth = 7;  // redistribute/baseline: odd moving-average width in periods, 3..21
                            // (default 7: a week of days, or seven weeks); redistribute/level:
                            // the periods on each side of the trend, the same range
    FillMethod fillMethod = FillMethod::Zero;
    DuplicateRule duplicateRule = DuplicateRule::First;

    std::string variant;  // merge_codes: the code folded away (e.g. "412")
    std::string into;     // merge_codes: the canonical code kept (e.g. "0412")

    std::uint64_t target = 0;  // withdraw: sequence number of the entry undone

    int maxDelay = 0;       // nowcast_complete: the maximum delay D in periods, >= 1
    int nowcastWindow = 0;  // nowcast_complete: the moving window in periods, >= 1

    std::string finding;  // optional, any kind: id of the scan finding this answers

    /// Usage errors: a field the kind needs is missing or out of range.
    Status validate() const;
};

/// Stable names used in the ledger file and on the command line.
const char* decisionKindName(DecisionKind kind);  // "redistribute", "spread_negative", ...
std::optional<DecisionKind> decisionKindFromName(std::string_view name);
const char* redistributeMethodName(
    RedistributeMethod method);  // "uniform", "proportional", "baseline", "level"
std::optional<RedistributeMethod> redistributeMethodFromName(std::string_view name);
const char* fillMethodName(FillMethod method);  // "zero", "linear", "share"
std::optional<FillMethod> fillMethodFromName(std::string_view name);
const char* duplicateRuleName(DuplicateRule rule);  // "first", "last", "sum", "max"
std::optional<DuplicateRule> duplicateRuleFromName(std::string_view name);

/// True for the kinds after which every region and measure total must equal
/// its total before, exactly (redistribute, spread_negative, fill_missing with
/// share or zero, accept). merge_codes conserves the sum of the two regions; withdraw
/// exactly reverses (or restores) the entry it names.
bool decisionConservesTotals(const Decision& decision);

}  // namespace siftwave::ledger
