#pragma once
// Workbench: the one document the window shows — the open Drop, its region
// register (when there is one) and, as the core parts land, the findings, the
// ledger and the fits. It owns no logic of its own: it keeps the core's values,
// hands them out read-only, and says when they change. Every change to the data
// will go through one door, apply(), so that undo maps to a ledger withdrawal.

#include "siftwave/drop.h"
#include "siftwave/fit/fit.h"
#include "siftwave/ledger/cleaned.h"
#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/entry.h"
#include "siftwave/ledger/signing.h"
#include "siftwave/nowcast/nowcast.h"
#include "siftwave/region_register.h"
#include "siftwave/release_history.h"
#include "siftwave/result.h"
#include "siftwave/scan/decision_check.h"
#include "siftwave/scan/scan.h"
#include "widgets/plot/series_view.h"

#include <QObject>
#include <QString>

#include <memory>
#include <optional>
#include <string>
#include <unordered_map>
#include <unordered_set>
#include <vector>

namespace siftwave::widgets {

class Workbench : public QObject {
    Q_OBJECT

public:
    explicit Workbench(QObject* parent = nullptr);

    bool hasDrop() const { return m_drop != nullptr; }
    /// The open drop; only valid when hasDrop().
    const Drop& drop() const { return *m_drop; }
    std::shared_ptr<const Drop> sharedDrop() const { return m_drop; }
    /// The region register, or nullptr when the drop came without one.
    const RegionRegister* regionRegister() const { return m_register.get(); }
    QString dropPath() const;

    /// The previous release, to compare against (nullptr when none is open).
    const Drop* previousDrop() const { return m_previous.get(); }
    QString previousPath() const;
    void setPreviousDrop(std::shared_ptr<const Drop> previous);
    /// Earlier releases of the same series (any order; the open drop is the latest): the plot
    /// then shows the nowcast the history gives (nowcast/triangle.h). Emits previousChanged.
    void setReleaseHistory(std::vector<std::shared_ptr<const Drop>> releases);
    std::size_t releaseHistorySize() const { return m_history.size(); }
    /// The earlier releases as given to setReleaseHistory (a project saves their paths).
    const std::vector<std::shared_ptr<const Drop>>& releaseHistory() const { return m_history; }
    /// Why the history gives no nowcast for the first region (a gap between releases, another
    /// calendar, ...); empty when it gives one or there is no history.
    QString releaseHistoryProblem() const;
    /// The release history as the core holds it (release_history.h): the earlier releases and
    /// the open drop, in order of their as-of dates; nullopt without earlier releases.
    std::optional<ReleaseHistory> releaseHistoryWithDrop() const;
    /// The releases the scan compares (scan::ScanContext::history): the previous release and the
    /// open drop (the history of two), else the release history when the open drop is its
    /// latest (its revisions are then against the release before it); nullopt when neither.
    std::optional<ReleaseHistory> comparedReleases() const;
    /// The release the drop is compared with: the previous release, else the history's release
    /// before the drop (comparedReleases()); nullptr when none. The plot draws it dotted.
    const Drop* comparedPrevious() const;

    /// Everything the plot shows for one region: the core's plot model (report::buildPlotModel:
    /// raw, cleaned, smoothed, ledger texts, finding marks, decision marks, the previous release
    /// when one is open and a second measure when `secondMeasure` >= 0) in the chart's types
    /// (seriesViewOf). An empty view when the drop has no such region or measure.
    SeriesView seriesView(const QString& regionCode, int measure, int secondMeasure = -1) const;

    /// The cleaned daily counts of a region (NaN where there is no value); empty when unknown.
    std::vector<double> cleanedCounts(const QString& regionCode, int measure) const;
    /// The region's population from the register, when known.
    std::optional<double> population(const QString& regionCode) const;
    /// Fits one wave of the region's cleaned counts with the model the options choose and, with
    /// `compare`, the four models beside it (fit::fitWithComparison).
    fit::ComparedFit fitRegion(const QString& regionCode, int measure,
                               const fit::FitOptions& options, bool compare) const;

    /// Replaces the open drop (and its register, which may be null).
    void setDrop(std::shared_ptr<const Drop> drop,
                 std::shared_ptr<const RegionRegister> regionRegister);
    void close();

    // --- Ledger: the one door for changes -----------------------------------------------

