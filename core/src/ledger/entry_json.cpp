// Canonical JSON of ledger entries, the hash chain and its verification.
#include "siftwave/ledger/entry.h"

#include "ledger/entry_json.h"
#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/ledger/signing.h"
#include "siftwave/sha256.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <functional>
#include <set>

namespace siftwave::ledger {

using nlohmann::json;

namespace {

constexpr int kEntryVersion = 1;
constexpr const char* kNowcastMethod = "chain_ladder";  // nowcast_complete's only method

json cellToJson(const CleanedCell& c) {
    return json{{"state", cleanedStateName(c.state)}, {"value", c.value}};
}

json rangeToJson(const DayRange& r) {
    return json{{"first", r.first.iso()}, {"last", r.last.iso()}};
}

Error syntax(std::uint64_t line, std::string message) {
    Error e = makeError(ErrorCode::Syntax, std::move(message));
    e.line = line;
    return e;
}

}  // namespace

namespace detail {

json decisionParameters(const Decision& d) {
    json p = json::object();
    auto put = [&](const char* key, const std::string& value) {
        if (!value.empty())
            p[key] = value;
    };
    for (DecisionParam param : decisionKindInfo(d.kind).parameters) {
        switch (param) {
            case DecisionParam::Region:
                put("region", d.region);
                break;
            case DecisionParam::Measure:
                put("measure", d.measure);
                break;
            case DecisionParam::Date:
                if (d.date)
                    p["date"] = d.date->iso();
                break;
            case DecisionParam::Window:
                if (d.window)
                    p["window"] = rangeToJson(*d.window);
                break;
            case DecisionParam::Excess:
                p["excess"] = d.excess;
                break;
            case DecisionParam::RedistributeMethod:
                p["method"] = redistributeMethodName(d.redistributeMethod);
                break;
            case DecisionParam::BaselineWidth:
                if (d.redistributeMethod == RedistributeMethod::Baseline ||
                    d.redistributeMethod == RedistributeMethod::Level)
                    p["baseline_width"] = d.baselineWidth;
                break;
            case DecisionParam::FillMethod:
                p["method"] = fillMethodName(d.fillMethod);
                break;
            case DecisionParam::Keep:
                p["keep"] = duplicateRuleName(d.duplicateRule);
                break;
            case DecisionParam::Variant:
                put("variant", d.variant);
                break;
            case DecisionParam::Into:
                put("into", d.into);
                break;
            case DecisionParam::Entry:
                p["entry"] = d.target;
                break;
            case DecisionParam::MaxDelay:
                p["max_delay"] = d.maxDelay;
                break;
            case DecisionParam::NowcastWindow:
                p["nowcast_window"] = d.nowcastWindow;
                break;
            case DecisionParam::NowcastMethod:
                p["method"] = kNowcastMethod;
                break;
        }
    }
    put("finding", d.finding);
    return p;
}

/// A narrowed read: {"from", "to", "regions"}, each only when given.
json narrowingToJson(const ReadNarrowing& n) {
    json j = json::object();
    if (n.from)
        j["from"] = n.from->iso();
    if (n.to)
        j["to"] = n.to->iso();
    if (!n.regions.empty())
        j["regions"] = n.regions;
    return j;
}

json entryToJson(const LedgerEntry& e, EntryPart part) {
    json cells = json::array();
    for (const CellChange& c : e.effect.cells) {
        cells.push_back(json{{"measure", c.measure},
                             {"region", c.region},
                             {"date", c.date.iso()},
                             {"before", cellToJson(c.before)},
                             {"after", cellToJson(c.after)}});
    }
    json totals = json::array();
    for (const TotalChange& t : e.effect.totals) {
        totals.push_back(json{{"measure", t.measure},
                              {"region", t.region},
                              {"before", t.before},
                              {"after", t.after}});
    }
    json j{{"version", kEntryVersion},
           {"sequence", e.sequence},
           {"time", e.timestamp},
           {"author", e.author},
           {"reason", e.reason},
           {"kind", decisionKindName(e.decision.kind)},
           {"parameters", decisionParameters(e.decision)},
           {"cells", std::move(cells)},
           {"totals", std::move(totals)},
           {"drop_sha256", e.dropSha256},
           {"previous_hash", e.previousHash}};
    if (e.narrowing.active())
        j["narrowed_read"] = narrowingToJson(e.narrowing);
    if (part != EntryPart::Signed && e.signature)
        j["signature"] = json{{"algorithm", "ed25519"},
                              {"public_key", e.signature->publicKey},
                              {"value", e.signature->value}};
    if (part == EntryPart::Whole)
        j["hash"] = e.hash;
    return j;
}

Result<std::string> canonicalDump(const json& j) {
    try {
        return j.dump(-1, ' ', false, json::error_handler_t::strict);
    } catch (const std::exception& ex) {
        return makeError(ErrorCode::Encoding,
                         std::string("text in the entry is not valid UTF-8: ") + ex.what());
    }
}

}  // namespace detail

namespace {

// Typed reading with the line number in every message.
class Reader {
public:
    explicit Reader(std::uint64_t line) : m_line(line) {}

