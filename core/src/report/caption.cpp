#include "siftwave/report/caption.h"

#include "siftwave/ledger/anchor.h"

#include <ctime>

namespace siftwave::report {

std::string todayUtc() {
    const std::time_t now = std::time(nullptr);
    std::tm utc{};
    gmtime_r(&now, &utc);
    char text[16];
    std::strftime(text, sizeof text, "%Y-%m-%d", &utc);
    return text;
}

std::string fileNameOf(const std::string& path) {
    const auto slash = path.find_last_of("/\\");
    return slash == std::string::npos ? path : path.substr(slash + 1);
}

const char* siftwaveVersion() {
    return "0.1.0";
}

CaptionFacts captionFacts(const Drop& drop, const ledger::Ledger& ledger, const fit::FitResult* fit,
                          const std::string& exportDate) {
    CaptionFacts facts;
    facts.sourceFile = fileNameOf(drop.source.path);
    facts.sourceSheet = drop.source.sheet;
    if (drop.periods() > 0) {
        facts.firstDate = drop.axis.first().iso();
        facts.lastDate = drop.axis.lastStart().iso();
    }
    facts.dropSha256Prefix = drop.source.sha256.substr(0, kHashPrefixLength);
    facts.narrowedRead = narrowingNote(drop.source);
    facts.ledgerEntries = ledger.entries.size();
    if (!ledger.entries.empty())
        facts.ledgerHeadPrefix = ledger::printedHead(ledger);
    if (fit) {
        facts.model = fit::modelName(fit->model);
        facts.method = fit::methodName(fit->method);
        facts.fitFirstDate = fit->windowFirst().iso();
        facts.fitLastDate = fit->windowLast().iso();
    }
    facts.exportDate = exportDate.empty() ? todayUtc() : exportDate;
    return facts;
}

std::vector<std::string> captionLines(const CaptionFacts& f) {
    std::vector<std::string> lines;
    std::string source =
        "Source: " + (f.sourceFile.empty() ? std::string("(unnamed)") : f.sourceFile);
    if (!f.sourceSheet.empty())
        source += ", sheet " + f.sourceSheet;
    if (!f.firstDate.empty())
        source += ", " + f.firstDate + " to " + f.lastDate;
    source += ", SHA-256 " + f.dropSha256Prefix;
    lines.push_back(source);
    if (!f.narrowedRead.empty())
        lines.push_back("Read: " + f.narrowedRead);
    if (f.ledgerEntries == 0)
        lines.push_back("Ledger: none, raw counts as reported");
    else
        lines.push_back("Ledger: " + std::to_string(f.ledgerEntries) +
                        (f.ledgerEntries == 1 ? " entry" : " entries") + ", head " +
                        f.ledgerHeadPrefix);
    if (f.model.empty())
        lines.push_back("Fit: none");
    else
        lines.push_back("Fit: " + f.model + ", " + f.method + ", " + f.fitFirstDate + " to " +
                        f.fitLastDate + (f.bands.empty() ? std::string() : "; " + f.bands));
    if (!f.transmission.empty())
        lines.push_back("Lower panel: " + f.transmission);
    if (!f.nowcastCompleted.empty())
        lines.push_back(f.nowcastCompleted);
    lines.push_back("Exported " + f.exportDate + " by Siftwave " + siftwaveVersion());
    lines.push_back(f.caution);
    return lines;
}

}  // namespace siftwave::report
