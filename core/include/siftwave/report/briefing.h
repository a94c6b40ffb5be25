#pragma once
// The briefing report: per region the annotated figure and its fit table, a
// summary of the scan's findings, every ledger entry, and the audit
// reconciliation (raw total, cleaned total, the entries that explain the
// difference). Content only: buildBriefing() gathers it, briefingHtml() writes
// it as one self-contained HTML page into which the caller places each
// region's figure (inline SVG or an image), so the HTML and the PDF report
// (widgets/export/report_writer.h) say the same thing.

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/export.h"
#include "siftwave/region_register.h"
#include "siftwave/report/caption.h"
#include "siftwave/report/figure_spec.h"
#include "siftwave/result.h"
#include "siftwave/scan/scan.h"

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

namespace siftwave::report {

/// One row of a fit table: the quantity, its estimate and its 95% interval, as text.
struct FitTableRow {
    std::string quantity;
    std::string value;
    std::string interval;  // "" when not available
};

/// Parameters, derived quantities and goodness of fit of one fit, formatted.
std::vector<FitTableRow> fitTable(const fit::FitResult& fit);

struct FindingLine {
    std::string id;
    std::string kind;
    std::string severity;
    std::string region;  // "" for drop-wide findings
    std::string measure;
    std::string first;  // ISO dates; "" for region-wide kinds
    std::string last;
};

struct FindingsSummary {
    std::size_t total = 0;
    std::map<std::string, std::size_t> bySeverity;  // "critical", "warning", "info"
    std::map<std::string, std::size_t> byKind;      // kinds with at least one finding
    std::vector<FindingLine> top;                   // the first ones in review order
    scan::RevisionSummary revisions;                // compared = false without --previous
    std::string previousFile;
};

struct LedgerLine {
    std::uint64_t sequence = 0;
    std::string timestamp;
    std::string author;
    std::string kind;
    std::string where;  // region and measure, or the codes merged
    std::string reason;
    std::int64_t netChange = 0;
    bool inEffect = true;
    std::string hashPrefix;
};

struct BriefingReport {
    std::string title;
    CaptionFacts caption;  // drop-level: no fit
    bool chainVerified = false;
    std::vector<FigureSpec> figures;  // one per region, in the order asked
    FindingsSummary findings;
    std::vector<LedgerLine> ledger;  // every entry, withdrawals included
    std::vector<ledger::ReconciliationRow>
        reconciliation;  // regions of the figures, and every row an entry moved
};

struct BriefingRequest {
    /// Regions to show (verbatim codes). Empty: every region an entry in effect touched,
    /// or every region of the drop when the ledger touched none.
    std::vector<std::string> regions;
    std::string measure;  // empty: the drop's first measure
    fit::FitOptions fit;  // each region's cleaned series is fitted with these
    bool fitRegions = true;
    bool countRange = false;  // also the range of daily counts on each figure (FigureRequest)
    const RegionRegister* regionRegister = nullptr;
    const Drop* previous = nullptr;  // the release before (revisions in the findings)
    std::size_t topFindings = 12;    // findings listed by name
    std::string exportDate;          // empty: today (UTC)
    std::string title;               // empty: "Briefing: <file name>"
    /// Each figure gets the transmission panel with these options (FigureRequest), each region
    /// the latest estimates, and the page the transmission caution; nullopt: none.
    std::optional<transmission::TransmissionOptions> transmission;
    bool transmissionGrowthRate = false;  // the panel shows r(t) rather than R_t

    Status validate() const;
};

/// Gathers the report. Errors: usage, a region that is not in the drop, a scan that fails.
Result<BriefingReport> buildBriefing(const Drop& drop, const ledger::Ledger& ledger,
                                     const ledger::Cleaned& cleaned,
                                     const BriefingRequest& request);

/// The report as one HTML page (UTF-8, no external resources). `figureMarkup[i]`
/// is placed verbatim as the figure of region i (e.g. inline SVG), which carries its
/// own caption block; for a missing or empty entry the figure is left out and its
/// caption lines are printed as text instead.
std::string briefingHtml(const BriefingReport& report,
                         const std::vector<std::string>& figureMarkup);

/// Text escaped for HTML element content and attribute values.
std::string htmlEscaped(const std::string& text);

}  // namespace siftwave::report