    Result<std::string> text(const json& obj, const char* key, bool required = true) const {
        auto it = obj.find(key);
        if (it == obj.end()) {
            if (!required)
                return std::string();
            return syntax(m_line, std::string("the entry has no \"") + key + "\"");
        }
        if (!it->is_string())
            return syntax(m_line, std::string("\"") + key + "\" must be text");
        return it->get<std::string>();
    }
    Result<std::int64_t> integer(const json& obj, const char* key) const {
        auto it = obj.find(key);
        if (it == obj.end())
            return syntax(m_line, std::string("the entry has no \"") + key + "\"");
        if (!it->is_number_integer())
            return syntax(m_line, std::string("\"") + key + "\" must be a whole number");
        return it->get<std::int64_t>();
    }
    Result<Date> date(const json& obj, const char* key) const {
        auto t = text(obj, key);
        if (!t)
            return t.error();
        auto d = Date::fromIso(*t);
        if (!d)
            return syntax(m_line, std::string("\"") + key + "\" is not an ISO 8601 date: " + *t);
        return *d;
    }
    Result<DayRange> range(const json& obj, const char* key) const {
        auto it = obj.find(key);
        if (it == obj.end() || !it->is_object())
            return syntax(m_line, std::string("\"") + key + "\" must be an object");
        auto first = date(*it, "first");
        if (!first)
            return first.error();
        auto last = date(*it, "last");
        if (!last)
            return last.error();
        if (*last < *first)
            return syntax(m_line, std::string("\"") + key + "\" ends before it starts");
        return DayRange{*first, *last};
    }
    Result<CleanedCell> cell(const json& obj, const char* key) const {
        auto it = obj.find(key);
        if (it == obj.end() || !it->is_object())
            return syntax(m_line, std::string("\"") + key + "\" must be an object");
        auto state = text(*it, "state");
        if (!state)
            return state.error();
        auto s = cleanedStateFromName(*state);
        if (!s)
            return syntax(m_line, "unknown cell state \"" + *state + "\"");
        auto value = integer(*it, "value");
        if (!value)
            return value.error();
        return CleanedCell{*value, *s};
    }
    Status onlyKeys(const json& obj, std::initializer_list<const char*> keys,
                    const char* what) const {
        std::set<std::string> allowed(keys.begin(), keys.end());
        for (auto it = obj.begin(); it != obj.end(); ++it) {
            if (!allowed.count(it.key()))
                return syntax(m_line, std::string("unknown field \"") + it.key() + "\" in " + what);
        }
        return Ok{};
    }
    std::uint64_t line() const { return m_line; }

private:
    std::uint64_t m_line;
};

/// Fails unless the parameters are an object with only the keys a decision has.
Status checkParameterKeys(const Reader& rd, const json& p) {
    if (!p.is_object())
        return syntax(rd.line(), "\"parameters\" must be an object");
    return rd.onlyKeys(
        p,
        {"region", "measure", "date", "window", "excess", "method", "baseline_width", "keep",
         "variant", "into", "entry", "finding", "max_delay", "nowcast_window"},
        "parameters");
}

/// The text parameters, each optional: region, measure, variant, into and finding.
Status readTextParameters(const Reader& rd, const json& p, Decision& d) {
    auto str = [&](const char* key, std::string& out) -> Status {
        auto t = rd.text(p, key, false);
        if (!t)
            return t.error();
        out = *t;
        return Ok{};
    };
    for (auto s : {str("region", d.region), str("measure", d.measure), str("variant", d.variant),
                   str("into", d.into), str("finding", d.finding)}) {
        if (!s)
            return s.error();
    }
    return Ok{};
}

/// The days, each optional: "date" and "window".
Status readDayParameters(const Reader& rd, const json& p, Decision& d) {
    if (p.contains("date")) {
        auto x = rd.date(p, "date");
        if (!x)
            return x.error();
        d.date = *x;
    }
    if (p.contains("window")) {
        auto x = rd.range(p, "window");
        if (!x)
            return x.error();
        d.window = *x;
    }
    return Ok{};
}

/// The whole numbers, each optional: "excess", "baseline_width" and "entry" (a positive id).
Status readNumberParameters(const Reader& rd, const json& p, Decision& d) {
    if (p.contains("excess")) {
        auto x = rd.integer(p, "excess");
        if (!x)
            return x.error();
        d.excess = *x;
    }
    if (p.contains("baseline_width")) {
        auto x = rd.integer(p, "baseline_width");
        if (!x)
            return x.error();
        d.baselineWidth = static_cast<int>(*x);
    }
    if (p.contains("entry")) {
        auto x = rd.integer(p, "entry");
        if (!x)
            return x.error();
        if (*x <= 0)
            return syntax(rd.line(), "\"entry\" must be a positive id");
        d.target = static_cast<std::uint64_t>(*x);
    }
    for (auto [key, out] :
         {std::pair{"max_delay", &d.maxDelay}, std::pair{"nowcast_window", &d.nowcastWindow}}) {
        if (!p.contains(key))
            continue;
        auto x = rd.integer(p, key);
        if (!x)
            return x.error();
        if (*x < 1 || *x > 100000)
            return syntax(rd.line(), std::string("\"") + key + "\" must be 1 to 100000");
        *out = static_cast<int>(*x);
    }
    return Ok{};
}

/// The named rules, each optional: "method" and "keep".
Status readRuleParameters(const Reader& rd, const json& p, Decision& d) {
    if (p.contains("method")) {
        auto x = rd.text(p, "method");
        if (!x)
            return x.error();
        // "method" names a redistribution method for the kinds that take one, the nowcast's
        // method for nowcast_complete, else a fill method.
        if (decisionKindInfo(d.kind).hasParameter(DecisionParam::NowcastMethod)) {
            if (*x != kNowcastMethod)
                return syntax(rd.line(),
                              "unknown nowcast method \"" + *x + "\" (" + kNowcastMethod + ")");
        } else if (decisionKindInfo(d.kind).hasParameter(DecisionParam::RedistributeMethod)) {
            auto m = redistributeMethodFromName(*x);
            if (!m)
                return syntax(rd.line(), "unknown redistribution method \"" + *x + "\"");
            d.redistributeMethod = *m;
        } else {
            auto m = fillMethodFromName(*x);
            if (!m)
                return syntax(rd.line(), "unknown fill method \"" + *x + "\"");
            d.fillMethod = *m;
        }
    }
    if (p.contains("keep")) {
        auto x = rd.text(p, "keep");
        if (!x)
            return x.error();
        auto r = duplicateRuleFromName(*x);
        if (!r)
            return syntax(rd.line(), "unknown duplicate rule \"" + *x + "\"");
        d.duplicateRule = *r;
    }
    return Ok{};
}

/// A decision of `kind` from its "parameters": the keys, each group of parameters in turn, then
/// the decision as a whole (its errors become syntax errors of this line).
Result<Decision> parseDecision(const Reader& rd, DecisionKind kind, const json& p) {
    if (auto s = checkParameterKeys(rd, p); !s)
        return s.error();
    Decision d;
    d.kind = kind;
    using ParameterStep = Status (*)(const Reader&, const json&, Decision&);
    for (ParameterStep step :
         {readTextParameters, readDayParameters, readNumberParameters, readRuleParameters}) {
        if (auto s = step(rd, p, d); !s)
            return s.error();
    }
    if (auto s = d.validate(); !s) {
        Error e = s.error();
        e.code = ErrorCode::Syntax;
        e.line = rd.line();
        return e;
    }
    return d;
}

/// Fails unless the line is an object with only the fields of an entry.
Status checkEntryKeys(const Reader& rd, const json& j) {
    if (!j.is_object())
        return syntax(rd.line(), "a ledger line must be a JSON object");
    return rd.onlyKeys(
        j,
        {"version", "sequence", "time", "author", "reason", "kind", "parameters", "cells", "totals",
         "drop_sha256", "previous_hash", "hash", "signature", "narrowed_read"},
        "the entry");
}

/// The version (this reader's, kEntryVersion) and the sequence number (positive).
Status readVersionAndSequence(const Reader& rd, const json& j, LedgerEntry& e) {
    auto version = rd.integer(j, "version");
    if (!version)
        return version.error();
    if (*version != kEntryVersion)
        return syntax(rd.line(), "unsupported entry version " + std::to_string(*version));
    auto seq = rd.integer(j, "sequence");
    if (!seq)
        return seq.error();
    if (*seq <= 0)
        return syntax(rd.line(), "\"sequence\" must be positive");
    e.sequence = static_cast<std::uint64_t>(*seq);
    return Ok{};
}

/// The text fields: time, author, reason and the three hashes (each 64 lower-case hex digits).
Status readTextFields(const Reader& rd, const json& j, LedgerEntry& e) {
    for (auto [key, out] : {std::pair<const char*, std::string*>{"time", &e.timestamp},
                            {"author", &e.author},
                            {"reason", &e.reason},
                            {"drop_sha256", &e.dropSha256},
                            {"previous_hash", &e.previousHash},
                            {"hash", &e.hash}}) {
        auto t = rd.text(j, key);
        if (!t)
            return t.error();
        *out = *t;
    }
    for (const std::string* h : {&e.dropSha256, &e.previousHash, &e.hash}) {
        if (!isSha256Hex(*h))
            return syntax(rd.line(), "a hash must be 64 lower-case hex digits");
    }
    return Ok{};
}

bool isLowerHex(const std::string& text, std::size_t digits) {
    return text.size() == digits && text.find_first_not_of("0123456789abcdef") == std::string::npos;
}

/// The optional signature: {"algorithm": "ed25519", "public_key": 64 hex, "value": 128 hex}.
Status readSignature(const Reader& rd, const json& j, LedgerEntry& e) {
    auto it = j.find("signature");
    if (it == j.end())
        return Ok{};
    if (!it->is_object())
        return syntax(rd.line(), "\"signature\" must be an object");
    if (auto s = rd.onlyKeys(*it, {"algorithm", "public_key", "value"}, "the signature"); !s)
        return s.error();
    auto algorithm = rd.text(*it, "algorithm");
    if (!algorithm)
        return algorithm.error();
    if (*algorithm != "ed25519")
        return syntax(rd.line(), "unsupported signature algorithm \"" + *algorithm + "\"");
    auto key = rd.text(*it, "public_key");
    auto value = rd.text(*it, "value");
    if (!key)
        return key.error();
    if (!value)
        return value.error();
    if (!isLowerHex(*key, 64) || !isLowerHex(*value, 128))
        return syntax(
            rd.line(),
            "a signature is a 64-digit public key and a 128-digit value in lower-case hex");
    e.signature = EntrySignature{*key, *value};
    return Ok{};
}

/// The optional narrowed read: {"from", "to", "regions"}, at least one of them; the regions are
/// text, sorted, each once (as ReadNarrowing keeps them).
Status readNarrowedRead(const Reader& rd, const json& j, LedgerEntry& e) {
    auto it = j.find("narrowed_read");
    if (it == j.end())
        return Ok{};
    if (!it->is_object())
        return syntax(rd.line(), "\"narrowed_read\" must be an object");
    if (auto s = rd.onlyKeys(*it, {"from", "to", "regions"}, "the narrowed read"); !s)
        return s.error();
    for (auto [key, out] : {std::pair<const char*, std::optional<Date>*>{"from", &e.narrowing.from},
                            {"to", &e.narrowing.to}}) {
        if (!it->contains(key))
            continue;
        auto day = rd.date(*it, key);
        if (!day)
            return day.error();
        *out = *day;
    }
    if (auto regions = it->find("regions"); regions != it->end()) {
        if (!regions->is_array())
            return syntax(rd.line(), "\"regions\" of the narrowed read must be a list of codes");
        for (const json& code : *regions) {
            if (!code.is_string())
                return syntax(rd.line(),
                              "\"regions\" of the narrowed read must be a list of codes");
            e.narrowing.regions.push_back(code.get<std::string>());
        }
        const std::vector<std::string>& codes = e.narrowing.regions;
        if (std::adjacent_find(codes.begin(), codes.end(), std::greater_equal<>()) != codes.end())
            return syntax(rd.line(),
                          "\"regions\" of the narrowed read must be sorted, each code once");
    }
    if (!e.narrowing.active())
        return syntax(rd.line(), "\"narrowed_read\" names no date and no region");
    return Ok{};
}

/// The decision: its kind by name, then its parameters.
Status readDecision(const Reader& rd, const json& j, LedgerEntry& e) {
    auto kindName = rd.text(j, "kind");
    if (!kindName)
        return kindName.error();
    auto kind = decisionKindFromName(*kindName);
    if (!kind)
        return syntax(rd.line(), "unknown decision kind \"" + *kindName + "\"");
    auto decision = parseDecision(rd, *kind, j.value("parameters", json()));
    if (!decision)
        return decision.error();
    e.decision = std::move(*decision);
    return Ok{};
}

/// One changed cell: where it is and its value before and after.
Result<CellChange> readCellChange(const Reader& rd, const json& c) {
    if (!c.is_object())
        return syntax(rd.line(), "each cell must be an object");
    auto measure = rd.text(c, "measure");
    if (!measure)
        return measure.error();
    auto region = rd.text(c, "region");
    if (!region)
        return region.error();
    auto date = rd.date(c, "date");
    if (!date)
        return date.error();
    auto before = rd.cell(c, "before");
    if (!before)
        return before.error();
    auto after = rd.cell(c, "after");
    if (!after)
        return after.error();
    return CellChange{*measure, *region, *date, *before, *after};
}

/// The changed cells. A line without "cells" throws (json::at), as a malformed entry.
Status readCellChanges(const Reader& rd, const json& j, LedgerEntry& e) {
    const json& cells = j.at("cells");
    if (!cells.is_array())
        return syntax(rd.line(), "\"cells\" must be an array");
    for (const json& c : cells) {
        auto change = readCellChange(rd, c);
        if (!change)
            return change.error();
        e.effect.cells.push_back(std::move(*change));
    }
    return Ok{};
}

/// One changed total: its measure and region and the total before and after.
Result<TotalChange> readTotalChange(const Reader& rd, const json& t) {
    if (!t.is_object())
        return syntax(rd.line(), "each total must be an object");
    auto measure = rd.text(t, "measure");
    if (!measure)
        return measure.error();
    auto region = rd.text(t, "region");
    if (!region)
        return region.error();
    auto before = rd.integer(t, "before");
    if (!before)
        return before.error();
    auto after = rd.integer(t, "after");
    if (!after)
        return after.error();
    return TotalChange{*measure, *region, *before, *after};
}

/// The changed totals.
Status readTotalChanges(const Reader& rd, const json& j, LedgerEntry& e) {
    if (!j.contains("totals") || !j.at("totals").is_array())
        return syntax(rd.line(), "\"totals\" must be an array");
    for (const json& t : j.at("totals")) {
        auto change = readTotalChange(rd, t);
        if (!change)
            return change.error();
        e.effect.totals.push_back(std::move(*change));
    }
    return Ok{};
}

}  // namespace

namespace detail {

Result<LedgerEntry> entryFromJson(const json& j, std::uint64_t lineNumber) {
    const Reader rd(lineNumber);
    if (auto s = checkEntryKeys(rd, j); !s)
        return s.error();
    LedgerEntry e;
    using EntryStep = Status (*)(const Reader&, const json&, LedgerEntry&);
    for (EntryStep step : {readVersionAndSequence, readTextFields, readDecision, readCellChanges,
                           readTotalChanges, readSignature, readNarrowedRead}) {
        if (auto s = step(rd, j, e); !s)
            return s.error();
    }
    return e;
}

}  // namespace detail

const std::string& genesisHash() {
    static const std::string zeros(64, '0');
    return zeros;
}

std::string Ledger::headHash() const {
    return entries.empty() ? genesisHash() : entries.back().hash;
}

std::int64_t Effect::netChange() const {
    std::int64_t sum = 0;
    for (const TotalChange& t : totals)
        sum += t.change();
    return sum;
}

Result<std::string> canonicalEntryJson(const LedgerEntry& entry) {
    return detail::canonicalDump(detail::entryToJson(entry, detail::EntryPart::Hashed));
}

Result<std::string> signedEntryJson(const LedgerEntry& entry) {
    return detail::canonicalDump(detail::entryToJson(entry, detail::EntryPart::Signed));
}

Result<std::string> entryLine(const LedgerEntry& entry) {
    return detail::canonicalDump(detail::entryToJson(entry, detail::EntryPart::Whole));
}

Result<LedgerEntry> parseEntryLine(std::string_view line, std::uint64_t lineNumber) {
    json j = json::parse(line.begin(), line.end(), nullptr, false);
    if (j.is_discarded())
        return syntax(lineNumber, "the line is not valid JSON");
    try {
        return detail::entryFromJson(j, lineNumber);
    } catch (const std::exception& ex) {
        return syntax(lineNumber, std::string("malformed entry: ") + ex.what());
    }
}

Status sealEntry(LedgerEntry& entry, const LedgerEntry* previous) {
    entry.previousHash = previous ? previous->hash : genesisHash();
    auto text = canonicalEntryJson(entry);
    if (!text)
        return text.error();
    entry.hash = sha256Hex(*text);
    return Ok{};
}

Status verifyChain(const Ledger& ledger) {
    const std::string drop = ledger.dropSha256();
    for (std::size_t i = 0; i < ledger.entries.size(); ++i) {
        const LedgerEntry& e = ledger.entries[i];
        const std::uint64_t position = i + 1;
        auto fail = [&](std::string message) {
            Error err = makeError(ErrorCode::Integrity,
                                  "entry " + std::to_string(position) + ": " + message);
            err.line = position;
            return err;
        };
        if (e.sequence != position) {
            return fail("its sequence number is " + std::to_string(e.sequence) +
                        "; entries were deleted, inserted or reordered");
        }
        const std::string& expectedPrevious = i == 0 ? genesisHash() : ledger.entries[i - 1].hash;
        if (e.previousHash != expectedPrevious) {
            return fail("its previous_hash does not match entry " + std::to_string(i) +
                        (i == 0 ? std::string(" (none)") : std::string()) +
                        "; entries were deleted, inserted, reordered or edited");
        }
        auto text = canonicalEntryJson(e);
        if (!text)
            return fail(text.error().message);
        if (sha256Hex(*text) != e.hash)
            return fail("its content does not match its hash; it was edited");
        if (e.signature && !signatureMatches(e))
            return fail(
                "its signature does not match its content; it was edited after it was "
                "signed");
        if (e.dropSha256 != drop)
            return fail("it names another drop than entry 1");
        if (e.narrowing != ledger.entries.front().narrowing)
            return fail("it was made on another narrowing of the drop than entry 1 (" +
                        describeRead(e.narrowing) +
                        ", entry 1: " + describeRead(ledger.entries.front().narrowing) + ")");
    }
    return Ok{};
}

}  // namespace siftwave::ledger
