#include "siftwave/scan/scan.h"

#include "scan/finding_kinds.h"
#include "scan/scan_input.h"
#include "siftwave/release_history.h"

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <optional>
#include <unordered_map>

namespace siftwave::scan {
namespace {

std::uint64_t fnv1a(std::string_view text) {
    std::uint64_t h = 14695981039346656037ull;
    for (unsigned char c : text) {
        h ^= c;
        h *= 1099511628211ull;
    }
    return h;
}

std::string idKey(const Finding& f) {
    std::string key = findingKindName(f.kind);
    key += '|';
    key += f.region ? *f.region : std::string("\x01*");
    key += '|';
    key += f.measure ? *f.measure : std::string("\x01*");
    key += '|';
    key += f.first ? f.first->iso() : std::string();
    key += '|';
    key += f.last ? f.last->iso() : std::string();
    return key;
}

int severityOrder(Severity s) {
    switch (s) {
        case Severity::Critical:
            return 0;
        case Severity::Warning:
            return 1;
        case Severity::Info:
            return 2;
    }
    return 2;
}

/// "line" -> "place", "first_line" -> "first_place", "line_after" -> "place_after", "lines"
/// -> "places"; other keys (and "baseline") are no source lines: nullopt.
std::optional<std::string> placeKeyOf(const std::string& key) {
    if (key == "line" || key == "lines")
        return "place" + key.substr(4);
    if (key.starts_with("line_"))
        return "place" + key.substr(4);
    if (key.ends_with("_line"))
        return key.substr(0, key.size() - 4) + "place";
    return std::nullopt;
}

/// A source line (a number) as its place, or every line of an array; other values unchanged.
nlohmann::json placesOf(const nlohmann::json& lines, const Provenance& source) {
    if (lines.is_number_unsigned() && lines.get<std::uint64_t>() > 0)
        return sourcePlace(source, lines.get<std::uint64_t>());
    if (!lines.is_array())
        return lines;
    nlohmann::json out = nlohmann::json::array();
    for (const nlohmann::json& line : lines)
        out.push_back(placesOf(line, source));
    return out;
}

/// The evidence of a workbook drop names its source lines as the sheet's rows ("data!14:14"),
/// through sourcePlace(), in objects nested at any depth (a duplicate's rows).
nlohmann::json withSheetPlaces(const nlohmann::json& value, const Provenance& source) {
    if (value.is_array()) {
        nlohmann::json out = nlohmann::json::array();
        for (const nlohmann::json& item : value)
            out.push_back(withSheetPlaces(item, source));
        return out;
    }
    if (!value.is_object())
        return value;
    nlohmann::json out = nlohmann::json::object();
    for (auto it = value.begin(); it != value.end(); ++it) {
        if (std::optional<std::string> key = placeKeyOf(it.key()))
            out[*key] = placesOf(it.value(), source);
        else
            out[it.key()] = withSheetPlaces(it.value(), source);
    }
    return out;
}

}  // namespace

std::string findingId(const Finding& finding) {
    char hex[17];
    std::snprintf(hex, sizeof hex, "%016llx",
                  static_cast<unsigned long long>(fnv1a(idKey(finding))));
    return std::string(findingKindName(finding.kind)) + "-" + std::string(hex, 12);
}

Result<ScanReport> scanDrop(const Drop& drop, const ScanOptions& options,
                            const ScanContext& context) {
    if (Status s = options.validate(); !s)
        return s.error();
    if (context.history != nullptr && context.previous != nullptr)
        return makeError(ErrorCode::Usage,
                         "give the scan a previous release or a release "
                         "history, not both");
    if (context.history != nullptr && &context.history->latest() != &drop)
        return makeError(ErrorCode::Usage,
                         "the scanned drop must be the release history's latest release");
    const detail::ScanInput in = detail::prepareScanInput(drop, options, context);

    ScanReport report;
    report.cadence = drop.axis.cadence();
    for (const detail::FindingKindDescriptor& kind : detail::findingKindTable()) {
        const bool inputs =
            (!(kind.needs & detail::kNeedsPrevious) || context.previous || context.history) &&
            (!(kind.needs & detail::kNeedsRegister) || context.regions);
        if (!inputs || !kind.enabled(options))
            continue;
        const std::size_t before = report.findings.size();
        kind.detect(in, report);
        // Evidence as CBOR bytes from here on (finding.h): the ranking below reads none of it.
        // A workbook drop's lines are named as its sheet's rows first.
        for (std::size_t i = before; i < report.findings.size(); ++i) {
            Evidence& evidence = report.findings[i].evidence;
            if (!drop.source.format.empty())
                evidence = withSheetPlaces(evidence.json(), drop.source);
            evidence.compact();
        }
    }

    std::vector<Finding>& all = report.findings;
    // Review order: severity, then counts in doubt, then kind, region order, date.
    std::unordered_map<std::string, std::size_t> regionOrder;
    for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
        regionOrder.emplace(drop.regionCodes[r], r);
    }
    auto regionRank = [&](const Finding& f) -> std::size_t {
        if (!f.region)
            return 0;
        auto it = regionOrder.find(*f.region);
        return it == regionOrder.end() ? drop.regionCodes.size() + 1 : it->second + 1;
    };
    std::stable_sort(all.begin(), all.end(), [&](const Finding& a, const Finding& b) {
        if (severityOrder(a.severity) != severityOrder(b.severity)) {
            return severityOrder(a.severity) < severityOrder(b.severity);
        }
        if (a.impact != b.impact)
            return a.impact > b.impact;
        if (a.kind != b.kind)
            return a.kind < b.kind;
        const std::size_t ra = regionRank(a), rb = regionRank(b);
        if (ra != rb)
            return ra < rb;
        if (a.first != b.first)
            return a.first < b.first;
        return a.measure < b.measure;
    });

