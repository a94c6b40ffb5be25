#include "siftwave/scan/finding.h"

#include "scan/finding_kinds.h"

#include <nlohmann/json.hpp>

#include <cassert>

namespace siftwave::scan {

Evidence::Evidence() = default;
Evidence::Evidence(const Evidence& other)
    : m_object(other.m_object ? std::make_unique<nlohmann::json>(*other.m_object) : nullptr),
      m_packed(other.m_packed) {}
Evidence::Evidence(Evidence&& other) noexcept = default;
Evidence& Evidence::operator=(const Evidence& other) {
    if (this != &other) {
        m_object = other.m_object ? std::make_unique<nlohmann::json>(*other.m_object) : nullptr;
        m_packed = other.m_packed;
    }
    return *this;
}
Evidence& Evidence::operator=(Evidence&& other) noexcept = default;
Evidence::~Evidence() = default;

Evidence& Evidence::operator=(nlohmann::json object) {
    m_object = std::make_unique<nlohmann::json>(std::move(object));
    m_packed.clear();
    return *this;
}

void Evidence::expand() {
    if (m_packed.empty())
        return;
    m_object = std::make_unique<nlohmann::json>(nlohmann::json::from_cbor(m_packed));
    m_packed.clear();
    m_packed.shrink_to_fit();
}

void Evidence::compact() {
    if (!m_object)
        return;
    m_packed = nlohmann::json::to_cbor(*m_object);
    m_packed.shrink_to_fit();
    m_object.reset();
}

nlohmann::json& Evidence::operator[](const std::string& key) {
    expand();
    if (!m_object)
        m_object = std::make_unique<nlohmann::json>(nlohmann::json::object());
    return (*m_object)[key];
}

nlohmann::json Evidence::operator[](const std::string& key) const {
    assert(contains(key));
    nlohmann::json object = json();
    const auto it = object.find(key);
    return it == object.end() ? nlohmann::json() : std::move(*it);
}

nlohmann::json Evidence::json() const {
    if (m_object)
        return *m_object;
    if (!m_packed.empty())
        return nlohmann::json::from_cbor(m_packed);
    return nlohmann::json::object();
}

bool Evidence::contains(const std::string& key) const {
    return json().contains(key);
}

std::vector<std::pair<std::string, std::string>> Evidence::scalars() const {
    std::vector<std::pair<std::string, std::string>> out;
    const nlohmann::json object = json();
    if (!object.is_object())
        return out;
    for (auto it = object.begin(); it != object.end(); ++it) {
        if (it->is_string())
            out.emplace_back(it.key(), it->get<std::string>());
        else if (it->is_number())
            out.emplace_back(it.key(), it->dump());
    }
    return out;
}

std::string Evidence::dump() const {
    return json().dump();
}

const char* findingKindName(FindingKind kind) {
    return detail::descriptorOf(kind).name;
}

std::optional<FindingKind> findingKindFromName(std::string_view name) {
    for (FindingKind kind : kAllFindingKinds) {
        if (name == findingKindName(kind))
            return kind;
    }
    return std::nullopt;
}

const char* severityName(Severity severity) {
    switch (severity) {
        case Severity::Info:
            return "info";
        case Severity::Warning:
            return "warning";
        case Severity::Critical:
            return "critical";
    }
    return "info";
}

nlohmann::json findingToJson(const Finding& f) {
    nlohmann::json j = nlohmann::json::object();
    j["id"] = f.id;
    j["kind"] = findingKindName(f.kind);
    j["severity"] = severityName(f.severity);
    j["rank"] = f.rank;
    j["region"] = f.region ? nlohmann::json(*f.region) : nlohmann::json(nullptr);
    j["measure"] = f.measure ? nlohmann::json(*f.measure) : nlohmann::json(nullptr);
    if (f.first)
        j["first"] = f.first->iso();
    if (f.last)
        j["last"] = f.last->iso();
    j["evidence"] = f.evidence.json();
    j["suggestion"] = suggestionToJson(f);
    return j;
}

namespace {

void putWindow(nlohmann::json& j, const std::optional<ledger::DayRange>& window,
               const char* firstKey, const char* lastKey) {
    if (!window)
        return;
    j[firstKey] = window->first.iso();
    j[lastKey] = window->last.iso();
}

/// The kind's own words (see suggestionToJson in finding.h).
void putKindFields(nlohmann::json& j, const ledger::Decision& d) {
    switch (d.kind) {
        case ledger::DecisionKind::Redistribute:
            j["excess"] = d.excess;
            j["method"] = ledger::redistributeMethodName(d.redistributeMethod);
            [[fallthrough]];
        case ledger::DecisionKind::SpreadNegative:
            if (d.date)
                j["date"] = d.date->iso();
            putWindow(j, d.window, "window_first", "window_last");
            break;
        case ledger::DecisionKind::FillMissing:
            j["method"] = ledger::fillMethodName(d.fillMethod);
            putWindow(j, d.window, "first", "last");
            break;
        case ledger::DecisionKind::ResolveDuplicate:
            j["keep"] = ledger::duplicateRuleName(d.duplicateRule);
            if (d.date)
                j["date"] = d.date->iso();
            break;
        case ledger::DecisionKind::MergeCodes:
            j["from"] = d.variant;
            j["into"] = d.into;
            break;
        case ledger::DecisionKind::Exclude:
            if (d.window)
                putWindow(j, d.window, "first", "last");
            else if (!d.region.empty())
                j["region"] = d.region;
            break;
        case ledger::DecisionKind::Accept:
        case ledger::DecisionKind::Withdraw:
        case ledger::DecisionKind::NowcastComplete:  // no finding suggests it
            break;
    }
}

}  // namespace

nlohmann::json suggestionToJson(const Finding& f) {
    nlohmann::json j = nlohmann::json::object();
    if (!f.suggestion)
        return j;
    j["decision"] = ledger::decisionKindName(f.suggestion->kind);
    putKindFields(j, *f.suggestion);
    const SuggestionNotes& n = f.suggestionNotes;
    if (!n.note.empty())
        j["note"] = n.note;
    if (!n.action.empty())
        j["action"] = n.action;
    if (n.absorbable)
        j["absorbable"] = *n.absorbable;
    return j;
}

std::string suggestionText(const Finding& f) {
    return suggestionToJson(f).dump();
}

}  // namespace siftwave::scan
