#include "widgets/common/workbench.h"

#include "siftwave/ledger/anchor.h"
#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/record.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/report/plot_model.h"

#include <QCoreApplication>

#include <filesystem>
#include <limits>

namespace siftwave::widgets {

Workbench::Workbench(QObject* parent) : QObject(parent) {}

QString Workbench::dropPath() const {
    return m_drop ? QString::fromStdString(m_drop->source.path) : QString();
}

SeriesView Workbench::seriesView(const QString& regionCode, int measure, int secondMeasure) const {
    if (!m_drop || measure < 0 || measure >= static_cast<int>(m_drop->measures.size()))
        return {};
    report::PlotRequest request;
    request.region = regionCode.toStdString();
    request.measure = m_drop->measures[static_cast<std::size_t>(measure)];
    if (secondMeasure >= 0 && secondMeasure < static_cast<int>(m_drop->measures.size()))
        request.secondMeasure = m_drop->measures[static_cast<std::size_t>(secondMeasure)];
    request.regions = m_register.get();
    request.previous = comparedPrevious();
    request.findings = findings();
    if (m_drop->caseList)  // a case list's last periods are incomplete: show their nowcast
        request.nowcast = nowcast::NowcastOptions{};
    else  // a release history gives the same nowcast from the releases' counts
        request.nowcastResult = historyNowcast(request.region, request.measure);
    Result<report::PlotModel> model = report::buildPlotModel(*m_drop, m_ledger, m_cleaned, request);
    return model ? seriesViewOf(*model) : SeriesView{};
}

std::vector<double> Workbench::cleanedCounts(const QString& regionCode, int measure) const {
    if (!m_drop || measure < 0 || measure >= static_cast<int>(m_drop->measures.size()))
        return {};
    const std::optional<std::size_t> region = m_drop->regionIndex(regionCode.toStdString());
    if (!region)
        return {};
    return siftwave::ledger::cleanedCounts(m_cleaned, static_cast<std::size_t>(measure), *region);
}

std::optional<std::int64_t> Workbench::cleanedTotal(const QString& regionCode, int measure) const {
    if (!m_drop || measure < 0 || measure >= static_cast<int>(m_drop->measures.size()))
        return std::nullopt;
    const std::optional<std::size_t> region = m_drop->regionIndex(regionCode.toStdString());
    if (!region)
        return std::nullopt;
    return m_cleaned.total(static_cast<std::size_t>(measure), *region);
}

Status Workbench::openLedger(const QString& path) {
    m_ledgerPath = path;
    m_decisionIndex.reset();
    m_ledger = ledger::Ledger{};
    m_cleaned = m_drop ? ledger::Cleaned(*m_drop) : ledger::Cleaned{};
    m_ledgerWritable = false;
    Status result = Ok{};
    if (m_drop) {
        Result<ledger::Ledger> read = ledger::readLedgerFile(path.toStdString());
        if (!read && read.error().code == ErrorCode::NotFound) {
            m_ledgerWritable = true;
        } else if (!read) {
            result = read.error();
        } else if (Result<ledger::Cleaned> replayed = ledger::replay(*m_drop, *read); !replayed) {
            result = replayed.error();
        } else {
            m_ledger = std::move(read).value();
            m_cleaned = std::move(replayed).value();
            m_ledgerWritable = true;
        }
    }
    if (!result) {
        m_chainOk = false;
        m_chainStatus = QCoreApplication::translate("Workbench", "ledger not usable: %1")
                            .arg(QString::fromStdString(result.error().describe()));
    } else {
        updateChainStatus();
    }
    Q_EMIT ledgerChanged();
    return result;
}

void Workbench::updateChainStatus() {
    m_decisionIndex.reset();  // the ledger, the drop or what is in effect changed
    const Status chain = ledger::verifyChain(m_ledger);
    Status conservation = Ok{};
    if (chain && m_drop)
        conservation = ledger::checkConservation(*m_drop, m_cleaned, m_ledger);
    m_chainOk = chain.ok() && conservation.ok();
    if (!chain)
        m_chainStatus = QCoreApplication::translate("Workbench", "chain broken: %1")
                            .arg(QString::fromStdString(chain.error().describe()));
    else if (!conservation)
        m_chainStatus = QCoreApplication::translate("Workbench", "totals do not reconcile: %1")
                            .arg(QString::fromStdString(conservation.error().describe()));
    else
        m_chainStatus =
            QCoreApplication::translate("Workbench", "chain verified · %1 entries · head %2")
                .arg(m_ledger.entries.size())
                .arg(QString::fromStdString(ledger::printedHead(m_ledger)));
    updateSigners();
}

void Workbench::updateSigners() {
    Result<std::vector<ledger::TrustedKey>> trusted =
        ledger::userTrust(ledger::defaultTrustedKeysPath(), ledger::defaultSigningKeyPath());
    m_signers =
        ledger::checkSignatures(m_ledger, trusted ? *trusted : std::vector<ledger::TrustedKey>{});
    m_chainScope =
        QCoreApplication::translate(
            "Workbench",
            "The chain shows the entries are consistent with each other. It cannot show that "
            "nobody edited an entry and recomputed the hashes, or cut entries off the end: "
            "compare the head (%1) with one recorded elsewhere (siftwave-cli ledger --verify "
            "--head).\nSignatures: %2.")
            .arg(QString::fromStdString(m_ledger.headHash()),
                 QString::fromStdString(ledger::describeSignatures(m_signers)));
    if (!trusted)
        m_chainScope += QStringLiteral("\n") +
                        QCoreApplication::translate("Workbench", "Trusted keys not read: %1")
                            .arg(QString::fromStdString(trusted.error().describe()));
}

Result<ledger::Effect> Workbench::preview(const ledger::Decision& decision) const {
    if (!m_drop)
        return makeError(ErrorCode::Usage, "no drop is open");
    return ledger::previewDecision(*m_drop, m_cleaned, decision);
}

Result<scan::DecisionCheck> Workbench::checkDecision(const ledger::Decision& decision) const {
    if (!m_drop)
        return makeError(ErrorCode::Usage, "no drop is open");
    return scan::checkDecision(*m_drop, m_cleaned, decision);
}

Result<std::uint64_t> Workbench::apply(const ledger::Decision& decision, const QString& reason) {
    if (!m_drop)
        return makeError(ErrorCode::Usage, "no drop is open");
    if (!m_ledgerWritable || m_ledgerPath.isEmpty())
        return makeError(ErrorCode::Integrity,
                         "the ledger is not open for writing: " + m_chainStatus.toStdString());
    ledger::RecordRequest request;
    request.ledgerPath = m_ledgerPath.toStdString();
    request.decision = decision;
    request.meta.reason = reason.trimmed().toStdString();
    // Signed when the user has a key (siftwave-cli signing-key --create).
    std::optional<ledger::SigningKey> key;
    std::error_code ec;
    if (std::filesystem::exists(ledger::defaultSigningKeyPath(), ec)) {
        Result<ledger::SigningKey> loaded =
            ledger::SigningKey::load(ledger::defaultSigningKeyPath());
        if (!loaded)
            return loaded.error();
        key = std::move(*loaded);
        request.signer = &*key;
    }
    // The file first: an entry exists only once it is on disk.
    Result<ledger::Recorded> recorded =
        ledger::recordDecision(*m_drop, request, m_ledger, m_cleaned);
    if (!recorded) {
        // Another writer's entries may be on disk: re-read so the window shows what the file
        // says. The refusal is what the caller must see.
        if (recorded.error().code != ErrorCode::Usage)
            static_cast<void>(openLedger(m_ledgerPath));
        return recorded.error();
    }
    m_ledger = std::move(recorded->ledger);
    m_cleaned = std::move(recorded->cleaned);
    updateChainStatus();
    Q_EMIT ledgerChanged();
    return recorded->entry.sequence;
}

Result<std::uint64_t> Workbench::withdraw(std::uint64_t sequence, const QString& reason) {
    ledger::Decision d;
    d.kind = ledger::DecisionKind::Withdraw;
    d.target = sequence;
    return apply(d, reason);
}

void Workbench::setScanReport(std::shared_ptr<const scan::ScanReport> report) {
    m_scan = std::move(report);
    m_decisionIndex.reset();
    Q_EMIT findingsChanged();
}

const std::vector<scan::Finding>& Workbench::findings() const {
    static const std::vector<scan::Finding> none;
    return m_scan ? m_scan->findings : none;
}

const scan::Finding* Workbench::finding(const QString& id) const {
    const std::string key = id.toStdString();
    for (const scan::Finding& f : findings())
        if (f.id == key)
            return &f;
    return nullptr;
}

const Workbench::DecisionIndex& Workbench::decisionIndex() const {
    if (m_decisionIndex)
        return *m_decisionIndex;
    DecisionIndex index;
    for (const ledger::LedgerEntry& e : m_ledger.entries)
        if (!e.decision.finding.empty() && e.decision.kind != ledger::DecisionKind::Withdraw &&
            m_cleaned.inEffect(e.sequence))
            index.decided.insert(e.decision.finding);
    for (const scan::Finding& f : findings())
        if (f.region && !index.decided.contains(f.id))
            ++index.openByRegion[*f.region];
    m_decisionIndex = std::move(index);
    return *m_decisionIndex;
}

bool Workbench::isDecided(const std::string& findingId) const {
    return decisionIndex().decided.contains(findingId);
}

int Workbench::openFindings(const QString& regionCode) const {
    const auto& open = decisionIndex().openByRegion;
    const auto it = open.find(regionCode.toStdString());
    return it == open.end() ? 0 : it->second;
}

std::optional<double> Workbench::population(const QString& regionCode) const {
    if (!m_register)
        return std::nullopt;
    const RegionEntry* entry = m_register->find(regionCode.toStdString());
    if (!entry || !entry->population)
        return std::nullopt;
    return static_cast<double>(*entry->population);
}

fit::ComparedFit Workbench::fitRegion(const QString& regionCode, int measure,
                                      const fit::FitOptions& options, bool compare) const {
    const std::vector<double> counts = cleanedCounts(regionCode, measure);
    if (counts.empty())
        return {makeError(ErrorCode::NotFound, "no such region or measure in the open drop"), {}};
    return fit::fitWithComparison(
        fit::Series{m_drop->axis.first(), counts, m_drop->axis.periodDays()}, options,
        population(regionCode), compare, m_fitWorkspace);
}

void Workbench::setDrop(std::shared_ptr<const Drop> drop,
                        std::shared_ptr<const RegionRegister> regionRegister) {
    m_drop = std::move(drop);
    m_register = std::move(regionRegister);
    m_previous.reset();  // it was the previous release of another drop
    m_scan.reset();
    m_ledger = ledger::Ledger{};
    m_cleaned = m_drop ? ledger::Cleaned(*m_drop) : ledger::Cleaned{};
    m_ledgerPath.clear();
    m_ledgerWritable = false;
    updateChainStatus();
    Q_EMIT dropChanged();
}

QString Workbench::previousPath() const {
    return m_previous ? QString::fromStdString(m_previous->source.path) : QString();
}

void Workbench::setPreviousDrop(std::shared_ptr<const Drop> previous) {
    m_previous = std::move(previous);
    Q_EMIT previousChanged();
}

void Workbench::setReleaseHistory(std::vector<std::shared_ptr<const Drop>> releases) {
    // The open drop is the latest release already: a copy of it in the list is left out.
    std::erase_if(releases, [this](const std::shared_ptr<const Drop>& d) {
        return !d || (m_drop && d->source.sha256 == m_drop->source.sha256);
    });
    m_history = std::move(releases);
    Q_EMIT previousChanged();
}

std::optional<ReleaseHistory> Workbench::releaseHistoryWithDrop() const {
    if (m_history.empty() || !m_drop)
        return std::nullopt;
    std::vector<std::shared_ptr<const Drop>> releases = m_history;
    releases.push_back(m_drop);
    Result<ReleaseHistory> history =
        ReleaseHistory::of(std::move(releases), ReleaseHistory::Order::ByAsOf);
    return history ? std::optional<ReleaseHistory>(std::move(*history)) : std::nullopt;
}

std::optional<ReleaseHistory> Workbench::comparedReleases() const {
    if (m_drop && m_previous) {
        Result<ReleaseHistory> two =
            ReleaseHistory::of({m_previous, m_drop}, ReleaseHistory::Order::AsGiven);
        return two ? std::optional<ReleaseHistory>(std::move(*two)) : std::nullopt;
    }
    std::optional<ReleaseHistory> history = releaseHistoryWithDrop();
    if (!history || &history->latest() != m_drop.get())
        return std::nullopt;
    return history;
}

const Drop* Workbench::comparedPrevious() const {
    if (m_previous)
        return m_previous.get();
    const std::optional<ReleaseHistory> releases = comparedReleases();
    // The drops are the workbench's own (m_history): the pointer outlives the history object.
    return releases ? &releases->release(releases->size() - 2) : nullptr;
}

std::optional<nowcast::NowcastResult> Workbench::historyNowcast(const std::string& region,
                                                                const std::string& measure) const {
    const std::optional<ReleaseHistory> history = releaseHistoryWithDrop();
    if (!history)
        return std::nullopt;
    Result<nowcast::ReportingTriangle> tri =
        nowcast::triangleFromReleases(*history, region, measure);
    if (!tri)
        return std::nullopt;
    Result<nowcast::NowcastResult> result = nowcast::nowcast(*tri);
    return result ? std::optional<nowcast::NowcastResult>(std::move(*result)) : std::nullopt;
}

QString Workbench::releaseHistoryProblem() const {
    const std::optional<ReleaseHistory> history = releaseHistoryWithDrop();
    if (!history || m_drop->regionCodes.empty() || m_drop->measures.empty())
        return {};
    Result<nowcast::ReportingTriangle> tri = nowcast::triangleFromReleases(
        *history, m_drop->regionCodes.front(), m_drop->measures.front());
    return tri ? QString() : QString::fromStdString(tri.error().describe());
}

void Workbench::close() {
    m_drop.reset();
    m_history.clear();
    m_register.reset();
    m_previous.reset();
    m_scan.reset();
    m_ledger = ledger::Ledger{};
    m_cleaned = ledger::Cleaned{};
    m_ledgerPath.clear();
    m_ledgerWritable = false;
    updateChainStatus();
    Q_EMIT dropChanged();
}

}  // namespace siftwave::widgets
