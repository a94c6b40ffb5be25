// One-line descriptions of findings, from their evidence: the words here, each kind's
// sentence in its entry of the finding kind table (finding_kinds.cpp).
#include "scan/finding_kinds.h"
#include "siftwave/scan/finding.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstdio>

namespace siftwave::scan {
namespace detail {
namespace {

std::string number(const nlohmann::json& v) {
    if (v.is_number_integer())
        return std::to_string(v.get<long long>());
    if (v.is_number()) {
        const double d = v.get<double>();
        char text[32];
        if (std::fabs(d - std::round(d)) < 1e-9 && std::fabs(d) < 1e15) {
            std::snprintf(text, sizeof text, "%.0f", d);
        } else {
            std::snprintf(text, sizeof text, "%.3g", d);
        }
        return text;
    }
    if (v.is_string())
        return v.get<std::string>();
    if (v.is_boolean())
        return v.get<bool>() ? "yes" : "no";
    return "?";
}

}  // namespace

std::string EvidenceText::get(const char* key) const {
    auto it = e.find(key);
    return it == e.end() ? std::string("?") : number(*it);
}

std::string EvidenceText::periods(const char* periodsKey, const char* daysKey) const {
    return e.contains(periodsKey) ? get(periodsKey) : get(daysKey);
}

bool EvidenceText::flag(const char* key) const {
    return e.value(key, false);
}

bool EvidenceText::has(const char* key) const {
    return e.contains(key);
}

EvidenceText EvidenceText::at(const char* key) const {
    return EvidenceText{e.at(key), weekly};
}

}  // namespace detail

std::string describeFinding(const Finding& f) {
    const nlohmann::json evidence = f.evidence.json();
    const detail::EvidenceText words{evidence, f.cadence == Cadence::Weekly};
    return detail::descriptorOf(f.kind).describe(words);
}

}  // namespace siftwave::scan
