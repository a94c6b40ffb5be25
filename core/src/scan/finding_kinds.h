#pragma once
// The descriptor table of finding kinds: one entry per FindingKind holding
// everything the scan knows about the kind besides its detector's own file: its
// name (JSON and command line), a one-line summary, what input it needs (a
// previous release, a region register), whether it is enabled and its options
// (the names set() and describeScanOptions() read, and the rules validate()
// checks), the detector to run and the one-line description of a finding from
// its evidence. scanDrop(), findingKindName(), describeFinding() and
// ScanOptions read this table; no switch over the kinds is left outside it.
// Entries are in FindingKind order, which is also the order of the options.

#include "scan/scan_input.h"

#include <cstdint>
#include <span>
#include <string>
#include <variant>
#include <vector>

namespace siftwave::scan::detail {

/// One option of a kind, by its "kind.param" name.
struct OptionEntry {
    const char* name;
    std::variant<bool*, int*, double*> value;
    const char* help;
};

/// One rule validate() checks: `ok` false names the option and what it must be.
struct OptionRule {
    bool ok;
    const char* name;
    const char* rule;
};

/// The input a kind needs besides the drop.
enum ScanNeed : unsigned {
    kNeedsDropOnly = 0,
    kNeedsPrevious = 1u << 0,  // ScanContext::previous or ::history
    kNeedsRegister = 1u << 1,  // ScanContext::regions
};

/// Words for describing a finding from its evidence (finding_text.cpp).
struct EvidenceText {
    const nlohmann::json& e;
    bool weekly = false;

    std::string unit() const { return weekly ? "week" : "day"; }
    std::string units() const { return weekly ? "weeks" : "days"; }
    /// The value under `key` as text ("?" when absent).
    std::string get(const char* key) const;
    /// A count of periods: `periodsKey`, or for evidence without it the daily `daysKey`.
    std::string periods(const char* periodsKey, const char* daysKey) const;
    bool flag(const char* key) const;
    bool has(const char* key) const;
    /// The words for a nested object of the evidence.
    EvidenceText at(const char* key) const;
};

struct FindingKindDescriptor {
    FindingKind kind;
    const char* name;     // "backlog_dump"
    const char* summary;  // what the kind is, one line
    unsigned needs;       // ScanNeed bits
    bool (*enabled)(const ScanOptions&);
    void (*detect)(const ScanInput&, ScanReport&);
    std::string (*describe)(const EvidenceText&);
    std::vector<OptionEntry> (*options)(ScanOptions&);
    std::vector<OptionRule> (*rules)(const ScanOptions&);
};

/// Every kind, in FindingKind order.
std::span<const FindingKindDescriptor> findingKindTable();
const FindingKindDescriptor& descriptorOf(FindingKind kind);

}  // namespace siftwave::scan::detail
