#pragma once
// What the ledger hands on: the cleaned data as long CSV and the audit report.
//
// Cleaned CSV (RFC 4180: fields quoted when they hold a comma, quote, CR or
// LF; quotes doubled; records end in CRLF):
//
//   date,region,measure,value,raw_value,entries
//
// one row per cell that was read or that an entry changed, in region, measure,
// date order. `value` is empty when the cleaned cell holds no value (absent,
// blank, unparsable, excluded, merged); `raw_value` is empty when the drop had
// no number there; `entries` lists the ids that changed the cell, separated by
// ';'. Spreadsheet safety: a text cell (region code, measure name) that begins
// with = + - @ TAB or CR is prefixed with an apostrophe so no spreadsheet reads
// it as a formula (common practice, no source). Numbers are never altered.
//
// Report: each entry with its time, author, kind, parameters, reason and the
// totals it moved; then the reconciliation table per region and measure: raw
// total, cleaned total, difference, and the entries in effect that explain
// the difference. Markdown, HTML (self-contained, escaped) or CSV. The Markdown
// and HTML headers also say when decisions in effect added counts
// (CountsAdded::describe()).

#include "siftwave/drop.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/result.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace siftwave::ledger {

/// The cleaned data as CSV text (deterministic: same inputs, same bytes).
std::string cleanedCsv(const Drop& drop, const Cleaned& cleaned);
/// Writes cleanedCsv() atomically.
Status writeCleanedCsv(const std::string& path, const Drop& drop, const Cleaned& cleaned);

struct ReconciliationRow {
    std::string region;
    std::string measure;
    std::int64_t rawTotal = 0;
    std::int64_t cleanedTotal = 0;
    std::vector<std::uint64_t> entries;  // entries in effect whose total change here is not 0
    std::int64_t difference() const { return cleanedTotal - rawTotal; }
};

/// Entries in effect after the whole ledger (withdrawals applied), by 0-based index.
std::vector<bool> entriesInEffect(const Ledger& ledger);

/// The decisions in effect that added counts: entries (not withdrawals) whose
/// recorded total changes sum to more than 0 over every region and measure
/// (fill_missing linear, resolve_duplicate sum or max, ...). A move between
/// regions (merge_codes) adds nothing; an exclusion lowers a total and is not
/// listed. After such entries the cleaned totals do not reconcile with the raw
/// ones, and `ledger --verify` says so instead of "totals reconcile".
struct CountsAdded {
    std::int64_t total = 0;              // the sum of those entries' changes, > 0 when any
    std::vector<std::uint64_t> entries;  // their sequence numbers, ascending
    bool any() const { return !entries.empty(); }
    /// "totals changed by decisions that add counts: +12 (entries #3, #5)"; "" when none.
    std::string describe() const;
};
CountsAdded countsAddedByDecisions(const Ledger& ledger);

/// Every region and measure of the drop, from the drop and its replay.
std::vector<ReconciliationRow> reconcile(const Drop& drop, const Cleaned& cleaned,
                                         const Ledger& ledger);
/// Without the drop: the regions and measures the entries touched, the raw
/// total being the first recorded "before" and the cleaned total the last "after".
std::vector<ReconciliationRow> reconcileFromLedger(const Ledger& ledger);

enum class ReportFormat { Markdown, Html, Csv };
/// From the file name: .md, .html/.htm, .csv; nullopt otherwise.
std::optional<ReportFormat> reportFormatFromPath(std::string_view path);

struct ReportContext {
    std::string ledgerPath;
    std::string dropPath;  // "" when the report was made without the drop
    std::string dropSha256;
    bool chainVerified = false;
};

std::string renderReport(const Ledger& ledger, const std::vector<ReconciliationRow>& rows,
                         const ReportContext& context, ReportFormat format);
/// Writes renderReport() atomically to `path` (format from its name).
Status writeReport(const std::string& path, const Ledger& ledger,
                   const std::vector<ReconciliationRow>& rows, const ReportContext& context);

}  // namespace siftwave::ledger
