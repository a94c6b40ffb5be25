#pragma once
// The caption block every exported figure carries, so a chart that travels
// without its context still says where its numbers came from.
//
// The facts (CaptionFacts) are gathered from the Drop's provenance, the Ledger
// and the FitResult; captionLines() turns them into a few short lines of plain
// text that the renderer prints under the plot, in this order:
//
//   Source: <file name>, <first date> to <last date>, SHA-256 <12 hex>
//   Read: <the narrowing and the rows it left out>   (only for a narrowed read, narrowingNote)
//   Ledger: <n> entries, head <12 hex>        (or "Ledger: none, raw counts as reported")
//   Fit: <model>, <method>, <first> to <last>[; <bands>] (or "Fit: none")
//   Lower panel: <R_t or r(t)>; <the transmission settings>   (only with a transmission panel)
//   Exported <YYYY-MM-DD> by Siftwave <version>
//   <fit::caution> [<transmission::caution> with a transmission panel]
//
// Twelve hex digits (48 bits) identify a file among the releases an analyst
// keeps; the full hashes are in the drop's provenance and the ledger file
// (common practice for short hash prefixes, no source).

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/entry.h"

#include <cstddef>
#include <string>
#include <vector>

namespace siftwave::report {

/// Hex digits of a SHA-256 shown in captions and reports.
inline constexpr std::size_t kHashPrefixLength = 12;

struct CaptionFacts {
    std::string sourceFile;         // file name without its folders
    std::string sourceSheet;        // a workbook drop's sheet read; empty for CSV
    std::string firstDate;          // ISO 8601, the release's calendar
    std::string lastDate;           // ISO 8601
    std::string dropSha256Prefix;   // kHashPrefixLength hex digits
    std::string narrowedRead;       // narrowingNote(): a narrowed read; "" for the whole file
    std::size_t ledgerEntries = 0;  // entries in the ledger file, withdrawals included
    std::string ledgerHeadPrefix;  // ledger::kMinAnchorDigits hex digits (enough for --head); empty
                                   // without a ledger
    std::string model;             // e.g. "gumbel"; empty without a fit
    std::string method;            // e.g. "lsq"
    std::string fitFirstDate;      // the fit window, ISO 8601
    std::string fitLastDate;
    std::string bands;       // what the figure's bands are (set by buildFigureSpec); "" = not said
    std::string exportDate;  // ISO 8601 date of the export (UTC)
    std::string caution = fit::caution;
    // With a transmission panel: what it shows and its settings (set by buildFigureSpec, which
    // then adds transmission::caution to `caution`); "" = no panel.
    std::string transmission;
    // When the plotted series is nowcast-completed by a ledger entry: the sentence saying so
    // (ledger::nowcastCompletionNote; buildFigureSpec then adds the nowcast's caution); "" = not.
    std::string nowcastCompleted;
};

/// The facts for one figure; `fit` may be null, `exportDate` empty = today (UTC).
CaptionFacts captionFacts(const Drop& drop, const ledger::Ledger& ledger, const fit::FitResult* fit,
                          const std::string& exportDate = {});

/// The caption as short lines (see the header comment); the caution is the last line.
std::vector<std::string> captionLines(const CaptionFacts& facts);

/// Today's date in UTC, "YYYY-MM-DD".
std::string todayUtc();

/// The last component of a path ("a/b/c.csv" -> "c.csv").
std::string fileNameOf(const std::string& path);

/// Siftwave's version, as in captions ("0.1.0").
const char* siftwaveVersion();

}  // namespace siftwave::report