    std::unordered_map<std::string, int> seen;
    for (std::size_t i = 0; i < all.size(); ++i) {
        Finding& f = all[i];
        f.rank = static_cast<int>(i) + 1;
        std::string id = findingId(f);
        const int n = ++seen[id];
        if (n > 1) {
            id += '-';  // (two appends: GCC 12 warns falsely of -Wrestrict on "-" + string)
            id += std::to_string(n);
        }
        f.id = std::move(id);
        if (f.suggestion)
            f.suggestion->finding = f.id;
    }

    for (FindingKind kind : kAllFindingKinds)
        report.byKind[findingKindName(kind)] = 0;
    for (Severity s : {Severity::Info, Severity::Warning, Severity::Critical}) {
        report.bySeverity[severityName(s)] = 0;
    }
    for (const Finding& f : all) {
        ++report.byKind[findingKindName(f.kind)];
        ++report.bySeverity[severityName(f.severity)];
    }
    return report;
}

nlohmann::json scanReportToJson(const ScanReport& report) {
    nlohmann::json findings = nlohmann::json::array();
    for (const Finding& f : report.findings)
        findings.push_back(findingToJson(f));
    return {{"findings", std::move(findings)}, {"summary", scanSummaryToJson(report)}};
}

namespace {

nlohmann::json revisionSummaryJson(const RevisionSummary& r) {
    return {
        {"cells_compared", r.cellsCompared},
        {"cells_changed", r.cellsChanged},
        {"cells_appeared", r.cellsAppeared},
        {"cells_vanished", r.cellsVanished},
        {"regions_revised", r.regionsRevised},
        {"net_change", r.netChange},
        {"absolute_change", r.absoluteChange},
        {"previous_total", r.previousTotal},
        {"share_changed", r.previousTotal > 0 ? r.absoluteChange / r.previousTotal : 0.0},
    };
}

}  // namespace

nlohmann::json scanSummaryToJson(const ScanReport& report) {
    nlohmann::json summary = nlohmann::json::object();
    summary["cadence"] = cadenceName(report.cadence);
    summary["by_kind"] = report.byKind;
    summary["by_severity"] = report.bySeverity;
    if (report.revisions.compared)
        summary["revisions"] = revisionSummaryJson(report.revisions);
    if (!report.releaseRevisions.empty()) {
        nlohmann::json pairs = nlohmann::json::array();
        for (const ReleaseRevisions& p : report.releaseRevisions) {
            pairs.push_back({{"previous_file", p.previousFile},
                             {"current_file", p.currentFile},
                             {"previous_as_of", p.previousAsOf.iso()},
                             {"current_as_of", p.currentAsOf.iso()},
                             {"revisions", revisionSummaryJson(p.summary)},
                             {"by_severity", p.bySeverity},
                             {"by_change", p.byChange}});
        }
        summary["release_revisions"] = std::move(pairs);
    }
    return summary;
}

}  // namespace siftwave::scan