    /// Binds the ledger file for the open drop: reads it when it exists (and replays it),
    /// else starts an empty one there. The error (broken chain, other drop) is returned and
    /// the ledger is then read-only until another file is chosen.
    Status openLedger(const QString& path);
    QString ledgerPath() const { return m_ledgerPath; }
    const ledger::Ledger& ledger() const { return m_ledger; }
    const ledger::Cleaned& cleaned() const { return m_cleaned; }
    /// "verified: N entries, head abc123…" or what is wrong; always current.
    QString chainStatus() const { return m_chainStatus; }
    bool chainOk() const { return m_chainOk; }
    /// What the check proves and what it cannot, and who signed (for a tooltip).
    QString chainScope() const { return m_chainScope; }
    /// Each entry's signer, as the user's trusted keys say (signing.h).
    const std::vector<ledger::SignatureCheck>& signers() const { return m_signers; }

    /// What a decision would do; nothing is recorded.
    Result<ledger::Effect> preview(const ledger::Decision& decision) const;
    /// Records a decision with its reason: drafts the entry, signs it when the user has a
    /// signing key, appends it to the ledger file (fsynced), then applies it; after another
    /// writer's entries when one appended first (record.h). Returns the entry's sequence number.
    Result<std::uint64_t> apply(const ledger::Decision& decision, const QString& reason);
    /// Undoes an entry by appending a withdrawal (history is never rewritten).
    Result<std::uint64_t> withdraw(std::uint64_t sequence, const QString& reason);
    /// What `decision` would newly make look wrong: a re-scan of the cleaned series it changes
    /// as they would be after it (scan/decision_check.h, the scan's default thresholds, as the
    /// findings use). Errors: those of preview().
    Result<scan::DecisionCheck> checkDecision(const ledger::Decision& decision) const;
    /// Cleaned total of a region for one measure (the raw total before any decision).
    std::optional<std::int64_t> cleanedTotal(const QString& regionCode, int measure) const;

    // --- Findings ------------------------------------------------------------------------

    void setScanReport(std::shared_ptr<const scan::ScanReport> report);
    /// Findings of the last scan, ranked (empty before the scan finished).
    const std::vector<scan::Finding>& findings() const;
    const scan::Finding* finding(const QString& id) const;
    /// True when an entry in effect names this finding.
    bool isDecided(const std::string& findingId) const;
    /// Findings of a region that no entry in effect answers.
    int openFindings(const QString& regionCode) const;

Q_SIGNALS:
    /// An entry was appended (or the ledger was opened): cleaned data and totals moved.
    void ledgerChanged();
    /// A scan finished.
    void findingsChanged();
    /// A different drop is open (or none): every view rebuilds.
    void dropChanged();
    /// A previous release was opened or closed.
    void previousChanged();

private:
    /// The nowcast of a region and measure from the release history (the open drop the latest);
    /// nullopt without a history, or when the releases do not make one (a gap, another calendar).
    std::optional<nowcast::NowcastResult> historyNowcast(const std::string& region,
                                                         const std::string& measure) const;
    std::shared_ptr<const Drop> m_drop;
    std::shared_ptr<const RegionRegister> m_register;
    std::shared_ptr<const Drop> m_previous;
    std::vector<std::shared_ptr<const Drop>> m_history;  // earlier releases (setReleaseHistory)
    ledger::Ledger m_ledger;
    ledger::Cleaned m_cleaned;
    QString m_ledgerPath;
    bool m_ledgerWritable = false;
    bool m_chainOk = true;
    QString m_chainStatus;
    QString m_chainScope;
    std::vector<ledger::SignatureCheck> m_signers;
    std::shared_ptr<const scan::ScanReport> m_scan;
    void updateChainStatus();
    void updateSigners();

    // Which findings an entry in effect answers, and the open ones per region: built on first
    // use after a change (one pass over the ledger and the findings), so views asking row by
    // row stay fast on drops with thousands of regions and findings.
    struct DecisionIndex {
        std::unordered_set<std::string> decided;
        std::unordered_map<std::string, int> openByRegion;
    };
    mutable std::optional<DecisionIndex> m_decisionIndex;
    // The scratch memory of the refits (fitRegion, on the GUI thread): made once, reused by every
    // refit while a window is dragged.
    mutable fit::FitWorkspace m_fitWorkspace;
    const DecisionIndex& decisionIndex() const;
};

}  // namespace siftwave::widgets
